import type { Scored } from './scored.ts';
import { dominates } from './dominates.ts';

/**
 * Deb's constraint-domination comparison (K. Deb, "An efficient constraint handling method for genetic
 * algorithms", CMAME 186, 311-338, 2000, sec. 3; as constrained domination in Deb et al. 2002, NSGA-II):
 * 1. a feasible design (violation 0) ranks before any infeasible one;
 * 2. two infeasible designs: the smaller total violation first;
 * 3. two feasible designs: the one that dominates first (one objective: the smaller value).
 * @returns negative when a ranks before b, positive when b ranks before a, 0 when neither (mutually
 *   non-dominated, or equal). Not a total order for several objectives: use rankCandidates to sort.
 * @example constrainedBetter({ index: 0, violation: 0, objectives: f(9) }, { index: 1, violation: 0.01, objectives: f(1) }) // < 0
 */
export function constrainedBetter(a: Scored, b: Scored): number {
  const aFeasible = a.violation === 0;
  const bFeasible = b.violation === 0;
  if (aFeasible !== bFeasible) return aFeasible ? -1 : 1;
  if (!aFeasible) return a.violation < b.violation ? -1 : a.violation > b.violation ? 1 : 0;
  if (dominates(a.objectives, b.objectives)) return -1;
  if (dominates(b.objectives, a.objectives)) return 1;
  return 0;
}
