/**
 * The run a `coilfront sweep` works on, from its options: a new run directory in --out (its spec
 * read and checked, its run.json written by run/sweep-setup.ts), or the run in --resume with its
 * checkpoint; and the identity its outputs carry.
 */
import { RUN_FILES, type RunRecord, runDigits } from '../run/run-directory.ts';
import { type CheckpointData, resumeSweepRun, startSweepRun } from '../run/sweep-setup.ts';
import { commandError, optionError } from './input-errors.ts';
import type { RunIdentity } from './sweep-outputs.ts';
import { loadRunSpec, loadSweepFile, type SweepSpec, stagesIdentity } from './sweep-spec.ts';

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
  /** How often the journal is forced to disk (a duration). */
  syncEvery: string;
  force?: boolean;
  overwrite?: boolean;
  quiet?: boolean;
  batchSize?: number;
  /** Significant digits of CSV numbers (a new run only; a resumed run keeps its own). */
  digits?: number;
}

export function checkSweepOptions(options: SweepOptions): void {
  if (options.workers !== undefined && (!Number.isInteger(options.workers) || options.workers < 0))
    throw optionError('--workers', `expected a whole number, got ${options.workers}`);
  if (options.keep !== undefined && (!Number.isInteger(options.keep) || options.keep < 1))
    throw optionError('--keep', `expected a whole number of at least 1, got ${options.keep}`);
}

export interface OpenedRun {
  directory: string;
  spec: SweepSpec;
  record: RunRecord;
  checkpoint: CheckpointData | null;
}

/** A new run in --out, or the run in --resume with its checkpoint. */
export function openSweepRun(specFile: string | undefined, options: SweepOptions): OpenedRun {
  if (options.resume !== undefined) {
    const directory = options.resume;
    if (options.out !== undefined && options.out !== directory)
      throw optionError('--out', 'give either --out DIR for a new run or --resume DIR, not both');
    const spec = loadRunSpec(directory);
    const given =
      specFile !== undefined ? { file: specFile, problem: loadSweepFile(specFile, { force: true }) } : undefined;
    if (given && stagesIdentity(given.problem) !== stagesIdentity(spec))
      throw optionError(
        `--resume ${directory}`,
        `refused: the stages (sweep.stages) of ${specFile} differ from those of the run's ${RUN_FILES.spec}`,
      );
    const opened = resumeSweepRun(directory, spec, {
      ...(given ? { given } : {}),
      ...(options.keep !== undefined ? { keep: options.keep } : {}),
      ...(options.digits !== undefined ? { digits: options.digits } : {}),
    });
    return { directory, spec, ...opened };
  }
  if (specFile === undefined) throw commandError('sweep', 'give a sweep file, or --resume DIR');
  if (options.out === undefined) throw optionError('--out', 'required: the directory for the results');
  const spec = loadSweepFile(specFile, { force: options.force ?? false });
  const record = startSweepRun(options.out, spec, {
    specFile,
    overwrite: options.overwrite ?? false,
    all: options.all ?? false,
    env: process.env,
    ...(options.keep !== undefined ? { keep: options.keep } : {}),
    ...(options.digits !== undefined ? { digits: options.digits } : {}),
    ...(options.batchSize !== undefined ? { batchSize: options.batchSize } : {}),
    ...(options.shard !== undefined ? { shard: options.shard } : {}),
    ...(options.shardCount !== undefined ? { shardCount: options.shardCount } : {}),
  });
  return { directory: options.out, spec, record, checkpoint: null };
}

/** What the outputs of a run record about it (candidates.csv's run, summary.json's identity). */
export function runIdentityOf(spec: SweepSpec, record: RunRecord): RunIdentity {
  return {
    specHash: spec.hash,
    seed: spec.seed,
    method: spec.method,
    samples: spec.samples,
    range: record.range,
    shard: record.shard ? { index: record.shard.index, count: record.shard.count } : null,
    keep: record.keep,
    digits: runDigits(record),
  };
}
