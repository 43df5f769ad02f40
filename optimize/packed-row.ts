/**
 * A kept candidate's row, packed: its dimension values and every metric in one Float64Array (NaN
 * where a metric is null), with its status, reason and warning count. About a third of the memory of
 * the same row in plain arrays, so the bounded store of a long sweep stays small; written to
 * checkpoints as plain JSON (null for NaN) and revived on resume.
 */
import type { CandidateRow } from './sweep-state.ts';

export class PackedRow {
  constructor(
    /** Dimension values, then metrics in METRIC_KEYS order; NaN for null. */
    readonly packed: Float64Array,
    readonly dimensions: number,
    readonly status: number,
    readonly reason: string | null,
    readonly warnings: number,
  ) {}

  /** Plain JSON: the numbers as one comma-separated string (shortest exact form; empty for NaN), so
   * a checkpoint of many rows does not first build an array of boxed numbers for each. */
  toJSON(): PackedRowData {
    let text = '';
    for (let i = 0; i < this.packed.length; i++) {
      const value = this.packed[i]!;
      text += `${i > 0 ? ',' : ''}${Number.isFinite(value) ? String(value) : ''}`;
    }
    return { packed: text, dimensions: this.dimensions, status: this.status, reason: this.reason, warnings: this.warnings };
  }

  static revive(data: PackedRowData): PackedRow {
    const numbers = data.packed === '' ? [] : data.packed.split(',');
    const packed = new Float64Array(numbers.length);
    numbers.forEach((text, i) => (packed[i] = text === '' ? Number.NaN : Number(text)));
    return new PackedRow(packed, data.dimensions, data.status, data.reason, data.warnings);
  }
}

export interface PackedRowData {
  /** The numbers, comma-separated, empty for NaN. */
  packed: string;
  dimensions: number;
  status: number;
  reason: string | null;
  warnings: number;
}

/** The packed row of row `row` of a batch result, straight from its arrays. */
export function packResultRow(
  values: Float64Array,
  metrics: Float64Array,
  row: number,
  dimensions: number,
  metricCount: number,
  status: number,
  reason: string | null,
  warnings: number,
): PackedRow {
  const packed = new Float64Array(dimensions + metricCount);
  packed.set(values.subarray(row * dimensions, (row + 1) * dimensions), 0);
  packed.set(metrics.subarray(row * metricCount, (row + 1) * metricCount), dimensions);
  return new PackedRow(packed, dimensions, status, reason, warnings);
}

/** Packs a row. */
export function packRow(row: CandidateRow): PackedRow {
  const packed = new Float64Array(row.values.length + row.metrics.length);
  packed.set(row.values, 0);
  row.metrics.forEach((value, m) => (packed[row.values.length + m] = value === null ? Number.NaN : value));
  return new PackedRow(packed, row.values.length, row.status, row.reason, row.warnings);
}

/** The plain row of a packed one. */
export function unpackRow(row: PackedRow): CandidateRow {
  return {
    values: Array.from(row.packed.subarray(0, row.dimensions)),
    metrics: Array.from(row.packed.subarray(row.dimensions), (v) => (Number.isFinite(v) ? v : null)),
    status: row.status,
    reason: row.reason,
    warnings: row.warnings,
  };
}
