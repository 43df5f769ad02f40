/**
 * `coilfront sensitivity spec.yaml`: first-order and total Sobol indices of every field of a sweep file on
 * each objective and constrained metric (optimize/sensitivity), evaluated in the sweep's worker pool.
 * Samples whose metric is null (infeasible or not applicable) are dropped for that metric; `kept` says how
 * many of N remain. Writes sensitivity.csv and sensitivity.json into --out, each written whole then renamed.
 */
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { inProcessEvaluator } from '../optimize/evaluate-batch.ts';
import { spaceSensitivity } from '../optimize/sensitivity/index.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { toCsv } from '../run/csv.ts';
import type { CliIo } from './io.ts';
import { SAFETY_LINE, safetyBlock } from './safety.ts';
import { loadSweepFile } from './sweep-spec.ts';
import { fileError, optionError } from './input-errors.ts';

export interface SensitivityOptions {
  samples?: number;
  workers?: number;
  out?: string;
}

function writeWhole(path: string, text: string): void {
  writeFileSync(`${path}.partial`, text);
  renameSync(`${path}.partial`, path);
}

export async function sensitivityCommand(file: string, options: SensitivityOptions, io: CliIo): Promise<number> {
  const samples = options.samples ?? 512;
  if (samples < 2) throw optionError('--samples', `expected at least 2, got ${samples}`);
  const spec = loadSweepFile(file);
  const k = spec.dimensions.length;
  if (k < 1 || k > 32) throw fileError(file, `sensitivity needs 1 to 32 swept fields, the file has ${k}`);
  const metrics = [...new Set([...spec.objectives.map((o) => o.metric), ...spec.constraints.map((c) => c.metric)])];
  if (metrics.length === 0) throw fileError(file, `no objectives or constraints to analyse`);
  const definition = spaceDefinitionOf(spec);
  const threads = options.workers ?? defaultWorkerCount();
  const evaluator =
    threads === 0 ? inProcessEvaluator(new DesignSpace(definition)) : createWorkerPool(definition, { threads });
  let results: Awaited<ReturnType<typeof spaceSensitivity>>;
  try {
    results = await spaceSensitivity(definition, evaluator, metrics, samples);
  } finally {
    await evaluator.close();
  }
  const fields = spec.dimensions.map((d) => d.path.join('.'));
  const rows: (string | number | null)[][] = [];
  for (const result of results) {
    for (let d = 0; d < k; d++) {
      const s = result.indices?.first[d];
      const t = result.indices?.total[d];
      rows.push([fields[d], result.metric, s?.value ?? null, s?.low ?? null, s?.high ?? null]);
      rows[rows.length - 1].push(t?.value ?? null, t?.low ?? null, t?.high ?? null, result.kept);
    }
  }
  const out = options.out ?? '.';
  mkdirSync(out, { recursive: true });
  const header = ['field', 'metric', 'S1', 'S1_low', 'S1_high', 'ST', 'ST_low', 'ST_high', 'kept'];
  writeWhole(join(out, 'sensitivity.csv'), toCsv(header, rows));
  const json = { safety: SAFETY_LINE, samples, evaluations: samples * (k + 2), fields, metrics: results };
  writeWhole(join(out, 'sensitivity.json'), `${JSON.stringify(json, null, 2)}\n`);
  const fmt = (v: number | string | null) => (typeof v === 'number' ? v.toFixed(3).padStart(7) : String(v ?? '—'));
  io.out(`Sobol indices, N = ${samples} (${samples * (k + 2)} evaluations), 95 % bootstrap intervals\n`);
  for (const row of rows) {
    io.out(`${String(row[1]).padEnd(28)} ${String(row[0]).padEnd(28)} S1 ${fmt(row[2])}  ST ${fmt(row[5])}\n`);
  }
  io.out(`\n${safetyBlock()}\n`);
  return 0;
}
