/**
 * Ring positions of a primary modelled as coaxial circles (the geometry convention of the README, Design files).
 *
 * Ring i (from 0, the inner end) of a flat spiral has radius r0 + i·p; of a cone r0 + i·p·cos θ at
 * height i·p·sin θ; of a helix r0 at height i·p; with r0 = inner_diameter/2 and p = conductor
 * diameter + turn spacing. A primary of N turns has ceil(N) rings; a fractional N makes the last
 * ring partial (its weight is the fraction, see `ringWeights`). Heights are above the floor: the
 * innermost ring sits `elevation` above the secondary's bottom turn.
 */
import type { PrimarySpec } from '../design.ts';
import type { Ring } from '../context.ts';

/**
 * The most turns a primary may have in this model (one ring per turn, a mutual inductance per pair
 * of rings, a field panel per ring); real primaries have 5 to 30 (common practice).
 */
export const MAX_PRIMARY_TURNS = 500;

/** Centre-line pitch of neighbouring primary conductors, m. */
export function primaryPitch(primary: PrimarySpec): number {
  return primary.conductorDiameter + primary.turnSpacing;
}

/**
 * The rings of a primary, inner end first, heights above the floor.
 * @param primary the primary, SI
 * @param secondaryBottomZ height of the secondary's bottom turn above the floor, m
 */
export function primaryRings(primary: PrimarySpec, secondaryBottomZ: number): Ring[] {
  const count = Math.ceil(primary.turns - 1e-9);
  const pitch = primaryPitch(primary);
  const innerRadius = primary.innerDiameter / 2;
  const baseZ = secondaryBottomZ + primary.elevation;
  const angle = primary.shape === 'cone' ? (primary.coneAngle ?? 0) : 0;
  const rings: Ring[] = [];
  for (let i = 0; i < count; i++) {
    if (primary.shape === 'helix') rings.push({ r: innerRadius, z: baseZ + i * pitch });
    else rings.push({ r: innerRadius + i * pitch * Math.cos(angle), z: baseZ + i * pitch * Math.sin(angle) });
  }
  return rings;
}

/**
 * Weight of each ring for a tap `tapTurns` from the inner end: 1 for the whole rings inside the
 * tap, the fractional part for the ring the tap lands on, 0 beyond. L(t) = Σ w_i w_j M_ij is then
 * a smooth (piecewise quadratic) function of the tap, exact at whole turns.
 */
export function ringWeights(ringCount: number, tapTurns: number): Float64Array {
  const weights = new Float64Array(ringCount);
  for (let i = 0; i < ringCount; i++) weights[i] = Math.min(1, Math.max(0, tapTurns - i));
  return weights;
}
