/**
 * `coilfront refine RUN_DIR [--starts N] [--evaluations N]`: polishes a finished (or stopped) sweep
 * with Nelder–Mead from its best candidates and across its Pareto front, in the same worker pool
 * (after `evolve`, the front includes the evolved designs of evolved.json).
 * Writes refined.csv (ranked, the columns of candidates.csv), refined.json (exact values for
 * `show --refined`), rewrites front.csv as the sweep's front merged with the refined designs, and
 * adds hypervolume before and after and the evaluations used to summary.json. It reads the sweep's
 * own front from checkpoint.json, so running it twice gives the same files. Ctrl-C or SIGTERM stops
 * it between batches with nothing written (cli/stage-signal.ts), and prints the command that resumes it.
 */
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { type RefineOutcome, refineSweep } from '../optimize/refine-run.ts';
import type { ShouldStop } from '../optimize/stage-stop.ts';
import { packRow } from '../optimize/packed-row.ts';
import { defaultWorkerCount } from '../workers/pool.ts';
import { openEvaluator } from '../run/evaluator.ts';
import { optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { readRunRecord, RUN_FILES } from '../run/run-directory.ts';
import { loadRunSpec } from './sweep-spec.ts';
import { candidateNumbering, outputEntries } from './sweep-outputs.ts';
import { readStageDesigns, readSummarySection, readSweepState, rowOfStageDesign } from './stage-outputs.ts';
import { stageStop } from './stage-signal.ts';
import { writeRefineOutputs } from './stage-writes.ts';
import { fileError } from './input-errors.ts';
import { refineConsole } from './views/stage-console.ts';

export interface RefineCommandOptions {
  starts: number;
  evaluations: number;
  workers?: number;
  /** Polled before each pool task (the sweep's stages pass their stop request); true stops with StageStopped. */
  shouldStop?: ShouldStop;
}

export async function refineCommand(directory: string, options: RefineCommandOptions, io: CliIo): Promise<number> {
  if (!Number.isInteger(options.starts) || options.starts < 1)
    throw optionError('--starts', `expected a whole number of at least 1, got ${options.starts}`);
  if (!Number.isInteger(options.evaluations) || options.evaluations < 1)
    throw optionError('--evaluations', `expected a whole number of at least 1, got ${options.evaluations}`);
  const record = readRunRecord(directory);
  const spec = loadRunSpec(directory);
  const state = readSweepState(directory, spec, record.keep);
  if (state.pool.size === 0) throw fileError(directory, `the sweep has no candidates to refine`);

  // Before refining: the sweep's candidates.csv numbering (rank and crowding by sample index).
  const candidates = candidateNumbering(outputEntries(state, record.keep).ranked);
  // After an evolve, its improved designs join the front the starts come from (numbered after the samples).
  const evolved = readStageDesigns(directory, RUN_FILES.evolvedDesigns);
  evolved.forEach((design, k) => {
    const row = rowOfStageDesign(design);
    const objectives = state.objectiveVector(row.metrics.map((v) => v ?? Number.NaN));
    if (objectives) state.pool.offer({ index: spec.samples + k, violation: 0, objectives }, packRow(row));
  });
  const firstRefined = spec.samples + evolved.length;
  const evolveSection = evolved.length > 0 ? readSummarySection(directory, 'evolve') : null;
  const referencePoint = spec.referencePoint ?? (evolveSection?.reference_point as number[] | undefined) ?? null;
  const threads = options.workers ?? defaultWorkerCount();
  const space = new DesignSpace(spaceDefinitionOf(spec));
  const evaluator = openEvaluator(spec, threads);
  const stop = stageStop(options.shouldStop, io);
  const started = performance.now();
  let outcome: RefineOutcome;
  try {
    outcome = await refineSweep(space, state, firstRefined, evaluator, {
      starts: options.starts,
      evaluations: options.evaluations,
      referencePoint,
      batchSize: Math.max(8, record.batch_size),
      shouldStop: stop.shouldStop,
    });
  } catch (error) {
    // Nothing is written before the last evaluation, and a refine is a pure function of the run.
    const resume = `npx coilfront refine ${directory} --starts ${options.starts} --evaluations ${options.evaluations}`;
    const code = stop.stopped(error, `nothing was written to ${directory}`, resume);
    if (code === null) throw error;
    return code;
  } finally {
    stop.dispose();
    await evaluator.close();
  }
  const written = await writeRefineOutputs(directory, spec, record, outcome, {
    evolved,
    firstRefined,
    evaluationBudget: options.evaluations,
    candidates,
    started,
    threads,
  });
  const { improved, improvedStarts, summaryPath } = written;
  io.out(refineConsole(directory, spec, outcome, improved, improvedStarts, summaryPath).join('\n'));
  return 0;
}
