/**
 * `coilfront sweep SPEC --out DIR` (or `--resume DIR`): the overnight run. Parses and checks the
 * options, sets up or reopens the run directory (run/sweep-setup.ts), runs the engine
 * (run/sweep-run.ts) in the worker pool, and turns its outcome into files, messages and an exit code.
 */
import { removeLeftoverTemporaryFiles } from '../run/durable/atomic-write.ts';
import { installStopSignal } from '../run/durable/stop-signal.ts';
import { openEvaluator } from '../run/evaluator.ts';
import { runDigits, type RunRecord } from '../run/run-directory.ts';
import { describeShard } from '../run/shard.ts';
import { type CheckpointData, lockRunOrRefuse, shardSourceOf } from '../run/sweep-setup.ts';
import { runSweep } from '../run/sweep-run.ts';
import { toCsv } from '../run/csv.ts';
import { defaultWorkerCount } from '../workers/pool.ts';
import { parseDuration } from './duration.ts';
import type { CliIo } from './io.ts';
import { columnSet } from './sweep-columns.ts';
import { writeSweepOutputs } from './sweep-outputs.ts';
import { checkSweepOptions, openSweepRun, runIdentityOf, type SweepOptions } from './sweep-open.ts';
import type { SweepSpec } from './sweep-spec.ts';
import { formatTopCandidates, NO_FEASIBLE_EXIT_CODE } from './top-candidates.ts';
import { runStages, stagesStarted, writeStagesProgress } from './stage-runner.ts';
import { readSweepState } from './stage-outputs.ts';
import { allCsvRows } from './views/all-csv.ts';
import { progressPrinter, sweepFailedText, sweepStoppedText } from './views/sweep-lines.ts';

export type { SweepOptions } from './sweep-open.ts';

export async function sweepCommand(specFile: string | undefined, options: SweepOptions, io: CliIo): Promise<number> {
  checkSweepOptions(options);
  const journalSyncSeconds = parseDuration(options.syncEvery, { option: '--sync-every' });
  const timeLimitSeconds =
    options.timeLimit !== undefined ? parseDuration(options.timeLimit, { option: '--time-limit' }) : undefined;
  const log = (line: string) => {
    if (!options.quiet) io.err(`${line}\n`);
  };
  const { directory, spec, record, checkpoint } = openSweepRun(specFile, options);
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

/** The sweep itself: the engine in the pool, then its outcome as messages and an exit code. */
async function sweepAndReport(
  directory: string,
  spec: SweepSpec,
  record: RunRecord,
  checkpoint: CheckpointData | null,
  { options, io, log, journalSyncSeconds, timeLimitSeconds }: LoopSettings,
): Promise<{ code: number; finished: boolean }> {
  const digits = runDigits(record);
  const identity = runIdentityOf(spec, record);
  const threads = options.workers ?? defaultWorkerCount();
  const evaluator = openEvaluator(spec, threads, (task, reason) =>
    log(`a worker failed (${reason}); retrying the batch at index ${task.kind === 'indices' ? task.start : '?'}`),
  );
  const header = toCsv(columnSet(spec.dimensions).header, [], digits);
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
    allCsv: record.all ? { header, rows: allCsvRows(spec.dimensions, digits) } : null,
    writeOutputs: (state, timing, complete) => writeSweepOutputs(directory, spec, state, identity, timing, complete),
    log,
    onProgress: options.quiet ? undefined : progressPrinter(io),
  });
  if (outcome.kind === 'failed') {
    io.err(sweepFailedText(outcome, directory));
    return { code: 1, finished: false };
  }
  const { state, complete } = outcome;
  if (!complete) {
    io.err(sweepStoppedText(stop, state.counts.evaluated, record.range[1] - record.range[0], directory));
    return { code: stop.exitCode(), finished: false };
  }
  if (!options.quiet) io.out(formatTopCandidates(directory, spec, state, 5));
  else if (state.counts.feasible === 0) io.err(`coilfront: no feasible design in ${directory}; see infeasible.csv\n`);
  return { code: state.counts.feasible === 0 && !record.shard ? NO_FEASIBLE_EXIT_CODE : 0, finished: true };
}
