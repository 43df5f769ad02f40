/**
 * `coilfront sweep SPEC --out DIR`: the overnight run. Samples the design space by index, evaluates
 * batches in the worker pool with a bounded number in flight, keeps the order-independent state,
 * journals every finished batch, snapshots the state, and writes the ranked outputs.
 *
 * Durability: every finished batch is appended to journal-<g>.log (CRC-framed, fsync'd every
 * --checkpoint-every); the state is snapshotted to checkpoint.json (atomic rename) every twelve
 * journal syncs, and a new journal generation begins. `--resume DIR` loads the snapshot, replays the
 * journal of its generation (a torn last record is dropped), and evaluates only what is left; since the
 * state depends on the set of designs and not on their order, the final files are byte-identical to an
 * uninterrupted run (summary.json's timing aside).
 */
import {
  existsSync,
  readFileSync,
  rmSync,
  writeFileSync,
  openSync,
  closeSync,
  ftruncateSync,
  writeSync,
  fsyncSync,
} from 'node:fs';
import { join } from 'node:path';
import { DesignSpace, type SpaceDefinition } from '../optimize/design-space.ts';
import {
  evaluateBatchTask,
  inProcessEvaluator,
  type BatchEvaluator,
  type BatchResult,
  type BatchTask,
} from '../optimize/evaluate-batch.ts';
import { SweepState, type SweepStateData } from '../optimize/sweep-state.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { decodeBatchRecord, encodeBatchRecord } from '../run/batch-codec.ts';
import { csvRows, DEFAULT_DIGITS, toCsv } from '../run/csv.ts';
import { removeLeftoverTemporaryFiles, writeChunksAtomicSync } from '../run/durable/atomic-write.ts';
import { jsonChunks } from '../run/json-chunks.ts';
import { acquireRunLock, RunLockError, type RunLock } from '../run/durable/lock.ts';
import { DiskError, toDiskError } from '../run/durable/disk-error.ts';
import { openJournal, readJournal, type Journal } from '../run/durable/journal.ts';
import { installStopSignal, type StopSignal } from '../run/durable/stop-signal.ts';
import { parseDuration, formatDuration } from './duration.ts';
import { InputError, optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import {
  journalName,
  prepareOutputDirectory,
  readRunRecord,
  runDigits,
  RUN_FILES,
  writeRunRecord,
  type RunRecord,
} from '../run/run-directory.ts';
import { describeShard, resolveShard, shardIndices } from '../run/shard.ts';
import { candidateCells, columnSet } from './sweep-columns.ts';
import { writeSweepOutputs, type RunIdentity } from './sweep-outputs.ts';
import { loadSweepFile, sweepFromValue, type SweepSpec } from './sweep-spec.ts';
import { parseInputText } from './read-file.ts';
import { formatTopCandidates, NO_FEASIBLE_EXIT_CODE } from './top-candidates.ts';
import { must } from '../core/must.ts';

export interface SweepOptions {
  out?: string;
  resume?: string;
  workers?: number;
  /** Candidates kept and ranked exactly; default DEFAULT_KEEP, or the resumed run's own. */
  keep?: number;
  all?: boolean;
  shard?: string;
  shardCount?: number;
  timeLimit?: string;
  checkpointEvery: string;
  force?: boolean;
  overwrite?: boolean;
  quiet?: boolean;
  batchSize?: number;
  /** Significant digits of CSV numbers (a new run only; a resumed run keeps its own). */
  digits?: number;
}

/** Candidates kept and ranked exactly when --keep is not given. */
export const DEFAULT_KEEP = 1000;

interface CheckpointData {
  format: 'coilfront-checkpoint';
  version: 1;
  spec_hash: string;
  generation: number;
  /** Batches 0 … prefix−1 are done, and those listed in `extra`. */
  done_prefix: number;
  done_extra: number[];
  state: SweepStateData;
  all_bytes: number;
  all_pending: Record<string, string>;
  complete: boolean;
}

/** The space definition a worker needs. */
export function spaceDefinitionOf(spec: SweepSpec): SpaceDefinition {
  return {
    tree: spec.tree,
    dimensions: spec.dimensions,
    method: spec.method,
    samples: spec.samples,
    seed: spec.seed,
    gridLevels: spec.gridLevels,
    ...(spec.robust ? { robust: spec.robust } : {}),
  };
}

/** Loads the sweep spec saved in a run directory. */
export function loadRunSpec(directory: string): SweepSpec {
  const path = join(directory, RUN_FILES.spec);
  if (!existsSync(path)) throw new InputError(`${directory}: not a coilfront run directory (no ${RUN_FILES.spec})`);
  return sweepFromValue(parseInputText(readFileSync(path, 'utf8'), path), path, { force: true });
}

/** Measures the time per design on this thread and picks a batch that runs for about 50 ms. */
export function measureBatchSize(
  space: DesignSpace,
  range: [number, number],
): { batchSize: number; secondsPerDesign: number } {
  const probe = Math.max(1, Math.min(16, range[1] - range[0]));
  // A first pass warms the JIT compiler; the second, over the same designs, is timed.
  evaluateBatchTask(space, { kind: 'indices', start: range[0], count: Math.min(probe, 8) });
  const started = performance.now();
  evaluateBatchTask(space, { kind: 'indices', start: range[0], count: probe });
  const secondsPerDesign = (performance.now() - started) / 1000 / probe;
  const batchSize = Math.max(8, Math.min(1024, Math.round(0.05 / Math.max(secondsPerDesign, 1e-6))));
  return { batchSize, secondsPerDesign };
}

class DoneSet {
  prefix = 0;
  private readonly extra = new Set<number>();
  has(batch: number): boolean {
    return batch < this.prefix || this.extra.has(batch);
  }
  add(batch: number): void {
    this.extra.add(batch);
    while (this.extra.has(this.prefix)) {
      this.extra.delete(this.prefix);
      this.prefix++;
    }
  }
  extras(): number[] {
    return [...this.extra].sort((a, b) => a - b);
  }
  get size(): number {
    return this.prefix + this.extra.size;
  }
}

/** all.csv in index order: rows of finished batches wait until every earlier batch is written. */
class OrderedCsvWriter {
  private fd: number;
  private nextBatch = 0;
  private readonly pending = new Map<number, string>();
  bytes = 0;
  constructor(
    private readonly path: string,
    header: string | null,
    startBytes: number,
    startPending: Record<string, string>,
  ) {
    this.fd = openSync(path, existsSync(path) ? 'r+' : 'w+');
    ftruncateSync(this.fd, startBytes);
    this.bytes = startBytes;
    for (const [batch, text] of Object.entries(startPending)) this.pending.set(Number(batch), text);
    if (startBytes === 0 && header !== null) this.write(header);
    this.nextBatch = 0;
  }
  private write(text: string): void {
    const buffer = Buffer.from(text, 'utf8');
    try {
      writeSync(this.fd, buffer, 0, buffer.length, this.bytes);
    } catch (error) {
      throw toDiskError(error, this.path, 'write');
    }
    this.bytes += buffer.length;
  }
  /** Marks where writing resumes: the first batch not yet written. */
  setNext(batch: number): void {
    this.nextBatch = batch;
  }
  add(batch: number, text: string): void {
    this.pending.set(batch, text);
    this.flush();
  }
  private flush(): void {
    while (this.pending.has(this.nextBatch)) {
      this.write(must(this.pending.get(this.nextBatch)));
      this.pending.delete(this.nextBatch);
      this.nextBatch++;
    }
  }
  /** Batches done but not written yet (for the checkpoint). */
  pendingTexts(): Record<string, string> {
    return Object.fromEntries([...this.pending].map(([batch, text]) => [String(batch), text]));
  }
  sync(): void {
    try {
      fsyncSync(this.fd);
    } catch (error) {
      throw toDiskError(error, this.path, 'sync');
    }
  }
  close(): void {
    this.sync();
    closeSync(this.fd);
  }
  get writtenBatches(): number {
    return this.nextBatch;
  }
}

function positiveInteger(value: number | undefined, option: string): void {
  if (value !== undefined && (!Number.isInteger(value) || value < 0))
    throw optionError(option, `expected a whole number, got ${value}`);
}

export async function sweepCommand(specFile: string | undefined, options: SweepOptions, io: CliIo): Promise<number> {
  positiveInteger(options.workers, '--workers');
  if (options.keep !== undefined && (!Number.isInteger(options.keep) || options.keep < 1)) {
    throw optionError('--keep', `expected a whole number of at least 1, got ${options.keep}`);
  }
  const journalSyncSeconds = parseDuration(options.checkpointEvery, { option: '--checkpoint-every' });
  const timeLimitSeconds =
    options.timeLimit !== undefined ? parseDuration(options.timeLimit, { option: '--time-limit' }) : undefined;
  const log = (line: string) => {
    if (!options.quiet) io.err(`${line}\n`);
  };

  let directory: string;
  let spec: SweepSpec;
  let record: RunRecord;
  let checkpoint: CheckpointData | null = null;
  if (options.resume !== undefined) {
    directory = options.resume;
    if (options.out !== undefined && options.out !== directory)
      throw optionError('--out', 'give either --out DIR for a new run or --resume DIR, not both');
    record = readRunRecord(directory);
    spec = loadRunSpec(directory);
    if (specFile !== undefined) {
      const given = loadSweepFile(specFile, { force: true });
      if (given.seed !== record.seed) {
        throw new InputError(
          `--resume ${directory}: refused: the run used seed ${record.seed}, ${specFile} has seed ${given.seed}`,
        );
      }
      if (given.hash !== record.spec_hash) {
        throw new InputError(
          `--resume ${directory}: refused: ${specFile} is not the sweep file this run was started from (spec hash ${given.hash.slice(0, 12)} ≠ ${record.spec_hash.slice(0, 12)})`,
        );
      }
    }
    if (spec.hash !== record.spec_hash)
      throw new InputError(
        `--resume ${directory}: refused: spec.yaml was changed after the run started (spec hash differs)`,
      );
    if (options.keep !== undefined && options.keep !== record.keep)
      throw optionError('--keep', `the run was started with --keep ${record.keep}`);
    if (options.digits !== undefined && options.digits !== runDigits(record))
      throw optionError('--digits', `the run was started with --digits ${runDigits(record)}`);
    const checkpointPath = join(directory, RUN_FILES.checkpoint);
    if (existsSync(checkpointPath)) {
      try {
        checkpoint = JSON.parse(readFileSync(checkpointPath, 'utf8')) as CheckpointData;
      } catch {
        throw new InputError(`${checkpointPath}: damaged checkpoint; the run cannot be resumed`);
      }
      if (checkpoint.spec_hash !== record.spec_hash)
        throw new InputError(`${checkpointPath}: belongs to another sweep (spec hash differs)`);
    }
  } else {
    if (specFile === undefined) throw new InputError('sweep: give a sweep file, or --resume DIR');
    if (options.out === undefined) throw optionError('--out', 'required: the directory for the results');
    directory = options.out;
    spec = loadSweepFile(specFile, { force: options.force ?? false });
    const shard = resolveShard({
      ...(options.shard !== undefined ? { shardFlag: options.shard } : {}),
      ...(options.shardCount !== undefined ? { countFlag: options.shardCount } : {}),
      ...(spec.shardCount !== null ? { specCount: spec.shardCount } : {}),
      env: process.env,
    });
    const range: [number, number] = shard ? shardIndices(shard.index, shard.count, spec.samples) : [0, spec.samples];
    prepareOutputDirectory(directory, options.overwrite ?? false);
    const space = new DesignSpace(spaceDefinitionOf(spec));
    const measured = options.batchSize
      ? { batchSize: options.batchSize, secondsPerDesign: NaN }
      : measureBatchSize(space, range);
    record = {
      format: 'coilfront-run',
      version: 1,
      spec_hash: spec.hash,
      seed: spec.seed,
      method: spec.method,
      samples: spec.samples,
      range,
      shard: shard ? { index: shard.index, count: shard.count, source: shard.source } : null,
      keep: options.keep ?? DEFAULT_KEEP,
      batch_size: measured.batchSize,
      all: options.all ?? false,
      digits: options.digits ?? DEFAULT_DIGITS,
      created: new Date().toISOString(),
    };
    try {
      writeFileSync(join(directory, RUN_FILES.spec), readFileSync(specFile));
      writeRunRecord(directory, record);
    } catch (error) {
      throw error instanceof InputError
        ? error
        : new InputError((error instanceof DiskError ? error : toDiskError(error, directory, 'write')).message);
    }
    for (const name of [
      RUN_FILES.checkpoint,
      RUN_FILES.candidates,
      RUN_FILES.infeasible,
      RUN_FILES.front,
      RUN_FILES.plot,
      RUN_FILES.summary,
      RUN_FILES.all,
      // A later stage must not start from an earlier sweep's evolved designs.
      RUN_FILES.evolved,
      RUN_FILES.evolvedDesigns,
      RUN_FILES.evolveJournal,
    ])
      rmSync(join(directory, name), { force: true });
  }

  let lock: RunLock;
  try {
    lock = acquireRunLock(directory);
  } catch (error) {
    if (error instanceof RunLockError || error instanceof DiskError)
      throw new InputError(`${directory}: ${error.message}`);
    throw error;
  }
  if (options.resume !== undefined) {
    for (const leftover of removeLeftoverTemporaryFiles(directory))
      log(`removed ${leftover}, left by a write that a crash cut off`);
  }
  if (record.shard)
    log(
      `${describeShard({ index: record.shard.index, count: record.shard.count, source: record.shard.source as 'flag' | 'slurm' | 'kubernetes' })}: sample indices ${record.range[0]} to ${record.range[1] - 1}`,
    );
  const runLoop = async (): Promise<number> => {
    const range = record.range;
    const batchSize = record.batch_size;
    const batchCount = Math.ceil((range[1] - range[0]) / batchSize);
    const identity: RunIdentity = {
      specHash: spec.hash,
      seed: spec.seed,
      method: spec.method,
      samples: spec.samples,
      range,
      shard: record.shard ? { index: record.shard.index, count: record.shard.count } : null,
      keep: record.keep,
      digits: runDigits(record),
    };
    const dimensionCount = spec.dimensions.length;
    const columns = columnSet(spec.dimensions);

    // ---- state: fresh, or the snapshot plus its journal
    const done = new DoneSet();
    let state = new SweepState(spec.objectives, spec.constraints, record.keep, spec.seed);
    let generation = 0;
    if (checkpoint) {
      state = SweepState.restore(checkpoint.state, spec.objectives, spec.constraints, record.keep, spec.seed);
      generation = checkpoint.generation;
      done.prefix = checkpoint.done_prefix;
      for (const batch of checkpoint.done_extra) done.add(batch);
    }
    const allPath = join(directory, RUN_FILES.all);
    const writer = record.all
      ? new OrderedCsvWriter(
          allPath,
          toCsv(columns.header, [], runDigits(record)),
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
    const allRowsText = (result: BatchResult): string => {
      const rows = [];
      for (let row = 0; row < result.count; row++) {
        const index = result.start + row;
        const { violation, reason } = state.classifyRow(result, row);
        rows.push(
          candidateCells(
            spec.dimensions,
            { rank: index + 1, paretoRank: null, crowding: null, feasible: violation === 0, violation, index },
            state.rowOf(result, row, dimensionCount, reason),
          ),
        );
      }
      return csvRows(rows, runDigits(record));
    };
    const takeResult = (batch: number, result: BatchResult) => {
      state.offerBatch(result, dimensionCount);
      done.add(batch);
      writer?.add(batch, allRowsText(result));
    };

    let replayed = 0;
    const journalPath = join(directory, journalName(generation));
    if (existsSync(journalPath)) {
      const contents = readJournal(journalPath);
      for (const payload of contents.records) {
        if (!(payload instanceof Uint8Array)) continue;
        const entry = decodeBatchRecord(payload);
        if (entry.generation !== generation || done.has(entry.batch)) continue;
        takeResult(entry.batch, entry.result);
        replayed++;
      }
      if (contents.tornTail) log(`${journalPath}: a torn last record was dropped (the batch is evaluated again)`);
    }
    if (options.resume !== undefined) {
      log(
        `resuming ${directory}: ${done.size} of ${batchCount} batches done${replayed ? ` (${replayed} from the journal)` : ''}`,
      );
    }

    let journal: Journal = openJournal(journalPath);
    const writeCheckpoint = (complete: boolean) => {
      writer?.sync();
      const nextGeneration = generation + 1;
      const data: CheckpointData = {
        format: 'coilfront-checkpoint',
        version: 1,
        spec_hash: spec.hash,
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
    const threads = options.workers ?? defaultWorkerCount();
    const evaluator: BatchEvaluator =
      threads === 0
        ? inProcessEvaluator(new DesignSpace(spaceDefinitionOf(spec)))
        : createWorkerPool(spaceDefinitionOf(spec), {
            threads,
            onRetry: (task, reason) =>
              log(
                `a worker failed (${reason}); retrying the batch at index ${task.kind === 'indices' ? task.start : '?'}`,
              ),
          });
    const stop: StopSignal = installStopSignal({
      ...(timeLimitSeconds !== undefined ? { timeLimitSeconds } : {}),
      log,
    });
    const maxInFlight = Math.max(2, (threads || 1) * 3);
    const window = maxInFlight * 4;
    const inFlight = new Map<number, Promise<void>>();
    let failure: unknown = null;
    let next = 0;
    let lastSync = performance.now();
    let syncsSinceSnapshot = 0;
    let lastProgress = performance.now();
    const taskOf = (batch: number): BatchTask => {
      const start = range[0] + batch * batchSize;
      return { kind: 'indices', start, count: Math.min(batchSize, range[1] - start) };
    };
    const progress = (final = false) => {
      if (options.quiet) return;
      const now = performance.now();
      const interval = io.isTty ? 500 : 10_000;
      if (!final && now - lastProgress < interval) return;
      lastProgress = now;
      const designs = Math.min(range[1] - range[0], done.size * batchSize);
      const total = range[1] - range[0];
      const rate = ((done.size - startedDone) * batchSize) / Math.max(1e-3, (now - startedAt) / 1000);
      const eta = rate > 0 ? formatDuration(Math.max(0, (total - designs) / rate)) : '?';
      const text = `swept ${designs}/${total} designs (${((100 * designs) / Math.max(1, total)).toFixed(1)}%), ${rate.toFixed(0)} designs/s, ${state.counts.feasible} feasible, ETA ${eta}`;
      if (io.isTty) io.err(`\r${text}${final ? '\n' : ''}`);
      else io.err(`${text}\n`);
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
        if (now - lastSync >= journalSyncSeconds * 1000) {
          journal.sync();
          writer?.sync();
          lastSync = now;
          if (++syncsSinceSnapshot >= 12) {
            writeCheckpoint(false);
            syncsSinceSnapshot = 0;
          }
        }
        progress();
      }
      await Promise.allSettled(inFlight.values());
    } finally {
      await evaluator.close();
      stop.dispose();
    }
    if (failure !== null) {
      const message =
        failure instanceof DiskError ? failure.message : failure instanceof Error ? failure.message : String(failure);
      io.err(
        `coilfront: the sweep stopped: ${message}\n  the last good checkpoint in ${directory} can be resumed with: npx coilfront sweep --resume ${directory}\n`,
      );
      return 1;
    }
    const complete = done.size >= batchCount;
    const wallSeconds = (performance.now() - startedAt) / 1000;
    const timing = {
      wallSeconds,
      designsPerSecond: ((done.size - startedDone) * batchSize) / Math.max(wallSeconds, 1e-9),
      workers: threads,
    };
    try {
      writeCheckpoint(complete);
      writer?.close();
      await writeSweepOutputs(directory, spec, state, identity, timing, complete);
      journal.close();
    } catch (error) {
      const diskError = error instanceof DiskError ? error : toDiskError(error, directory, 'write');
      io.err(
        `coilfront: ${diskError.message}\n  the last good checkpoint in ${directory} can be resumed with: npx coilfront sweep --resume ${directory}\n`,
      );
      return 1;
    }
    progress(true);
    if (!complete) {
      const why =
        stop.reason === 'time-limit' ? 'the time limit was reached' : `${stop.signal ?? 'a signal'} was received`;
      io.err(
        `stopped: ${why} after ${state.counts.evaluated} of ${range[1] - range[0]} designs; outputs so far are in ${directory}\n  resume with: npx coilfront sweep --resume ${directory}\n`,
      );
      return stop.exitCode();
    }
    if (!options.quiet) io.out(formatTopCandidates(directory, spec, state, 5));
    else if (state.counts.feasible === 0) io.err(`coilfront: no feasible design in ${directory}; see infeasible.csv\n`);
    return state.counts.feasible === 0 && !record.shard ? NO_FEASIBLE_EXIT_CODE : 0;
  };
  try {
    return await runLoop();
  } finally {
    lock.release();
  }
}
