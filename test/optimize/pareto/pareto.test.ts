import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { dominates } from '../../../optimize/pareto/dominates.ts';
import { totalViolation } from '../../../optimize/pareto/constraint-violation.ts';
import { constrainedBetter } from '../../../optimize/pareto/constrained-better.ts';
import { nondominatedSort } from '../../../optimize/pareto/nondominated-sort.ts';
import { crowdingDistance } from '../../../optimize/pareto/crowding-distance.ts';
import { rankCandidates } from '../../../optimize/pareto/rank-candidates.ts';
import type { Scored } from '../../../optimize/pareto/scored.ts';

const scored = (index: number, violation: number, ...objectives: number[]): Scored => ({
  index,
  violation,
  objectives: Float64Array.from(objectives),
});

/** Brute-force Pareto ranks by the definition (Deb et al. 2002): rank 1 = not dominated; rank r+1 = not
 * dominated once ranks ≤ r are removed. */
function bruteForceRanks(points: number[][]): number[] {
  const rank = new Array<number>(points.length).fill(0);
  let current = 0;
  let left = points.length;
  while (left > 0) {
    current++;
    const front = points
      .map((_, i) => i)
      .filter((i) => rank[i] === 0 && !points.some((q, j) => rank[j] === 0 && dominates(q, points[i])));
    for (const i of front) rank[i] = current;
    left -= front.length;
  }
  return rank;
}

const smallIntegerPoints = (dimensions: number) =>
  fc.array(fc.array(fc.integer({ min: 0, max: 6 }), { minLength: dimensions, maxLength: dimensions }), {
    maxLength: 40,
  });

describe('dominates(a, b) (minimisation)', () => {
  it('is true when a is no worse everywhere and better somewhere', () => {
    expect(dominates([1, 2], [1, 3])).toBe(true);
    expect(dominates([0, 0, 0], [1, 1, 1])).toBe(true);
  });
  it('is false for equal vectors, for a trade-off, and for the reverse', () => {
    expect(dominates([1, 2], [1, 2])).toBe(false);
    expect(dominates([1, 3], [2, 1])).toBe(false);
    expect(dominates([1, 3], [1, 2])).toBe(false);
  });
  it('is false in both directions when either side has NaN', () => {
    expect(dominates([Number.NaN, 0], [1, 1])).toBe(false);
    expect(dominates([1, 1], [Number.NaN, 2])).toBe(false);
  });
  it('is irreflexive, antisymmetric and transitive (property)', () => {
    fc.assert(
      fc.property(smallIntegerPoints(3), (points) => {
        for (const a of points) {
          expect(dominates(a, a)).toBe(false);
          for (const b of points) {
            if (dominates(a, b)) expect(dominates(b, a)).toBe(false);
            for (const c of points) if (dominates(a, b) && dominates(b, c)) expect(dominates(a, c)).toBe(true);
          }
        }
      }),
      { numRuns: 30, seed: 1 },
    );
  });
});

describe('totalViolation(values, constraints)', () => {
  it('is 0 for values inside and on their bounds', () => {
    expect(totalViolation([100, 10, 5], [{ min: 100 }, { max: 10 }, { min: 0, max: 5 }])).toBe(0);
  });
  it('sums violations normalised by the bound: 90 against min 100 is 0.1, 12 against max 10 is 0.2', () => {
    expect(totalViolation([90, 12], [{ min: 100 }, { max: 10 }])).toBeCloseTo(0.3, 15);
  });
  it('normalises a bound of 0 by 1e-12', () => {
    expect(totalViolation([-1e-12], [{ min: 0 }])).toBeCloseTo(1, 12);
  });
  it('counts null, undefined and NaN of a bounded metric as 1 each, and ignores them for an unbounded one', () => {
    expect(totalViolation([null, Number.NaN, undefined], [{ min: 1 }, { max: 1 }, { min: 0, max: 2 }])).toBe(3);
    expect(totalViolation([null], [{}])).toBe(0);
  });
  it('is 0 for no constraints', () => {
    expect(totalViolation([], [])).toBe(0);
  });
});

describe('constrainedBetter(a, b) (Deb 2000 rules)', () => {
  it('ranks a feasible design before any infeasible one, however good its objectives (rule 1)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1e9, max: 1e9, noNaN: true }),
        fc.double({ min: 1e-9, max: 1e9, noNaN: true }),
        (value, violation) => {
          const feasible = scored(1, 0, 1e12);
          const infeasible = scored(2, violation, value);
          expect(constrainedBetter(feasible, infeasible)).toBeLessThan(0);
          expect(constrainedBetter(infeasible, feasible)).toBeGreaterThan(0);
        },
      ),
      { numRuns: 100, seed: 3 },
    );
  });
  it('orders two infeasible designs by violation (rule 2), equal violations tie', () => {
    expect(constrainedBetter(scored(1, 0.5, 0), scored(2, 0.2, 9))).toBeGreaterThan(0);
    expect(constrainedBetter(scored(1, 0.2, 0), scored(2, 0.2, 9))).toBe(0);
  });
  it('orders two feasible designs by domination (rule 3), mutual non-domination ties', () => {
    expect(constrainedBetter(scored(1, 0, 1, 1), scored(2, 0, 2, 2))).toBeLessThan(0);
    expect(constrainedBetter(scored(1, 0, 1, 3), scored(2, 0, 2, 2))).toBe(0);
    expect(constrainedBetter(scored(1, 0, 5), scored(2, 0, 4))).toBeGreaterThan(0);
  });
});

describe('nondominatedSort(points)', () => {
  it('returns [] for no points and one front for one point', () => {
    expect(nondominatedSort([])).toEqual([]);
    expect(nondominatedSort([[3, 4]])).toEqual([[0]]);
  });
  it('sorts a hand-worked set into three fronts; equal vectors share a front', () => {
    const points = [
      [1, 5],
      [2, 2],
      [5, 1],
      [3, 3],
      [2, 2],
      [6, 6],
    ];
    expect(nondominatedSort(points)).toEqual([[0, 1, 2, 4], [3], [5]]);
  });
  it.each([2, 3, 4])('agrees with brute force on random sets with ties in %i objectives (property)', (dimensions) => {
    fc.assert(
      fc.property(smallIntegerPoints(dimensions), (points) => {
        const fronts = nondominatedSort(points);
        const ranks = new Array<number>(points.length).fill(0);
        fronts.forEach((front, f) => {
          for (const i of front) ranks[i] = f + 1;
        });
        expect(ranks).toEqual(bruteForceRanks(points));
      }),
      { numRuns: 80, seed: dimensions },
    );
  });
  it('agrees with brute force on 800 points near a plane in 3 objectives (fronts of hundreds, looked up in the k-d tree)', () => {
    let state = 12345;
    const next = () => {
      state = (Math.imul(state, 1103515245) + 12345) >>> 0;
      return state / 2 ** 32;
    };
    const points = Array.from({ length: 800 }, () => {
      const a = next();
      const b = next() * (1 - a);
      const noise = Math.floor(next() * 4) / 40;
      return [a + noise, b + noise, 1 - a - b + noise];
    });
    const fronts = nondominatedSort(points);
    expect(fronts[0].length).toBeGreaterThan(64);
    const ranks = new Array<number>(points.length).fill(0);
    fronts.forEach((front, f) => {
      for (const i of front) ranks[i] = f + 1;
    });
    expect(ranks).toEqual(bruteForceRanks(points));
  });

  it('with limit stops after the front that reaches it', () => {
    const points = [
      [1, 1],
      [2, 2],
      [3, 3],
      [4, 4],
    ];
    expect(nondominatedSort(points, 2)).toEqual([[0], [1]]);
  });
  it('puts a point with NaN in the first front', () => {
    expect(
      nondominatedSort([
        [1, 1],
        [Number.NaN, 0],
        [2, 2],
      ]),
    ).toEqual([[0, 1], [2]]);
  });
});

describe('crowdingDistance(points, front) (Deb et al. 2002, sec. III-B)', () => {
  it('hand-worked front of four points in two objectives', () => {
    // Sorted by f1: (0,10), (2,6), (5,3), (10,0); ranges 10 and 10.
    // (2,6): f1 (5−0)/10 + f2 (10−3)/10 = 1.2; (5,3): (10−2)/10 + (6−0)/10 = 1.4; ends: Infinity.
    const points = [
      [5, 3],
      [0, 10],
      [10, 0],
      [2, 6],
    ];
    const distance = crowdingDistance(points, [0, 1, 2, 3]);
    expect(distance[1]).toBe(Infinity);
    expect(distance[2]).toBe(Infinity);
    expect(distance[0]).toBeCloseTo(1.4, 15);
    expect(distance[3]).toBeCloseTo(1.2, 15);
  });
  it('gives Infinity to fronts of one or two points and 0 to an empty one', () => {
    expect(Array.from(crowdingDistance([[1, 2]], [0]))).toEqual([Infinity]);
    expect(
      Array.from(
        crowdingDistance(
          [
            [1, 2],
            [2, 1],
          ],
          [0, 1],
        ),
      ),
    ).toEqual([Infinity, Infinity]);
    expect(crowdingDistance([], []).length).toBe(0);
  });
  it('does not depend on the order the front is listed in', () => {
    const points = [
      [0, 9],
      [1, 7],
      [3, 4],
      [3, 4],
      [6, 2],
      [9, 0],
    ];
    const forward = crowdingDistance(points, [0, 1, 2, 3, 4, 5]);
    const backward = crowdingDistance(points, [5, 4, 3, 2, 1, 0]);
    expect(Array.from(backward).reverse()).toEqual(Array.from(forward));
  });
});

describe('rankCandidates(items)', () => {
  it('returns empty results for no items', () => {
    const result = rankCandidates([]);
    expect(result.order).toEqual([]);
    expect(result.paretoRank.length).toBe(0);
  });
  it('puts feasible by front and crowding first, then infeasible by violation, ties by index', () => {
    const items = [
      scored(10, 0, 2, 6),
      scored(11, 0.3, 0, 0),
      scored(12, 0, 0, 10),
      scored(13, 0, 6, 6),
      scored(14, 0, 10, 0),
      scored(15, 0.1, 9, 9),
      scored(16, 0, 5, 3),
      scored(17, 0.1, 1, 1),
    ];
    const { order, paretoRank } = rankCandidates(items);
    // Front 1: 12 (Inf), 14 (Inf), 16 (1.4), 10 (1.2); front 2: 13; infeasible: 15, 17 (0.1, by index), 11.
    expect(order.map((p) => items[p].index)).toEqual([12, 14, 16, 10, 13, 15, 17, 11]);
    expect(Array.from(paretoRank)).toEqual([1, 0, 1, 2, 1, 0, 1, 0]);
  });
  it('one objective: plain order by value then index; equal values share a rank', () => {
    const items = [scored(5, 0, 3), scored(2, 0, 1), scored(9, 0, 1), scored(1, 0.5, -100), scored(3, 0, 2)];
    const { order, paretoRank } = rankCandidates(items);
    expect(order.map((p) => items[p].index)).toEqual([2, 9, 3, 5, 1]);
    expect(Array.from(paretoRank)).toEqual([3, 1, 1, 0, 2]);
  });
  it('is independent of the input order (property)', () => {
    fc.assert(
      fc.property(smallIntegerPoints(2), (points) => {
        const items = points.map((p, i) => scored(i, i % 5 === 0 ? (i % 3) / 10 : 0, ...p));
        const reversed = items.slice().reverse();
        const a = rankCandidates(items).order.map((p) => items[p].index);
        const b = rankCandidates(reversed).order.map((p) => reversed[p].index);
        expect(b).toEqual(a);
      }),
      { numRuns: 60, seed: 11 },
    );
  });
  it('breaks crowding ties between repeated vectors by index, whatever the input order', () => {
    // Three copies of (0, 2): the boundary copies (Infinity) must be the lowest and highest index (3 and
    // 9), the interior one index 5 (crowding 0), in every input order. By hand: (1, 1) has
    // (2 − 0)/2 + (2 − 0)/2 = 2, so the order is 3, 4, 9 (Infinity, by index), 7 (2), 5 (0).
    const copies = [scored(5, 0, 0, 2), scored(3, 0, 0, 2), scored(9, 0, 0, 2)];
    const others = [scored(4, 0, 2, 0), scored(7, 0, 1, 1)];
    const orders = [
      [...copies, ...others],
      [copies[1], copies[2], ...others, copies[0]],
      [copies[2], ...others, copies[0], copies[1]],
    ];
    for (const items of orders) {
      const { order, crowding } = rankCandidates(items);
      expect(order.map((p) => items[p].index)).toEqual([3, 4, 9, 7, 5]);
      expect(crowding[items.findIndex((item) => item.index === 5)]).toBe(0);
    }
  });

  it('with limit gives the same first positions as the full ranking', () => {
    const items = Array.from({ length: 60 }, (_, i) => scored(i, 0, (i * 7) % 13, (i * 5) % 11));
    const full = rankCandidates(items).order;
    expect(rankCandidates(items, 10).order).toEqual(full.slice(0, 10));
  });
  it('rejects a NaN violation and a feasible item with the wrong number of objectives', () => {
    expect(() => rankCandidates([scored(1, Number.NaN, 1)])).toThrow(RangeError);
    expect(() => rankCandidates([scored(1, 0, 1, 2), scored(2, 0, 1)])).toThrow(/objectives/);
  });
});
