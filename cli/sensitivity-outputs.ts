/**
 * The files and console table of a sensitivity study: sensitivity.csv (a row per field and metric, and
 * the feasibility indicator's rows), sensitivity.json (each written whole then renamed), the indices
 * with their intervals and what the complete-block basis left out, and the cautions.
 */
import { join } from 'node:path';
import type { SaltelliOutputs, SensitivityPlan, SpaceSensitivity } from '../optimize/sensitivity/index.ts';
import { sensitivityOf } from '../optimize/sensitivity/index.ts';
import { toCsv } from '../run/csv.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import type { CliIo } from './io.ts';
import { SAFETY_LINE, safetyBlock } from './safety.ts';

/** The name of the feasibility indicator's rows in sensitivity.csv. */
export const FEASIBLE_ROW = 'feasible';

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
export function writeSensitivityOutputs(
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
