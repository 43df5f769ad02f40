import { refineRangeError } from './refine-errors.ts';

/**
 * A point of a mixed design space as the refinement engine sees it: continuous coordinates in the
 * unit cube (the design space maps them to SI values) and, for each discrete parameter, the index
 * of its level in an ordered list (integers in order, wire gauges thin to thick, form sizes small to
 * large). The engine never interprets either; it only moves them.
 */
export interface MixedPoint {
  continuous: Float64Array;
  levels: Int32Array;
}

/** An asynchronous batch evaluator of mixed points: one record per point, in order. */
export type MixedBatchEvaluator<R> = (points: MixedPoint[]) => Promise<ReadonlyArray<R>>;

/**
 * The canonical key of a mixed point: every continuous coordinate written to full precision
 * (JavaScript's shortest round-trip decimal, so two keys are equal exactly when the numbers are;
 * −0 and 0 share a key), then the levels. Used to recognise a design already evaluated.
 *
 * @example mixedPointKey({ continuous: Float64Array.of(0.1, 1), levels: Int32Array.of(3) }) // '0.1,1|3'
 */
export function mixedPointKey(point: MixedPoint): string {
  return `${Array.from(point.continuous, (value) => String(value)).join(',')}|${point.levels.join(',')}`;
}

/** Builds a MixedPoint from plain arrays (copies them); levels must be integers. */
export function mixedPoint(continuous: ArrayLike<number>, levels: ArrayLike<number> = []): MixedPoint {
  for (let i = 0; i < levels.length; i++) {
    if (!Number.isInteger(levels[i])) throw refineRangeError('mixedPoint', 'integer level indices', levels);
  }
  return { continuous: Float64Array.from(continuous), levels: Int32Array.from(levels) };
}

/** A deep copy of a mixed point. */
export function copyMixedPoint(point: MixedPoint): MixedPoint {
  return { continuous: Float64Array.from(point.continuous), levels: Int32Array.from(point.levels) };
}
