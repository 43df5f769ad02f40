/**
 * The tolerance study of one candidate: its `draws` builds (the common random numbers of ToleranceDraws)
 * evaluated through a BatchEvaluator, the yield, the fraction of builds that would be feasible candidates
 * of the sweep (built, evaluated, every constraint met, every objective available), with its Wilson
 * interval [wilson1927], and the 5 %, 50 % and 95 % quantiles of chosen metrics over the builds that have
 * them (linear interpolation between order statistics, Hyndman & Fan 1996 definition 7 [hyndman1996]).
 * A pure function of the space, the candidate, the seed and the draw count.
 */
import { METRIC_KEYS, metricIndex } from '../../core/metrics.ts';
import { STATUS_OK, type BatchEvaluator, type BatchResult } from '../evaluate-batch.ts';
import { totalViolation } from '../pareto/constraint-violation.ts';
import type { ToleranceConstraint, ToleranceSpace } from '../space-definition.ts';
import { type ProportionInterval, wilsonInterval } from '../sensitivity/wilson.ts';
import { sortedQuantile } from './quantile.ts';
import { ToleranceDraws } from './tolerance-draws.ts';
import { drawRow } from './tolerance-space.ts';

export { sortedQuantile };

export interface ToleranceSettings {
  draws: number;
  seed: number;
  constraints: readonly ToleranceConstraint[];
  /** Metrics that must be available for a build to count (the sweep's objectives). */
  required: readonly string[];
  /** Metrics whose quantiles are reported. */
  metrics: readonly string[];
  /** Rows per evaluator task (default 32). */
  batchSize?: number;
}

export interface MetricQuantiles {
  metric: string;
  /** Builds that have the metric. */
  kept: number;
  p05: number | null;
  p50: number | null;
  p95: number | null;
}

export interface CandidateTolerance {
  draws: number;
  /** Builds that would be feasible candidates. */
  passing: number;
  /** Builds that could not be built or evaluated (impossible geometry, no tuning, a failed evaluation). */
  impossible: number;
  /** Those builds by the field their reason names (`primary.tap_turns`), in order of the field name. */
  impossibleBy: Record<string, number>;
  yield: ProportionInterval;
  quantiles: MetricQuantiles[];
}

/** Evaluates the draws of one candidate (its base values) and summarises them. */
export async function candidateTolerance(
  space: ToleranceSpace,
  evaluator: BatchEvaluator,
  baseValues: ArrayLike<number>,
  settings: ToleranceSettings,
): Promise<CandidateTolerance> {
  const { draws } = settings;
  if (!Number.isInteger(draws) || draws < 1)
    throw new RangeError(`candidateTolerance: draws must be ≥ 1, got ${draws}`);
  const sampler = new ToleranceDraws(space.fields, settings.seed);
  const width = space.definition.dimensions.length;
  const batchSize = settings.batchSize ?? 32;
  const constraintColumns = settings.constraints.map((c) => metricIndex(c.metric));
  const requiredColumns = settings.required.map((m) => metricIndex(m));
  const metricColumns = settings.metrics.map((m) => metricIndex(m));
  const outputs = settings.metrics.map(() => new Float64Array(draws).fill(Number.NaN));
  const passes = new Uint8Array(draws);
  const impossible = new Uint8Array(draws);
  const z = new Float64Array(space.fields.length);
  const pending: Promise<void>[] = [];
  const metricCount = METRIC_KEYS.length;
  const constraintValues = new Float64Array(constraintColumns.length);
  const reasonCounts = new Map<string, number>();
  const record = (start: number, result: BatchResult) => {
    for (let row = 0; row < result.count; row++) {
      const j = start + row;
      const offset = row * metricCount;
      for (let m = 0; m < metricColumns.length; m++) outputs[m][j] = result.metrics[offset + metricColumns[m]];
      if (result.status[row] !== STATUS_OK) {
        impossible[j] = 1;
        const reason = result.reasons.find(([r]) => r === row)?.[1] ?? 'not evaluated';
        const where = reason.split(':')[0];
        reasonCounts.set(where, (reasonCounts.get(where) ?? 0) + 1);
        continue;
      }
      for (let c = 0; c < constraintColumns.length; c++)
        constraintValues[c] = result.metrics[offset + constraintColumns[c]];
      let ok = totalViolation(constraintValues, settings.constraints) === 0;
      for (const column of requiredColumns) ok &&= Number.isFinite(result.metrics[offset + column]);
      passes[j] = ok ? 1 : 0;
    }
  };
  for (let start = 0; start < draws; start += batchSize) {
    const count = Math.min(batchSize, draws - start);
    const values = new Float64Array(count * width);
    for (let row = 0; row < count; row++) {
      sampler.deviatesAt(start + row, z);
      drawRow(space, baseValues, z, values, row * width);
    }
    pending.push(evaluator.evaluate({ kind: 'values', values, count }).then((result) => record(start, result)));
  }
  await Promise.all(pending);
  let passing = 0;
  let failed = 0;
  for (let j = 0; j < draws; j++) {
    passing += passes[j];
    failed += impossible[j];
  }
  const quantiles = settings.metrics.map((metric, m): MetricQuantiles => {
    const kept = Array.from(outputs[m]).filter((v) => Number.isFinite(v));
    kept.sort((a, b) => a - b);
    if (kept.length === 0) return { metric, kept: 0, p05: null, p50: null, p95: null };
    return {
      metric,
      kept: kept.length,
      p05: sortedQuantile(kept, 0.05),
      p50: sortedQuantile(kept, 0.5),
      p95: sortedQuantile(kept, 0.95),
    };
  });
  const impossibleBy: Record<string, number> = {};
  for (const key of [...reasonCounts.keys()].sort()) impossibleBy[key] = reasonCounts.get(key) ?? 0;
  return { draws, passing, impossible: failed, impossibleBy, yield: wilsonInterval(passing, draws), quantiles };
}
