/**
 * The worker pool: piscina threads that evaluate batches of designs of one design space. Only this
 * folder knows about threads; optimize/ sees a BatchEvaluator.
 *
 * A worker that dies (throws outside a design, exits, runs out of memory) is replaced by piscina; the
 * batch it held is retried once, and if it fails again its designs come back as failed rows with the
 * reason, so a sweep always goes on.
 */
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import { METRIC_KEYS } from '../core/metrics.ts';
import type { Design } from '../core/design.ts';
import type { Evaluation } from '../core/evaluate.ts';
import { DesignSpace, type SpaceDefinition } from '../optimize/design-space.ts';
import { STATUS_FAILED, type BatchEvaluator, type BatchResult, type BatchTask } from '../optimize/evaluate-batch.ts';

/** Young-generation limit of each worker thread, MB. */
const WORKER_YOUNG_GENERATION_MB = 8;
/**
 * Old-generation limit of each `evaluate --batch` worker, MB. A worker keeps nothing between designs
 * (measured with --trace-gc: about 8 MB live after each full collection), but without a limit V8 lets the
 * old space of a busy thread swell to 40–45 MB of garbage before it collects; the peak RSS of a run is
 * the rare moment when every thread's heap is swollen at once, so it rose with the length of the run
 * (141 MB at 300 designs, 221 MB at 20,000). Capped, each worker's heap stays under about 28 MB.
 */
const DESIGN_WORKER_OLD_GENERATION_MB = 32;

/**
 * Old-generation limit of each sweep worker, MB: the same swelling, measured on the demo sweep at
 * 2·10⁵ samples with two workers: peak RSS 236 MB uncapped, 210 MB at 48 MB, 208 MB at 32 MB. 48 MB
 * leaves room for the heaviest designs (robust quantiles, three-coil solves) over the few MB live.
 */
const SWEEP_WORKER_OLD_GENERATION_MB = 48;

/** Default number of threads: the machine's available parallelism. */
export function defaultWorkerCount(): number {
  return Math.max(1, availableParallelism());
}

export interface PoolOptions {
  threads: number;
  /** Called once for each batch that had to be retried, with the reason (for the log). */
  onRetry?: (task: BatchTask, reason: string) => void;
}

function failedResult(task: BatchTask, space: DesignSpace, reason: string): BatchResult {
  const count = task.count;
  const dimensions = space.dimensionCount;
  let values: Float64Array;
  if (task.kind === 'values') values = task.values.slice();
  else {
    // The designs' own values, regenerated here, so a failed row still says which design it was.
    values = new Float64Array(count * dimensions);
    const one = new Float64Array(dimensions);
    for (let row = 0; row < count; row++) {
      space.valuesAt(task.start + row, one);
      values.set(one, row * dimensions);
    }
  }
  return {
    start: task.kind === 'indices' ? task.start : -1,
    count,
    values,
    metrics: new Float64Array(count * METRIC_KEYS.length).fill(Number.NaN),
    status: new Uint8Array(count).fill(STATUS_FAILED),
    reasons: Array.from({ length: count }, (_, row) => [row, reason] as [number, string]),
    warningMasks: new Uint32Array(count),
  };
}

/** A BatchEvaluator backed by a piscina pool of `threads` workers. */
export function createWorkerPool(space: SpaceDefinition, options: PoolOptions): BatchEvaluator & { threads: number } {
  const threads = Math.max(1, Math.floor(options.threads));
  const pool = new Piscina({
    filename: resolveWorkerFile(),
    minThreads: threads,
    maxThreads: threads,
    idleTimeout: 60_000,
    workerData: { space },
    // A small young generation: the workers keep nothing between designs, and V8's default lets
    // each thread's nursery grow to tens of MB (measured: 25 MB less peak RSS, same speed).
    resourceLimits: {
      maxYoungGenerationSizeMb: WORKER_YOUNG_GENERATION_MB,
      maxOldGenerationSizeMb: SWEEP_WORKER_OLD_GENERATION_MB,
    },
    // Workers inherit the environment (the test crash hook reads it).
    env: process.env as Record<string, string>,
  });
  let mainSpace: DesignSpace | null = null;
  const run = async (task: BatchTask): Promise<BatchResult> => {
    try {
      return (await pool.run(task)) as BatchResult;
    } catch (first) {
      const reason = describeFailure(first);
      options.onRetry?.(task, reason);
      try {
        return (await pool.run(task)) as BatchResult;
      } catch (second) {
        mainSpace ??= new DesignSpace(space);
        return failedResult(task, mainSpace, `worker failed twice on this batch: ${describeFailure(second)}`);
      }
    }
  };
  return {
    threads,
    evaluate: run,
    close: async () => {
      await pool.destroy();
    },
  };
}

/** A pool that evaluates whole designs (evaluate --batch): chunks of designs in, Evaluations out. */
export function createDesignPool(threads: number): {
  evaluate(designs: Design[]): Promise<Evaluation[]>;
  close(): Promise<void>;
} {
  const pool = new Piscina({
    filename: resolveWorkerFile(),
    minThreads: Math.max(1, threads),
    maxThreads: Math.max(1, threads),
    idleTimeout: 60_000,
    workerData: { space: null },
    resourceLimits: {
      maxYoungGenerationSizeMb: WORKER_YOUNG_GENERATION_MB,
      maxOldGenerationSizeMb: DESIGN_WORKER_OLD_GENERATION_MB,
    },
  });
  return {
    evaluate: async (designs) => (await pool.run({ kind: 'designs', designs })) as Evaluation[],
    close: async () => {
      await pool.destroy();
    },
  };
}

function describeFailure(error: unknown): string {
  if (error instanceof Error) return error.message.split('\n')[0];
  return String(error);
}

function resolveWorkerFile(): string {
  const here = fileURLToPath(import.meta.url);
  // Built: dist/workers/pool.js → dist/workers/evaluate-worker.js. From sources under vitest:
  // workers/pool.ts → dist/workers/evaluate-worker.js (workers must be built JS; `npm test` builds).
  if (here.endsWith('.js')) return here.replace(/pool\.js$/, 'evaluate-worker.js');
  return here.replace(/workers[\\/]pool\.ts$/, 'dist/workers/evaluate-worker.js');
}
