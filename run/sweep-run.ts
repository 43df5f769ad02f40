/**
 * The sweep engine: evaluates the batches of a run's index range in a BatchEvaluator with a bounded
 * number in flight, keeps the order-independent state, journals every finished batch, snapshots the
 * state, and hands the final state to the caller's output writer.
 *
 * Durability: every finished batch is appended to journal-<g>.log (CRC-framed, fsync'd every
 * `journalSyncSeconds`); the state is snapshotted to checkpoint.json (atomic rename) every
 * SYNCS_PER_SNAPSHOT journal syncs, and a new journal generation begins. A resumed run loads the
 * snapshot, replays the journal of its generation (a torn last record is dropped), and evaluates only
 * what is left; since the state depends on the set of designs and not on their order, the final files
 * are byte-identical to an uninterrupted run (timing aside).
 */
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import type { BatchEvaluator, BatchResult, BatchTask } from '../optimize/evaluate-batch.ts';
import { SweepState } from '../optimize/sweep-state.ts';
import { decodeBatchRecord, encodeBatchRecord } from './batch-codec.ts';
import { writeChunksAtomicSync } from './durable/atomic-write.ts';
import { openJournal, readJournal, type Journal } from './durable/journal.ts';
import type { StopSignal } from './durable/stop-signal.ts';
import { DoneSet } from './done-set.ts';
import { jsonChunks } from './json-chunks.ts';
import { OrderedCsvWriter } from './ordered-csv-writer.ts';
import { journalName, RUN_FILES, type RunRecord } from './run-directory.ts';
import type { CheckpointData, SweepProblem } from './sweep-setup.ts';

/** Journal syncs between two snapshots of the state (each snapshot starts a new journal generation). */
export const SYNCS_PER_SNAPSHOT = 12;
/** Batches in flight per worker thread (at least two in all), so no worker waits for the next task. */
export const TASKS_IN_FLIGHT_PER_THREAD = 3;
/** How far past the first unfinished batch the scheduler may run ahead, in multiples of the tasks in flight. */
export const LOOKAHEAD_FACTOR = 4;

export interface SweepProgress {
  /** Designs evaluated in this run's range so far (resumed ones included). */
  designs: number;
  total: number;
  /** Designs per second in this process. */
  rate: number;
  feasible: number;
}

export interface SweepTiming {
  wallSeconds: number;
  designsPerSecond: number;
  workers: number;
}

export interface SweepRunOptions {
  directory: string;
  problem: SweepProblem;
  record: RunRecord;
  /** The snapshot to start from (a resumed run), or null. */
  checkpoint: CheckpointData | null;
  /** A resumed run (says how much was done before it starts). */
  resumed: boolean;
  evaluator: BatchEvaluator;
  /** Worker threads behind the evaluator (0: in this thread); sets the tasks in flight. */
  threads: number;
  stop: StopSignal;
  journalSyncSeconds: number;
  /** all.csv, when the run keeps every row: its header and the text of a batch's rows. */
  allCsv: { header: string; rows: (state: SweepState, result: BatchResult) => string } | null;
  /** Writes the run's outputs from the final state (after the last snapshot). */
  writeOutputs: (state: SweepState, timing: SweepTiming, complete: boolean) => Promise<void>;
  log: (line: string) => void;
  /** Called after every round of finished batches and once at the end. */
  onProgress?: (progress: SweepProgress, final: boolean) => void;
}

export type SweepRunResult =
  | { kind: 'finished'; state: SweepState; complete: boolean; timing: SweepTiming }
  /** The loop stopped on an error (phase 'loop') or the outputs could not be written ('outputs'). */
  | { kind: 'failed'; phase: 'loop' | 'outputs'; error: unknown };

/** Runs (or resumes) a sweep to the end of its range or to the stop signal. */
export async function runSweep(options: SweepRunOptions): Promise<SweepRunResult> {
  const { directory, problem, record, checkpoint, evaluator, stop } = options;
  const range = record.range;
  const batchSize = record.batch_size;
  const batchCount = Math.ceil((range[1] - range[0]) / batchSize);
  const dimensionCount = problem.dimensions.length;

  // ---- state: fresh, or the snapshot plus its journal
  const done = new DoneSet();
  let state = new SweepState(problem.objectives, problem.constraints, record.keep, problem.seed);
  let generation = 0;
  if (checkpoint) {
    state = SweepState.restore(checkpoint.state, problem.objectives, problem.constraints, record.keep, problem.seed);
    generation = checkpoint.generation;
    done.prefix = checkpoint.done_prefix;
    for (const batch of checkpoint.done_extra) done.add(batch);
  }
  const writer = options.allCsv
    ? new OrderedCsvWriter(
        join(directory, RUN_FILES.all),
        options.allCsv.header,
        checkpoint ? checkpoint.all_bytes : 0,
        checkpoint ? checkpoint.all_pending : {},
      )
    : null;
  if (writer && checkpoint) {
    // Rows of batches below the first pending one are already in the file.
    const pendingBatches = Object.keys(checkpoint.all_pending).map(Number);
    let next = 0;
    while (done.has(next) && !pendingBatches.includes(next)) next++;
    writer.setNext(next);
  }
  const takeResult = (batch: number, result: BatchResult) => {
    state.offerBatch(result, dimensionCount);
    done.add(batch);
    if (writer && options.allCsv) writer.add(batch, options.allCsv.rows(state, result));
  };

  const journalPath = join(directory, journalName(generation));
  const replayed = replayJournal(journalPath, generation, done, takeResult, options.log);
  if (options.resumed)
    options.log(
      `resuming ${directory}: ${done.size} of ${batchCount} batches done${replayed ? ` (${replayed} from the journal)` : ''}`,
    );

  let journal: Journal = openJournal(journalPath);
  const writeCheckpoint = (complete: boolean) => {
    writer?.sync();
    const nextGeneration = generation + 1;
    const data: CheckpointData = {
      format: 'coilfront-checkpoint',
      version: 1,
      spec_hash: problem.hash,
      generation: nextGeneration,
      done_prefix: done.prefix,
      done_extra: done.extras(),
      state: state.toJSON(),
      all_bytes: writer ? writer.bytes : 0,
      all_pending: writer ? writer.pendingTexts() : {},
      complete,
    };
    const nextJournal = openJournal(join(directory, journalName(nextGeneration)));
    writeChunksAtomicSync(join(directory, RUN_FILES.checkpoint), jsonChunks(data));
    journal.close();
    rmSync(journal.path, { force: true });
    journal = nextJournal;
    generation = nextGeneration;
  };

  // ---- the loop
  const startedAt = performance.now();
  const startedDone = done.size;
  const total = range[1] - range[0];
  const progress = (final: boolean) => {
    if (!options.onProgress) return;
    const designs = Math.min(total, done.size * batchSize);
    const rate = ((done.size - startedDone) * batchSize) / Math.max(1e-3, (performance.now() - startedAt) / 1000);
    options.onProgress({ designs, total, rate, feasible: state.counts.feasible }, final);
  };
  const maxInFlight = Math.max(2, (options.threads || 1) * TASKS_IN_FLIGHT_PER_THREAD);
  const window = maxInFlight * LOOKAHEAD_FACTOR;
  const inFlight = new Map<number, Promise<void>>();
  let failure: unknown = null;
  let next = 0;
  let lastSync = performance.now();
  let syncsSinceSnapshot = 0;
  const taskOf = (batch: number): BatchTask => {
    const start = range[0] + batch * batchSize;
    return { kind: 'indices', start, count: Math.min(batchSize, range[1] - start) };
  };
  try {
    while (failure === null) {
      while (!stop.stopRequested && inFlight.size < maxInFlight && next < batchCount && next < done.prefix + window) {
        const batch = next++;
        if (done.has(batch)) continue;
        const promise = evaluator
          .evaluate(taskOf(batch))
          .then((result) => {
            takeResult(batch, result);
            journal.append(encodeBatchRecord(generation, batch, result));
          })
          .catch((error) => {
            failure ??= error;
          })
          .finally(() => inFlight.delete(batch));
        inFlight.set(batch, promise);
      }
      if (inFlight.size === 0) break;
      await Promise.race(inFlight.values());
      if (failure !== null) break;
      const now = performance.now();
      if (now - lastSync >= options.journalSyncSeconds * 1000) {
        journal.sync();
        writer?.sync();
        lastSync = now;
        if (++syncsSinceSnapshot >= SYNCS_PER_SNAPSHOT) {
          writeCheckpoint(false);
          syncsSinceSnapshot = 0;
        }
      }
      progress(false);
    }
    await Promise.allSettled(inFlight.values());
  } finally {
    await evaluator.close();
    stop.dispose();
  }
  if (failure !== null) return { kind: 'failed', phase: 'loop', error: failure };
  const complete = done.size >= batchCount;
  const wallSeconds = (performance.now() - startedAt) / 1000;
  const timing: SweepTiming = {
    wallSeconds,
    designsPerSecond: ((done.size - startedDone) * batchSize) / Math.max(wallSeconds, 1e-9),
    workers: options.threads,
  };
  try {
    writeCheckpoint(complete);
    writer?.close();
    await options.writeOutputs(state, timing, complete);
    journal.close();
  } catch (error) {
    return { kind: 'failed', phase: 'outputs', error };
  }
  progress(true);
  return { kind: 'finished', state, complete, timing };
}

/** Replays the finished batches of the journal of `generation` that the snapshot does not hold. */
function replayJournal(
  path: string,
  generation: number,
  done: DoneSet,
  take: (batch: number, result: BatchResult) => void,
  log: (line: string) => void,
): number {
  if (!existsSync(path)) return 0;
  let replayed = 0;
  const contents = readJournal(path);
  for (const payload of contents.records) {
    if (!(payload instanceof Uint8Array)) continue;
    const entry = decodeBatchRecord(payload);
    if (entry.generation !== generation || done.has(entry.batch)) continue;
    take(entry.batch, entry.result);
    replayed++;
  }
  if (contents.tornTail) log(`${path}: a torn last record was dropped (the batch is evaluated again)`);
  return replayed;
}
