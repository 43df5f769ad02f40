/**
 * The design space as the refinement engine sees it: continuous dimensions (plain ranges) become
 * unit-cube coordinates, discrete ones (sets, integer ranges, stepped ranges) become ordered level
 * indices. Converts both ways between a MixedPoint and the dimension values of a design, so a
 * refined design is always inside the sweep's ranges and on its allowed levels.
 */
import type { Dimension } from './design-tree.ts';
import { dimensionValue } from './design-space.ts';
import type { MixedPoint } from './refine/mixed-point.ts';
import { must } from '../core/must.ts';

export interface MixedSpace {
  /** Positions (in the dimension list) of the continuous dimensions. */
  continuous: number[];
  /** Positions of the discrete dimensions, and each one's number of levels. */
  discrete: number[];
  levelCounts: number[];
}

function levelsOf(dimension: Dimension): number | null {
  if (dimension.kind === 'choose') return dimension.values.length;
  if (dimension.integer) return Math.floor(dimension.to) - Math.ceil(dimension.from) + 1;
  if (dimension.step !== null) return Math.floor((dimension.to - dimension.from) / dimension.step + 1e-9) + 1;
  return null;
}

export function mixedSpaceOf(dimensions: readonly Dimension[]): MixedSpace {
  const space: MixedSpace = { continuous: [], discrete: [], levelCounts: [] };
  dimensions.forEach((dimension, d) => {
    const levels = levelsOf(dimension);
    if (levels === null) space.continuous.push(d);
    else {
      space.discrete.push(d);
      space.levelCounts.push(levels);
    }
  });
  return space;
}

/** Dimension values of a mixed point. */
export function valuesOfPoint(dimensions: readonly Dimension[], space: MixedSpace, point: MixedPoint): Float64Array {
  const values = new Float64Array(dimensions.length);
  space.continuous.forEach((d, i) => {
    values[d] = dimensionValue(dimensions[d], Math.min(1, Math.max(0, point.continuous[i])));
  });
  space.discrete.forEach((d, i) => {
    const dimension = dimensions[d];
    const level = point.levels[i];
    if (dimension.kind === 'choose') values[d] = level;
    else if (dimension.integer) values[d] = Math.ceil(dimension.from) + level;
    else values[d] = dimension.from + must(dimension.step) * level;
  });
  return values;
}

/** The mixed point of dimension values (the inverse map; continuous coordinates clamped to [0, 1]). */
export function pointOfValues(
  dimensions: readonly Dimension[],
  space: MixedSpace,
  values: ArrayLike<number>,
): MixedPoint {
  const continuous = new Float64Array(space.continuous.length);
  space.continuous.forEach((d, i) => {
    const dimension = dimensions[d];
    if (dimension.kind !== 'range') return;
    const value = values[d];
    const u =
      dimension.scale === 'log'
        ? Math.log(value / dimension.from) / Math.log(dimension.to / dimension.from)
        : (value - dimension.from) / (dimension.to - dimension.from);
    continuous[i] = Math.min(1, Math.max(0, u));
  });
  const levels = new Int32Array(space.discrete.length);
  space.discrete.forEach((d, i) => {
    const dimension = dimensions[d];
    const value = values[d];
    if (dimension.kind === 'choose') levels[i] = value;
    else if (dimension.integer) levels[i] = Math.round(value - Math.ceil(dimension.from));
    else levels[i] = Math.round((value - dimension.from) / must(dimension.step));
    levels[i] = Math.min(space.levelCounts[i] - 1, Math.max(0, levels[i]));
  });
  return { continuous, levels };
}
