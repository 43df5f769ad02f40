import { JOE_KUO_DIRECTION_ROWS, JOE_KUO_MAX_DIMENSIONS } from './joe-kuo-directions.ts';
import type { UnitCubeSampler } from './unit-cube-sampler.ts';
import { assertIndex } from './unit-cube-sampler.ts';
import { assertSeed, hash32 } from '../random.ts';

/** Bits per coordinate: 2^32 points, resolution 2^−32. */
const BITS = 32;
const TWO_POW_32 = 4294967296;

/**
 * Direction numbers v_k (k = 0 .. 31, scaled by 2^32) of every dimension, by the recurrence of
 * Bratley & Fox (ACM TOMS 14, 1988), as used by Joe & Kuo (2008):
 * v_k = m_{k+1}·2^(31−k) for k < s, then v_k = v_{k−s} ⊕ (v_{k−s} >> s) ⊕ ⊕_{j=1}^{s−1} a_j v_{k−j}.
 * @returns a Uint32Array of dimensions × 32 entries, row-major by dimension.
 */
export function sobolDirectionNumbers(dimensions: number): Uint32Array {
  const table = new Uint32Array(dimensions * BITS);
  for (let k = 0; k < BITS; k++) table[k] = (1 << (31 - k)) >>> 0; // dimension 1: van der Corput, all m = 1
  for (let d = 1; d < dimensions; d++) {
    const row = JOE_KUO_DIRECTION_ROWS[d - 1];
    const degree = row[1];
    const coefficients = row[2];
    const base = d * BITS;
    for (let k = 0; k < BITS; k++) {
      if (k < degree) {
        table[base + k] = (row[3 + k] << (31 - k)) >>> 0;
      } else {
        let v = table[base + k - degree];
        v ^= v >>> degree;
        for (let j = 1; j < degree; j++) {
          if ((coefficients >>> (degree - 1 - j)) & 1) v ^= table[base + k - j];
        }
        table[base + k] = v >>> 0;
      }
    }
  }
  return table;
}

/** Reverses the 32 bits of an unsigned integer. */
function reverseBits(value: number): number {
  let x = value >>> 0;
  x = ((x >>> 1) & 0x55555555) | ((x & 0x55555555) << 1);
  x = ((x >>> 2) & 0x33333333) | ((x & 0x33333333) << 2);
  x = ((x >>> 4) & 0x0f0f0f0f) | ((x & 0x0f0f0f0f) << 4);
  x = ((x >>> 8) & 0x00ff00ff) | ((x & 0x00ff00ff) << 8);
  return ((x >>> 16) | (x << 16)) >>> 0;
}

/**
 * Hash-based nested uniform (Owen) scrambling of a 32-bit fixed-point coordinate: B. Burley, "Practical
 * hash-based Owen scrambling", JCGT 9(4), 1-20 (2020): reverse the bits, apply its
 * Laine-Karras-style hash (x += seed, then x ^= x·c for four even constants; the constants are quoted from
 * memory of that paper), reverse back. In bit-reversed order, addition and multiplication by even constants only carry towards
 * higher bits, so each output digit depends on that digit and the digits before it: a nested permutation,
 * which keeps every (t, m, s)-net property of the sequence (each 2^m block stays stratified).
 */
export function owenScramble(value: number, seed: number): number {
  let x = reverseBits(value);
  x = (x + seed) >>> 0;
  x ^= Math.imul(x, 0x6c50b47c);
  x ^= Math.imul(x, 0xb82f1e52);
  x ^= Math.imul(x, 0xc7afe638);
  x ^= Math.imul(x, 0x8d22f6e6);
  return reverseBits(x);
}

/**
 * The Sobol sequence with Joe & Kuo's direction numbers (new-joe-kuo-6.21201, see joe-kuo-directions.ts),
 * in Gray-code order (Antonov & Saleev 1979; the order of Joe & Kuo's own generator and of scipy): point i
 * is the XOR of the direction numbers over the set bits of i ⊕ (i >> 1). Optionally scrambled by
 * hash-based Owen scrambling (Burley 2020), one seed per dimension derived from `seed`.
 *
 * Range: dimensions 1 to 64, indices 0 to 2^32 − 1. Unscrambled point 0 is the origin; the first 2^m
 * points of every dimension fall one in each interval [k/2^m, (k+1)/2^m), scrambled or not.
 * @example const s = createSobolSampler(2, 0, false); s.pointAt(1, out) // out = [0.5, 0.5]
 */
export class SobolSampler implements UnitCubeSampler {
  readonly dimensions: number;
  readonly size = null;
  private readonly directions: Uint32Array;
  private readonly scrambleSeeds: Uint32Array | null;
  private readonly scratch: Uint32Array;

  constructor(dimensions: number, seed: number, scramble: boolean) {
    if (!Number.isInteger(dimensions) || dimensions < 1 || dimensions > JOE_KUO_MAX_DIMENSIONS) {
      throw new RangeError(
        `SobolSampler: dimensions must be an integer from 1 to ${JOE_KUO_MAX_DIMENSIONS}, got ${dimensions}`,
      );
    }
    assertSeed(seed, 'SobolSampler');
    this.dimensions = dimensions;
    this.directions = sobolDirectionNumbers(dimensions);
    this.scratch = new Uint32Array(dimensions);
    if (scramble) {
      this.scrambleSeeds = new Uint32Array(dimensions);
      for (let d = 0; d < dimensions; d++) this.scrambleSeeds[d] = hash32(seed, 0x50b01, d);
    } else {
      this.scrambleSeeds = null;
    }
  }

  /** The 32-bit fixed-point coordinates of point `index` (before scrambling), written into `out`. */
  integerPointAt(index: number, out: Uint32Array): void {
    assertIndex(index, TWO_POW_32, 'SobolSampler.pointAt');
    out.fill(0, 0, this.dimensions);
    let gray = (index ^ (index >>> 1)) >>> 0;
    const dimensions = this.dimensions;
    for (let k = 0; gray !== 0; k++, gray >>>= 1) {
      if (gray & 1) {
        for (let d = 0; d < dimensions; d++) out[d] ^= this.directions[d * BITS + k];
      }
    }
  }

  pointAt(index: number, out: Float64Array): void {
    const integers = this.scratch;
    this.integerPointAt(index, integers);
    const seeds = this.scrambleSeeds;
    for (let d = 0; d < this.dimensions; d++) {
      const value = seeds === null ? integers[d] : owenScramble(integers[d], seeds[d]);
      out[d] = value / TWO_POW_32;
    }
  }
}

/**
 * A Sobol sampler. @param dimensions 1 to 64. @param seed unsigned 32-bit. @param scramble default true.
 * @example createSobolSampler(3, 42).pointAt(5, new Float64Array(3))
 */
export function createSobolSampler(dimensions: number, seed: number, scramble = true): SobolSampler {
  return new SobolSampler(dimensions, seed, scramble);
}
