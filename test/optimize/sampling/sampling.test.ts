import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createSampler } from '../../../optimize/sampling/create-sampler.ts';
import { SobolSampler, owenScramble } from '../../../optimize/sampling/sobol-sampler.ts';
import { LatinHypercubeSampler, permuteAt } from '../../../optimize/sampling/latin-hypercube-sampler.ts';
import { GridSampler } from '../../../optimize/sampling/grid-sampler.ts';
import { RandomSampler } from '../../../optimize/sampling/random-sampler.ts';
import type { UnitCubeSampler } from '../../../optimize/sampling/unit-cube-sampler.ts';

function pointsOf(sampler: UnitCubeSampler, count: number, start = 0): Float64Array[] {
  return Array.from({ length: count }, (_, i) => {
    const out = new Float64Array(sampler.dimensions);
    sampler.pointAt(start + i, out);
    return out;
  });
}

/** Counts points per cell of a 2^a × 2^b grid over dimensions (x, y). */
function elementaryCounts(points: Float64Array[], x: number, y: number, a: number, b: number): number[] {
  const counts = new Array<number>(2 ** (a + b)).fill(0);
  for (const p of points) counts[Math.floor(p[x] * 2 ** a) * 2 ** b + Math.floor(p[y] * 2 ** b)]++;
  return counts;
}

describe('SobolSampler balance', () => {
  // Exact property: the first 2^m points of a Sobol sequence put one point in each interval [k/2^m,(k+1)/2^m)
  // of every dimension, and dimensions 1-2 form a (0, m, 2)-net (Sobol 1967; Niederreiter, "Random number
  // generation and quasi-Monte Carlo methods", SIAM 1992, ch. 4). Nested (Owen) scrambling keeps both
  // (Owen 1995, "Randomly permuted (t,m,s)-nets and (t,s)-sequences").
  it.each([
    [false, 0],
    [true, 0],
    [true, 12345],
  ])(
    'pointAt over 2^10 points (scramble %s, seed %i) puts one point in each 1/1024 interval of all 64 dimensions',
    (scramble, seed) => {
      const sampler = new SobolSampler(64, seed, scramble);
      const points = pointsOf(sampler, 1024);
      for (let d = 0; d < 64; d++) {
        const counts = new Array<number>(1024).fill(0);
        for (const p of points) counts[Math.floor(p[d] * 1024)]++;
        expect(counts.every((c) => c === 1)).toBe(true);
      }
    },
  );

  it.each([false, true])(
    'dimensions 1 and 2 of 2^8 points (scramble %s) are a (0,8,2)-net: one point per elementary box',
    (scramble) => {
      const points = pointsOf(new SobolSampler(2, 99, scramble), 256);
      for (let a = 0; a <= 8; a++) {
        expect(elementaryCounts(points, 0, 1, a, 8 - a).every((c) => c === 1)).toBe(true);
      }
    },
  );

  it('every block of 2^m consecutive points starting at a multiple of 2^m is balanced too (digital net property)', () => {
    const sampler = new SobolSampler(8, 5, true);
    const points = pointsOf(sampler, 256, 256 * 37);
    for (let d = 0; d < 8; d++) {
      const counts = new Array<number>(256).fill(0);
      for (const p of points) counts[Math.floor(p[d] * 256)]++;
      expect(counts.every((c) => c === 1)).toBe(true);
    }
  });

  it('scrambled values lie in [0, 1), differ between seeds and repeat for the same seed', () => {
    const a = pointsOf(new SobolSampler(4, 1, true), 64);
    const b = pointsOf(new SobolSampler(4, 1, true), 64);
    const c = pointsOf(new SobolSampler(4, 2, true), 64);
    expect(a).toEqual(b);
    expect(a).not.toEqual(c);
    for (const p of a) for (const v of p) expect(v >= 0 && v < 1).toBe(true);
    // Scrambling moves the origin away from 0 (a scrambled point 0 is uniform in the cube).
    expect(Array.from(a[0]).some((v) => v !== 0)).toBe(true);
  });

  it('owenScramble is a bijection on 12-bit prefixes (nested permutation)', () => {
    // All 4096 values with distinct top 12 bits map to distinct top 12 bits.
    const seen = new Set<number>();
    for (let i = 0; i < 4096; i++) seen.add(owenScramble((i << 20) >>> 0, 0xdeadbeef) >>> 20);
    expect(seen.size).toBe(4096);
  });

  it('pointAt at index 2^32 − 1 works and 2^32 throws RangeError', () => {
    const sampler = new SobolSampler(3, 0, false);
    const out = new Float64Array(3);
    sampler.pointAt(2 ** 32 - 1, out);
    expect(out.every((v) => v >= 0 && v < 1)).toBe(true);
    expect(() => sampler.pointAt(2 ** 32, out)).toThrow(RangeError);
    expect(() => sampler.pointAt(-1, out)).toThrow(RangeError);
    expect(() => sampler.pointAt(1.5, out)).toThrow(RangeError);
  });

  it('rejects 0 or 65 dimensions and a bad seed', () => {
    expect(() => new SobolSampler(0, 0, true)).toThrow(RangeError);
    expect(() => new SobolSampler(65, 0, true)).toThrow(/dimensions must be an integer from 1 to 64/);
    expect(() => new SobolSampler(2, -1, true)).toThrow(/seed/);
    expect(() => new SobolSampler(2, 2 ** 32, true)).toThrow(/seed/);
  });
});

describe('LatinHypercubeSampler', () => {
  it('has exactly one point per stratum in every dimension (property, random N, seed, dimensions)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 300 }),
        fc.integer({ min: 0, max: 2 ** 32 - 1 }),
        fc.integer({ min: 1, max: 6 }),
        (count, seed, dimensions) => {
          const sampler = new LatinHypercubeSampler(dimensions, count, seed);
          const points = pointsOf(sampler, count);
          for (let d = 0; d < dimensions; d++) {
            const hits = new Array<number>(count).fill(0);
            let insideStrata = true;
            for (const p of points) {
              const stratum = Math.floor(p[d] * count);
              if (!(p[d] >= stratum / count && p[d] < (stratum + 1) / count)) insideStrata = false;
              hits[stratum]++;
            }
            expect(insideStrata).toBe(true);
            expect(hits.every((h) => h === 1)).toBe(true);
          }
        },
      ),
      { numRuns: 60, seed: 4242 },
    );
  });

  it('is one point per stratum for a large N = 100 003 in one dimension, without storing the permutation', () => {
    const count = 100_003;
    const sampler = new LatinHypercubeSampler(1, count, 77);
    const hits = new Uint8Array(count);
    const out = new Float64Array(1);
    for (let i = 0; i < count; i++) {
      sampler.pointAt(i, out);
      hits[Math.floor(out[0] * count)]++;
    }
    expect(hits.every((h) => h === 1)).toBe(true);
  });

  it('throws RangeError for an index ≥ N and for N = 0', () => {
    const sampler = new LatinHypercubeSampler(2, 10, 1);
    expect(() => sampler.pointAt(10, new Float64Array(2))).toThrow(RangeError);
    expect(() => new LatinHypercubeSampler(2, 0, 1)).toThrow(RangeError);
    expect(sampler.size).toBe(10);
  });

  it('permuteAt is a permutation of 0..length−1 for lengths around powers of two', () => {
    for (const length of [1, 2, 3, 31, 32, 33, 1000, 1024, 1025]) {
      const seen = new Set<number>();
      for (let i = 0; i < length; i++) seen.add(permuteAt(i, length, 0x9e3779b9));
      expect(seen.size).toBe(length);
      expect(Math.max(...seen)).toBe(length - 1);
    }
  });

  it('different dimensions use different permutations (dimensions are not copies of each other)', () => {
    const points = pointsOf(new LatinHypercubeSampler(2, 50, 3), 50);
    expect(points.some((p) => Math.floor(p[0] * 50) !== Math.floor(p[1] * 50))).toBe(true);
  });
});

describe('GridSampler', () => {
  it('new GridSampler([5]) puts levels at 0, 1/4, 1/2, 3/4, 1 (endpoints included)', () => {
    expect(pointsOf(new GridSampler([5]), 5).map((p) => p[0])).toEqual([0, 0.25, 0.5, 0.75, 1]);
  });

  it('a dimension with one level sits at 0.5', () => {
    expect(pointsOf(new GridSampler([1, 2]), 2).map((p) => Array.from(p))).toEqual([
      [0.5, 0],
      [0.5, 1],
    ]);
  });

  it('new GridSampler([3, 2]) has size 6, dimension 0 fastest, every combination once', () => {
    const grid = new GridSampler([3, 2]);
    expect(grid.size).toBe(6);
    const points = pointsOf(grid, 6).map((p) => Array.from(p));
    expect(points).toEqual([
      [0, 0],
      [0.5, 0],
      [1, 0],
      [0, 1],
      [0.5, 1],
      [1, 1],
    ]);
    expect(() => grid.pointAt(6, new Float64Array(2))).toThrow(RangeError);
  });

  it('rejects no levels and a level count of 0', () => {
    expect(() => new GridSampler([])).toThrow(RangeError);
    expect(() => new GridSampler([2, 0])).toThrow(/at least 1/);
  });
});

describe('RandomSampler and createSampler', () => {
  it('RandomSampler gives the same point for the same seed and index, in [0, 1)', () => {
    const a = pointsOf(new RandomSampler(3, 11), 20);
    const b = pointsOf(new RandomSampler(3, 11), 20);
    expect(a).toEqual(b);
    for (const p of a) for (const v of p) expect(v >= 0 && v < 1).toBe(true);
    expect(pointsOf(new RandomSampler(3, 12), 1)).not.toEqual(a.slice(0, 1));
  });

  it('createSampler builds each method and point i does not depend on which points were asked before', () => {
    for (const method of ['sobol', 'lhs', 'grid', 'random'] as const) {
      const options = { method, dimensions: 3, seed: 8, samples: 64, levels: [4, 4, 4] };
      const forward = pointsOf(createSampler(options), 64);
      const backward = createSampler(options);
      for (let i = 63; i >= 0; i -= 7) {
        const out = new Float64Array(3);
        backward.pointAt(i, out);
        expect(out).toEqual(forward[i]);
      }
    }
  });

  it('createSampler reports sizes: grid the product of levels, lhs N, sobol and random unbounded', () => {
    expect(createSampler({ method: 'grid', dimensions: 2, seed: 0, samples: 0, levels: [3, 7] }).size).toBe(21);
    expect(createSampler({ method: 'lhs', dimensions: 2, seed: 0, samples: 9 }).size).toBe(9);
    expect(createSampler({ method: 'sobol', dimensions: 2, seed: 0, samples: 9 }).size).toBeNull();
    expect(createSampler({ method: 'random', dimensions: 2, seed: 0, samples: 9 }).size).toBeNull();
  });

  it('createSampler rejects a grid without one level count per dimension, and an unknown method', () => {
    expect(() => createSampler({ method: 'grid', dimensions: 2, seed: 0, samples: 1, levels: [3] })).toThrow(
      RangeError,
    );
    expect(() => createSampler({ method: 'halton' as 'grid', dimensions: 2, seed: 0, samples: 1 })).toThrow(
      /method must be/,
    );
  });

  it('createSampler with scramble: false gives the plain Sobol sequence', () => {
    const out = new Float64Array(2);
    createSampler({ method: 'sobol', dimensions: 2, seed: 3, samples: 8, scramble: false }).pointAt(2, out);
    expect(Array.from(out)).toEqual([0.75, 0.25]);
  });
});
