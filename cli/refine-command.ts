/**
 * `coilfront refine RUN_DIR [--starts N] [--evaluations N]`: polishes a finished (or stopped) sweep
 * with Nelder–Mead from its best candidates and across its Pareto front, in the same worker pool
 * (after `evolve`, the front includes the evolved designs of evolved.json).
 * Writes refined.csv (ranked, the columns of candidates.csv), refined.json (exact values for
 * `show --refined`), rewrites front.csv as the sweep's front merged with the refined designs, and
 * adds hypervolume before and after and the evaluations used to summary.json. It reads the sweep's
 * own front from checkpoint.json, so running it twice gives the same files.
 */
import { join } from 'node:path';
import { inProcessEvaluator, type BatchEvaluator } from '../optimize/evaluate-batch.ts';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { type RefineOutcome, refineSweep } from '../optimize/refine-run.ts';
import type { ShouldStop } from '../optimize/stage-stop.ts';
import { type PackedRow, packRow } from '../optimize/packed-row.ts';
import type { RankedEntry } from '../optimize/pareto/candidate-pool.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { toCsv } from '../run/csv.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { readRunRecord, RUN_FILES, runDigits } from '../run/run-directory.ts';
import { columnSet } from './sweep-columns.ts';
import { loadRunSpec } from './sweep-spec.ts';
import { candidateNumbering, outputEntries, rankedRows, sortedFront } from './sweep-outputs.ts';
import { SAFETY_CAUTIONS } from './safety.ts';
import {
  designLines,
  hypervolumeLines,
  improvedDesigns,
  readStageDesigns,
  readSummarySection,
  readSweepState,
  rowOfStageDesign,
  writeMergedFront,
  writeStageDesigns,
  writeSummarySection,
} from './stage-outputs.ts';
import { fileError } from './input-errors.ts';

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
  const evaluator: BatchEvaluator =
    threads === 0 ? inProcessEvaluator(space) : createWorkerPool(spaceDefinitionOf(spec), { threads });
  const started = performance.now();
  let outcome: RefineOutcome;
  try {
    outcome = await refineSweep(space, state, firstRefined, evaluator, {
      starts: options.starts,
      evaluations: options.evaluations,
      referencePoint,
      batchSize: Math.max(8, record.batch_size),
      ...(options.shouldStop ? { shouldStop: options.shouldStop } : {}),
    });
  } finally {
    await evaluator.close();
  }
  const columns = columnSet(spec.dimensions);
  const indexColumn = columns.header.indexOf('sample_index');
  // Every feasible trial point, ranked, goes to refine-trials.csv; refined.csv holds only the
  // improved designs: the refined ones on the merged front, one per distinct objective vector.
  const trials = outcome.refined.ranked(record.keep);
  const trialRows = rankedRows(spec.dimensions, trials);
  for (const row of trialRows) row[indexColumn] = null;
  writeFileAtomicSync(join(directory, RUN_FILES.refineTrials), toCsv(columns.header, trialRows));
  const front = sortedFront(outcome.merged);
  const improved = improvedDesigns(front, firstRefined);
  const digits = runDigits(record);
  writeStageDesigns(directory, spec, improved, 'r', { csv: RUN_FILES.refined, json: RUN_FILES.refinedDesigns, digits });
  // A refined design is known by its id in refined.csv (`show RUN r3`), an evolved one by its e-id.
  const ids = new Map<number, string>([
    ...evolved.flatMap((design, k): [number, string][] => (design.id ? [[spec.samples + k, design.id]] : [])),
    ...improved.map((entry, i): [number, string] => [entry.item.index, `r${i + 1}`]),
  ]);
  const stageOf = (index: number) => (index < firstRefined ? 'evolved' : 'refined');
  await writeMergedFront(directory, spec, front, { candidates, ids, stageOf, digits }, improved);
  const improvedStarts = outcome.startResults.filter((r) => r.improved).length;
  const summaryPath = writeSummarySection(directory, 'refine', {
    starts: outcome.startResults.length,
    improved_starts: improvedStarts,
    improved_designs: improved.length,
    evaluations: outcome.evaluations,
    evaluation_budget: options.evaluations,
    refined_feasible: outcome.refined.feasibleSize,
    front_size: front.length,
    hypervolume_before: outcome.hypervolumeBefore,
    hypervolume_after: outcome.hypervolumeAfter,
    reference_point: outcome.referencePoint,
    timing: { wall_seconds: (performance.now() - started) / 1000, workers: threads },
  });
  io.out(refineConsole(directory, spec, outcome, improved, improvedStarts, summaryPath).join('\n'));
  return 0;
}

/** What refine prints: the improved designs with units, the hypervolume explained, the files. */
function refineConsole(
  directory: string,
  spec: ReturnType<typeof loadRunSpec>,
  outcome: RefineOutcome,
  improved: readonly RankedEntry<PackedRow>[],
  improvedStarts: number,
  summaryPath: string,
): string[] {
  const lines = [
    `refined ${outcome.startResults.length} starts with ${outcome.evaluations} evaluations; ${improvedStarts} starts improved on their design`,
  ];
  if (outcome.refined.feasibleSize === 0) {
    lines.push(
      'no refined design met every constraint: the front is unchanged (see the sweep for what rejects designs)',
    );
  } else if (improved.length === 0) {
    lines.push('no refined design extends the front: the sweep front is already as good near every start');
  } else {
    lines.push(`${improved.length} refined designs extend the front (in refined.csv, shown by their id):`);
    lines.push(...designLines(spec, improved, 'r', RUN_FILES.refined));
  }
  lines.push(...hypervolumeLines(spec, outcome.hypervolumeBefore, outcome.hypervolumeAfter, outcome.referencePoint));
  lines.push(
    `files: ${join(directory, RUN_FILES.refined)} (improved designs), ${join(directory, RUN_FILES.refineTrials)} (every feasible trial), ${join(directory, RUN_FILES.front)} (updated), ${summaryPath} (refine section)`,
  );
  if (improved.length > 0) lines.push(`a refined design: npx coilfront show ${directory} r1`);
  lines.push('', 'SAFETY', ...SAFETY_CAUTIONS, '');
  return lines;
}
