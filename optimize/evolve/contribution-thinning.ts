/**
 * Greedy hypervolume thinning of a mutually non-dominated front with three or more objectives: remove,
 * one at a time, the member whose exclusive hypervolume contribution is smallest (the selection of
 * Beume, Naujoks & Emmerich 2007 [beume2007sms], applied to a whole generation's last front as in their
 * (μ + λ) variant). Each contribution is exact, computed by optimize/pareto/hypervolume.ts:
 *   contribution(p) = Π_j (ref_j − p_j) − HV({ max(p, q) : q ≠ p })
 * (the part of p's box that no other member's box covers; max taken per objective). After a removal only
 * the members whose contribution can have changed are recomputed: p's changes only if some region is
 * dominated by p and the removed member w and by no one else, which is impossible when max(p, w) is
 * weakly dominated by a third member; the others are recomputed, so the result is the exact greedy one.
 */
import { defaultReferencePoint, hypervolume } from '../pareto/index.ts';
import type { Scored } from '../pareto/index.ts';

/** Does a weakly dominate b (minimisation)? */
function weaklyDominates(a: Float64Array, b: Float64Array): boolean {
  for (let j = 0; j < a.length; j++) if (a[j] > b[j]) return false;
  return true;
}

/** The front's objectives scaled to [0, 1] by its own range (a constant objective to 0). */
function normalised(members: readonly Scored[]): Float64Array[] {
  const d = members[0].objectives.length;
  const low = new Float64Array(d).fill(Infinity);
  const high = new Float64Array(d).fill(-Infinity);
  for (const m of members) {
    for (let j = 0; j < d; j++) {
      low[j] = Math.min(low[j], m.objectives[j]);
      high[j] = Math.max(high[j], m.objectives[j]);
    }
  }
  return members.map((m) =>
    Float64Array.from(m.objectives, (v, j) => (high[j] > low[j] ? (v - low[j]) / (high[j] - low[j]) : 0)),
  );
}

/** Exclusive hypervolume of points[p] among the members still `alive`, with reference `reference`. */
function exclusiveContribution(points: Float64Array[], alive: boolean[], p: number, reference: Float64Array): number {
  const own = points[p];
  let box = 1;
  for (let j = 0; j < own.length; j++) box *= reference[j] - own[j];
  const shadows: Float64Array[] = [];
  for (let q = 0; q < points.length; q++) {
    if (q === p || !alive[q]) continue;
    const shadow = Float64Array.from(own, (v, j) => Math.max(v, points[q][j]));
    shadows.push(shadow);
  }
  return Math.max(0, box - hypervolume(own.length < 4 ? shadows : nondominated(shadows), reference));
}

/**
 * The points that no other weakly dominates (of equal ones, one): in four or more objectives the
 * hypervolume sweep's cost grows with the square of the points, and most shadows are dominated. By
 * increasing coordinate sum a point can be dominated only by one before it, and (dominance being
 * transitive) by one already kept if by any, so each is compared with the kept ones only.
 */
function nondominated(points: Float64Array[]): Float64Array[] {
  const sums = points.map((p) => p.reduce((a, b) => a + b, 0));
  const order = points.map((_, i) => i).sort((a, b) => sums[a] - sums[b] || a - b);
  const kept: Float64Array[] = [];
  for (const i of order) if (!kept.some((k) => weaklyDominates(k, points[i]))) kept.push(points[i]);
  return kept;
}

/**
 * Thins `members` (mutually non-dominated, ≥ 3 objectives) to `keep` by greedy exclusive-contribution
 * removal. The member with the smallest value of each objective always stays (as the two extremes do
 * in two objectives). Ties: the newer member (larger index) goes first, so results never depend on list
 * order. Objectives are normalised by the front's own range; the reference point is that of
 * defaultReferencePoint (optimize/pareto/hypervolume.ts) on the normalised front.
 */
export function thinByContributionMany<T extends Scored>(members: readonly T[], keep: number): T[] {
  const count = members.length;
  if (count <= keep) return members.slice();
  const d = members[0].objectives.length;
  const points = normalised(members);
  // The project's default reference point of the normalised front: 10 % of the range beyond its worst
  // value (1.1), so that the members at the edge keep a contribution.
  const reference = defaultReferencePoint(points);
  const alive = new Array<boolean>(count).fill(true);
  const extreme = new Array<boolean>(count).fill(false);
  for (let j = 0; j < d; j++) {
    let best = 0;
    for (let i = 1; i < count; i++) {
      const better = points[i][j] < points[best][j];
      const tie = points[i][j] === points[best][j] && members[i].index < members[best].index;
      if (better || tie) best = i;
    }
    extreme[best] = true;
  }
  const value = new Float64Array(count);
  for (let i = 0; i < count; i++) value[i] = extreme[i] ? Infinity : exclusiveContribution(points, alive, i, reference);
  const corner = new Float64Array(d);
  for (let left = count; left > keep; left--) {
    let worst = -1;
    for (let i = 0; i < count; i++) {
      if (!alive[i]) continue;
      if (
        worst < 0 ||
        value[i] < value[worst] ||
        (value[i] === value[worst] && members[i].index > members[worst].index)
      )
        worst = i;
    }
    alive[worst] = false;
    const removed = points[worst];
    for (let p = 0; p < count; p++) {
      if (!alive[p] || extreme[p]) continue;
      for (let j = 0; j < d; j++) corner[j] = Math.max(points[p][j], removed[j]);
      let covered = false;
      for (let q = 0; q < count && !covered; q++)
        if (q !== p && alive[q] && weaklyDominates(points[q], corner)) covered = true;
      if (!covered) value[p] = exclusiveContribution(points, alive, p, reference);
    }
  }
  return members.filter((_, i) => alive[i]);
}
