/**
 * The columns of candidates.csv, front.csv, refined.csv and all.csv: ranking columns, every varied
 * parameter, every metric of the contract, each column with its unit in the name
 * (`secondary.form_diameter_mm`, `resonant_frequency_kHz`, `wire_length_m`), whether a parameter was
 * varied as a range or as a set of quantities. The order is stable.
 */
import { warningKeysOf } from '../core/outcome/warnings.ts';
import { METRICS } from '../core/metrics.ts';
import { awgDiameter } from '../core/wire.ts';
import type { Dimension, WireValue } from '../optimize/design-tree.ts';
import type { CandidateRow } from '../optimize/sweep-state.ts';
import type { Cell } from './csv.ts';
import { KIND_DISPLAY, METRIC_DISPLAY } from './display-units.ts';
import type { QuantityKind } from './units.ts';

export interface ColumnSet {
  header: string[];
  parameterHeaders: string[];
  metricHeaders: string[];
}

function unitSuffix(quantity: string | undefined): string {
  if (quantity === undefined) return '';
  const unit = KIND_DISPLAY[quantity as QuantityKind];
  return unit && unit.label !== '' ? `_${unit.label}` : '';
}

function isWire(value: unknown): value is WireValue {
  return typeof value === 'object' && value !== null && ('awg' in value || 'bareDiameter' in value);
}

/** How a set's choices go into the sheet: as numbers (quantities), as wires, or as text labels. */
function chooseForm(dimension: Dimension & { kind: 'choose' }): 'number' | 'wire' | 'text' {
  if (dimension.values.every((v) => typeof v === 'number')) return 'number';
  if (dimension.values.every(isWire)) return 'wire';
  return 'text';
}

/** Bare copper diameter of a wire (SI): the gauge's by ASTM B258 [astmb258], or the one given. */
function bareDiameterOf(wire: WireValue): number {
  return 'awg' in wire ? awgDiameter(wire.awg) : wire.bareDiameter;
}

/**
 * The column names of one dimension: a quantity (range or set of quantities) is one number column
 * with its unit in the name; a set of wires is its label and its bare diameter in mm; any other set
 * (shapes, whole sections) is one text column.
 */
function dimensionHeaders(dimension: Dimension): string[] {
  const name = dimension.path.join('.');
  if (dimension.kind === 'range') return [`${name}${unitSuffix(dimension.quantity)}`];
  const form = chooseForm(dimension);
  if (form === 'number') return [`${name}${unitSuffix(dimension.quantity)}`];
  if (form === 'wire') return [name, `${name}_bare_diameter_mm`];
  return [name];
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
  const parameterHeaders = dimensions.flatMap(dimensionHeaders);
  const metricHeaders = METRICS.map((m) => metricHeader(m.key, m.unit));
  return {
    header: [...RANK_HEADERS, ...parameterHeaders, ...metricHeaders, ...TAIL_HEADERS],
    parameterHeaders,
    metricHeaders,
  };
}

/** The parameter cells of a candidate in display units (text sets by their label). */
export function parameterCells(dimensions: readonly Dimension[], values: readonly number[]): Cell[] {
  return dimensions.flatMap((dimension, d): Cell[] => {
    const value = values[d];
    if (dimension.kind === 'range') {
      const unit = KIND_DISPLAY[dimension.quantity as QuantityKind];
      return [unit ? value / unit.divisor : value];
    }
    const choice = dimension.values[value];
    const form = chooseForm(dimension);
    if (form === 'number') {
      const unit = dimension.quantity === undefined ? undefined : KIND_DISPLAY[dimension.quantity as QuantityKind];
      return [typeof choice === 'number' ? (unit ? choice / unit.divisor : choice) : null];
    }
    const label = dimension.labels[value] ?? null;
    if (form === 'wire') return [label, isWire(choice) ? bareDiameterOf(choice) / 1e-3 : null];
    return [label];
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
