import { describe, expect, it } from 'vitest';
import type { BatchEvaluator, BatchResult, BatchTask } from '../../optimize/evaluate-batch.ts';
import { scheduleBatches, tasksInFlight } from '../../run/batch-scheduler.ts';

/** An evaluator whose batches finish after a delay that varies with the batch (out of order). */
function slowEvaluator(log: { inFlight: number; most: number }): BatchEvaluator {
  return {
    evaluate: async (task: BatchTask) => {
      log.inFlight++;
      log.most = Math.max(log.most, log.inFlight);
      const start = task.kind === 'indices' ? task.start : -1;
      await new Promise((resolve) => setTimeout(resolve, (start * 7) % 5));
      log.inFlight--;
      return { start, count: task.count } as BatchResult;
    },
    close: async () => {},
  };
}

const taskOf = (batch: number): BatchTask => ({ kind: 'indices', start: batch, count: 1 });

describe('scheduleBatches(options)', () => {
  it('takes every batch not done exactly once and never holds more than the tasks in flight', async () => {
    const log = { inFlight: 0, most: 0 };
    const taken: number[] = [];
    const failure = await scheduleBatches({
      evaluator: slowEvaluator(log),
      batchCount: 40,
      taskOf,
      threads: 2,
      isDone: (batch) => batch % 10 === 3,
      stopRequested: () => false,
      take: (batch) => taken.push(batch),
    });
    expect(failure).toBeNull();
    const expected = Array.from({ length: 40 }, (_, b) => b).filter((b) => b % 10 !== 3);
    expect([...taken].sort((a, b) => a - b)).toEqual(expected);
    expect(log.most).toBe(tasksInFlight(2));
    expect(tasksInFlight(0)).toBe(3);
  });

  it('starts nothing past the start limit, starts nothing once a stop is requested, and returns the first error', async () => {
    const limitedTaken: number[] = [];
    const limited = await scheduleBatches({
      evaluator: slowEvaluator({ inFlight: 0, most: 0 }),
      batchCount: 100,
      taskOf,
      threads: 1,
      startLimit: () => 20,
      stopRequested: () => false,
      take: (batch) => limitedTaken.push(batch),
    });
    expect(limited).toBeNull();
    expect([...limitedTaken].sort((a, b) => a - b)).toEqual(Array.from({ length: 20 }, (_, b) => b));
    const taken: number[] = [];
    let stop = false;
    await scheduleBatches({
      evaluator: slowEvaluator({ inFlight: 0, most: 0 }),
      batchCount: 100,
      taskOf,
      threads: 1,
      stopRequested: () => stop,
      take: (batch) => {
        taken.push(batch);
        if (taken.length === 12) stop = true;
      },
    });
    expect(taken.length).toBeGreaterThanOrEqual(12);
    expect(taken.length).toBeLessThanOrEqual(12 + tasksInFlight(1));
    const failed = await scheduleBatches({
      evaluator: slowEvaluator({ inFlight: 0, most: 0 }),
      batchCount: 10,
      taskOf,
      threads: 0,
      stopRequested: () => false,
      take: (batch) => {
        if (batch === 4) throw new Error('disk full');
      },
    });
    expect(failed?.error).toBeInstanceOf(Error);
  });
});
