/**
 * `coilfront sensitivity spec.yaml`: first-order and total Sobol indices of every field of a sweep file on
 * each objective and constrained metric and on feasibility (optimize/sensitivity), evaluated in the sweep's
 * worker pool with a journal (run/sensitivity-run.ts: kill -9 and a rerun give the same files), whole or as
 * `--shard k/N` blocks merged with `--merge`. Writes sensitivity.csv and sensitivity.json into --out, each
 * written whole then renamed.
 */
import { existsSync, mkdirSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { spaceDefinitionOf } from '../optimize/design-space.ts';
import type { ShouldStop } from '../optimize/stage-stop.ts';
import {
  type SaltelliOutputs,
  type SensitivityPlan,
  type SpaceSensitivity,
  sensitivityOf,
} from '../optimize/sensitivity/index.ts';
import { toCsv } from '../run/csv.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import {
  readSensitivityShards,
  runSensitivityStudy,
  SENSITIVITY_JOURNAL,
  sensitivityShardDirectory,
  sensitivityShardFolder,
} from '../run/sensitivity-run.ts';
import { openEvaluator } from '../run/evaluator.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { describeShard, resolveShard } from '../run/shard.ts';
import { lockRunOrRefuse } from '../run/sweep-setup.ts';
import { defaultWorkerCount } from '../workers/pool.ts';
import { commandError, fileError, optionError } from './input-errors.ts';
import type { CliIo } from './io.ts';
import { SAFETY_LINE, safetyBlock } from './safety.ts';
import { writeSummarySection } from './stage-outputs.ts';
import { loadRunSpec, loadSweepFile, type SweepSpec } from './sweep-spec.ts';

export interface SensitivityOptions {
  samples?: number;
  workers?: number;
  out?: string;
  /** `k/N`: evaluate only the k-th of N blocks of the design's rows, into its own shard directory. */
  shard?: string;
  /** Merge the shards (these directories, or every one under `<out>/sensitivity-shards` when `true`). */
  merge?: string[] | boolean;
}

/** The name of the feasibility indicator's rows in sensitivity.csv. */
export const FEASIBLE_ROW = 'feasible';

function mergeDirectories(out: string, merge: string[] | boolean): string[] {
  if (Array.isArray(merge) && merge.length > 0) return merge;
  const folder = sensitivityShardFolder(out);
  const found = existsSync(folder) ? readdirSync(folder).filter((name) => /^\d+-of-\d+$/.test(name)) : [];
  if (found.length === 0) throw optionError('--merge', `no shard directories given, and none in ${folder}`);
  return found.sort((a, b) => Number(a.split('-')[0]) - Number(b.split('-')[0])).map((name) => join(folder, name));
}

function planOf(file: string, samples: number): { plan: SensitivityPlan; identity: string } {
  return planOfSpec(loadSweepFile(file), file, samples);
}

/** The study of a read sweep file (`file` names it in messages): its plan, and its identity (the spec hash). */
function planOfSpec(spec: SweepSpec, file: string, samples: number): { plan: SensitivityPlan; identity: string } {
  const k = spec.dimensions.length;
  if (k < 1 || k > 32) throw fileError(file, `sensitivity needs 1 to 32 swept fields, the file has ${k}`);
  const metrics = [...new Set([...spec.objectives.map((o) => o.metric), ...spec.constraints.map((c) => c.metric)])];
  if (metrics.length === 0) throw fileError(file, `no objectives or constraints to analyse`);
  const required = spec.objectives.map((o) => o.metric);
  const plan = { definition: spaceDefinitionOf(spec), samples, metrics, constraints: spec.constraints, required };
  return { plan, identity: spec.hash };
}

export async function sensitivityCommand(file: string, options: SensitivityOptions, io: CliIo): Promise<number> {
  const samples = options.samples ?? 512;
  if (!Number.isInteger(samples) || samples < 2) throw optionError('--samples', `expected at least 2, got ${samples}`);
  if (options.merge && options.shard !== undefined)
    throw commandError(
      'sensitivity',
      '--shard and --merge do not go together: merge the finished shards without --shard',
    );
  const { plan, identity } = planOf(file, samples);
  const out = options.out ?? '.';
  if (options.merge) {
    const outputs = readSensitivityShards(identity, plan, mergeDirectories(out, options.merge));
    mkdirSync(out, { recursive: true });
    writeSensitivityOutputs(out, plan, outputs, io);
    return 0;
  }
  const shard = resolveShard({ shardFlag: options.shard, env: process.env });
  const directory = shard ? sensitivityShardDirectory(out, shard) : out;
  mkdirSync(directory, { recursive: true });
  const lock = lockRunOrRefuse(directory);
  try {
    const threads = options.workers ?? defaultWorkerCount();
    const evaluator = openEvaluator(plan.definition, threads);
    if (shard) io.err(`sensitivity: ${describeShard(shard)}\n`);
    const outputs = await runSensitivityStudy({
      journalPath: join(directory, SENSITIVITY_JOURNAL),
      identity,
      plan,
      evaluator,
      threads,
      shard,
      notice: (line) => io.err(`${line}\n`),
    });
    if (shard) {
      io.out(
        `sensitivity shard ${shard.index}/${shard.count}: its rows are evaluated into ${directory}\n` +
          `when every shard has finished: npx coilfront sensitivity ${file} --merge (with the same --samples and --out)\n${SAFETY_LINE}\n`,
      );
      return 0;
    }
    writeSensitivityOutputs(out, plan, outputs, io);
    return 0;
  } finally {
    lock.release();
  }
}

type Row = (string | number | null)[];

function tableRows(fields: readonly string[], result: SpaceSensitivity, samples: number): Row[] {
  const rows: Row[] = [];
  const push = (metric: string, indices: SpaceSensitivity['metrics'][number]['indices'], kept: number) => {
    for (let d = 0; d < fields.length; d++) {
      const s = indices?.first[d];
      const t = indices?.total[d];
      rows.push([fields[d], metric, s?.value ?? null, s?.low ?? null, s?.high ?? null]);
      rows[rows.length - 1].push(t?.value ?? null, t?.low ?? null, t?.high ?? null, kept);
    }
  };
  for (const metric of result.metrics) push(metric.metric, metric.indices, metric.kept);
  push(FEASIBLE_ROW, result.feasibility.indices, samples);
  return rows;
}

/** The console lines on feasibility and on metrics whose samples were not all kept. */
function basisLines(result: SpaceSensitivity, samples: number): string {
  const f = result.feasibility;
  const share = (count: number) => `${((100 * count) / f.points).toFixed(1)} %`;
  let text = `feasible: ${f.feasible} of ${f.points} independent points (${share(f.feasible)}); infeasible ${share(f.points - f.feasible)}, of which could not be built ${share(f.impossible)}\n`;
  if (f.indices === null) text += `feasibility does not vary over these points: no indices for '${FEASIBLE_ROW}'\n`;
  for (const metric of result.metrics) {
    if (metric.basis === 'all') continue;
    text += `${metric.metric}: null at some points; indices over the ${metric.kept} of ${samples} samples whose every row has it (complete blocks: exact for a box-shaped region, otherwise indicative)\n`;
  }
  return text;
}

/**
 * Writes sensitivity.csv and sensitivity.json and prints the table with the cautions; returns what
 * sensitivity.json holds besides its safety line (a sweep's sensitivity stage puts it in summary.json).
 */
function writeSensitivityOutputs(
  out: string,
  plan: SensitivityPlan,
  outputs: SaltelliOutputs,
  io: CliIo,
): Record<string, unknown> {
  const result = sensitivityOf(plan, outputs);
  const k = plan.definition.dimensions.length;
  const fields = plan.definition.dimensions.map((d) => d.path.join('.'));
  const rows = tableRows(fields, result, plan.samples);
  const header = ['field', 'metric', 'S1', 'S1_low', 'S1_high', 'ST', 'ST_low', 'ST_high', 'kept'];
  writeFileAtomicSync(join(out, 'sensitivity.csv'), toCsv(header, rows));
  const { feasible, impossible, points, indices } = result.feasibility;
  const study = {
    samples: plan.samples,
    evaluations: plan.samples * (k + 2),
    fields,
    metrics: result.metrics,
    // The share of the 2N independent points that are feasible candidates, beside the counts it comes from.
    feasibility: { feasible, impossible, points, share: feasible / points, indices },
  };
  writeFileAtomicSync(join(out, 'sensitivity.json'), `${JSON.stringify({ safety: SAFETY_LINE, ...study }, null, 2)}\n`);
  const fmt = (v: number | string | null) => (typeof v === 'number' ? v.toFixed(3).padStart(7) : String(v ?? '—'));
  io.out(`Sobol indices, N = ${plan.samples} (${plan.samples * (k + 2)} evaluations), 95 % bootstrap intervals\n`);
  for (const row of rows) {
    io.out(`${String(row[1]).padEnd(28)} ${String(row[0]).padEnd(28)} S1 ${fmt(row[2])}  ST ${fmt(row[5])}\n`);
  }
  io.out(`${basisLines(result, plan.samples)}\n${safetyBlock()}\n`);
  return study;
}

/** The name of the section of summary.json that a sweep's sensitivity stage writes. */
export const SOBOL_SECTION = 'sobol';

export interface SensitivityStageOptions {
  samples: number;
  workers?: number;
  /** Polled between batches (the stages' stop request): true stops with StageStopped, the journal kept. */
  shouldStop?: ShouldStop;
}

/**
 * A sweep's `- sensitivity: { samples }` stage on its finished run directory: the study of `coilfront
 * sensitivity DIR/spec.yaml --samples N --out DIR` (the same plan, identity and journal, so the same files),
 * and the `sobol` section of summary.json, which holds what sensitivity.json holds less its safety line.
 */
export async function sensitivityStage(
  directory: string,
  options: SensitivityStageOptions,
  io: CliIo,
): Promise<number> {
  const file = join(directory, RUN_FILES.spec);
  const { plan, identity } = planOfSpec(loadRunSpec(directory), file, options.samples);
  const lock = lockRunOrRefuse(directory);
  try {
    const threads = options.workers ?? defaultWorkerCount();
    const evaluator = openEvaluator(plan.definition, threads);
    const outputs = await runSensitivityStudy({
      journalPath: join(directory, SENSITIVITY_JOURNAL),
      identity,
      plan,
      evaluator,
      threads,
      notice: (line) => io.err(`${line}\n`),
      ...(options.shouldStop ? { shouldStop: options.shouldStop } : {}),
    });
    const study = writeSensitivityOutputs(directory, plan, outputs, io);
    const path = writeSummarySection(directory, SOBOL_SECTION, study);
    io.out(`the same indices are in the '${SOBOL_SECTION}' section of ${path}\n`);
    return 0;
  } finally {
    lock.release();
  }
}
