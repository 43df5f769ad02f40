import type { UnitCubeSampler } from './unit-cube-sampler.ts';
import { assertIndex } from './unit-cube-sampler.ts';
import { assertSeed, uniformAt } from '../random.ts';

/**
 * Independent uniform points: coordinate d of point i is uniformAt(seed, i, d) (see random.ts).
 * Indices 0 to 2^53 − 1.
 * @example new RandomSampler(3, 11).pointAt(0, new Float64Array(3))
 */
export class RandomSampler implements UnitCubeSampler {
  readonly dimensions: number;
  readonly size = null;
  private readonly seed: number;

  constructor(dimensions: number, seed: number) {
    if (!Number.isInteger(dimensions) || dimensions < 1) {
      throw new RangeError(`RandomSampler: dimensions must be an integer of at least 1, got ${dimensions}`);
    }
    assertSeed(seed, 'RandomSampler');
    this.dimensions = dimensions;
    this.seed = seed;
  }

  pointAt(index: number, out: Float64Array): void {
    assertIndex(index, Number.MAX_SAFE_INTEGER + 1, 'RandomSampler.pointAt');
    for (let d = 0; d < this.dimensions; d++) out[d] = uniformAt(this.seed, index, d);
  }
}
