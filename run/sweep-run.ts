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
import type { BatchEvaluator, BatchResult } from '../optimize/evaluate-batch.ts';
import { SweepState } from '../optimize/sweep-state.ts';
import { decodeBatchRecord, encodeBatchRecord } from './batch-codec.ts';
import { scheduleBatches, tasksInFlight } from './batch-scheduler.ts';
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
export { TASKS_IN_FLIGHT_PER_THREAD } from './batch-scheduler.ts';
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

/** What a run holds while it goes: the state, the done set, the journal's generation, all.csv's writer. */
interface RunHold {
  state: SweepState;
  done: DoneSet;
  generation: number;
  writer: OrderedCsvWriter | null;
  take: (batch: number, result: BatchResult) => void;
}

/** The state of a new run, or of a resumed one: its snapshot plus the journal of its generation. */
function openRunHold(options: SweepRunOptions): RunHold {
  const { directory, problem, record, checkpoint } = options;
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
  const dimensionCount = problem.dimensions.length;
  const hold: RunHold = { state, done, generation, writer, take: () => {} };
  hold.take = (batch, result) => {
    hold.state.offerBatch(result, dimensionCount);
    done.add(batch);
    if (writer && options.allCsv) writer.add(batch, options.allCsv.rows(hold.state, result));
  };
  return hold;
}

/** The journal of the hold's generation, and the snapshot that starts the next generation. */
function journalKeeper(options: SweepRunOptions, hold: RunHold) {
  const { directory, problem } = options;
  let journal: Journal = openJournal(join(directory, journalName(hold.generation)));
  const snapshot = (complete: boolean) => {
    hold.writer?.sync();
    const nextGeneration = hold.generation + 1;
    const data: CheckpointData = {
      format: 'coilfront-checkpoint',
      version: 1,
      spec_hash: problem.hash,
      generation: nextGeneration,
      done_prefix: hold.done.prefix,
      done_extra: hold.done.extras(),
      state: hold.state.toJSON(),
      all_bytes: hold.writer ? hold.writer.bytes : 0,
      all_pending: hold.writer ? hold.writer.pendingTexts() : {},
      complete,
    };
    const nextJournal = openJournal(join(directory, journalName(nextGeneration)));
    writeChunksAtomicSync(join(directory, RUN_FILES.checkpoint), jsonChunks(data));
    journal.close();
    rmSync(journal.path, { force: true });
    journal = nextJournal;
    hold.generation = nextGeneration;
  };
  let lastSync = performance.now();
  let syncsSinceSnapshot = 0;
  /** Syncs the journal (and all.csv) when it is due, and snapshots every SYNCS_PER_SNAPSHOT syncs. */
  const syncWhenDue = () => {
    const now = performance.now();
    if (now - lastSync < options.journalSyncSeconds * 1000) return;
    journal.sync();
    hold.writer?.sync();
    lastSync = now;
    if (++syncsSinceSnapshot >= SYNCS_PER_SNAPSHOT) {
      snapshot(false);
      syncsSinceSnapshot = 0;
    }
  };
  return {
    append: (batch: number, result: BatchResult) => journal.append(encodeBatchRecord(hold.generation, batch, result)),
    syncWhenDue,
    snapshot,
    close: () => journal.close(),
  };
}

/** Runs (or resumes) a sweep to the end of its range or to the stop signal. */
export async function runSweep(options: SweepRunOptions): Promise<SweepRunResult> {
  const { directory, record, evaluator, stop } = options;
  const range = record.range;
  const batchSize = record.batch_size;
  const batchCount = Math.ceil((range[1] - range[0]) / batchSize);
  const hold = openRunHold(options);
  const { done } = hold;
  const replayed = replayJournal(join(directory, journalName(hold.generation)), hold, options.log);
  if (options.resumed)
    options.log(
      `resuming ${directory}: ${done.size} of ${batchCount} batches done${replayed ? ` (${replayed} from the journal)` : ''}`,
    );
  const journal = journalKeeper(options, hold);

  const startedAt = performance.now();
  const startedDone = done.size;
  const total = range[1] - range[0];
  const progress = (final: boolean) => {
    if (!options.onProgress) return;
    const designs = Math.min(total, done.size * batchSize);
    const rate = ((done.size - startedDone) * batchSize) / Math.max(1e-3, (performance.now() - startedAt) / 1000);
    options.onProgress({ designs, total, rate, feasible: hold.state.counts.feasible }, final);
  };
  const window = tasksInFlight(options.threads) * LOOKAHEAD_FACTOR;
  let failure: { error: unknown } | null;
  try {
    failure = await scheduleBatches({
      evaluator,
      batchCount,
      threads: options.threads,
      taskOf: (batch) => {
        const start = range[0] + batch * batchSize;
        return { kind: 'indices', start, count: Math.min(batchSize, range[1] - start) };
      },
      isDone: (batch) => done.has(batch),
      stopRequested: () => stop.stopRequested,
      startLimit: () => done.prefix + window,
      take: (batch, result) => {
        hold.take(batch, result);
        journal.append(batch, result);
      },
      afterRound: () => {
        journal.syncWhenDue();
        progress(false);
      },
    });
  } finally {
    await evaluator.close();
    stop.dispose();
  }
  if (failure !== null) return { kind: 'failed', phase: 'loop', error: failure.error };
  const complete = done.size >= batchCount;
  const wallSeconds = (performance.now() - startedAt) / 1000;
  const timing: SweepTiming = {
    wallSeconds,
    designsPerSecond: ((done.size - startedDone) * batchSize) / Math.max(wallSeconds, 1e-9),
    workers: options.threads,
  };
  try {
    journal.snapshot(complete);
    hold.writer?.close();
    await options.writeOutputs(hold.state, timing, complete);
    journal.close();
  } catch (error) {
    return { kind: 'failed', phase: 'outputs', error };
  }
  progress(true);
  return { kind: 'finished', state: hold.state, complete, timing };
}

/** Replays the finished batches of the journal of `generation` that the snapshot does not hold. */
function replayJournal(path: string, hold: RunHold, log: (line: string) => void): number {
  const { generation, done, take } = hold;
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
