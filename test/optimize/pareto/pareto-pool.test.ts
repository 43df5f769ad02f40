import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { CandidatePool } from '../../../optimize/pareto/candidate-pool.ts';
import { dominates } from '../../../optimize/pareto/dominates.ts';
import { rankCandidates } from '../../../optimize/pareto/rank-candidates.ts';
import type { Scored } from '../../../optimize/pareto/scored.ts';
import { uniformAt } from '../../../optimize/random.ts';
import { DominanceIndex } from '../../../optimize/pareto/dominance-index.ts';
import { must } from '../../../core/must.ts';

const scored = (index: number, violation: number, objectives: number[]): Scored => ({
  index,
  violation,
  objectives: Float64Array.from(objectives),
});

function shuffled<T>(values: T[], seed: number): T[] {
  const copy = values.slice();
  for (let i = copy.length - 1; i > 0; i--) {
    const j = Math.floor(uniformAt(seed, i, 91) * (i + 1));
    [copy[i], copy[j]] = [copy[j], copy[i]];
  }
  return copy;
}

/** The kept set by definition: feasible points dominated by fewer than K points of the whole set. */
function bruteForceKept(items: Scored[], keep: number): number[] {
  const feasible = items.filter((item) => item.violation === 0);
  return feasible
    .filter((p) => feasible.filter((q) => dominates(q.objectives, p.objectives)).length < keep)
    .map((p) => p.index)
    .sort((a, b) => a - b);
}

/** Random candidates: small integer objectives (many ties and equal vectors), some infeasible. */
const candidateSets = (objectiveCount: number) =>
  fc
    .array(
      fc.record({
        objectives: fc.array(fc.integer({ min: 0, max: 8 }), { minLength: objectiveCount, maxLength: objectiveCount }),
        violation: fc.oneof(
          fc.constant(0),
          fc.constant(0),
          fc.constant(0),
          fc.integer({ min: 1, max: 5 }).map((v) => v / 4),
        ),
      }),
      { maxLength: 120 },
    )
    .map((rows) => rows.map((row, index) => scored(index, row.violation, row.objectives)));

describe('CandidatePool (K-dominance filter) against brute force', () => {
  it.each([2, 3, 4])(
    'keeps exactly the points with fewer than K dominators, in any arrival order (%i objectives)',
    (objectiveCount) => {
      fc.assert(
        fc.property(
          candidateSets(objectiveCount),
          fc.integer({ min: 1, max: 12 }),
          fc.integer({ min: 0, max: 1e6 }),
          (items, keep, seed) => {
            const expected = bruteForceKept(items, keep);
            for (const order of [items, shuffled(items, seed), items.slice().reverse()]) {
              const pool = new CandidatePool<number>(keep, objectiveCount);
              for (const item of order) pool.offer(item, item.index * 10);
              const kept = pool.feasibleEntries();
              expect(kept.map((e) => e.item.index)).toEqual(expected);
              // Stored dominator counts equal the counts over the whole set; payloads travel with their items.
              for (const entry of kept) {
                const count = items.filter(
                  (q) => q.violation === 0 && dominates(q.objectives, entry.item.objectives),
                ).length;
                expect(entry.dominatedBy).toBe(count);
                expect(entry.payload).toBe(entry.item.index * 10);
              }
            }
          },
        ),
        { numRuns: 70, seed: objectiveCount * 101 },
      );
    },
  );

  it('is closed under "dominated-by", so Pareto ranks and the first K of rankCandidates equal those on the whole set', () => {
    fc.assert(
      fc.property(
        candidateSets(3),
        fc.integer({ min: 1, max: 10 }),
        fc.integer({ min: 0, max: 1e6 }),
        (items, keep, seed) => {
          const pool = new CandidatePool<null>(keep, 3);
          for (const item of shuffled(items, seed)) pool.offer(item, null);
          const whole = rankCandidates(items);
          const wholeFirst = whole.order.slice(0, keep).map((p) => items[p].index);
          const fromPool = pool.ranked();
          expect(fromPool.map((e) => e.item.index)).toEqual(wholeFirst);
          const byIndex = new Map(items.map((item, position) => [item.index, position]));
          for (const entry of fromPool) {
            const position = must(byIndex.get(entry.item.index));
            expect(entry.paretoRank).toBe(whole.paretoRank[position]);
            expect(entry.crowding).toBe(whole.crowding[position]);
          }
        },
      ),
      { numRuns: 80, seed: 5 },
    );
  });

  it('front() is the non-dominated feasible subset of everything offered', () => {
    fc.assert(
      fc.property(candidateSets(2), fc.integer({ min: 1, max: 6 }), (items, keep) => {
        const pool = new CandidatePool<null>(keep, 2);
        for (const item of items) pool.offer(item, null);
        const feasible = items.filter((i) => i.violation === 0);
        const expected = feasible
          .filter((p) => !feasible.some((q) => dominates(q.objectives, p.objectives)))
          .map((p) => p.index);
        expect(pool.front().map((e) => e.item.index)).toEqual(expected);
      }),
      { numRuns: 60, seed: 6 },
    );
  });

  it('merge of shard pools equals the pool of the whole stream (claim d), overlapping shards included', () => {
    fc.assert(
      fc.property(
        candidateSets(3),
        fc.integer({ min: 1, max: 8 }),
        fc.integer({ min: 0, max: 1e6 }),
        (items, keep, seed) => {
          const whole = new CandidatePool<number>(keep, 3);
          for (const item of items) whole.offer(item, item.index);
          const shards = [0, 1, 2].map(() => new CandidatePool<number>(keep, 3));
          items.forEach((item, i) => {
            shards[Math.floor(uniformAt(seed, i, 5) * 3)].offer(item, item.index);
            if (i % 7 === 0) shards[(i + 1) % 3].offer(item, item.index); // overlap: same index twice
          });
          shards[0].merge(shards[1]);
          shards[0].merge(shards[2]);
          expect(JSON.stringify(shards[0])).toBe(JSON.stringify(whole));
        },
      ),
      { numRuns: 60, seed: 8 },
    );
  });
});

describe('CandidatePool behaviour', () => {
  it('starts empty: no entries, no front, no ranking', () => {
    const pool = new CandidatePool<null>(10, 2);
    expect(pool.size).toBe(0);
    expect(pool.entries()).toEqual([]);
    expect(pool.front()).toEqual([]);
    expect(pool.ranked()).toEqual([]);
  });

  it('one objective keeps the K smallest by (value, index) exactly, ties by index', () => {
    const pool = new CandidatePool<null>(3, 1);
    for (const [index, value] of [
      [5, 2],
      [1, 7],
      [4, 2],
      [9, 1],
      [2, 2],
      [3, 0.5],
    ] as const)
      pool.offer(scored(index, 0, [value]), null);
    expect(pool.ranked().map((e) => e.item.index)).toEqual([3, 9, 2]);
    expect(pool.front().map((e) => e.item.index)).toEqual([3]);
  });

  it('no objectives (a feasibility-only sweep) keeps the K smallest indices of feasible designs', () => {
    const pool = new CandidatePool<null>(2, 0);
    for (const index of [8, 3, 5]) pool.offer(scored(index, 0, []), null);
    expect(pool.ranked().map((e) => e.item.index)).toEqual([3, 5]);
  });

  it('keeps the K least-violating infeasible candidates, ranked after every feasible one', () => {
    const pool = new CandidatePool<null>(2, 2);
    pool.offer(scored(1, 0.5, [0, 0]), null);
    pool.offer(scored(2, 0.1, [0, 0]), null);
    pool.offer(scored(3, 0.3, [0, 0]), null);
    pool.offer(scored(4, 0, [9, 9]), null);
    expect(pool.infeasibleEntries().map((e) => e.item.index)).toEqual([2, 3]);
    expect(pool.ranked(10).map((e) => e.item.index)).toEqual([4, 2, 3]);
  });

  it('keeps all copies of an equal objective vector (equal vectors do not dominate each other)', () => {
    const pool = new CandidatePool<null>(1, 2);
    for (let i = 0; i < 5; i++) pool.offer(scored(i, 0, [1, 1]), null);
    pool.offer(scored(9, 0, [2, 2]), null);
    expect(pool.feasibleEntries().map((e) => e.item.index)).toEqual([0, 1, 2, 3, 4]);
  });

  it('a value on a tie (same first objective, same sum) is handled in both scans', () => {
    const pool = new CandidatePool<null>(1, 2);
    pool.offer(scored(0, 0, [1, 2]), null);
    pool.offer(scored(1, 0, [1, 1]), null); // dominates 0, smaller sum
    pool.offer(scored(2, 0, [0, 2]), null); // same sum as 0, dominates it too
    expect(pool.feasibleEntries().map((e) => e.item.index)).toEqual([1, 2]);
  });

  it('offerWith builds payloads only for kept candidates and ends in the same state as offer', () => {
    for (const objectiveCount of [1, 2, 3]) {
      const lazy = new CandidatePool<number>(5, objectiveCount);
      const eager = new CandidatePool<number>(5, objectiveCount);
      let built = 0;
      for (let i = 0; i < 2000; i++) {
        const item = scored(
          i,
          i % 4 === 0 ? uniformAt(3, i, 9) : 0,
          Array.from({ length: objectiveCount }, (_, j) => uniformAt(3, i, j)),
        );
        lazy.offerWith(item, () => {
          built++;
          return i;
        });
        eager.offer(item, i);
      }
      expect(JSON.stringify(lazy)).toBe(JSON.stringify(eager));
      expect(built).toBeLessThan(600);
    }
  });

  it('copies the objectives, so the caller may reuse its buffer', () => {
    const pool = new CandidatePool<null>(5, 2);
    const buffer = Float64Array.of(1, 2);
    pool.offer({ index: 0, violation: 0, objectives: buffer }, null);
    buffer[0] = 99;
    expect(Array.from(pool.feasibleEntries()[0].item.objectives)).toEqual([1, 2]);
  });

  it('restore(JSON.parse(JSON.stringify(pool))) gives a pool that continues exactly like the original', () => {
    const items = Array.from({ length: 400 }, (_, i) =>
      scored(i, i % 9 === 0 ? 0.2 : 0, [uniformAt(1, i, 0), uniformAt(1, i, 1), uniformAt(1, i, 2)]),
    );
    const original = new CandidatePool<{ row: number }>(20, 3);
    for (const item of items.slice(0, 200)) original.offer(item, { row: item.index });
    const restored = CandidatePool.restore<{ row: number }>(JSON.parse(JSON.stringify(original)));
    for (const item of items.slice(200)) {
      original.offer(item, { row: item.index });
      restored.offer(item, { row: item.index });
    }
    expect(JSON.stringify(restored)).toBe(JSON.stringify(original));
  });

  it('toJSON keeps NaN and infinite values of infeasible candidates through JSON text', () => {
    const pool = new CandidatePool<null>(3, 2);
    pool.offer(scored(4, Infinity, [Number.NaN, -Infinity]), null);
    const restored = CandidatePool.restore<null>(JSON.parse(JSON.stringify(pool)));
    const entry = restored.infeasibleEntries()[0];
    expect(entry.item.violation).toBe(Infinity);
    expect(Array.from(entry.item.objectives)).toEqual([Number.NaN, -Infinity]);
  });

  it('rejects a NaN or negative violation, a wrong objective count and non-finite feasible objectives', () => {
    const pool = new CandidatePool<null>(5, 2);
    expect(() => pool.offer(scored(0, Number.NaN, [1, 2]), null)).toThrow(RangeError);
    expect(() => pool.offer(scored(0, -1, [1, 2]), null)).toThrow(RangeError);
    expect(() => pool.offer(scored(0, 0, [1]), null)).toThrow(/2 values/);
    expect(() => pool.offer(scored(0, 0, [1, Number.NaN]), null)).toThrow(/finite/);
    expect(() => pool.offer(scored(0, 0, [1, Infinity]), null)).toThrow(/finite/);
    expect(() => new CandidatePool(0, 2)).toThrow(RangeError);
    expect(() => new CandidatePool(5, 2).merge(new CandidatePool(5, 3))).toThrow(RangeError);
  });

  it('stays bounded on a long correlated stream: 20 000 offers, K = 50, two objectives', () => {
    const pool = new CandidatePool<null>(50, 2);
    for (let i = 0; i < 20_000; i++) {
      const t = uniformAt(4, i, 0);
      pool.offer(scored(i, 0, [t + 0.05 * uniformAt(4, i, 1), t + 0.05 * uniformAt(4, i, 2)]), null);
    }
    expect(pool.feasibleSize).toBeLessThan(400);
    expect(pool.ranked().length).toBe(50);
  });
});

describe('CandidatePool on larger streams (the k-d tree is rebuilt many times, points leave from inside it)', () => {
  it.each([
    [2, 'anticorrelated'],
    [3, 'independent'],
    [4, 'independent'],
  ] as const)(
    'matches brute force on 2 500 offers in %i objectives (%s, with repeated vectors), K = 25',
    (objectiveCount, kind) => {
      const items = Array.from({ length: 2500 }, (_, i) => {
        const source = i % 10 === 3 ? i - 3 : i; // every tenth offer repeats an earlier vector
        const common = uniformAt(6, source, 50);
        const objectives = Array.from({ length: objectiveCount }, (_, j) =>
          kind === 'independent'
            ? Math.round(uniformAt(6, source, j) * 200) / 200
            : (j % 2 === 0 ? common : 1 - common) + 0.1 * uniformAt(6, source, j),
        );
        return scored(i, 0, objectives);
      });
      const expected = bruteForceKept(items, 25);
      const pool = new CandidatePool<null>(25, objectiveCount);
      for (const item of shuffled(items, objectiveCount)) pool.offer(item, null);
      expect(pool.feasibleEntries().map((e) => e.item.index)).toEqual(expected);
      const whole = rankCandidates(items);
      expect(pool.ranked().map((e) => e.item.index)).toEqual(whole.order.slice(0, 25).map((p) => items[p].index));
    },
  );
});

describe('DominanceIndex', () => {
  it('countDominators and forEachDominated agree with brute force after random inserts and removals', () => {
    const index = new DominanceIndex(3);
    const stored = new Map<number, number[]>();
    for (let i = 0; i < 3000; i++) {
      const point = [0, 1, 2].map((j) => Math.floor(uniformAt(8, i, j) * 20));
      index.insert(point, 0, i, null);
      stored.set(i, point);
      if (i % 3 === 0) {
        // remove a random stored point by its sample index
        const victim = Math.floor(uniformAt(8, i, 9) * (i + 1));
        for (let slot = 0; slot < index.slotCount; slot++) {
          if (index.live[slot] === 1 && index.sampleIndices[slot] === victim) {
            index.remove(slot);
            stored.delete(victim);
          }
        }
      }
      if (i % 250 === 0) {
        const probe = [0, 1, 2].map((j) => Math.floor(uniformAt(9, i, j) * 20));
        const dominators = [...stored.values()].filter((q) => dominates(q, probe)).length;
        expect(index.countDominators(probe, Infinity)).toBe(dominators);
        expect(Math.min(index.countDominators(probe, 5), 5)).toBe(Math.min(dominators, 5));
        const visited: number[] = [];
        index.forEachDominated(probe, (slot) => visited.push(index.sampleIndices[slot]));
        const expectedVisited = [...stored.entries()].filter(([, q]) => dominates(probe, q)).map(([k]) => k);
        expect(visited.sort((a, b) => a - b)).toEqual(expectedVisited.sort((a, b) => a - b));
      }
    }
    expect(index.liveCount).toBe(stored.size);
  });
});
