/**
 * Sobol indices of every dimension of a design space on chosen metrics, evaluated through a BatchEvaluator
 * (the sweep's worker pool, or in-process). Unit coordinates map to dimension values exactly as the sweep
 * maps them (dimensionValue: ranges, steps and discrete choices alike).
 *
 * Null metrics: a sample j whose metric is null (NaN) in any of its k + 2 rows is dropped for that metric
 * (the estimators need matched rows); the count kept is reported, and a metric with fewer than 2 kept
 * samples, or no variance, gets null indices.
 */
import { METRIC_KEYS } from '../../core/metrics.ts';
import { dimensionValue, type SpaceDefinition } from '../design-space.ts';
import type { BatchEvaluator } from '../evaluate-batch.ts';
import { SaltelliDesign, type SobolIndices, type SobolOptions, sobolIndices } from './saltelli.ts';

export interface MetricSensitivity {
  metric: string;
  /** Samples (of N) whose rows all had the metric. */
  kept: number;
  indices: SobolIndices | null;
}

/** Evaluates the N·(k + 2) Saltelli rows in batches of `batchSize` and estimates the indices per metric. */
export async function spaceSensitivity(
  definition: SpaceDefinition,
  evaluator: BatchEvaluator,
  metrics: readonly string[],
  samples: number,
  options: SobolOptions & { batchSize?: number } = {},
): Promise<MetricSensitivity[]> {
  const k = definition.dimensions.length;
  const design = new SaltelliDesign(k, samples, definition.seed);
  const columns = metrics.map((metric) => {
    const column = METRIC_KEYS.indexOf(metric as (typeof METRIC_KEYS)[number]);
    if (column < 0) throw new RangeError(`metric: unknown metric ${metric}`);
    return column;
  });
  const outputs = metrics.map(() => new Float64Array(design.size));
  const batchSize = options.batchSize ?? 256;
  const unit = new Float64Array(k);
  const pending: Promise<void>[] = [];
  for (let start = 0; start < design.size; start += batchSize) {
    const count = Math.min(batchSize, design.size - start);
    const values = new Float64Array(count * k);
    for (let row = 0; row < count; row++) {
      design.pointAt(start + row, unit);
      for (let d = 0; d < k; d++) values[row * k + d] = dimensionValue(definition.dimensions[d], unit[d]);
    }
    pending.push(
      evaluator.evaluate({ kind: 'values', values, count }).then((result) => {
        for (let row = 0; row < count; row++) {
          for (let m = 0; m < columns.length; m++) {
            outputs[m][start + row] = result.metrics[row * METRIC_KEYS.length + columns[m]];
          }
        }
      }),
    );
  }
  await Promise.all(pending);
  return metrics.map((metric, m) => {
    const all = outputs[m];
    const keep: number[] = [];
    for (let j = 0; j < samples; j++) {
      let finite = true;
      for (let b = 0; b < k + 2 && finite; b++) finite = Number.isFinite(all[b * samples + j]);
      if (finite) keep.push(j);
    }
    if (keep.length < 2) return { metric, kept: keep.length, indices: null };
    const packed = new Float64Array(keep.length * (k + 2));
    for (let b = 0; b < k + 2; b++) {
      for (let t = 0; t < keep.length; t++) packed[b * keep.length + t] = all[b * samples + keep[t]];
    }
    try {
      return { metric, kept: keep.length, indices: sobolIndices(packed, k, options) };
    } catch {
      return { metric, kept: keep.length, indices: null };
    }
  });
}
