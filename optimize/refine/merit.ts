import { refineRangeError } from './refine-errors.ts';

/**
 * The merit of one evaluated point: a total constraint violation and an objective value, both to
 * be minimised, compared by Deb's feasibility rules.
 *
 * - `violation`: total constraint violation, Σ max(0, g_j) over normalised constraints g_j ≤ 0;
 *   0 means feasible. Must be ≥ 0 (NaN is read as +Infinity: "could not be evaluated").
 * - `value`: the objective (or a scalarisation of several); NaN is read as +Infinity.
 */
export interface Merit {
  violation: number;
  value: number;
}

/** The merit of a point that was never evaluated, or could not be: worse than any other. */
export const WORST_MERIT: Readonly<Merit> = Object.freeze({ violation: Infinity, value: Infinity });

/**
 * Normalises a merit or a bare objective value (a bare number is feasible) into a fresh Merit
 * with NaN read as +Infinity. Throws a RangeError for a negative violation, which can only come
 * from a caller's bug (a violation is a sum of non-negative parts).
 */
export function toMerit(input: Merit | number): Merit {
  if (typeof input === 'number') return { violation: 0, value: Number.isNaN(input) ? Infinity : input };
  const violation = Number.isNaN(input.violation) ? Infinity : input.violation;
  if (violation < 0) throw refineRangeError('a merit', 'a violation >= 0', input.violation);
  const value = Number.isNaN(input.value) ? Infinity : input.value;
  return { violation, value };
}

/**
 * Deb's feasibility rules as a comparator (K. Deb, "An efficient constraint handling method for
 * genetic algorithms", Comput. Methods Appl. Mech. Engrg. 186 (2000) 311–338; details from memory): a feasible
 * point beats an infeasible one; two feasible points compare by value; two infeasible points
 * compare by total violation. Ours adds one tie-break Deb leaves open: equal violations compare
 * by value. The result is the lexicographic order on (violation, value).
 *
 * Returns a negative number when `a` is better, positive when `b` is better, 0 for a tie; use
 * with a stable sort. Arguments must already be normalised by `toMerit` (no NaN).
 */
export function compareMerits(a: Merit, b: Merit): number {
  if (a.violation !== b.violation) return a.violation < b.violation ? -1 : 1;
  if (a.value !== b.value) return a.value < b.value ? -1 : 1;
  return 0;
}

/** True when `a` is strictly better than `b` by Deb's rules (see `compareMerits`). */
export function isBetterMerit(a: Merit, b: Merit): boolean {
  return compareMerits(a, b) < 0;
}

/** True when the merit is feasible (violation exactly 0). */
export function isFeasibleMerit(merit: Merit): boolean {
  return merit.violation === 0;
}

/**
 * The difference between two merits used by the stopping rule: |Δviolation| + |Δvalue|, with two
 * equal values (infinities included) differing by 0. For feasible merits this is scipy's
 * |f_0 − f_j|.
 */
export function meritDistance(a: Merit, b: Merit): number {
  const violationGap = a.violation === b.violation ? 0 : Math.abs(a.violation - b.violation);
  const valueGap = a.value === b.value ? 0 : Math.abs(a.value - b.value);
  return violationGap + valueGap;
}
