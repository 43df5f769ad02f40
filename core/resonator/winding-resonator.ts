/**
 * The distributed resonator of a design's winding: the capacitance matrix from one field solve at
 * the finest segment count, the inductance matrix from the loop sum, the ladder solved at the
 * finest count and at coarser nested counts (the same solve, restricted: the nodes are uniform, so
 * the coarse hats are exact combinations of the fine ones), and the segment count chosen by
 * convergence.
 *
 * The convergence test is the Richardson error estimate [richardson1927] of the finer of two
 * counts n/2 and n: for a discretisation of order p, f(n) − f(∞) ≈ (f(n/2) − f(n)) / (2^p − 1).
 * The observed order of the uniform ladder (from the ratio of successive changes 8 → 16 → 32 → 64)
 * lies between 1.7 and 1.9 for bare and lightly loaded coils of 70 to 2000 turns, ℓ/a from 1 to
 * 100 (tested): the charge density is singular at the sheet's ends, so the ladder falls a little
 * short of the 1/n² of a smooth solution. The estimate takes CONVERGENCE_ORDER = 1.6, below those.
 * Under a large topload with primary rings near the base (the examples) the ratio 16 → 32 was
 * 2.7–3.3 (order 1.4–1.7), where the changes are already below 2·10⁻⁴: there the estimate may read
 * up to about 15 % low, far inside the tolerance. The finer ladder is kept when its estimated
 * error is within SEGMENT_TOLERANCE.
 */
import { nodeCapacitanceMatrix, type NodeCapacitanceMatrix } from '../electrostatics/capacitance-matrix.ts';
import type { FieldArrangement } from '../electrostatics/field-solve.ts';
import {
  coarsenCapacitance,
  foldTopload,
  type LadderMatrices,
  solveResonator,
  type ResonatorSolution,
} from './resonator.ts';
import { segmentInductanceMatrix, type SegmentedWinding } from './segment-inductance.ts';

/**
 * Winding panels of the capacitance solve. The finest ladder has half as many (uniform) segments:
 * a hat narrower than two of the graded panels asks the piecewise-constant collocation for more
 * than it resolves, while hats two panels wide are resolved (energy balance to 10⁻⁶ in the tests).
 */
export const WINDING_PANELS = 64;
/** Finest ladder. */
export const FINEST_SEGMENTS = WINDING_PANELS / 2;
/** Coarsest count tried. */
export const COARSEST_SEGMENTS = 8;
/** Fewest turns in one segment (see solveAt). */
export const MIN_TURNS_PER_SEGMENT = 1;
/** Convergence rule: the estimated relative error of the kept fundamental (see the header). */
export const SEGMENT_TOLERANCE = 1e-3;
/** Lower bound of the observed order of convergence in the segment count (see the header). */
export const CONVERGENCE_ORDER = 1.6;

/** Richardson estimate of the relative error of f(n) from f(n/2) and f(n) (see the header). */
export function estimatedError(coarse: number, fine: number): number {
  return Math.abs(coarse - fine) / ((2 ** CONVERGENCE_ORDER - 1) * fine);
}

/** The converged ladder and what was checked on the way. */
export interface WindingResonator {
  /** The ladder at the chosen count. */
  solution: ResonatorSolution;
  /** Node fractions of the chosen ladder. */
  fractions: Float64Array;
  /** The chosen ladder's matrices (for re-solving it with a load at the top). */
  ladder: LadderMatrices;
  /** Fundamental at each count tried, Hz, by count. */
  fundamentalByCount: { segments: number; frequency: number }[];
  /** True when the kept count's estimated error is within SEGMENT_TOLERANCE. */
  converged: boolean;
  /** The node capacitance matrix of the finest count (for fields by superposition). */
  capacitance: NodeCapacitanceMatrix;
}

/**
 * @param arrangement the field arrangement (needs a winding)
 * @param winding the winding for the inductance matrix
 * @param extraTopCapacitance a lumped capacitance to ground at the top (streamer loading), F
 * @param panels winding panels of the capacitance solve (default WINDING_PANELS; a power-of-two multiple of 2·COARSEST_SEGMENTS)
 */
export function windingResonator(
  arrangement: FieldArrangement,
  winding: SegmentedWinding,
  extraTopCapacitance = 0,
  panels = WINDING_PANELS,
  capacitance: NodeCapacitanceMatrix | null = nodeCapacitanceMatrix(arrangement, panels, panels / 2),
): WindingResonator | null {
  if (!capacitance || !arrangement.winding) return null;
  const length = arrangement.winding.topZ - arrangement.winding.bottomZ;
  const folded = foldTopload(capacitance.matrix, capacitance.size, capacitance.nodes, extraTopCapacitance);
  const solveAt = (stride: number) => {
    const coarse = coarsenCapacitance(folded, capacitance.fractions, stride);
    if (!coarse) return null;
    // A segment shorter than MIN_TURNS_PER_SEGMENT turns shares its turns with its neighbours so
    // much that the inductance matrix loses rank (two segments inside one turn link the same flux).
    for (let k = 0; k < coarse.fractions.length - 1; k++) {
      if ((coarse.fractions[k + 1] - coarse.fractions[k]) * winding.turns < MIN_TURNS_PER_SEGMENT) return null;
    }
    const inductance = segmentInductanceMatrix(winding, Array.from(coarse.fractions));
    const ladder = { inductance, capacitance: coarse.matrix, fractions: coarse.fractions, length };
    const solution = solveResonator(ladder);
    return solution ? { solution, fractions: coarse.fractions, ladder } : null;
  };
  const fundamentalByCount: { segments: number; frequency: number }[] = [];
  let stride = capacitance.nodes / COARSEST_SEGMENTS;
  if (!Number.isInteger(stride) || stride < 1) stride = 1;
  let previous = solveAt(stride);
  // A winding of few turns: fewer, longer segments (down to one).
  while (!previous && stride < capacitance.nodes) {
    stride *= 2;
    if (capacitance.nodes % stride !== 0) break;
    previous = solveAt(stride);
  }
  if (!previous) return null;
  fundamentalByCount.push({ segments: previous.solution.segments, frequency: previous.solution.fundamental.frequency });
  while (stride > 1) {
    stride /= 2;
    if (!Number.isInteger(stride)) break;
    const next = solveAt(stride);
    if (!next) break;
    fundamentalByCount.push({ segments: next.solution.segments, frequency: next.solution.fundamental.frequency });
    previous = next;
    const [coarse, fine] = fundamentalByCount.slice(-2);
    if (estimatedError(coarse.frequency, fine.frequency) < SEGMENT_TOLERANCE) {
      return {
        solution: previous.solution,
        fractions: previous.fractions,
        ladder: previous.ladder,
        fundamentalByCount,
        converged: true,
        capacitance,
      };
    }
  }
  return {
    solution: previous.solution,
    fractions: previous.fractions,
    ladder: previous.ladder,
    fundamentalByCount,
    converged: false,
    capacitance,
  };
}
