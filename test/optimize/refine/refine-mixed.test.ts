import { describe, expect, test } from 'vitest';
import { coalesceBatches } from '../../../optimize/refine/batch-coalescer.ts';
import { EvaluationCache } from '../../../optimize/refine/evaluation-cache.ts';
import type { Merit } from '../../../optimize/refine/merit.ts';
import { mixedPoint, mixedPointKey } from '../../../optimize/refine/mixed-point.ts';
import type { MixedPoint } from '../../../optimize/refine/mixed-point.ts';
import { neighbourPass, neighboursOf } from '../../../optimize/refine/neighbour-pass.ts';
import { refineStart, refineStarts } from '../../../optimize/refine/refine-start.ts';
import { StartLedger } from '../../../optimize/refine/start-ledger.ts';

// The test problems here are invented with exact optima worked out by hand in each test.

const feasible = (value: number): Merit => ({ violation: 0, value });

describe('mixedPointKey', () => {
  test('mixedPointKey keeps full precision: 0.1 + 0.2 and 0.3 are different designs; −0 and 0 are the same', () => {
    const sum = mixedPointKey(mixedPoint([0.1 + 0.2], [1]));
    expect(sum).not.toBe(mixedPointKey(mixedPoint([0.3], [1])));
    expect(mixedPointKey(mixedPoint([-0], [1]))).toBe(mixedPointKey(mixedPoint([0], [1])));
    expect(mixedPointKey(mixedPoint([0.5], [2]))).not.toBe(mixedPointKey(mixedPoint([0.5], [3])));
  });
  test('mixedPoint rejects a non-integer level', () => {
    expect(() => mixedPoint([0.5], [1.5])).toThrow(/mixedPoint requires integer level indices, got \[1.5\]/);
  });
});

describe('EvaluationCache', () => {
  test('evaluates each distinct design once: repeats within a batch, across batches, and in flight', async () => {
    const sent: string[] = [];
    const cache = new EvaluationCache<number>(async (points) => {
      sent.push(...points.map(mixedPointKey));
      return points.map((p) => p.continuous[0] * 10 + p.levels[0]);
    });
    const a = mixedPoint([0.5], [1]);
    const b = mixedPoint([0.25], [2]);
    const first = cache.evaluate([a, b, a]);
    const concurrent = cache.evaluate([b]); // asked while the first batch is in flight
    expect(await first).toEqual([6, 4.5, 6]);
    expect(await concurrent).toEqual([4.5]);
    expect(await cache.evaluate([a])).toEqual([6]);
    expect(sent).toEqual(['0.5|1', '0.25|2']);
    expect([cache.evaluations, cache.hits, cache.size]).toEqual([2, 3, 2]);
    expect(cache.entries().map((entry) => entry.record)).toEqual([6, 4.5]);
  });

  test('a failed batch is not cached, so the same designs can be asked again', async () => {
    let calls = 0;
    const cache = new EvaluationCache<number>(async (points) => {
      calls++;
      if (calls === 1) throw new Error('pool lost a worker');
      return points.map(() => 1);
    });
    await expect(cache.evaluate([mixedPoint([0.1])])).rejects.toThrow('pool lost a worker');
    expect(await cache.evaluate([mixedPoint([0.1])])).toEqual([1]);
    expect(calls).toBe(2);
  });
});

describe('coalesceBatches', () => {
  test('callers in the same turn share one call, each gets its own slice; maxBatchSize splits it', async () => {
    const calls: number[][] = [];
    const shared = coalesceBatches(
      async (items: number[]) => {
        calls.push(items);
        return items.map((item) => item * item);
      },
      { maxBatchSize: 4 },
    );
    const answers = await Promise.all([shared([1, 2]), shared([3]), shared([4, 5, 6])]);
    expect(answers).toEqual([[1, 4], [9], [16, 25, 36]]);
    expect(calls).toEqual([
      [1, 2, 3, 4],
      [5, 6],
    ]);
  });
  test('an error reaches every caller of the failed call', async () => {
    const shared = coalesceBatches(async (): Promise<number[]> => {
      throw new Error('worker crashed');
    });
    const results = await Promise.allSettled([shared([1]), shared([2])]);
    expect(results.map((result) => result.status)).toEqual(['rejected', 'rejected']);
  });
});

describe('neighbourPass', () => {
  test('neighboursOf gives one level down and up per discrete parameter, within range', () => {
    const neighbours = neighboursOf(mixedPoint([0.5], [0, 3]), [4, 4]);
    expect(neighbours.map((p) => Array.from(p.levels))).toEqual([
      [1, 3],
      [0, 2],
    ]);
  });

  test('walks the lattice to the exact minimum of (a − 7)² + (b − 2)² from (0, 5)', async () => {
    const cache = new EvaluationCache<number>(async (points) =>
      points.map((p) => (p.levels[0] - 7) ** 2 + (p.levels[1] - 2) ** 2),
    );
    const ledger = new StartLedger(cache, feasible, 1000);
    const start = mixedPoint([], [0, 5]);
    const [merit] = await ledger.merits([start]);
    const result = await neighbourPass({ point: start, merit }, [12, 6], ledger);
    expect(Array.from(result.point.levels)).toEqual([7, 2]);
    expect(result.merit.value).toBe(0);
    expect(result.moves).toBe(10); // 7 + 3 unit moves, one per batch
    expect(ledger.used).toBe(23); // regression figure: distinct designs, revisits answered by the cache
  });

  test('stops with outOfBudget when the budget is spent, never exceeding it', async () => {
    const cache = new EvaluationCache<number>(async (points) => points.map((p) => (p.levels[0] - 50) ** 2));
    const ledger = new StartLedger(cache, feasible, 7);
    const start = mixedPoint([], [0]);
    const [merit] = await ledger.merits([start]);
    const result = await neighbourPass({ point: start, merit }, [100], ledger);
    expect(result.outOfBudget).toBe(true);
    // start 0, then levels 1..6 at one new design each (the level below is cached): 7 designs.
    expect(ledger.used).toBe(7);
    expect(Array.from(result.point.levels)).toEqual([6]);
  });
});

describe('refineStart (mixed continuous and discrete)', () => {
  // f(x, t) = (x − 0.1·t)² + 0.02·(t − 6)², x in [0, 1], t a level 0..9: exact minimum 0 at
  // (0.6, 6). From (0.9, 2), Nelder–Mead alone stops at x = 0.2 (t held) and the neighbour pass
  // alone at t = 5 (x held at 0.2), so it takes the alternation to reach the minimum:
  // NM → x 0.2; levels 3, 4, 5; NM → x 0.5; level 6; NM → x 0.6; no better level.
  const objective = (p: MixedPoint) => (p.continuous[0] - 0.1 * p.levels[0]) ** 2 + 0.02 * (p.levels[0] - 6) ** 2;
  const options = { levelCounts: [10], maxEvaluations: 600, nelderMead: { xatol: 1e-8, fatol: 1e-12 } };

  test('alternates Nelder–Mead and neighbour passes to the exact mixed minimum (0.6, 6)', async () => {
    let sent = 0;
    const cache = new EvaluationCache<number>(async (points) => {
      sent += points.length;
      return points.map(objective);
    });
    const result = await refineStart({ continuous: [0.9], levels: [2] }, cache, feasible, options);
    expect(result.status).toBe('converged');
    expect(Array.from(result.point.levels)).toEqual([6]);
    expect(result.point.continuous[0]).toBeCloseTo(0.6, 7);
    expect(result.merit.value).toBeLessThan(1e-14);
    expect(result.neighbourMoves).toBe(4);
    expect(result.rounds).toBe(3);
    expect(sent).toBe(result.evaluations); // one start: every design it asked was evaluated once
    expect(cache.hits).toBeGreaterThan(0); // NM's start vertex and revisited levels came from the cache
    expect([result.evaluations, result.nelderMeadRuns.length]).toEqual([178, 6]); // regression figures
  });

  test('is deterministic, and its course does not depend on other starts sharing the cache', async () => {
    const alone = await refineStart(
      { continuous: [0.9], levels: [2] },
      new EvaluationCache(async (points: MixedPoint[]) => points.map(objective)),
      feasible,
      options,
    );
    const shared = new EvaluationCache(async (points: MixedPoint[]) => points.map(objective));
    const together = await refineStarts(
      [
        { continuous: [0.1], levels: [8] },
        { continuous: [0.9], levels: [2] },
        { continuous: [0.9], levels: [2] },
      ],
      shared,
      () => feasible,
      options,
    );
    expect(together[1]).toEqual(alone);
    expect(together[2]).toEqual(alone);
    // the third start repeats the second: the shared cache evaluates its designs only once
    expect(shared.evaluations).toBe(together[0].evaluations + alone.evaluations);
  });

  test('respects its evaluation budget', async () => {
    const cache = new EvaluationCache(async (points: MixedPoint[]) => points.map(objective));
    const result = await refineStart({ continuous: [0.9], levels: [2] }, cache, feasible, {
      ...options,
      maxEvaluations: 25,
    });
    expect(result.evaluations).toBeLessThanOrEqual(25);
    expect(result.status).toBe('max_evaluations');
    expect(result.improved).toBe(true);
  });

  test('keeps to the feasible side of a constraint (Deb rules): x ≤ 0.55 moves the optimum to (0.55, 6)', async () => {
    // With x ≤ 0.55, at t = 6 the best x is 0.55 (f = 0.0025); t = 5 gives x 0.5, f = 0.02; so (0.55, 6).
    const cache = new EvaluationCache(async (points: MixedPoint[]) =>
      points.map((p) => ({ value: objective(p), violation: Math.max(0, p.continuous[0] - 0.55) })),
    );
    const result = await refineStart({ continuous: [0.9], levels: [2] }, cache, (record) => record, options);
    expect(result.merit.violation).toBe(0);
    expect(Array.from(result.point.levels)).toEqual([6]);
    expect(result.point.continuous[0]).toBeCloseTo(0.55, 4);
  });

  test('many starts through coalesceBatches reach the pool in few, large batches with the same results', async () => {
    const batchSizes: number[] = [];
    const pool = coalesceBatches(async (points: MixedPoint[]) => {
      batchSizes.push(points.length);
      return points.map(objective);
    });
    const starts = [0, 1, 2, 3, 4, 5, 6, 7].map((i) => ({ continuous: [i / 8], levels: [i] }));
    const results = await refineStarts(starts, new EvaluationCache(pool), () => feasible, options);
    for (const [index, start] of starts.entries()) {
      const alone = await refineStart(
        start,
        new EvaluationCache(async (points: MixedPoint[]) => points.map(objective)),
        feasible,
        options,
      );
      expect(results[index]).toEqual(alone);
    }
    const total = batchSizes.reduce((a, b) => a + b, 0);
    expect(batchSizes.length).toBeLessThan(total / 3);
  });

  test('rejects a level outside its range', async () => {
    const cache = new EvaluationCache(async (points: MixedPoint[]) => points.map(objective));
    await expect(refineStart({ continuous: [0.5], levels: [10] }, cache, feasible, options)).rejects.toThrow(
      /refineStart requires level 0 in 0..9, got 10/,
    );
  });
});
