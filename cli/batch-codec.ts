/**
 * Batch results as plain JSON for the journal (NaN as null), and back.
 */
import type { BatchResult } from '../optimize/evaluate-batch.ts';

export interface EncodedBatch {
  start: number;
  count: number;
  values: Array<number | null>;
  metrics: Array<number | null>;
  status: number[];
  reasons: Array<[number, string]>;
  warnings: number[];
}

const finiteOrNull = (value: number): number | null => (Number.isFinite(value) ? value : null);

export function encodeBatch(result: BatchResult): EncodedBatch {
  return {
    start: result.start,
    count: result.count,
    values: Array.from(result.values, finiteOrNull),
    metrics: Array.from(result.metrics, finiteOrNull),
    status: Array.from(result.status),
    reasons: result.reasons,
    warnings: Array.from(result.warningCounts),
  };
}

export function decodeBatch(encoded: EncodedBatch): BatchResult {
  return {
    start: encoded.start,
    count: encoded.count,
    values: Float64Array.from(encoded.values, (v) => (v === null ? Number.NaN : v)),
    metrics: Float64Array.from(encoded.metrics, (v) => (v === null ? Number.NaN : v)),
    status: Uint8Array.from(encoded.status),
    reasons: encoded.reasons,
    warningCounts: Uint16Array.from(encoded.warnings),
  };
}
