/**
 * The common shape of every sampler of the unit cube: point i is a pure function of the sampler's options
 * (method, dimensions, seed, samples, levels) and of i, so a worker, a shard or a resumed run regenerates
 * exactly the same points in any order.
 */
export interface UnitCubeSampler {
  /** Number of coordinates of each point. */
  readonly dimensions: number;
  /** Number of addressable points: the grid's point count, the Latin hypercube's N; null = unbounded. */
  readonly size: number | null;
  /**
   * Writes point `index` into `out[0 .. dimensions − 1]`: values in [0, 1) (the grid also reaches 1,
   * its endpoints are included).
   * @throws RangeError for an index that is negative, not an integer or beyond the sampler's size.
   */
  pointAt(index: number, out: Float64Array): void;
}

/** The sampling methods of a sweep file's `sweep.method`. */
export type SamplingMethod = 'sobol' | 'lhs' | 'grid' | 'random';

/** Options of {@link createSampler}. */
export interface SamplerOptions {
  /** Which sampler. */
  method: SamplingMethod;
  /** Number of coordinates (≥ 1; Sobol supports up to 64). */
  dimensions: number;
  /** Unsigned 32-bit seed (scrambling, permutations, jitter); ignored by the grid. */
  seed: number;
  /** Number of samples of the run: the Latin hypercube's N; informative for the others. */
  samples: number;
  /** Grid only: number of levels per dimension (each ≥ 1). */
  levels?: number[];
  /** Sobol only: false gives the plain (unscrambled) sequence of Joe & Kuo; default true. */
  scramble?: boolean;
}

/** Throws a RangeError unless `index` is a non-negative integer below `limit`. */
export function assertIndex(index: number, limit: number, caller: string): void {
  if (!Number.isInteger(index) || index < 0 || index >= limit) {
    throw new RangeError(`${caller}: index must be an integer from 0 to ${limit - 1}, got ${index}`);
  }
}
