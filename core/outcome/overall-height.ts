/** Overall height of the structure above the floor: its highest conductor. */
import type { BreakoutPointSpec, Design, ToploadSpec } from '../design.ts';
import type { SecondaryGeometry } from '../context.ts';
import { toploadCentreHeight, toploadTopHeight } from './clearance.ts';

/**
 * Height of a breakout point's apex above the floor, m, for a point pointing up; null for none, one
 * on the rim (it points outward, at the mid-plane) or an unsized one. A point on a toroid's centre
 * disc stands on the mid-plane (the disc's plane); elsewhere on the topload's top surface (a sphere's
 * pole, the tube's crown). The rod's length runs from the surface to the apex (breakout-rod.ts).
 */
export function pointApexHeight(
  topload: ToploadSpec,
  point: BreakoutPointSpec | undefined,
  centreHeight: number,
  length: number | null,
): number | null {
  if (point?.position !== 'top' || length === null || !Number.isFinite(length)) return null;
  if (topload.shape === 'toroid' && topload.centerDisc === true) return centreHeight + length;
  return toploadTopHeight(topload, centreHeight) + length;
}

/**
 * Highest point of the structure above the floor, m: the topload's top (toroid mid-plane + tube/2,
 * sphere centre + radius), a breakout point's apex above it (`pointLength`, the rod's solved or
 * given length) and the winding's top; null when neither winding nor topload can be placed
 * (geometry). A three-coil system's feed line and driver are added by the caller.
 */
export function overallHeight(
  design: Design,
  secondary: SecondaryGeometry | undefined,
  pointLength: number | null = null,
): number | null {
  const windingTop = secondary ? secondary.topZ : null;
  if (design.topload) {
    const centre = toploadCentreHeight(design.topload, windingTop);
    if (centre === null) return windingTop;
    const top = toploadTopHeight(design.topload, centre);
    const apex = pointApexHeight(design.topload, design.breakoutPoint, centre, pointLength);
    const highest = apex === null ? top : Math.max(top, apex);
    return windingTop === null ? highest : Math.max(highest, windingTop);
  }
  return windingTop;
}
