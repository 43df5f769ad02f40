import type { UnitCubeSampler } from './unit-cube-sampler.ts';
import { assertIndex } from './unit-cube-sampler.ts';
import { assertSeed, hash32, uniformAt } from '../random.ts';

/**
 * A keyed pseudo-random permutation of 0 .. length − 1, evaluated at one position without storing it:
 * A. Kensler, "Correlated multi-jittered sampling", Pixar Technical Memo 13-01 (2013), function permute().
 * A keyed bijection on the next power of two (every step, an odd multiply, an xor with a constant or with
 * a right shift of the masked value, maps the low bits to themselves one-to-one) is cycle-walked until
 * it lands below `length`, then rotated by the key.
 * @param position integer in [0, length). @param length integer in [1, 2^32). @param key 32-bit key.
 * @returns the image of `position`, an integer in [0, length).
 */
export function permuteAt(position: number, length: number, key: number): number {
  let mask = (length - 1) >>> 0;
  mask |= mask >>> 1;
  mask |= mask >>> 2;
  mask |= mask >>> 4;
  mask |= mask >>> 8;
  mask |= mask >>> 16;
  mask >>>= 0;
  const p = key >>> 0;
  let i = position >>> 0;
  do {
    i ^= p;
    i = Math.imul(i, 0xe170893d);
    i ^= p >>> 16;
    i ^= (i & mask) >>> 4;
    i ^= p >>> 8;
    i = Math.imul(i, 0x0929eb3f);
    i ^= p >>> 23;
    i ^= (i & mask) >>> 1;
    i = Math.imul(i, 1 | (p >>> 27));
    i = Math.imul(i, 0x6935fa69);
    i ^= (i & mask) >>> 11;
    i = Math.imul(i, 0x74dcb303);
    i ^= (i & mask) >>> 2;
    i = Math.imul(i, 0x9e501cc3);
    i ^= (i & mask) >>> 2;
    i = Math.imul(i, 0xc860a3df);
    i &= mask;
    i ^= i >>> 5;
    i >>>= 0;
  } while (i >= length);
  return (i + p) % length;
}

/**
 * Latin hypercube sampling (McKay, Beckman & Conover, Technometrics 21, 1979), index-addressable:
 * coordinate d of point i is (π_d(i) + u_{i,d}) / N, with π_d a seeded permutation of 0 .. N − 1
 * ({@link permuteAt}, one key per dimension) and u_{i,d} = uniformAt(seed, i, stream) a jitter in [0, 1).
 * Over the N points each dimension has exactly one point in each stratum [k/N, (k+1)/N); no sample is
 * held in memory. Indices ≥ N throw a RangeError.
 * @example new LatinHypercubeSampler(2, 100, 7).pointAt(3, new Float64Array(2))
 */
export class LatinHypercubeSampler implements UnitCubeSampler {
  readonly dimensions: number;
  readonly size: number;
  private readonly seed: number;
  private readonly keys: Uint32Array;

  constructor(dimensions: number, samples: number, seed: number) {
    if (!Number.isInteger(dimensions) || dimensions < 1) {
      throw new RangeError(`LatinHypercubeSampler: dimensions must be an integer of at least 1, got ${dimensions}`);
    }
    if (!Number.isInteger(samples) || samples < 1 || samples > 4294967295) {
      throw new RangeError(`LatinHypercubeSampler: samples must be an integer from 1 to 4294967295, got ${samples}`);
    }
    assertSeed(seed, 'LatinHypercubeSampler');
    this.dimensions = dimensions;
    this.size = samples;
    this.seed = seed;
    this.keys = new Uint32Array(dimensions);
    for (let d = 0; d < dimensions; d++) this.keys[d] = hash32(seed, 0x1a7e, d);
  }

  pointAt(index: number, out: Float64Array): void {
    const count = this.size;
    assertIndex(index, count, 'LatinHypercubeSampler.pointAt');
    for (let d = 0; d < this.dimensions; d++) {
      const stratum = permuteAt(index, count, this.keys[d]);
      const jitter = uniformAt(this.seed, index, 0x1a7e0000 + d);
      let value = (stratum + jitter) / count;
      // Rounding can push (k + u)/N onto the next stratum's edge for large N: fall back to the centre.
      if (value < stratum / count || value >= (stratum + 1) / count) value = (stratum + 0.5) / count;
      out[d] = value;
    }
  }
}
