/**
 * `coilfront refine RUN_DIR [--starts N] [--evaluations N]`: polishes a finished (or stopped) sweep
 * with Nelder–Mead from its best candidates and across its Pareto front, in the same worker pool.
 * Writes refined.csv (ranked, the columns of candidates.csv), refined.json (exact values for
 * `show --refined`), rewrites front.csv as the sweep's front merged with the refined designs, and
 * adds hypervolume before and after and the evaluations used to summary.json. It reads the sweep's
 * own front from checkpoint.json, so running it twice gives the same files.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { inProcessEvaluator, type BatchEvaluator } from '../optimize/evaluate-batch.ts';
import { DesignSpace } from '../optimize/design-space.ts';
import { type RefineOutcome, refineSweep } from '../optimize/refine-run.ts';
import { type PackedRow, unpackRow } from '../optimize/packed-row.ts';
import type { RankedEntry } from '../optimize/pareto/candidate-pool.ts';
import { metricIndex } from '../core/metrics.ts';
import { SweepState } from '../optimize/sweep-state.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { toCsv } from './csv.ts';
import { writeFileAtomicSync } from './durable/atomic-write.ts';
import { InputError, optionError } from './input-error.ts';
import type { CliIo } from './io.ts';
import { readRunRecord, RUN_FILES } from './run-directory.ts';
import { columnSet } from './sweep-columns.ts';
import { loadRunSpec, spaceDefinitionOf } from './sweep-command.ts';
import { candidateNumbering, outputEntries, rankedRows, sortedFront } from './sweep-outputs.ts';
import { SAFETY_CAUTIONS } from './safety.ts';
import { formatNumber } from './display-units.ts';
import { frontPlotSvg } from './plots.ts';
import { metricText } from './top-candidates.ts';

export interface RefineCommandOptions {
  starts: number;
  evaluations: number;
  workers?: number;
}

export async function refineCommand(directory: string, options: RefineCommandOptions, io: CliIo): Promise<number> {
  if (!Number.isInteger(options.starts) || options.starts < 1)
    throw optionError('--starts', `expected a whole number of at least 1, got ${options.starts}`);
  if (!Number.isInteger(options.evaluations) || options.evaluations < 1)
    throw optionError('--evaluations', `expected a whole number of at least 1, got ${options.evaluations}`);
  const record = readRunRecord(directory);
  const spec = loadRunSpec(directory);
  const checkpointPath = join(directory, RUN_FILES.checkpoint);
  if (!existsSync(checkpointPath))
    throw new InputError(`${directory}: no checkpoint yet; let the sweep run (or resume it) first`);
  const checkpoint = JSON.parse(readFileSync(checkpointPath, 'utf8')) as {
    state: Parameters<typeof SweepState.restore>[0];
  };
  const state = SweepState.restore(checkpoint.state, spec.objectives, spec.constraints, record.keep, spec.seed);
  if (state.pool.size === 0) throw new InputError(`${directory}: the sweep has no candidates to refine`);

  // Before refining: the sweep's candidates.csv numbering (rank and crowding by sample index).
  const candidates = candidateNumbering(outputEntries(state, record.keep).ranked);
  const threads = options.workers ?? defaultWorkerCount();
  const space = new DesignSpace(spaceDefinitionOf(spec));
  const evaluator: BatchEvaluator =
    threads === 0 ? inProcessEvaluator(space) : createWorkerPool(spaceDefinitionOf(spec), { threads });
  const started = performance.now();
  let outcome;
  try {
    outcome = await refineSweep(space, state, spec.samples, evaluator, {
      starts: options.starts,
      evaluations: options.evaluations,
      referencePoint: spec.referencePoint,
      batchSize: Math.max(8, record.batch_size),
    });
  } finally {
    await evaluator.close();
  }
  const columns = columnSet(spec.dimensions);
  const indexColumn = columns.header.indexOf('sample_index');
  const rankColumn = columns.header.indexOf('rank');
  // Every feasible trial point, ranked, goes to refine-trials.csv; refined.csv holds only the
  // improved designs: the refined ones on the merged front, one per distinct objective vector.
  const trials = outcome.refined.ranked(record.keep);
  const trialRows = rankedRows(spec.dimensions, trials);
  for (const row of trialRows) row[indexColumn] = null;
  writeFileAtomicSync(join(directory, RUN_FILES.refineTrials), toCsv(columns.header, trialRows));
  const improved = improvedDesigns(sortedFront(outcome.merged), spec.samples);
  const rows = rankedRows(spec.dimensions, improved);
  for (const row of rows) row[indexColumn] = null;
  writeFileAtomicSync(join(directory, RUN_FILES.refined), toCsv(columns.header, rows));
  writeFileAtomicSync(
    join(directory, RUN_FILES.refinedDesigns),
    `${JSON.stringify(
      improved.map((entry, i) => ({ rank: i + 1, id: `r${i + 1}`, values: unpackRow(entry.payload).values })),
      null,
      1,
    )}\n`,
  );
  const refinedId = new Map(improved.map((entry, i) => [entry.item.index, `r${i + 1}`]));
  const front = sortedFront(outcome.merged);
  const frontRows = rankedRows(spec.dimensions, front, candidates);
  front.forEach((entry, i) => {
    const row = frontRows[i];
    if (!row || entry.item.index < spec.samples) return;
    // A refined design is known by its id in refined.csv (`show RUN r3`); it has no sample index.
    row[indexColumn] = null;
    row[rankColumn] = refinedId.get(entry.item.index) ?? null;
  });
  writeFileAtomicSync(join(directory, RUN_FILES.front), toCsv(columns.header, frontRows));
  writeFileAtomicSync(
    join(directory, 'front.svg'),
    await frontPlotSvg(
      spec.objectives,
      improved.map((entry) => unpackRow(entry.payload)),
      front.map((entry) => unpackRow(entry.payload)),
    ),
  );
  const summaryPath = join(directory, RUN_FILES.summary);
  const summary = existsSync(summaryPath)
    ? (JSON.parse(readFileSync(summaryPath, 'utf8')) as Record<string, unknown>)
    : {};
  const improvedStarts = outcome.startResults.filter((r) => r.improved).length;
  summary.refine = {
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
  };
  writeFileAtomicSync(summaryPath, `${JSON.stringify(summary, null, 2)}\n`);
  io.out(refineConsole(directory, spec, outcome, improved, improvedStarts, summaryPath).join('\n'));
  return 0;
}

/** Designs closer than this fraction of the front's extent in every objective count as one. */
const DISTINCT_FRACTION = 0.01;

/**
 * The refined designs on the merged front, distinct: in front order, a design is kept unless a kept
 * one lies within DISTINCT_FRACTION of the front's extent in every objective (Nelder–Mead trials
 * near a converged point would otherwise repeat one design many times).
 */
function improvedDesigns(front: readonly RankedEntry<PackedRow>[], samples: number): RankedEntry<PackedRow>[] {
  const objectiveCount = front[0]?.item.objectives.length ?? 0;
  const extent = Array.from({ length: objectiveCount }, (_, j) => {
    const values = front.map((entry) => entry.item.objectives[j] ?? 0);
    return Math.max(...values) - Math.min(...values) || 1;
  });
  const kept: RankedEntry<PackedRow>[] = [];
  for (const entry of front) {
    if (entry.item.index < samples) continue;
    const near = kept.some((other) =>
      extent.every(
        (range, j) =>
          Math.abs((entry.item.objectives[j] ?? 0) - (other.item.objectives[j] ?? 0)) <= DISTINCT_FRACTION * range,
      ),
    );
    if (!near) kept.push(entry);
  }
  return kept;
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
    improved.slice(0, 10).forEach((entry, i) => {
      const row = unpackRow(entry.payload);
      const values = spec.objectives.map(
        (o) => `${o.metric} ${metricText(o.metric, row.metrics[metricIndex(o.metric)])}`,
      );
      lines.push(`  r${i + 1}  ${values.join(', ')}`);
    });
    if (improved.length > 10) lines.push(`  … and ${improved.length - 10} more in refined.csv`);
  }
  const before = outcome.hypervolumeBefore;
  const after = outcome.hypervolumeAfter;
  if (before !== null && after !== null && outcome.referencePoint) {
    const gain =
      before > 0 ? ` (${after >= before ? '+' : ''}${formatNumber((100 * (after - before)) / before, 3)} %)` : '';
    const reference = spec.objectives
      .map((o, j) => {
        const value = (outcome.referencePoint?.[j] ?? Number.NaN) * (o.sense === 'maximize' ? -1 : 1);
        return `${o.metric} ${metricText(o.metric, value)}`;
      })
      .join(', ');
    lines.push(
      `hypervolume of the front ${formatNumber(before, 6)} → ${formatNumber(after, 6)}${gain}: the objective space the front dominates up to the reference point (${reference}), in SI units multiplied`,
    );
  }
  lines.push(
    `files: ${join(directory, RUN_FILES.refined)} (improved designs), ${join(directory, RUN_FILES.refineTrials)} (every feasible trial), ${join(directory, RUN_FILES.front)} (updated), ${summaryPath} (refine section)`,
  );
  if (improved.length > 0) lines.push(`a refined design: npx coilfront show ${directory} r1`);
  lines.push('', 'SAFETY', ...SAFETY_CAUTIONS, '');
  return lines;
}
