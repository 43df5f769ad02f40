/**
 * The report's content from a run's files (cli/views/report-page.ts draws it): which columns the
 * front plot and the table show, the bars of what rejected designs, and the study tables beside the
 * sweep (rank correlations, Sobol indices, build tolerances).
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { RUN_FILES } from '../../run/run-directory.ts';
import { METRIC_DISPLAY } from '../display-units.ts';
import { summaryQuantileSlots } from '../quantile-merits.ts';
import { constraintText } from '../top-candidates.ts';
import { KEY_FIGURES } from './design-drawing.ts';
import type { ReportData } from './report-page.ts';
import { readRunTable, type RunTable } from './run-table.ts';
import { columnTitle } from './vega-render.ts';

export interface ReportSummary {
  counts?: Record<string, number>;
  constraints?: { metric: string; min?: number; max?: number; rejected: number }[];
  impossible_by?: Record<string, number>;
  objectives?: { metric: string; sense: string }[];
  sensitivities?: Record<string, Record<string, number | null>>;
  version?: number;
  build_quantiles?: unknown;
}

/** The CSV column of a metric: its name with the display unit (`resonant_frequency_kHz`). */
export function metricColumn(metric: string): string {
  const display = METRIC_DISPLAY[metric];
  return display && display.label !== '' ? `${metric}_${display.label}` : metric;
}

function rowsOf(table: RunTable): Record<string, number | string | null>[] {
  return table.rows.map((row) => Object.fromEntries(table.header.map((h, c) => [h, row[c]])));
}

/** A constraint as a bar label in display units: `resonant_frequency 90 kHz … 300 kHz`, `overall_height ≤ 2.4 m`. */
function constraintLabel(constraint: { metric: string; min?: number; max?: number }): string {
  return `${constraint.metric} ${constraintText(constraint)}`;
}

/** Column titles: the unit's title, and for a build_quantile_k column what it holds (summary.json version 2). */
function columnTitles(header: readonly string[], summary: ReportSummary): Record<string, string> {
  const slots = summaryQuantileSlots(summary);
  return Object.fromEntries(
    header.map((h) => {
      const slot = slots.find((s) => h === s.column || h.startsWith(`${s.column}_`));
      return [h, slot ? `${columnTitle(h)}: ${slot.label} over the tolerance draws` : columnTitle(h)];
    }),
  );
}

/** The columns of the report: the plot's axes, the key columns of a design, the table's columns. */
function reportColumns(candidates: RunTable, summary: ReportSummary) {
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
  return { objectives, axisColumns, x, y, keyColumns, tableColumns };
}

/** The front's and the candidates' rows as records by column name. */
export function reportRows(front: RunTable, candidates: RunTable) {
  return { frontRows: rowsOf(front), candidateRows: rowsOf(candidates) };
}

/** The whole of the report's content, given the drawings made and the notes so far. */
export function reportData(
  directory: string,
  summary: ReportSummary,
  candidates: RunTable,
  rows: ReturnType<typeof reportRows>,
  drawn: { drawings: Record<string, string>; topThree: string[]; notes: string[] },
): ReportData {
  const { frontRows, candidateRows } = rows;
  const { notes } = drawn;
  const rejections = rejectionsOf(summary);
  const { sensitivities, globalIndices, buildTolerances } = studyTables(directory, summary);
  if (frontRows.length === 0)
    notes.push(`No design met every constraint: see ${RUN_FILES.infeasible} and the bars above.`);
  const { objectives, axisColumns, x, y, keyColumns, tableColumns } = reportColumns(candidates, summary);
  // In the order the page has always listed them (it embeds parts of this record as JSON).
  return {
    title: `coilfront report: ${directory}`,
    run: directory,
    counts: summary.counts ?? {},
    rejections,
    objectives,
    axisColumns,
    titles: columnTitles(candidates.header, summary),
    x,
    y,
    candidates: candidateRows,
    front: frontRows,
    tableColumns,
    keyColumns,
    drawings: drawn.drawings,
    topThree: drawn.topThree,
    sensitivities,
    globalIndices,
    buildTolerances,
    notes,
  };
}

/** A bar per rejecting constraint and per reason a design could not be built. */
function rejectionsOf(summary: ReportSummary): ReportData['rejections'] {
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
  summary: ReportSummary,
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
