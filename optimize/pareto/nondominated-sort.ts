import { dominates } from './dominates.ts';
import { DominanceIndex } from './dominance-index.ts';

function hasNaN(point: ArrayLike<number>): boolean {
  for (let j = 0; j < point.length; j++) if (Number.isNaN(point[j])) return true;
  return false;
}

/** Sum of a vector's components (a monotone key: a dominator never has a larger sum, rounding included). */
function componentSum(point: ArrayLike<number>): number {
  let sum = 0;
  for (let j = 0; j < point.length; j++) sum += point[j];
  return sum;
}

/**
 * Non-dominated sorting (the front structure of Deb, Pratap, Agarwal & Meyarivan, "A fast and elitist
 * multiobjective genetic algorithm: NSGA-II", IEEE TEC 6(2), 182-197, 2002, sec. III-A), computed by
 * peeling instead of the paper's domination lists so memory stays O(N): points are ordered by the sum of
 * their objectives, then lexicographically (every dominator of a point comes before it), and each front
 * is the set of remaining points not dominated by an earlier member of that front (looked up in a k-d
 * tree once the front has 64 members). Same fronts as the paper; O(M·N²) at worst, typically about
 * O(M·N log N) per front computed, so asking for few fronts (limit) is cheap.
 *
 * Equal vectors share a front. A point with a NaN component dominates nothing and is never dominated, so
 * it is in the first front.
 * @param points objective vectors (minimisation), all of the same length.
 * @param limit stop once the fronts returned hold at least this many points (the last front is complete);
 *   default all.
 * @returns fronts from best (rank 1) on, each a list of positions into `points`, ascending.
 * @example nondominatedSort([[1, 2], [2, 1], [2, 2]]) // [[0, 1], [2]]
 */
export function nondominatedSort(points: readonly ArrayLike<number>[], limit = Infinity): number[][] {
  const keys = points.map(componentSum);
  let remaining = points.map((_, position) => position);
  remaining.sort((a, b) => {
    const ka = Number.isNaN(keys[a]) ? Infinity : keys[a];
    const kb = Number.isNaN(keys[b]) ? Infinity : keys[b];
    if (ka !== kb) return ka < kb ? -1 : 1;
    const pa = points[a];
    const pb = points[b];
    for (let j = 0; j < pa.length; j++) {
      if (pa[j] !== pb[j]) return pa[j] < pb[j] || Number.isNaN(pb[j]) ? -1 : 1;
    }
    return a - b;
  });
  const fronts: number[][] = [];
  const dimensions = points.length > 0 ? points[0].length : 0;
  let ranked = 0;
  while (remaining.length > 0 && ranked < limit) {
    const front: number[] = [];
    const rest: number[] = [];
    // The front so far: a plain list while small, a k-d tree (dominance-index.ts) once it grows, so a
    // large front costs O(log) per membership test instead of O(|front|).
    let index: DominanceIndex | null = null;
    for (const position of remaining) {
      const point = points[position];
      let dominated = false;
      if (index !== null && !hasNaN(point)) {
        dominated = index.countDominators(point, 1) > 0;
      } else {
        for (let f = 0; f < front.length; f++) {
          if (dominates(points[front[f]], point)) {
            dominated = true;
            break;
          }
        }
      }
      if (dominated) {
        rest.push(position);
        continue;
      }
      front.push(position);
      if (index !== null) {
        if (!hasNaN(point)) index.insert(point, 0, position, null);
      } else if (front.length === 64 && dimensions > 0) {
        index = new DominanceIndex(dimensions);
        for (const member of front) if (!hasNaN(points[member])) index.insert(points[member], 0, member, null);
      }
    }
    fronts.push(front.slice().sort((a, b) => a - b));
    ranked += front.length;
    remaining = rest;
  }
  return fronts;
}
