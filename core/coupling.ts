/**
 * Coupling between the primary and the secondary: mutual inductance of the tapped primary to the
 * winding, and the coupling coefficient.
 */
import type { Ring } from './context.ts';
import { ringToSheetMutualInductance, type WindingSheet } from './inductance/sheet-mutual.ts';

/**
 * Mutual inductance of each primary ring to the secondary winding, H (current-sheet integral,
 * equal to the ring-to-turn sum to better than 10⁻⁶; see inductance/sheet-mutual.ts).
 * @param rings primary ring centre lines, m
 * @param winding the secondary as a sheet over [bottomZ, topZ] at the wire's centre-line radius
 * Source: Maxwell (1873) §701 integrated over the winding.
 */
export function ringMutualInductances(rings: readonly Ring[], winding: WindingSheet): Float64Array {
  const mutuals = new Float64Array(rings.length);
  for (let i = 0; i < rings.length; i++) mutuals[i] = ringToSheetMutualInductance(rings[i].r, rings[i].z, winding);
  return mutuals;
}

/**
 * Mutual inductance of the primary tapped at `tapTurns` to the secondary, H: Σ w_i M_i with the
 * tap weights of primary/rings.ts.
 * @param ringMutuals from `ringMutualInductances`
 * @param tapTurns tap in turns from the inner end
 */
export function tappedMutualInductance(ringMutuals: Float64Array, tapTurns: number): number {
  let total = 0;
  for (let i = 0; i < ringMutuals.length; i++) total += Math.min(1, Math.max(0, tapTurns - i)) * ringMutuals[i];
  return total;
}

/**
 * Coupling coefficient k = M / √(L1 L2), dimensionless, 0 ≤ k < 1 for any physical pair.
 * @param mutual M, H
 * @param primaryInductance L1, H
 * @param secondaryInductance L2, H
 * Source: definition (e.g. Terman, Radio Engineers' Handbook, 1943, coupled circuits).
 */
export function couplingCoefficient(mutual: number, primaryInductance: number, secondaryInductance: number): number {
  return mutual / Math.sqrt(primaryInductance * secondaryInductance);
}
