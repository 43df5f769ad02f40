import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { defaultReferencePoint, hypervolume } from '../../../optimize/pareto/hypervolume.ts';

/**
 * Exact hypervolume by inclusion–exclusion over all non-empty subsets (the measure of a union of boxes
 * [p, r]: Σ_S (−1)^{|S|+1} Π_j (r_j − max_{i∈S} p_ij)), for small sets. An independent exact method.
 */
function inclusionExclusion(points: number[][], reference: number[]): number {
  const inside = points.filter((p) => p.every((v, j) => v < reference[j]));
  let total = 0;
  for (let mask = 1; mask < 1 << inside.length; mask++) {
    let sign = -1;
    const corner = reference.map(() => -Infinity);
    for (let i = 0; i < inside.length; i++) {
      if (mask & (1 << i)) {
        sign = -sign;
        inside[i].forEach((v, j) => {
          corner[j] = Math.max(corner[j], v);
        });
      }
    }
    total += sign * corner.reduce((product, v, j) => product * (reference[j] - v), 1);
  }
  return total;
}

const pointSets = (dimensions: number, maxLength: number) =>
  fc.array(
    fc.array(
      fc.integer({ min: 0, max: 10 }).map((v) => v / 10),
      { minLength: dimensions, maxLength: dimensions },
    ),
    { maxLength },
  );

describe('hypervolume(points, reference)', () => {
  it('is 0 for no points, and for points not strictly better than the reference in every objective', () => {
    expect(hypervolume([], [1, 1])).toBe(0);
    expect(
      hypervolume(
        [
          [1, 0],
          [0.5, 1],
          [2, 2],
        ],
        [1, 1],
      ),
    ).toBe(0);
  });

  it('of a single point is the box to the reference, in 1 to 5 objectives', () => {
    expect(hypervolume([[0.25]], [1])).toBe(0.75);
    expect(hypervolume([[0.5, 0.25]], [1, 1])).toBe(0.375);
    expect(hypervolume([[0.5, 0.5, 0]], [1, 1, 2])).toBe(0.5);
    expect(hypervolume([[0, 0, 0, 0.5]], [1, 2, 3, 1])).toBe(3);
    expect(hypervolume([[0, 0, 0, 0, 0]], [1, 1, 1, 1, 2])).toBe(2);
  });

  it('adds nothing for dominated, repeated or NaN points', () => {
    const front = [
      [0.1, 0.8, 0.5],
      [0.6, 0.2, 0.3],
      [0.4, 0.4, 0.9],
    ];
    const value = hypervolume(front, [1, 1, 1]);
    expect(hypervolume([...front, [0.7, 0.9, 0.95], front[1], [Number.NaN, 0, 0]], [1, 1, 1])).toBe(value);
  });

  it.each([2, 3, 4])(
    'agrees with inclusion–exclusion on small random sets with ties in %i objectives (property)',
    (dimensions) => {
      fc.assert(
        fc.property(pointSets(dimensions, 9), (points) => {
          const reference = new Array<number>(dimensions).fill(1);
          expect(hypervolume(points, reference)).toBeCloseTo(inclusionExclusion(points, reference), 12);
        }),
        { numRuns: 120, seed: 40 + dimensions },
      );
    },
  );

  it('does not depend on the order of the points (property, 3 objectives)', () => {
    fc.assert(
      fc.property(pointSets(3, 30), (points) => {
        expect(hypervolume(points.slice().reverse(), [1, 1, 1])).toBe(hypervolume(points, [1, 1, 1]));
      }),
      { numRuns: 50, seed: 9 },
    );
  });

  it('rejects a point whose length differs from the reference, and an empty reference', () => {
    expect(() => hypervolume([[0, 0]], [1, 1, 1])).toThrow(RangeError);
    expect(() => hypervolume([], [])).toThrow(RangeError);
  });

  it('handles 1 000 points on a 4-D spherical front in under 3 seconds', () => {
    const points = Array.from({ length: 1000 }, (_, i) => {
      const a = (((i * 0.618034) % 1) * Math.PI) / 2;
      const b = (((i * 0.754878) % 1) * Math.PI) / 2;
      const c = (((i * 0.56984) % 1) * Math.PI) / 2;
      return [
        Math.cos(a) * Math.cos(b) * Math.cos(c),
        Math.cos(a) * Math.cos(b) * Math.sin(c),
        Math.cos(a) * Math.sin(b),
        Math.sin(a),
      ];
    });
    const started = performance.now();
    const value = hypervolume(points, [1.1, 1.1, 1.1, 1.1]);
    expect(performance.now() - started).toBeLessThan(3000);
    expect(value).toBeGreaterThan(0);
    expect(value).toBeLessThan(1.1 ** 4);
  });
});

describe('defaultReferencePoint(points)', () => {
  it('is the nadir plus 10 % of the range per objective', () => {
    expect(
      Array.from(
        defaultReferencePoint([
          [0, 4],
          [2, 1],
        ]),
      ),
    ).toEqual([2.2, 4.3]);
  });
  it('adds 1 where the range is 0, and ignores NaN', () => {
    expect(
      Array.from(
        defaultReferencePoint([
          [3, Number.NaN],
          [3, 5],
        ]),
      ),
    ).toEqual([4, 6]);
  });
  it('rejects no points and an objective with no number', () => {
    expect(() => defaultReferencePoint([])).toThrow(RangeError);
    expect(() => defaultReferencePoint([[Number.NaN]])).toThrow(/no numeric value/);
  });
});
