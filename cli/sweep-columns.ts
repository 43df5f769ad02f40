/**
 * The columns of candidates.csv, front.csv, refined.csv and all.csv: ranking columns, every varied
 * parameter, every metric of the contract, each column with its unit in the name
 * (`secondary.form_diameter_mm`, `resonant_frequency_kHz`, `wire_length_m`), whether a parameter was
 * varied as a range or as a set of quantities. The order is stable.
 */
import { warningKeysOf } from '../core/outcome/warnings.ts';
import { METRICS } from '../core/metrics.ts';
import { awgDiameter } from '../core/wire/awg.ts';
import type { Dimension } from '../optimize/design-tree.ts';
import type { CandidateRow } from '../optimize/sweep-state.ts';
import type { Cell } from '../run/csv.ts';
import { KIND_DISPLAY, METRIC_DISPLAY } from './display-units.ts';
import type { QuantityKind } from './units.ts';

export interface ColumnSet {
  header: string[];
  parameterHeaders: string[];
  metricHeaders: string[];
}

/**
 * The column names of one dimension: one; two for a set of wires (the label and the bare diameter);
 * for a set of whole sections the label and then one number column per numeric field.
 */
function headersOf(dimension: Dimension): string[] {
  const name = dimension.path.join('.');
  if (dimension.kind === 'choose' && dimension.wire) return [name, `${name}_bare_diameter_mm`];
  if (dimension.kind === 'choose' && dimension.sectionFields) {
    return [name, ...dimension.sectionFields.map((field) => `${name}.${field.name}${unitSuffix(field.quantity)}`)];
  }
  const quantity = dimension.quantity;
  if (quantity === undefined) return [name];
  const unit = KIND_DISPLAY[quantity as QuantityKind];
  return [unit && unit.label !== '' ? `${name}_${unit.label}` : name];
}

function unitSuffix(quantity: string | null): string {
  const unit = quantity === null ? undefined : KIND_DISPLAY[quantity as QuantityKind];
  return unit && unit.label !== '' ? `_${unit.label}` : '';
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
  const parameterHeaders = dimensions.flatMap(headersOf);
  const metricHeaders = METRICS.map((m) => metricHeader(m.key, m.unit));
  return {
    header: [...RANK_HEADERS, ...parameterHeaders, ...metricHeaders, ...TAIL_HEADERS],
    parameterHeaders,
    metricHeaders,
  };
}

/**
 * The parameter cells of a candidate in display units: a range or a set of quantities as a number
 * (its unit is in the header), any other set by its label, and a set of wires by its label and
 * then its bare diameter in mm.
 */
export function parameterCells(dimensions: readonly Dimension[], values: readonly number[]): Cell[] {
  return dimensions.flatMap((dimension, d): Cell[] => {
    const value = values[d] ?? Number.NaN;
    if (dimension.kind === 'choose') {
      const chosen = dimension.values[value];
      if (dimension.wire) return [dimension.labels[value] ?? null, wireDiameterMm(chosen)];
      if (dimension.sectionFields) {
        // A whole section: its label, then each numeric field in display units (empty where it has none).
        const cells = dimension.sectionFields.map((field): Cell => {
          const number = field.values[value] ?? null;
          const unit = field.quantity === null ? undefined : KIND_DISPLAY[field.quantity as QuantityKind];
          return number === null ? null : unit ? number / unit.divisor : number;
        });
        return [dimension.labels[value] ?? null, ...cells];
      }
      if (dimension.quantity !== undefined && typeof chosen === 'number') {
        const unit = KIND_DISPLAY[dimension.quantity as QuantityKind];
        return [unit ? chosen / unit.divisor : chosen];
      }
      return [dimension.labels[value] ?? null];
    }
    const unit = KIND_DISPLAY[dimension.quantity as QuantityKind];
    return [unit ? value / unit.divisor : value];
  });
}

/** The bare diameter of a wire choice in mm ('AWG n' by the ASTM B258 rule), or null. */
function wireDiameterMm(choice: unknown): number | null {
  if (typeof choice !== 'object' || choice === null) return null;
  const wire = choice as { awg?: number; bareDiameter?: number };
  if (typeof wire.bareDiameter === 'number') return wire.bareDiameter * 1e3;
  if (typeof wire.awg === 'number') return awgDiameter(wire.awg) * 1e3;
  return null;
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
  rank: number | null;
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
