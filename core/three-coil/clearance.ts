/** Plan-view outline of a topload: its outer radius, m (geometry). */
import type { ToploadSpec } from '../design.ts';

export function toploadOuterRadius(topload: ToploadSpec): number {
  return topload.shape === 'toroid' ? topload.outerDiameter / 2 : topload.diameter / 2;
}
