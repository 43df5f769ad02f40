/**
 * The in-flight scheduler shared by the run layer's sweep and the library's in-memory sweep: keeps a
 * bounded number of batches in a BatchEvaluator, hands each finished one to `take` (in whatever order
 * they finish: the state it feeds is order-independent), and calls `afterRound` after every round of
 * finished batches. It does not close the evaluator.
 */
import type { BatchEvaluator, BatchResult, BatchTask } from '../optimize/evaluate-batch.ts';

/** Batches in flight per worker thread (at least two in all), so no worker waits for the next task. */
export const TASKS_IN_FLIGHT_PER_THREAD = 3;

export interface ScheduleOptions {
  evaluator: BatchEvaluator;
  batchCount: number;
  taskOf: (batch: number) => BatchTask;
  /** Worker threads behind the evaluator (0: in this thread); sets the tasks in flight. */
  threads: number;
  /** Batches already done (a resumed run): skipped. */
  isDone?: (batch: number) => boolean;
  /** No batch is started from here on while this says so (a stop signal, an abort). */
  stopRequested: () => boolean;
  /** Batches at or past this number wait (a run keeps its done set compact); unbounded unless given. */
  startLimit?: () => number;
  take: (batch: number, result: BatchResult) => void;
  /** Called after every round of finished batches (journal syncs, snapshots, progress). */
  afterRound?: () => void;
}

/** The tasks in flight for a number of worker threads. */
export function tasksInFlight(threads: number): number {
  return Math.max(2, Math.max(1, threads) * TASKS_IN_FLIGHT_PER_THREAD);
}

/**
 * Runs the batches to the end, to the stop request or to the first error (thrown by the evaluator or
 * by `take`); returns that error, or null. Batches in flight when it stops are awaited.
 */
export async function scheduleBatches(options: ScheduleOptions): Promise<{ error: unknown } | null> {
  const { evaluator, batchCount, taskOf, take } = options;
  const maxInFlight = tasksInFlight(options.threads);
  const inFlight = new Map<number, Promise<void>>();
  let failure: { error: unknown } | null = null;
  let next = 0;
  const limit = options.startLimit ?? (() => Number.POSITIVE_INFINITY);
  while (failure === null) {
    while (!options.stopRequested() && inFlight.size < maxInFlight && next < batchCount && next < limit()) {
      const batch = next++;
      if (options.isDone?.(batch)) continue;
      const promise = evaluator
        .evaluate(taskOf(batch))
        .then((result) => take(batch, result))
        .catch((error: unknown) => {
          failure ??= { error };
        })
        .finally(() => inFlight.delete(batch));
      inFlight.set(batch, promise);
    }
    if (inFlight.size === 0) break;
    await Promise.race(inFlight.values());
    if (failure !== null) break;
    options.afterRound?.();
    // In this thread the batches resolve at once: let timers and signal handlers run between rounds.
    if (options.threads === 0) await new Promise((resolve) => setImmediate(resolve));
  }
  await Promise.allSettled(inFlight.values());
  return failure;
}
