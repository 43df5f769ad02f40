/**
 * The outputs of a tolerance study: tolerance.csv (display units, as candidates.csv) and tolerance.json
 * (SI), each written whole then renamed, and one console line per candidate with the cautions. A study of
 * refined or evolved designs writes tolerance-refined.* or tolerance-evolved.* beside the sweep's.
 */
import { join } from 'node:path';
import { METRICS } from '../core/metrics.ts';
import type { CandidateTolerance, ToleranceField } from '../optimize/tolerance/index.ts';
import type { ConstraintDefinition } from '../optimize/sweep-state.ts';
import { type Cell, toCsv } from '../run/csv.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import type { StudyCandidate } from '../run/tolerance-run.ts';
import { formatNumber, METRIC_DISPLAY } from './display-units.ts';
import type { CliIo } from './io.ts';
import { SAFETY_LINE, safetyBlock } from './safety.ts';

/** Which designs a study of a run takes: the sweep's ranked list, or a stage's outputs. */
export type StudySource = 'candidates' | 'refined' | 'evolved';

export const TOLERANCE_FILES = { csv: 'tolerance.csv', json: 'tolerance.json', journal: 'tolerance-journal.log' };

/** The file names of a study of `source`. */
export function toleranceFiles(source: StudySource): typeof TOLERANCE_FILES {
  if (source === 'candidates') return TOLERANCE_FILES;
  return {
    csv: `tolerance-${source}.csv`,
    json: `tolerance-${source}.json`,
    journal: `tolerance-${source}-journal.log`,
  };
}

export interface StudyReport {
  out: string;
  files: typeof TOLERANCE_FILES;
  sourceFile: string;
  draws: number;
  seed: number;
  fields: readonly ToleranceField[];
  constraints: readonly ConstraintDefinition[];
  metrics: readonly string[];
  candidates: readonly StudyCandidate[];
  results: readonly CandidateTolerance[];
}

function metricColumn(key: string, quantile: string): string {
  const display = METRIC_DISPLAY[key];
  if (display) return `${key}_${quantile}_${display.label}`;
  const unit = METRICS.find((m) => m.key === key)?.unit ?? '';
  return unit === '' || unit === 'count' ? `${key}_${quantile}` : `${key}_${quantile}_${unit.replace('/', '_per_')}`;
}

function displayValue(key: string, value: number | null): number | null {
  if (value === null) return null;
  return value / (METRIC_DISPLAY[key]?.divisor ?? 1);
}

/** The rank column: the candidate's id as the run's other files give it ('3', 'r3', 'e3', 'design'). */
function rankCell(candidate: StudyCandidate): Cell {
  return /^\d+$/.test(candidate.id) ? Number(candidate.id) : candidate.id;
}

function csvOf(report: StudyReport): string {
  const head = ['rank', 'sample_index', 'draws', 'passing', 'impossible', 'yield', 'yield_low', 'yield_high'];
  for (const metric of report.metrics) head.push(...['p05', 'p50', 'p95'].map((q) => metricColumn(metric, q)));
  const rows: Cell[][] = report.results.map((result, c) => {
    const candidate = report.candidates[c];
    const row: Cell[] = [rankCell(candidate), candidate.sampleIndex, result.draws, result.passing];
    row.push(result.impossible, result.yield.estimate, result.yield.low, result.yield.high);
    for (const q of result.quantiles)
      row.push(displayValue(q.metric, q.p05), displayValue(q.metric, q.p50), displayValue(q.metric, q.p95));
    return row;
  });
  return toCsv(head, rows);
}

function jsonOf(report: StudyReport): string {
  const json = {
    safety: SAFETY_LINE,
    source: report.sourceFile,
    draws: report.draws,
    seed: report.seed,
    units: 'SI',
    fields: report.fields.map((f) => ({ ...f, path: f.path.join('.') })),
    constraints: report.constraints,
    metrics: report.metrics,
    candidates: report.results.map((result, c) => ({
      rank: report.candidates[c].id === 'design' ? null : rankCell(report.candidates[c]),
      sample_index: report.candidates[c].sampleIndex,
      ...result,
    })),
  };
  return `${JSON.stringify(json, null, 2)}\n`;
}

/** One console line of a candidate: its yield with the interval, and the first metric's quantiles. */
function candidateLine(candidate: StudyCandidate, result: CandidateTolerance, shown: string): string {
  const name = candidate.id === 'design' ? 'design' : `rank ${candidate.id}`;
  const q = result.quantiles[0];
  const spread =
    q.p05 === null
      ? ''
      : `   ${shown} 5/50/95 %: ${[q.p05, q.p50, q.p95].map((v) => formatNumber(displayValue(shown, v) as number)).join(' / ')} ${METRIC_DISPLAY[shown]?.label ?? ''}`;
  const y = result.yield;
  return `${name.padEnd(9)} yield ${(100 * y.estimate).toFixed(1).padStart(5)} % [${(100 * y.low).toFixed(1)}, ${(100 * y.high).toFixed(1)}]  ${result.passing}/${result.draws}${spread}\n`;
}

/** Writes the study's CSV and JSON and prints its table with the cautions. */
export function writeStudyOutputs(report: StudyReport, io: CliIo): void {
  writeFileAtomicSync(join(report.out, report.files.csv), csvOf(report));
  writeFileAtomicSync(join(report.out, report.files.json), jsonOf(report));
  io.out(
    `Tolerance study: ${report.draws} builds per candidate, ${report.fields.length} toleranced fields, yield with 95 % Wilson interval\n`,
  );
  for (let c = 0; c < report.results.length; c++)
    io.out(candidateLine(report.candidates[c], report.results[c], report.metrics[0]));
  io.out(`files: ${join(report.out, report.files.csv)}, ${join(report.out, report.files.json)}\n\n${safetyBlock()}\n`);
}
