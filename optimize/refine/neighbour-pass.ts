import { isBetterMerit } from './merit.ts';
import type { Merit } from './merit.ts';
import { copyMixedPoint } from './mixed-point.ts';
import type { MixedPoint } from './mixed-point.ts';
import { refineRangeError } from './refine-errors.ts';
import type { StartLedger } from './start-ledger.ts';

/** Result of a neighbour pass. */
export interface NeighbourPassResult {
  /** The best point found (the incumbent if nothing was better). */
  point: MixedPoint;
  merit: Merit;
  /** Moves accepted (each one level on one discrete parameter). */
  moves: number;
  /** True when the pass stopped because its budget ran out. */
  outOfBudget: boolean;
}

/**
 * The neighbour pass over discrete parameters: holding the continuous coordinates, tries one level
 * down and one level up on every discrete parameter around the incumbent (the next wire gauge, the
 * next form size, ±1 turn), all in one batch; moves to the best neighbour if it beats the
 * incumbent by Deb's rules, and repeats until no neighbour is better or the budget is spent. This
 * is steepest descent on the lattice of levels, a discrete analogue of a coordinate search
 * (common practice for mixed-variable refinement; no source claimed).
 *
 * @param incumbent the point to start from, with its merit
 * @param levelCounts number of ordered levels of each discrete parameter (levels are 0..count−1)
 * @param ledger the start's budgeted, cached evaluator
 */
export async function neighbourPass<R>(
  incumbent: { point: MixedPoint; merit: Merit },
  levelCounts: ReadonlyArray<number>,
  ledger: StartLedger<R>,
): Promise<NeighbourPassResult> {
  if (incumbent.point.levels.length !== levelCounts.length) {
    throw refineRangeError(
      'neighbourPass',
      `one level per discrete parameter (${levelCounts.length})`,
      incumbent.point.levels.length,
    );
  }
  let point = copyMixedPoint(incumbent.point);
  let merit = incumbent.merit;
  let moves = 0;
  for (;;) {
    const neighbours = neighboursOf(point, levelCounts);
    if (neighbours.length === 0) return { point, merit, moves, outOfBudget: false };
    const affordable = affordablePrefix(neighbours, ledger);
    if (affordable.length === 0) return { point, merit, moves, outOfBudget: true };
    const merits = await ledger.merits(affordable);
    let bestIndex = -1;
    for (let i = 0; i < affordable.length; i++) {
      if (isBetterMerit(merits[i], bestIndex < 0 ? merit : merits[bestIndex])) bestIndex = i;
    }
    if (bestIndex < 0) return { point, merit, moves, outOfBudget: affordable.length < neighbours.length };
    point = affordable[bestIndex];
    merit = merits[bestIndex];
    moves++;
  }
}

/**
 * The lattice neighbours of a point: for each discrete parameter in order, one level down then
 * one level up, where those levels exist. Continuous coordinates are copied unchanged.
 */
export function neighboursOf(point: MixedPoint, levelCounts: ReadonlyArray<number>): MixedPoint[] {
  const neighbours: MixedPoint[] = [];
  for (let d = 0; d < levelCounts.length; d++) {
    for (const step of [-1, 1]) {
      const level = point.levels[d] + step;
      if (level < 0 || level >= levelCounts[d]) continue;
      const neighbour = copyMixedPoint(point);
      neighbour.levels[d] = level;
      neighbours.push(neighbour);
    }
  }
  return neighbours;
}

function affordablePrefix<R>(points: MixedPoint[], ledger: StartLedger<R>): MixedPoint[] {
  const chosen: MixedPoint[] = [];
  for (const point of points) {
    if (ledger.cost([...chosen, point]) > ledger.remaining) break;
    chosen.push(point);
  }
  return chosen;
}
