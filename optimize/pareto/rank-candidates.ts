import type { Scored } from './scored.ts';
import { nondominatedSort } from './nondominated-sort.ts';
import { crowdingDistance } from './crowding-distance.ts';

/** The result of {@link rankCandidates}: positions into the input and per-item rank data. */
export interface CandidateRanking {
  /** Positions into `items`, best first (all of them, or the first `limit`). */
  order: number[];
  /** Per item: Pareto rank from 1 among feasible items; 0 for infeasible; −1 when not computed (limit). */
  paretoRank: Int32Array;
  /** Per item: crowding distance within its front (Infinity at front boundaries); 0 infeasible/not computed. */
  crowding: Float64Array;
}

function checkItem(item: Scored, objectiveCount: number): void {
  if (!(item.violation >= 0)) {
    throw new RangeError(`rankCandidates: violation must be a number ≥ 0, got ${item.violation} (index ${item.index})`);
  }
  if (item.violation === 0 && item.objectives.length !== objectiveCount) {
    throw new RangeError(
      `rankCandidates: every feasible item needs ${objectiveCount} objectives, got ${item.objectives.length} (index ${item.index})`,
    );
  }
}

/**
 * The final ranking of a sweep, deterministic and independent of input order:
 * 1. feasible items (violation 0) first, by Pareto rank (non-dominated sorting, Deb et al. 2002), within a
 *    front by crowding distance descending, ties by sample index ascending; with one objective (or none)
 *    simply by value, ties by index (paretoRank is then the dense rank of the value);
 * 2. infeasible items after, by total violation ascending (Deb 2000), ties by index.
 * @param items scored candidates (objectives in the minimisation convention, finite).
 * @param limit rank only the first `limit` positions (fronts are computed until they hold `limit` feasible
 *   items; the order array then has min(limit, items.length) entries). Default: all.
 * @example
 * const { order } = rankCandidates(pool.entries().map((e) => e.item));
 */
export function rankCandidates(items: readonly Scored[], limit = Infinity): CandidateRanking {
  const paretoRank = new Int32Array(items.length).fill(-1);
  const crowding = new Float64Array(items.length);
  const feasible: number[] = [];
  const infeasible: number[] = [];
  const objectiveCount = items.find((item) => item.violation === 0)?.objectives.length ?? 0;
  items.forEach((item, position) => {
    checkItem(item, objectiveCount);
    if (item.violation === 0) feasible.push(position);
    else infeasible.push(position);
  });
  // Sample-index order from here on, so that ties inside crowdingDistance (broken by position) are broken
  // by index and nothing depends on the order of the input.
  feasible.sort((a, b) => items[a].index - items[b].index);
  const order: number[] = [];
  if (objectiveCount <= 1) {
    const value = (position: number) => (objectiveCount === 0 ? 0 : items[position].objectives[0]);
    feasible.sort((a, b) => value(a) - value(b) || items[a].index - items[b].index);
    let rank = 0;
    feasible.forEach((position, i) => {
      if (i === 0 || value(position) !== value(feasible[i - 1])) rank++;
      paretoRank[position] = rank;
    });
    // Crowding within each group of equal values (a one-objective "front"), as in the general case.
    let start = 0;
    for (let i = 1; i <= feasible.length; i++) {
      if (i === feasible.length || paretoRank[feasible[i]] !== paretoRank[feasible[start]]) {
        const group = feasible.slice(start, i);
        const distances = crowdingDistance(
          group.map((p) => items[p].objectives),
          group.map((_, k) => k),
        );
        group.forEach((p, k) => {
          crowding[p] = distances[k];
        });
        start = i;
      }
    }
    order.push(...feasible.slice(0, Math.min(feasible.length, limit)));
  } else {
    const points = feasible.map((position) => items[position].objectives);
    const fronts = nondominatedSort(points, limit);
    fronts.forEach((front, f) => {
      const distances = crowdingDistance(points, front);
      const members = front.map((local, k) => ({ position: feasible[local], distance: distances[k] }));
      for (const member of members) {
        paretoRank[member.position] = f + 1;
        crowding[member.position] = member.distance;
      }
      members.sort(
        (a, b) =>
          (a.distance === b.distance ? 0 : a.distance > b.distance ? -1 : 1) ||
          items[a.position].index - items[b.position].index,
      );
      for (const member of members) if (order.length < limit) order.push(member.position);
    });
  }
  infeasible.sort((a, b) => items[a].violation - items[b].violation || items[a].index - items[b].index);
  for (const position of infeasible) {
    paretoRank[position] = 0;
    if (order.length < limit) order.push(position);
  }
  return { order, paretoRank, crowding };
}
