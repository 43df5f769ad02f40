/**
 * Setting up a sweep's run directory: a new run (its record, the saved sweep file, stale outputs
 * removed) or a resumed one (the record, the checks that the run is the same, its checkpoint), and
 * the run lock. Every refusal is one InputError line naming the directory or the option.
 */
import { existsSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { DesignSpace, type SpaceDefinition, spaceDefinitionOf } from '../optimize/design-space.ts';
import { evaluateBatchTask } from '../optimize/evaluate-batch.ts';
import type { ConstraintDefinition, ObjectiveDefinition, SweepStateData } from '../optimize/sweep-state.ts';
import { DEFAULT_DIGITS } from './csv.ts';
import { DiskError, toDiskError } from './durable/disk-error.ts';
import { acquireRunLock, type RunLock, RunLockError } from './durable/lock.ts';
import {
  prepareOutputDirectory,
  RUN_FILES,
  type RunRecord,
  readRunRecord,
  runDigits,
  writeRunRecord,
} from './run-directory.ts';
import { resolveShard, type ShardSource, shardIndices } from './shard.ts';
import { InputError, inputErrorOf, optionError, subjectError } from './input-error.ts';

/** What the run layer needs of a sweep: its space, its ranking and its identity. */
export interface SweepProblem extends SpaceDefinition {
  objectives: readonly ObjectiveDefinition[];
  constraints: readonly ConstraintDefinition[];
  /** Shard count for schedulers that give only an index, from the sweep file. */
  shardCount: number | null;
  /** The identity of the sweep file's content. */
  hash: string;
}

/** Candidates kept and ranked exactly when --keep is not given. */
export const DEFAULT_KEEP = 1000;

/** A batch should run for about this long: long enough to amortise messaging, short enough to balance. */
export const BATCH_SECONDS_TARGET = 0.05;

/** The snapshot of a sweep's state, written atomically every SYNCS_PER_SNAPSHOT journal syncs. */
export interface CheckpointData {
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

/** Measures the time per design on this thread and picks a batch that runs for about BATCH_SECONDS_TARGET. */
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
  const batchSize = Math.max(8, Math.min(1024, Math.round(BATCH_SECONDS_TARGET / Math.max(secondsPerDesign, 1e-6))));
  return { batchSize, secondsPerDesign };
}

export interface NewRunOptions {
  /** The sweep file as given, copied into the run as spec.yaml. */
  specFile: string;
  overwrite: boolean;
  keep?: number;
  all: boolean;
  digits?: number;
  batchSize?: number;
  shard?: string;
  shardCount?: number;
  env: NodeJS.ProcessEnv;
}

/** The files a new run must not inherit from an earlier run in the same directory. */
const STALE_OUTPUTS = [
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
  // A new run starts its stages (sweep.stages) from the first.
  RUN_FILES.stages,
];

/** Starts a new run in `directory`: the record (with the measured batch size), spec.yaml, no stale outputs. */
export function startSweepRun(directory: string, problem: SweepProblem, options: NewRunOptions): RunRecord {
  const shard = resolveShard({
    ...(options.shard !== undefined ? { shardFlag: options.shard } : {}),
    ...(options.shardCount !== undefined ? { countFlag: options.shardCount } : {}),
    ...(problem.shardCount !== null ? { specCount: problem.shardCount } : {}),
    env: options.env,
  });
  const range: [number, number] = shard
    ? shardIndices(shard.index, shard.count, problem.samples)
    : [0, problem.samples];
  prepareOutputDirectory(directory, options.overwrite);
  const measured = options.batchSize
    ? { batchSize: options.batchSize, secondsPerDesign: Number.NaN }
    : measureBatchSize(new DesignSpace(spaceDefinitionOf(problem)), range);
  const record: RunRecord = {
    format: 'coilfront-run',
    version: 1,
    spec_hash: problem.hash,
    seed: problem.seed,
    method: problem.method,
    samples: problem.samples,
    range,
    shard: shard ? { index: shard.index, count: shard.count, source: shard.source } : null,
    keep: options.keep ?? DEFAULT_KEEP,
    batch_size: measured.batchSize,
    all: options.all,
    digits: options.digits ?? DEFAULT_DIGITS,
    created: new Date().toISOString(),
  };
  try {
    writeFileSync(join(directory, RUN_FILES.spec), readFileSync(options.specFile));
    writeRunRecord(directory, record);
  } catch (error) {
    throw error instanceof InputError
      ? error
      : inputErrorOf(error instanceof DiskError ? error : toDiskError(error, directory, 'write'));
  }
  for (const name of STALE_OUTPUTS) rmSync(join(directory, name), { force: true });
  return record;
}

export interface ResumeOptions {
  /** The sweep file given again on the command line, with its name, to check against the run's. */
  given?: { file: string; problem: SweepProblem };
  keep?: number;
  digits?: number;
}

/** Opens a run to resume: its record and checkpoint, refusing anything that would change its results. */
export function resumeSweepRun(
  directory: string,
  problem: SweepProblem,
  options: ResumeOptions,
): { record: RunRecord; checkpoint: CheckpointData | null } {
  const record = readRunRecord(directory);
  const given = options.given;
  if (given !== undefined) {
    if (given.problem.seed !== record.seed) {
      throw optionError(
        `--resume ${directory}`,
        `refused: the run used seed ${record.seed}, ${given.file} has seed ${given.problem.seed}`,
      );
    }
    if (given.problem.hash !== record.spec_hash) {
      throw optionError(
        `--resume ${directory}`,
        `refused: ${given.file} is not the sweep file this run was started from (spec hash ${given.problem.hash.slice(0, 12)} ≠ ${record.spec_hash.slice(0, 12)})`,
      );
    }
  }
  if (problem.hash !== record.spec_hash)
    throw optionError(
      `--resume ${directory}`,
      `refused: spec.yaml was changed after the run started (spec hash differs)`,
    );
  if (options.keep !== undefined && options.keep !== record.keep)
    throw optionError('--keep', `the run was started with --keep ${record.keep}`);
  if (options.digits !== undefined && options.digits !== runDigits(record))
    throw optionError('--digits', `the run was started with --digits ${runDigits(record)}`);
  return { record, checkpoint: readCheckpoint(directory, record.spec_hash) };
}

/** The run's checkpoint, or null before the first; a damaged or foreign one is refused. */
export function readCheckpoint(directory: string, specHash: string): CheckpointData | null {
  const path = join(directory, RUN_FILES.checkpoint);
  if (!existsSync(path)) return null;
  let checkpoint: CheckpointData;
  try {
    checkpoint = JSON.parse(readFileSync(path, 'utf8')) as CheckpointData;
  } catch {
    throw subjectError(path, `damaged checkpoint; the run cannot be resumed`);
  }
  if (checkpoint.spec_hash !== specHash) throw subjectError(path, `belongs to another sweep (spec hash differs)`);
  return checkpoint;
}

/** Takes the run's lock for this process, or refuses in one line (another process holds it, or the disk fails). */
export function lockRunOrRefuse(directory: string): RunLock {
  try {
    return acquireRunLock(directory);
  } catch (error) {
    if (error instanceof RunLockError || error instanceof DiskError) throw subjectError(directory, `${error.message}`);
    throw error;
  }
}

/** The shard's source as the run record stores it. */
export function shardSourceOf(record: RunRecord): ShardSource {
  return (record.shard?.source ?? 'flag') as ShardSource;
}
