/** Overall height of the structure above the floor. */
import type { Design } from '../design.ts';
import type { SecondaryGeometry } from '../context.ts';
import { toploadCentreHeight, toploadTopHeight } from './clearance.ts';

/**
 * Highest point of the topload (toroid mid-plane + tube/2, sphere centre + radius) or, without a
 * topload, of the winding, above the floor, m; null when neither can be placed (geometry).
 */
export function overallHeight(design: Design, secondary: SecondaryGeometry | undefined): number | null {
  const windingTop = secondary ? secondary.topZ : null;
  if (design.topload) {
    const centre = toploadCentreHeight(design.topload, windingTop);
    if (centre === null) return windingTop;
    const top = toploadTopHeight(design.topload, centre);
    return windingTop === null ? top : Math.max(top, windingTop);
  }
  return windingTop;
}
