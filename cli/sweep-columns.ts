/**
 * The columns of candidates.csv, front.csv, refined.csv and all.csv: ranking columns, every varied
 * parameter, every metric of the contract, each column with its unit in the name
 * (`secondary.form_diameter_mm`, `resonant_frequency_kHz`, `wire_length_m`). The order is stable.
 */
import { warningKeysOf } from '../core/outcome/warnings.ts';
import { METRICS } from '../core/metrics.ts';
import type { Dimension } from '../optimize/design-tree.ts';
import type { CandidateRow } from '../optimize/sweep-state.ts';
import type { Cell } from './csv.ts';
import { KIND_DISPLAY, METRIC_DISPLAY } from './display-units.ts';
import type { QuantityKind } from './units.ts';

export interface ColumnSet {
  header: string[];
  parameterHeaders: string[];
  metricHeaders: string[];
}

function parameterHeader(dimension: Dimension): string {
  const name = dimension.path.join('.');
  if (dimension.kind === 'choose') return name;
  const unit = KIND_DISPLAY[dimension.quantity as QuantityKind];
  return unit && unit.label !== '' ? `${name}_${unit.label}` : name;
}

function metricHeader(key: string, siUnit: string): string {
  const display = METRIC_DISPLAY[key];
  if (display) return `${key}_${display.label}`;
  if (siUnit === '' || siUnit === 'count') return key;
  return `${key}_${siUnit.replace('/', '_per_')}`;
}

export const RANK_HEADERS = ['rank', 'pareto_rank', 'crowding', 'feasible', 'total_violation', 'sample_index'];
export const TAIL_HEADERS = ['warnings', 'reason'];

export function columnSet(dimensions: readonly Dimension[]): ColumnSet {
  const parameterHeaders = dimensions.map(parameterHeader);
  const metricHeaders = METRICS.map((m) => metricHeader(m.key, m.unit));
  return {
    header: [...RANK_HEADERS, ...parameterHeaders, ...metricHeaders, ...TAIL_HEADERS],
    parameterHeaders,
    metricHeaders,
  };
}

/** The parameter cells of a candidate in display units (set choices by their label). */
export function parameterCells(dimensions: readonly Dimension[], values: readonly number[]): Cell[] {
  return dimensions.map((dimension, d) => {
    const value = values[d];
    if (dimension.kind === 'choose') return dimension.labels[value] ?? null;
    const unit = KIND_DISPLAY[dimension.quantity as QuantityKind];
    return unit ? value / unit.divisor : value;
  });
}

/** The metric cells of a candidate in display units (empty where null). */
export function metricCells(metrics: ReadonlyArray<number | null>): Cell[] {
  return METRICS.map((m, i) => {
    const value = metrics[i];
    if (value === null || value === undefined) return null;
    const display = METRIC_DISPLAY[m.key];
    return display ? value / display.divisor : value;
  });
}

export interface RankedCells {
  rank: number;
  paretoRank: number | null;
  crowding: number | null;
  feasible: boolean;
  violation: number;
  index: number | null;
}

/** One full row. */
export function candidateCells(dimensions: readonly Dimension[], ranked: RankedCells, row: CandidateRow): Cell[] {
  return [
    ranked.rank,
    ranked.paretoRank,
    ranked.crowding,
    ranked.feasible,
    ranked.violation,
    ranked.index,
    ...parameterCells(dimensions, row.values),
    ...metricCells(row.metrics),
    warningKeysOf(row.warningMask).join(';'),
    row.reason,
  ];
}
