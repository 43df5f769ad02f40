/**
 * Pareto dominance for minimisation: a dominates b when a is no worse in every objective and better in
 * at least one (Deb, "Multi-objective optimization using evolutionary algorithms", Wiley 2001, def. 2.5).
 * Equal vectors do not dominate each other; a NaN component makes every comparison with it false, so a
 * vector with NaN neither dominates nor is dominated.
 * @param a,b objective vectors of the same length, minimisation convention (maximised metrics negated).
 * @example dominates([1, 2], [1, 3]) // true; dominates([1, 2], [1, 2]) // false
 */
export function dominates(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  let strictlyBetter = false;
  for (let j = 0; j < a.length; j++) {
    const x = a[j];
    const y = b[j];
    if (x < y) strictlyBetter = true;
    else if (!(x === y)) return false; // x > y, or NaN on either side
  }
  return strictlyBetter;
}
