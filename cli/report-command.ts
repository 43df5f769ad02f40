/**
 * `coilfront report RUN [--out report.html]`: the morning report of a run as one self-contained HTML
 * file (cli/views/report-page.ts): the cautions in full, the counts and what rejected designs, the
 * interactive front with each front design's drawing, a sortable table of the top candidates, the
 * drawings of the top three, and the sensitivities of summary.json.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { METRIC_DISPLAY } from './display-units.ts';
import { drawingOf } from './draw-command.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { optionError } from '../run/input-error.ts';
import { fileError } from './input-errors.ts';
import type { CliIo } from './io.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { runDesign, runSpace } from './run-design.ts';
import { KEY_FIGURES } from './views/design-drawing.ts';
import { type ReportData, reportHtml } from './views/report-page.ts';
import { columnTitle } from './views/vega-render.ts';
import { readRunTable, type RunTable } from './views/run-table.ts';

export interface ReportOptions {
  out?: string;
  /** Most front designs drawn (each drawing is one more field solve), default 40. */
  drawings?: string;
}

const DEFAULT_DRAWINGS = 40;
/** A coarser field grid than `draw`'s for the report's many drawings (smaller file, quicker). */
const REPORT_FIELD_COLUMNS = 45;

interface Summary {
  counts?: Record<string, number>;
  constraints?: { metric: string; min?: number; max?: number; rejected: number }[];
  impossible_by?: Record<string, number>;
  objectives?: { metric: string; sense: string }[];
  sensitivities?: Record<string, Record<string, number | null>>;
}

/** The CSV column of a metric: its name with the display unit (`resonant_frequency_kHz`). */
export function metricColumn(metric: string): string {
  const display = METRIC_DISPLAY[metric];
  return display && display.label !== '' ? `${metric}_${display.label}` : metric;
}

function rowsOf(table: RunTable): Record<string, number | string | null>[] {
  return table.rows.map((row) => Object.fromEntries(table.header.map((h, c) => [h, row[c]])));
}

/** A constraint as a bar label: `resonant_frequency 90000 … 300000`. */
function constraintLabel(constraint: { metric: string; min?: number; max?: number }): string {
  const bounds = [
    constraint.min !== undefined ? `≥ ${constraint.min}` : '',
    constraint.max !== undefined ? `≤ ${constraint.max}` : '',
  ]
    .filter((b) => b !== '')
    .join(' and ');
  return `${constraint.metric} ${bounds} (SI)`;
}

export async function reportCommand(directory: string, options: ReportOptions, io: CliIo): Promise<number> {
  if (!existsSync(join(directory, RUN_FILES.summary)))
    throw fileError(directory, `not a finished run (no ${RUN_FILES.summary})`);
  let drawingLimit = DEFAULT_DRAWINGS;
  if (options.drawings !== undefined) {
    if (!/^\d+$/.test(options.drawings))
      throw optionError('--drawings', `expected a whole number, got '${options.drawings}'`);
    drawingLimit = Number(options.drawings);
  }
  if (options.out !== undefined && !/\.html?$/i.test(options.out))
    throw optionError('--out', `expected a file name ending in .html, got '${options.out}'`);
  const summary = JSON.parse(readFileSync(join(directory, RUN_FILES.summary), 'utf8')) as Summary;
  const candidates = readRunTable(join(directory, RUN_FILES.candidates));
  const front = readRunTable(join(directory, RUN_FILES.front));
  const space = runSpace(directory);

  const objectives = (summary.objectives ?? []).map((o) => ({ column: metricColumn(o.metric), sense: o.sense }));
  const axisColumns = candidates.header.filter(
    (_h, c) => candidates.numeric[c] && candidates.rows.some((row) => row[c] !== null),
  );
  const pick = (wanted: string | undefined, fallback: number) =>
    wanted !== undefined && axisColumns.includes(wanted) ? wanted : (axisColumns[fallback] ?? axisColumns[0] ?? 'rank');
  const x = pick(objectives[0]?.column, 0);
  const y = objectives.length > 1 ? pick(objectives[1]?.column, 1) : 'rank';

  const parameters = candidates.header.filter((h) => h.includes('.'));
  const keyMetricColumns = KEY_FIGURES.map(([, key]) => metricColumn(key)).filter((c) => candidates.header.includes(c));
  const keyColumns = [...new Set([...objectives.map((o) => o.column), ...keyMetricColumns, ...parameters])];
  const tableColumns = [
    ...new Set(
      [
        'rank',
        'pareto_rank',
        ...objectives.map((o) => o.column),
        ...parameters,
        ...keyMetricColumns,
        'warnings',
      ].filter((c) => candidates.header.includes(c)),
    ),
  ];

  const frontRows = rowsOf(front);
  const candidateRows = rowsOf(candidates);
  const drawings: Record<string, string> = {};
  const notes: string[] = [];
  const draw = (id: string) => {
    if (id in drawings) return;
    const found = runDesign(directory, id, space);
    drawings[id] = drawingOf(found.design, found.label, directory, REPORT_FIELD_COLUMNS).replace(
      /^<svg /,
      `<svg data-rank="${id}" `,
    );
  };
  const frontIds = frontRows.map((r) => String(r.rank));
  for (const id of frontIds.slice(0, drawingLimit)) draw(id);
  if (frontIds.length > drawingLimit) {
    notes.push(
      `${frontIds.length - drawingLimit} of the ${frontIds.length} front designs are not drawn here (--drawings ${drawingLimit}); npx coilfront draw ${directory} RANK draws any.`,
    );
  }
  const topThree = candidateRows.slice(0, 3).map((r) => String(r.rank));
  for (const id of topThree) draw(id);

  const rejections = rejectionsOf(summary);
  const { sensitivities, globalIndices, buildTolerances } = studyTables(directory, summary);
  if (frontRows.length === 0)
    notes.push(`No design met every constraint: see ${RUN_FILES.infeasible} and the bars above.`);

  const data: ReportData = {
    title: `coilfront report: ${directory}`,
    run: directory,
    counts: summary.counts ?? {},
    rejections,
    objectives,
    axisColumns,
    titles: Object.fromEntries(candidates.header.map((h) => [h, columnTitle(h)])),
    x,
    y,
    candidates: candidateRows,
    front: frontRows,
    tableColumns,
    keyColumns,
    drawings,
    topThree,
    sensitivities,
    globalIndices,
    buildTolerances,
    notes,
  };
  const out = options.out ?? join(directory, 'report.html');
  writeFileAtomicSync(out, reportHtml(data));
  io.out(`${out}\n`);
  return 0;
}

/** A bar per rejecting constraint and per reason a design could not be built. */
function rejectionsOf(summary: Summary): ReportData['rejections'] {
  const rejections: ReportData['rejections'] = [];
  for (const constraint of summary.constraints ?? []) {
    rejections.push({ label: constraintLabel(constraint), count: constraint.rejected, kind: 'constraint' });
  }
  for (const [reason, count] of Object.entries(summary.impossible_by ?? {})) {
    rejections.push({ label: reason, count, kind: 'impossible' });
  }
  return rejections;
}

/** A CSV the run may hold (sensitivity.csv, tolerance.csv) as header and rows, or null. */
function optionalTable(path: string): { header: string[]; rows: ReturnType<typeof readRunTable>['rows'] } | null {
  if (!existsSync(path)) return null;
  const table = readRunTable(path);
  return { header: table.header, rows: table.rows };
}

/** The studies beside the sweep: rank correlations of summary.json, Sobol indices, build tolerances. */
function studyTables(
  directory: string,
  summary: Summary,
): Pick<ReportData, 'sensitivities' | 'globalIndices' | 'buildTolerances'> {
  let sensitivities: ReportData['sensitivities'] = null;
  if (summary.sensitivities && Object.keys(summary.sensitivities).length > 0) {
    const names = Object.keys(summary.sensitivities);
    const metrics = (summary.objectives ?? []).map((o) => o.metric);
    sensitivities = {
      parameters: names,
      metrics,
      values: names.map((p) => metrics.map((m) => summary.sensitivities?.[p]?.[m] ?? null)),
    };
  }
  return {
    sensitivities,
    globalIndices: optionalTable(join(directory, 'sensitivity.csv')),
    buildTolerances: optionalTable(join(directory, 'tolerance.csv')),
  };
}
