/**
 * Clearances in air between the primary's outer ring and the secondary or the topload, and the
 * voltage across them, for a strike check.
 */
import type { SecondaryGeometry, Ring } from '../context.ts';
import type { ToploadSpec } from '../design.ts';

/**
 * Withstand gradient assumed for long, non-uniform air gaps at RF, V/m: ≈ 200 kV per metre, the
 * builders' figure for streamer length per voltage (refs §9 [C], "very rough"). It is much
 * below the 3 MV/m of uniform cm-scale gaps (§6.2), as long rod-like gaps are.
 */
export const LONG_GAP_WITHSTAND_GRADIENT = 200e3;

/**
 * Voltage on the secondary at height z above the floor, V, for a top voltage `peakVoltage`.
 * @param profile 'linear' (uniform gradient) or 'quarter_wave' (V ∝ sin(π/2 · s), s the fraction of the winding)
 * Below the winding 0, above it the top voltage. The profiles are the design file's voltage_profile.
 */
export function windingVoltageAt(
  secondary: SecondaryGeometry,
  profile: 'linear' | 'quarter_wave',
  peakVoltage: number,
  z: number,
): number {
  const fraction = Math.min(1, Math.max(0, (z - secondary.bottomZ) / (secondary.topZ - secondary.bottomZ)));
  return peakVoltage * (profile === 'quarter_wave' ? Math.sin((Math.PI / 2) * fraction) : fraction);
}

/**
 * Strike margin between one primary ring and the secondary winding at the ring's height:
 * (air distance × withstand gradient) / (voltage difference).
 * @param ring the ring's centre line (r, z above the floor), m
 * @param conductorRadius the ring conductor's radius, m (subtracted from the distance)
 * @param primaryVoltage the ring's own potential, V (taken with the worst polarity: added)
 * @param gradient withstand gradient, V/m (LONG_GAP_WITHSTAND_GRADIENT by default)
 * @returns the margin (> 1: the gap is expected to hold; Infinity with no voltage), the air gap
 *          (m) and the voltage across it (V)
 * The winding point is the one at the ring's height (clamped to the winding's ends), on the
 * winding's outer surface (radius + half the insulated wire). A coarse, conservative estimate:
 * a common-practice gradient, no field solve of the gap. Strikes from the topload are judged
 * separately, from the spark-length estimate.
 */
export function primaryStrikeMargin(
  ring: Ring,
  conductorRadius: number,
  secondary: SecondaryGeometry,
  profile: 'linear' | 'quarter_wave',
  peakVoltage: number,
  primaryVoltage: number,
  gradient: number = LONG_GAP_WITHSTAND_GRADIENT,
): { margin: number; height: number; gap: number; voltage: number } {
  const surfaceRadius = secondary.radius + secondary.overallDiameter / 2;
  const height = Math.min(secondary.topZ, Math.max(secondary.bottomZ, ring.z));
  const gap = Math.max(0, Math.hypot(ring.r - surfaceRadius, ring.z - height) - conductorRadius);
  const voltage = windingVoltageAt(secondary, profile, peakVoltage, height) + Math.abs(primaryVoltage);
  const margin = voltage > 0 ? (gap * gradient) / voltage : Infinity;
  return { margin, height, gap, voltage };
}

/**
 * Height of the topload's centre (toroid mid-plane or sphere centre) above the floor, m, or null
 * when the design does not place it.
 * @param secondaryTopZ top of the winding above the floor, m (null without a secondary)
 */
export function toploadCentreHeight(topload: ToploadSpec, secondaryTopZ: number | null): number | null {
  if (secondaryTopZ !== null && topload.heightAboveWinding !== undefined)
    return secondaryTopZ + topload.heightAboveWinding;
  if (topload.centerHeight !== undefined) return topload.centerHeight;
  return null;
}

/**
 * Shortest air distance from a coaxial ring to the topload's surface, m: in the meridian plane,
 * the distance from the ring to the tube's circle (toroid) or the sphere's, less its radius
 * (exact for these axisymmetric shapes).
 */
export function toploadToRingDistance(topload: ToploadSpec, centreHeight: number, ring: Ring): number {
  if (topload.shape === 'toroid') {
    const tubeRadius = topload.tubeDiameter / 2;
    const majorRadius = topload.outerDiameter / 2 - tubeRadius;
    return Math.max(0, Math.hypot(ring.r - majorRadius, ring.z - centreHeight) - tubeRadius);
  }
  return Math.max(0, Math.hypot(ring.r, ring.z - centreHeight) - topload.diameter / 2);
}

/**
 * Highest point of the topload above the floor, m: toroid mid-plane + tube/2, sphere centre +
 * radius (geometry).
 */
export function toploadTopHeight(topload: ToploadSpec, centreHeight: number): number {
  return centreHeight + (topload.shape === 'toroid' ? topload.tubeDiameter / 2 : topload.diameter / 2);
}
