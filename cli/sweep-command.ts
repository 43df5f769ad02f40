/**
 * `coilfront sweep SPEC --out DIR` (or `--resume DIR`): the overnight run. Parses and checks the
 * options, sets up or reopens the run directory (run/sweep-setup.ts), runs the engine
 * (run/sweep-run.ts) in the worker pool, and turns its outcome into files, messages and an exit code.
 */
import { spaceDefinitionOf, DesignSpace } from '../optimize/design-space.ts';
import { inProcessEvaluator, type BatchEvaluator, type BatchResult } from '../optimize/evaluate-batch.ts';
import type { SweepState } from '../optimize/sweep-state.ts';
import { csvRows, toCsv } from '../run/csv.ts';
import { removeLeftoverTemporaryFiles } from '../run/durable/atomic-write.ts';
import { DiskError, toDiskError } from '../run/durable/disk-error.ts';
import { installStopSignal } from '../run/durable/stop-signal.ts';
import { RUN_FILES, runDigits, type RunRecord } from '../run/run-directory.ts';
import { describeShard } from '../run/shard.ts';
import {
  type CheckpointData,
  lockRunOrRefuse,
  resumeSweepRun,
  shardSourceOf,
  startSweepRun,
} from '../run/sweep-setup.ts';
import { runSweep, type SweepProgress } from '../run/sweep-run.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { formatDuration, parseDuration } from './duration.ts';
import type { CliIo } from './io.ts';
import { candidateCells, columnSet } from './sweep-columns.ts';
import { writeSweepOutputs, type RunIdentity } from './sweep-outputs.ts';
import { loadRunSpec, loadSweepFile, type SweepSpec } from './sweep-spec.ts';
import { formatTopCandidates, NO_FEASIBLE_EXIT_CODE } from './top-candidates.ts';
import { runStages, stagesStarted, writeStagesProgress } from './stage-runner.ts';
import { readSweepState } from './stage-outputs.ts';
import { stagesIdentity } from './sweep-spec.ts';
import { commandError, optionError } from './input-errors.ts';

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

function checkOptions(options: SweepOptions): void {
  if (options.workers !== undefined && (!Number.isInteger(options.workers) || options.workers < 0))
    throw optionError('--workers', `expected a whole number, got ${options.workers}`);
  if (options.keep !== undefined && (!Number.isInteger(options.keep) || options.keep < 1))
    throw optionError('--keep', `expected a whole number of at least 1, got ${options.keep}`);
}

interface OpenedRun {
  directory: string;
  spec: SweepSpec;
  record: RunRecord;
  checkpoint: CheckpointData | null;
}

/** A new run in --out, or the run in --resume with its checkpoint. */
function openRun(specFile: string | undefined, options: SweepOptions): OpenedRun {
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

export async function sweepCommand(specFile: string | undefined, options: SweepOptions, io: CliIo): Promise<number> {
  checkOptions(options);
  const journalSyncSeconds = parseDuration(options.syncEvery, { option: '--sync-every' });
  const timeLimitSeconds =
    options.timeLimit !== undefined ? parseDuration(options.timeLimit, { option: '--time-limit' }) : undefined;
  const log = (line: string) => {
    if (!options.quiet) io.err(`${line}\n`);
  };
  const { directory, spec, record, checkpoint } = openRun(specFile, options);
  const stages = record.shard ? [] : (spec.stages ?? []);
  if (record.shard && (spec.stages ?? []).length > 0)
    log(`a shard runs no stages: run them on the merged directory (npx coilfront evolve, refine)`);
  const lock = lockRunOrRefuse(directory);
  let code: number;
  try {
    if (options.resume !== undefined)
      for (const leftover of removeLeftoverTemporaryFiles(directory))
        log(`removed ${leftover}, left by a write that a crash cut off`);
    if (record.shard)
      log(
        `${describeShard({ ...record.shard, source: shardSourceOf(record) })}: sample indices ${record.range[0]} to ${record.range[1] - 1}`,
      );
    // A run whose stages have begun has its sweep finished and written: it goes on with the stages.
    if (options.resume !== undefined && stages.length > 0 && stagesStarted(directory)) {
      log(`the sweep of ${directory} is finished; continuing with its stages`);
      code = readSweepState(directory, spec, record.keep).counts.feasible === 0 ? NO_FEASIBLE_EXIT_CODE : 0;
    } else {
      const swept = await sweepAndReport(directory, spec, record, checkpoint, {
        options,
        io,
        log,
        journalSyncSeconds,
        timeLimitSeconds,
      });
      if (!swept.finished || stages.length === 0) return swept.code;
      code = swept.code;
      // The sweep's outputs are written: from here a resume continues with the stages.
      writeStagesProgress(directory, []);
    }
  } finally {
    lock.release();
  }
  // Each stage takes the run's lock itself, as its command does.
  const stageIo: CliIo = options.quiet ? { ...io, err: () => {} } : io;
  const stageCode = await runStages(directory, stages, options.workers, stageIo, log, io.err);
  return stageCode !== 0 ? stageCode : code;
}

interface LoopSettings {
  options: SweepOptions;
  io: CliIo;
  log: (line: string) => void;
  journalSyncSeconds: number;
  timeLimitSeconds: number | undefined;
}

async function sweepAndReport(
  directory: string,
  spec: SweepSpec,
  record: RunRecord,
  checkpoint: CheckpointData | null,
  { options, io, log, journalSyncSeconds, timeLimitSeconds }: LoopSettings,
): Promise<{ code: number; finished: boolean }> {
  const digits = runDigits(record);
  const columns = columnSet(spec.dimensions);
  const identity: RunIdentity = {
    specHash: spec.hash,
    seed: spec.seed,
    method: spec.method,
    samples: spec.samples,
    range: record.range,
    shard: record.shard ? { index: record.shard.index, count: record.shard.count } : null,
    keep: record.keep,
    digits,
  };
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
  const allRows = (state: SweepState, result: BatchResult): string => {
    const rows = [];
    for (let row = 0; row < result.count; row++) {
      const index = result.start + row;
      const { violation, reason } = state.classifyRow(result, row);
      rows.push(
        candidateCells(
          spec.dimensions,
          { rank: index + 1, paretoRank: null, crowding: null, feasible: violation === 0, violation, index },
          state.rowOf(result, row, spec.dimensions.length, reason),
        ),
      );
    }
    return csvRows(rows, digits);
  };
  const stop = installStopSignal({ ...(timeLimitSeconds !== undefined ? { timeLimitSeconds } : {}), log });
  const outcome = await runSweep({
    directory,
    problem: spec,
    record,
    checkpoint,
    resumed: options.resume !== undefined,
    evaluator,
    threads,
    stop,
    journalSyncSeconds,
    allCsv: record.all ? { header: toCsv(columns.header, [], digits), rows: allRows } : null,
    writeOutputs: (state, timing, complete) => writeSweepOutputs(directory, spec, state, identity, timing, complete),
    log,
    onProgress: options.quiet ? undefined : progressPrinter(io),
  });
  const resumeHint = `the last good checkpoint in ${directory} can be resumed with: npx coilfront sweep --resume ${directory}`;
  if (outcome.kind === 'failed') {
    const { error } = outcome;
    if (outcome.phase === 'loop') {
      const message = error instanceof Error ? error.message : String(error);
      io.err(`coilfront: the sweep stopped: ${message}\n  ${resumeHint}\n`);
    } else {
      const diskError = error instanceof DiskError ? error : toDiskError(error, directory, 'write');
      io.err(`coilfront: ${diskError.message}\n  ${resumeHint}\n`);
    }
    return { code: 1, finished: false };
  }
  const { state, complete } = outcome;
  if (!complete) {
    const why =
      stop.reason === 'time-limit' ? 'the time limit was reached' : `${stop.signal ?? 'a signal'} was received`;
    io.err(
      `stopped: ${why} after ${state.counts.evaluated} of ${record.range[1] - record.range[0]} designs; outputs so far are in ${directory}\n  resume with: npx coilfront sweep --resume ${directory}\n`,
    );
    return { code: stop.exitCode(), finished: false };
  }
  if (!options.quiet) io.out(formatTopCandidates(directory, spec, state, 5));
  else if (state.counts.feasible === 0) io.err(`coilfront: no feasible design in ${directory}; see infeasible.csv\n`);
  return { code: state.counts.feasible === 0 && !record.shard ? NO_FEASIBLE_EXIT_CODE : 0, finished: true };
}

/** The progress line: refreshed in place on a terminal, one line every ten seconds in a log. */
function progressPrinter(io: CliIo): (progress: SweepProgress, final: boolean) => void {
  let last = performance.now();
  return ({ designs, total, rate, feasible }, final) => {
    const now = performance.now();
    if (!final && now - last < (io.isTty ? 500 : 10_000)) return;
    last = now;
    const eta = rate > 0 ? formatDuration(Math.max(0, (total - designs) / rate)) : '?';
    const text = `swept ${designs}/${total} designs (${((100 * designs) / Math.max(1, total)).toFixed(1)}%), ${rate.toFixed(0)} designs/s, ${feasible} feasible, ETA ${eta}`;
    if (io.isTty) io.err(`\r${text}${final ? '\n' : ''}`);
    else io.err(`${text}\n`);
  };
}
