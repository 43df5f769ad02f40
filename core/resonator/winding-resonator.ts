/**
 * The distributed resonator of a design's winding: the capacitance matrix from one field solve at
 * the finest segment count, the inductance matrix from the loop sum, the ladder solved at the
 * finest count and at coarser nested counts (the same solve, restricted), and the segment count
 * chosen by convergence: the smallest n whose fundamental is within 0.1 % of the one at 2n.
 */
import { nodeCapacitanceMatrix, type NodeCapacitanceMatrix } from '../electrostatics/capacitance-matrix.ts';
import type { FieldArrangement } from '../electrostatics/field-solve.ts';
import { coarsenCapacitance, foldTopload, solveResonator, type ResonatorSolution } from './resonator.ts';
import { segmentInductanceMatrix, type SegmentedWinding } from './segment-inductance.ts';

/**
 * Winding panels of the capacitance solve. The finest ladder has half as many segments: a hat on
 * single panels asks the piecewise-constant collocation for more than it resolves (its energy
 * balance drifts), while hats two panels wide are resolved (energy balance to 10⁻⁶ in the tests).
 */
export const WINDING_PANELS = 64;
/** Finest ladder. */
export const FINEST_SEGMENTS = WINDING_PANELS / 2;
/** Coarsest count tried. */
export const COARSEST_SEGMENTS = 8;
/** Fewest turns in one segment (see solveAt). */
export const MIN_TURNS_PER_SEGMENT = 1;
/** Convergence rule: fundamental within this fraction of the one at twice the count. */
export const SEGMENT_TOLERANCE = 1e-3;

/** The converged ladder and what was checked on the way. */
export interface WindingResonator {
  /** The ladder at the chosen count. */
  solution: ResonatorSolution;
  /** Node fractions of the chosen ladder. */
  fractions: Float64Array;
  /** Fundamental at each count tried, Hz, by count. */
  fundamentalByCount: { segments: number; frequency: number }[];
  /** True when two successive counts agreed within SEGMENT_TOLERANCE. */
  converged: boolean;
  /** The node capacitance matrix of the finest count (for fields by superposition). */
  capacitance: NodeCapacitanceMatrix;
}

/**
 * @param arrangement the field arrangement (needs a winding)
 * @param winding the winding for the inductance matrix
 * @param extraTopCapacitance a lumped capacitance to ground at the top (streamer loading), F
 * @param panels winding panels of the capacitance solve (default WINDING_PANELS; a power-of-two multiple of COARSEST_SEGMENTS)
 */
export function windingResonator(
  arrangement: FieldArrangement,
  winding: SegmentedWinding,
  extraTopCapacitance = 0,
  panels = WINDING_PANELS,
  capacitance: NodeCapacitanceMatrix | null = nodeCapacitanceMatrix(arrangement, panels),
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
    const solution = solveResonator({ inductance, capacitance: coarse.matrix, fractions: coarse.fractions, length });
    return solution ? { solution, fractions: coarse.fractions } : null;
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
  while (stride > 2) {
    stride /= 2;
    if (!Number.isInteger(stride)) break;
    const next = solveAt(stride);
    if (!next) break;
    fundamentalByCount.push({ segments: next.solution.segments, frequency: next.solution.fundamental.frequency });
    const change = Math.abs(next.solution.fundamental.frequency / previous.solution.fundamental.frequency - 1);
    if (change < SEGMENT_TOLERANCE) {
      return {
        solution: previous.solution,
        fractions: previous.fractions,
        fundamentalByCount,
        converged: true,
        capacitance,
      };
    }
    previous = next;
  }
  return {
    solution: previous.solution,
    fractions: previous.fractions,
    fundamentalByCount,
    converged: false,
    capacitance,
  };
}
