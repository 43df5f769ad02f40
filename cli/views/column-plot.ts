/**
 * Any column of a run against any other: the ranked candidates as small marks, the front over them
 * as larger marks labelled with their candidate rank, the closest infeasible designs optionally as
 * muted hollow marks. Columns by their CSV names; axis titles carry the units of the names.
 */
import type { TopLevelSpec } from 'vega-lite';
import { optionError } from '../input-errors.ts';
import { type RunTable, columnIndex } from './run-table.ts';
import { PICTURE_CAUTION, type PointLabel, columnTitle, pointLabelLayers, wrapText } from './vega-render.ts';

const PLOT_WIDTH = 640;

export interface ColumnPlotOptions {
  x: string;
  y: string;
  color?: string;
  frontOnly?: boolean;
  logX?: boolean;
  logY?: boolean;
  /** Draw infeasible.csv's designs as muted marks. */
  nearMisses?: boolean;
}

export interface RunTables {
  candidates: RunTable;
  front: RunTable;
  infeasible: RunTable | null;
}

/** Our own palette: candidates slate, front deep teal, near misses pale sand. */
export const PLOT_COLOURS = {
  candidate: '#8795a1',
  front: '#0b6e69',
  miss: '#d9c9a3',
  refined: '#c2571a',
  evolved: '#6b4c9a',
};

interface Datum {
  set: 'candidate' | 'front' | 'near miss';
  x: number;
  y: number;
  c: number | string | null;
  rank: number | null;
  label: string;
}

function numericColumn(table: RunTable, name: string, option: string): number {
  const c = columnIndex(table, name, option);
  if (!table.numeric[c]) throw optionError(option, `column '${name}' holds text, not numbers`);
  return c;
}

/** The front's rank labels, best rank first (the first placed when the plot is crowded). */
function frontLabels(data: readonly Datum[]): PointLabel[] {
  return data
    .filter((d) => d.set === 'front' && d.rank !== null)
    .sort((a, b) => (a.rank ?? 0) - (b.rank ?? 0))
    .map((d) => ({ x: d.x, y: d.y, text: d.label }));
}

/** The points of the plot: candidates, near misses (optional) and the front, each with its candidate rank. */
function plotData(tables: RunTables, options: ColumnPlotOptions): Datum[] {
  const { candidates, front } = tables;
  const rankOfIndex = new Map<number, number>();
  const indexColumn = candidates.header.indexOf('sample_index');
  const rankColumn = candidates.header.indexOf('rank');
  for (const row of candidates.rows) {
    const index = row[indexColumn];
    const rank = row[rankColumn];
    if (typeof index === 'number' && typeof rank === 'number') rankOfIndex.set(index, rank);
  }
  const data: Datum[] = [];
  const take = (table: RunTable, set: Datum['set']) => {
    const tx = table.header.indexOf(options.x);
    const ty = table.header.indexOf(options.y);
    const tc = options.color !== undefined ? table.header.indexOf(options.color) : -1;
    const ti = table.header.indexOf('sample_index');
    for (const row of table.rows) {
      const x = row[tx];
      const y = row[ty];
      if (typeof x !== 'number' || typeof y !== 'number') continue;
      if (options.logX && x <= 0) continue;
      if (options.logY && y <= 0) continue;
      const index = row[ti];
      const rank = set === 'near miss' ? null : typeof index === 'number' ? (rankOfIndex.get(index) ?? null) : null;
      data.push({ set, x, y, c: tc >= 0 ? (row[tc] ?? null) : null, rank, label: rank === null ? '' : String(rank) });
    }
  };
  if (!options.frontOnly) take(candidates, 'candidate');
  if (options.nearMisses && tables.infeasible && !options.frontOnly) take(tables.infeasible, 'near miss');
  take(front, 'front');
  return data;
}

/** A numeric colour column with at most this many distinct values (a set: 15, 22, 33 nF) gets one swatch per value. */
const DISCRETE_COLOUR_LEVELS = 8;
/** Legend titles are long column names with units: wide enough not to be cut. */
const LEGEND_TITLE_LIMIT = 360;

/** The colour channel: the --color column (a scale of its own), else the set a point belongs to. */
function colorEncoding(candidates: RunTable, options: ColumnPlotOptions) {
  const cc = options.color !== undefined ? columnIndex(candidates, options.color, '--color') : -1;
  const colorNumeric = cc >= 0 && candidates.numeric[cc];
  const levels = new Set(candidates.rows.map((row) => row[cc]).filter((v) => typeof v === 'number'));
  const colorType = !colorNumeric ? 'nominal' : levels.size <= DISCRETE_COLOUR_LEVELS ? 'ordinal' : 'quantitative';
  return cc >= 0
    ? {
        field: 'c',
        type: colorType,
        title: columnTitle(options.color ?? ''),
        legend: { titleLimit: LEGEND_TITLE_LIMIT },
        ...(colorNumeric ? { scale: { scheme: 'viridis' } } : {}),
      }
    : {
        field: 'set',
        type: 'nominal' as const,
        title: null,
        scale: {
          domain: ['candidate', 'front', 'near miss'],
          range: [PLOT_COLOURS.candidate, PLOT_COLOURS.front, PLOT_COLOURS.miss],
        },
      };
}

/** The Vega-Lite spec of the plot. */
export function columnPlotSpec(tables: RunTables, options: ColumnPlotOptions): TopLevelSpec {
  const { candidates } = tables;
  numericColumn(candidates, options.x, '--x');
  numericColumn(candidates, options.y, '--y');
  const color = colorEncoding(candidates, options);
  const data = plotData(tables, options);
  const x = {
    field: 'x',
    type: 'quantitative' as const,
    title: columnTitle(options.x),
    scale: options.logX ? { type: 'log' as const } : { zero: false },
  };
  const y = {
    field: 'y',
    type: 'quantitative' as const,
    title: columnTitle(options.y),
    scale: options.logY ? { type: 'log' as const } : { zero: false },
  };
  const counts = (set: Datum['set']) => data.filter((d) => d.set === set).length;
  const empty = data.length === 0;
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: {
      text: wrapText(
        empty
          ? `Nothing to plot: no design has both ${options.x} and ${options.y}`
          : `${columnTitle(options.y)} against ${columnTitle(options.x)}: ${counts('front')} front designs, ${counts('candidate')} candidates${counts('near miss') > 0 ? `, ${counts('near miss')} near misses` : ''}`,
        PLOT_WIDTH,
        14,
      ),
      subtitle: wrapText(
        `${PICTURE_CAUTION} Front designs carry their rank in candidates.csv (npx coilfront show RUN RANK).`,
        PLOT_WIDTH,
        11,
      ),
      fontSize: 14,
      subtitleFontSize: 11,
      anchor: 'start',
    },
    width: PLOT_WIDTH,
    height: 420,
    data: { values: data as unknown as Record<string, unknown>[] },
    layer: [
      {
        transform: [{ filter: "datum.set === 'near miss'" }],
        mark: { type: 'point', size: 18, opacity: 0.8, strokeWidth: 1 },
        encoding: { x, y, color },
      },
      {
        transform: [{ filter: "datum.set === 'candidate'" }],
        mark: { type: 'circle', size: 14, opacity: 0.75 },
        encoding: { x, y, color },
      },
      {
        transform: [{ filter: "datum.set === 'front'" }],
        mark: { type: 'square', size: 46, stroke: '#102a2a', strokeWidth: 0.8 },
        encoding: { x, y, color },
      },
      ...pointLabelLayers('#102a2a'),
    ],
    usermeta: { pointLabels: frontLabels(data) },
  } as unknown as TopLevelSpec;
}
