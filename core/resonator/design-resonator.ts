/**
 * The distributed resonator of a design's secondary, as the pipeline uses it (refs §11, the
 * distributed model): the node capacitance matrix of the winding, its topload and the grounded
 * parts from one field factorisation, the segment inductance matrix from the loop sum, the ladder's
 * modes, and what later stages need from them:
 * - the fundamental and the first overtone;
 * - the top-normalised voltage shape along the winding (the field solve takes it as its profile);
 * - the equivalent lumped values at the top (same frequency, same stored energy for the same top
 *   voltage) for the coupled-circuit dynamics;
 * - the resistance factor Σ Δ_k i_k² / I_eff² (Δ_k the share of the wire in segment k), which turns
 *   the uniform-current AC resistance of the winding into the one the mode's current sees, so that
 *   the loss ½ R_eff I_eff² equals Σ ½ R Δ_k i_k²;
 * - the fundamental with a lumped capacitance added at the top node (streamer loading).
 *
 * The segment count: the ladders (uniform segments) come from a 32-panel solve (8 and 16 segments);
 * when the Richardson estimate of the 16-segment error (winding-resonator.ts) exceeds 0.1 %, from a
 * 64-panel solve (8, 16, 32 segments).
 * The capacitance matrix does not depend on the voltage profile (electrostatics is linear), so the
 * modes and the profile need no iteration: a second pass would give the same matrices.
 */
import { type NodeCapacitanceMatrix, nodeCapacitanceMatrix } from '../electrostatics/capacitance-matrix.ts';
import type { FieldArrangement, VoltageShape } from '../electrostatics/field-solve.ts';
import { type ResonatorSolution, solveResonator, voltageAt } from './resonator.ts';
import { estimatedError, windingResonator } from './winding-resonator.ts';
import type { SegmentedWinding } from './segment-inductance.ts';

/** Panel counts tried in turn (see the header). */
export const RESONATOR_PANELS = [32, 64] as const;

/** The distributed secondary, SI. */
export interface DistributedWinding {
  /** The ladder at the chosen segment count. */
  solution: ResonatorSolution;
  /** The node capacitance matrix it came from (its densities give the fields of any profile). */
  capacitance: NodeCapacitanceMatrix;
  /** Its node heights as fractions of the winding length, base (0) first. */
  fractions: Float64Array;
  /** Fundamental, Hz. */
  fundamental: number;
  /** First overtone, Hz (null with one segment). */
  overtone: number | null;
  /** Effective inductance and capacitance at the top, H and F. */
  effectiveInductance: number;
  effectiveCapacitance: number;
  /** Top-normalised voltage of the fundamental at a fraction of the winding length. */
  shape: VoltageShape;
  /** Peak |dV/dz| per volt at the top, 1/m, and the fraction of the length where it sits. */
  peakGradientPerVolt: number;
  peakGradientFraction: number;
  /** R_eff / R for the mode's current (see the header). */
  resistanceFactor: number;
  /** True when the kept count's estimated error is within 0.1 % (winding-resonator.ts). */
  converged: boolean;
  /** Estimated relative error of the kept fundamental (null when only one count could be solved). */
  lastChange: number | null;
  /** The fundamental with `extraTop` farads added at the top node, Hz (null when the ladder fails). */
  loadedFundamental: (extraTop: number) => number | null;
}

/**
 * @param arrangement the field arrangement with its winding (the winding's profile is ignored)
 * @param winding the winding for the inductance matrix
 * @returns null when no ladder could be solved (a matrix not positive definite)
 */
export function distributedWinding(
  arrangement: FieldArrangement,
  winding: SegmentedWinding,
): DistributedWinding | null {
  for (const panels of RESONATOR_PANELS) {
    const capacitance = nodeCapacitanceMatrix(arrangement, panels, panels / 2);
    if (!capacitance) return null;
    const resonator = windingResonator(arrangement, winding, 0, panels, capacitance);
    if (!resonator) return null;
    if (!resonator.converged && panels !== RESONATOR_PANELS[RESONATOR_PANELS.length - 1]) continue;
    const { solution, fractions } = resonator;
    const fundamental = solution.fundamental;
    let squareSum = 0;
    for (let k = 0; k < solution.segments; k++) {
      squareSum += (fractions[k + 1] - fractions[k]) * fundamental.current[k] ** 2;
    }
    return {
      solution,
      capacitance,
      fractions,
      fundamental: fundamental.frequency,
      overtone: solution.modes.length > 1 ? solution.modes[1].frequency : null,
      effectiveInductance: solution.effectiveInductance,
      effectiveCapacitance: solution.effectiveCapacitance,
      shape: (fraction) => voltageAt(fundamental, fractions, fraction),
      peakGradientPerVolt: solution.peakGradientPerVolt,
      peakGradientFraction: solution.peakGradientFraction,
      resistanceFactor: squareSum / solution.effectiveCurrent ** 2,
      converged: resonator.converged,
      lastChange: lastChange(resonator.fundamentalByCount),
      loadedFundamental: (extraTop) => {
        // The chosen ladder with the load added at its top node (the last row and column).
        const n = solution.segments;
        const loaded = Float64Array.from(resonator.ladder.capacitance);
        loaded[n * n - 1] += extraTop;
        return solveResonator({ ...resonator.ladder, capacitance: loaded })?.fundamental.frequency ?? null;
      },
    };
  }
  return null;
}

/**
 * Mutual inductance of each segment of the ladder to a set of weighted coaxial rings, H: the
 * ring-to-sheet mutual of each segment's part of the winding (the sum over segments is the whole
 * winding's mutual, by linearity of the sheet integral).
 * @param sheetMutual M of a ring to a sheet over [bottomZ, topZ] with the given turns
 */
export function segmentMutuals(
  fractions: ArrayLike<number>,
  winding: { bottomZ: number; topZ: number; turns: number },
  ringWeights: readonly { weight: number; mutual: (bottomZ: number, topZ: number, turns: number) => number }[],
): Float64Array {
  const n = fractions.length - 1;
  const length = winding.topZ - winding.bottomZ;
  const mutuals = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const bottom = winding.bottomZ + fractions[k] * length;
    const top = winding.bottomZ + fractions[k + 1] * length;
    const turns = (fractions[k + 1] - fractions[k]) * winding.turns;
    let sum = 0;
    for (const ring of ringWeights) if (ring.weight !== 0) sum += ring.weight * ring.mutual(bottom, top, turns);
    mutuals[k] = sum;
  }
  return mutuals;
}

function lastChange(byCount: readonly { frequency: number }[]): number | null {
  if (byCount.length < 2) return null;
  return estimatedError(byCount[byCount.length - 2].frequency, byCount[byCount.length - 1].frequency);
}
