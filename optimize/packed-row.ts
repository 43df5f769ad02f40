/**
 * A kept candidate's row, packed: its dimension values and every metric in one Float64Array (NaN
 * where a metric is null), with its status, reason and warning mask. About a third of the memory of
 * the same row in plain arrays, so the bounded store of a long sweep stays small; written to
 * checkpoints as plain JSON (null for NaN) and revived on resume.
 */

/** One candidate as stored: its dimension values, every metric (null where none), status and reason. */
export interface CandidateRow {
  values: number[];
  metrics: Array<number | null>;
  status: number;
  reason: string | null;
  /** The row's warnings as a bit mask over WARNING_KEYS (core/outcome/warnings.ts). */
  warningMask: number;
}

export class PackedRow {
  constructor(
    /** Dimension values, then metrics in METRIC_KEYS order; NaN for null. */
    readonly packed: Float64Array,
    readonly dimensions: number,
    readonly status: number,
    readonly reason: string | null,
    readonly warningMask: number,
  ) {}

  toJSON(): PackedRowData {
    return {
      packed: Array.from(this.packed, (v) => (Number.isFinite(v) ? v : null)),
      dimensions: this.dimensions,
      status: this.status,
      reason: this.reason,
      warningMask: this.warningMask,
    };
  }

  static revive(data: PackedRowData): PackedRow {
    return new PackedRow(
      Float64Array.from(data.packed, (v) => (v === null ? Number.NaN : v)),
      data.dimensions,
      data.status,
      data.reason,
      data.warningMask,
    );
  }
}

export interface PackedRowData {
  packed: Array<number | null>;
  dimensions: number;
  status: number;
  reason: string | null;
  /** Bit mask over WARNING_KEYS. */
  warningMask: number;
}

/** Packs a row. */
export function packRow(row: CandidateRow): PackedRow {
  const packed = new Float64Array(row.values.length + row.metrics.length);
  packed.set(row.values, 0);
  row.metrics.forEach((value, m) => {
    packed[row.values.length + m] = value === null ? Number.NaN : value;
  });
  return new PackedRow(packed, row.values.length, row.status, row.reason, row.warningMask);
}

/** The plain row of a packed one. */
export function unpackRow(row: PackedRow): CandidateRow {
  return {
    values: Array.from(row.packed.subarray(0, row.dimensions)),
    metrics: Array.from(row.packed.subarray(row.dimensions), (v) => (Number.isFinite(v) ? v : null)),
    status: row.status,
    reason: row.reason,
    warningMask: row.warningMask,
  };
}
