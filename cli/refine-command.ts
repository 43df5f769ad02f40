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
import { refineSweep } from '../optimize/refine-run.ts';
import { unpackRow } from '../optimize/packed-row.ts';
import { SweepState } from '../optimize/sweep-state.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { toCsv } from './csv.ts';
import { writeFileAtomicSync } from './durable/atomic-write.ts';
import { InputError, optionError } from './input-error.ts';
import type { CliIo } from './io.ts';
import { readRunRecord, RUN_FILES, runDigits } from './run-directory.ts';
import { columnSet } from './sweep-columns.ts';
import { loadRunSpec, spaceDefinitionOf } from './sweep-command.ts';
import { rankedRows, sortedFront, frontRanks } from './sweep-outputs.ts';
import { SAFETY_CAUTIONS } from './safety.ts';
import { formatNumber } from './display-units.ts';
import { frontPlotSvg } from './plots.ts';

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
  const refinedRanked = outcome.refined.ranked(record.keep);
  const rows = rankedRows(spec.dimensions, refinedRanked);
  // Refined designs are not samples: their sample_index cell stays empty.
  const indexColumn = columns.header.indexOf('sample_index');
  for (const row of rows) row[indexColumn] = null;
  writeFileAtomicSync(join(directory, RUN_FILES.refined), toCsv(columns.header, rows, runDigits(record)));
  writeFileAtomicSync(
    join(directory, RUN_FILES.refinedDesigns),
    `${JSON.stringify(
      refinedRanked.map((entry, i) => ({ rank: i + 1, values: unpackRow(entry.payload).values })),
      null,
      1,
    )}\n`,
  );
  const front = sortedFront(outcome.merged);
  const frontRows = rankedRows(spec.dimensions, front);
  front.forEach((entry, i) => {
    if (entry.item.index >= spec.samples) frontRows[i][indexColumn] = null;
  });
  writeFileAtomicSync(join(directory, RUN_FILES.front), toCsv(columns.header, frontRows, runDigits(record)));
  writeFileAtomicSync(
    join(directory, 'front.svg'),
    await frontPlotSvg(
      spec.objectives,
      refinedRanked.map((entry) => unpackRow(entry.payload)),
      front.map((entry) => unpackRow(entry.payload)),
      {
        // Swept designs keep their rank in candidates.csv; refined ones are marked as such.
        ranks: frontRanks(
          state.pool.ranked(record.keep).filter((entry) => entry.item.violation === 0),
          front,
        ).map((rank, i) => (front[i].item.index >= spec.samples ? null : rank)),
        refined: front.map((entry) => entry.item.index >= spec.samples),
      },
    ),
  );
  const summaryPath = join(directory, RUN_FILES.summary);
  const summary = existsSync(summaryPath)
    ? (JSON.parse(readFileSync(summaryPath, 'utf8')) as Record<string, unknown>)
    : {};
  const improved = outcome.startResults.filter((r) => r.improved).length;
  summary.refine = {
    starts: outcome.startResults.length,
    improved_starts: improved,
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
  const gain =
    outcome.hypervolumeBefore !== null && outcome.hypervolumeAfter !== null
      ? ` hypervolume ${formatNumber(outcome.hypervolumeBefore, 6)} → ${formatNumber(outcome.hypervolumeAfter, 6)}`
      : '';
  io.out(
    [
      `refined ${outcome.startResults.length} starts with ${outcome.evaluations} evaluations (${improved} improved):${gain}`,
      `files: ${join(directory, RUN_FILES.refined)}, ${join(directory, RUN_FILES.front)} (updated), ${summaryPath} (refine section)`,
      `a refined design: npx coilfront show ${directory} --refined 1`,
      '',
      'SAFETY',
      ...SAFETY_CAUTIONS,
      '',
    ].join('\n'),
  );
  return 0;
}
