/**
 * Sobol indices of every dimension of a design space on chosen metrics and on feasibility, evaluated through a
 * BatchEvaluator (the sweep's worker pool, or in-process). Unit coordinates map to dimension values exactly as
 * the sweep maps them (dimensionValue: ranges, steps and discrete choices alike).
 *
 * The rows of the Saltelli design are evaluated in batches ({@link saltelliTask}), recorded into
 * {@link SaltelliOutputs} ({@link recordSaltelliRows}) and turned into indices ({@link sensitivityOf}); the
 * run layer journals the recorded rows so a stopped or sharded study gives the same indices.
 *
 * Feasibility: every row is a feasible candidate of the sweep or not (built, evaluated, every constraint
 * met, every objective available: the yield's definition in optimize/tolerance). The 0/1 indicator is
 * defined at every point, so its indices use all N samples.
 *
 * Metrics that are null at some points (a design that cannot be built, a metric it cannot have): the
 * estimators combine the k + 2 rows of a sample j (A, B and every AB⁽ⁱ⁾ at j), so a sample whose metric is
 * null in any of its rows is left out whole ("complete blocks"); the indices are those of the metric over
 * the samples kept. Where the region with the metric is a box (a product of ranges of the fields), a sample
 * is kept exactly when its A and B rows lie in the box, so the kept samples are a Saltelli design of the
 * inputs conditioned on the box and the indices are exactly the conditional ones (tested); in any other
 * region the conditioned inputs are not independent and the indices are only indicative: `basis` says which
 * case applies. Designs that are built but miss a constraint keep their metric and count as usual.
 */
import { METRIC_KEYS, metricIndex } from '../../core/metrics.ts';
import { dimensionValue, type SpaceDefinition } from '../design-space.ts';
import { type BatchEvaluator, type BatchResult, type BatchTask, STATUS_OK } from '../evaluate-batch.ts';
import { type MetricBounds, totalViolation } from '../pareto/constraint-violation.ts';
import { SaltelliDesign, type SobolIndices, type SobolOptions, sobolIndices } from './saltelli.ts';

/** A bound on a metric that decides feasibility. */
export interface SensitivityConstraint extends MetricBounds {
  metric: string;
}

/** What a sensitivity study evaluates: the space, the metrics, and what makes a row feasible. */
export interface SensitivityPlan {
  definition: SpaceDefinition;
  /** Base samples N; the design has N·(k + 2) rows. */
  samples: number;
  metrics: readonly string[];
  constraints: readonly SensitivityConstraint[];
  /** Metrics a feasible row must have (the sweep's objectives). */
  required: readonly string[];
}

/** A row's outcome: not built or not evaluated, built but infeasible, or a feasible candidate. */
export const ROW_IMPOSSIBLE = 0;
export const ROW_INFEASIBLE = 1;
export const ROW_FEASIBLE = 2;

/** The recorded rows of a Saltelli design: per metric its value (NaN where null), and each row's outcome. */
export class SaltelliOutputs {
  readonly size: number;
  readonly values: Float64Array[];
  readonly outcome: Uint8Array;
  /** 1 where the row has been recorded. */
  readonly recorded: Uint8Array;

  constructor(metricCount: number, size: number) {
    this.size = size;
    this.values = Array.from({ length: metricCount }, () => new Float64Array(size).fill(Number.NaN));
    this.outcome = new Uint8Array(size);
    this.recorded = new Uint8Array(size);
  }

  /** Rows [start, end) that have not been recorded, as [start, count] runs. */
  missingRuns(start: number, end: number): [number, number][] {
    const runs: [number, number][] = [];
    for (let r = start; r < end; r++) {
      if (this.recorded[r]) continue;
      const last = runs[runs.length - 1];
      if (last && last[0] + last[1] === r) last[1]++;
      else runs.push([r, 1]);
    }
    return runs;
  }
}

/** The values task of rows [start, start + count) of the design. */
export function saltelliTask(
  definition: SpaceDefinition,
  design: SaltelliDesign,
  start: number,
  count: number,
): BatchTask {
  const k = definition.dimensions.length;
  const values = new Float64Array(count * k);
  const unit = new Float64Array(k);
  for (let row = 0; row < count; row++) {
    design.pointAt(start + row, unit);
    for (let d = 0; d < k; d++) values[row * k + d] = dimensionValue(definition.dimensions[d], unit[d]);
  }
  return { kind: 'values', values, count };
}

/** The metric columns of a plan: its metrics, its constraints' and its required ones. */
export function planColumns(plan: SensitivityPlan) {
  const column = (metric: string) => {
    const index = metricIndex(metric);
    if (index < 0) throw new RangeError(`metric: unknown metric ${metric}`);
    return index;
  };
  return {
    metrics: plan.metrics.map(column),
    constraints: plan.constraints.map((c) => column(c.metric)),
    required: plan.required.map(column),
  };
}

/** Records the evaluated rows [start, start + result.count) into `outputs`. */
export function recordSaltelliRows(
  plan: SensitivityPlan,
  outputs: SaltelliOutputs,
  start: number,
  result: BatchResult,
): void {
  const columns = planColumns(plan);
  const width = METRIC_KEYS.length;
  const bounds = new Float64Array(columns.constraints.length);
  for (let row = 0; row < result.count; row++) {
    const r = start + row;
    const offset = row * width;
    for (let m = 0; m < columns.metrics.length; m++) outputs.values[m][r] = result.metrics[offset + columns.metrics[m]];
    let outcome = ROW_IMPOSSIBLE;
    if (result.status[row] === STATUS_OK) {
      for (let c = 0; c < bounds.length; c++) bounds[c] = result.metrics[offset + columns.constraints[c]];
      let ok = totalViolation(bounds, plan.constraints) === 0;
      for (const column of columns.required) ok &&= Number.isFinite(result.metrics[offset + column]);
      outcome = ok ? ROW_FEASIBLE : ROW_INFEASIBLE;
    }
    outputs.outcome[r] = outcome;
    outputs.recorded[r] = 1;
  }
}

export interface MetricSensitivity {
  metric: string;
  /** Samples (of N) whose k + 2 rows all had the metric. */
  kept: number;
  /** 'all': every sample kept; 'complete-blocks': samples with a null row left out whole (see the module). */
  basis: 'all' | 'complete-blocks';
  indices: SobolIndices | null;
}

export interface FeasibilitySensitivity {
  /** Rows of A and B (2N points drawn independently over the space) that are feasible candidates. */
  feasible: number;
  /** Rows of A and B that could not be built or evaluated. */
  impossible: number;
  /** 2N. */
  points: number;
  /** Indices of the 0/1 feasibility indicator over all N samples; null when it does not vary. */
  indices: SobolIndices | null;
}

export interface SpaceSensitivity {
  metrics: MetricSensitivity[];
  feasibility: FeasibilitySensitivity;
}

function indicesOrNull(values: Float64Array, k: number, options: SobolOptions): SobolIndices | null {
  try {
    return sobolIndices(values, k, options);
  } catch {
    return null; // no variance
  }
}

/** The indices of every metric and of feasibility from fully recorded outputs. */
export function sensitivityOf(
  plan: SensitivityPlan,
  outputs: SaltelliOutputs,
  options: SobolOptions = {},
): SpaceSensitivity {
  const k = plan.definition.dimensions.length;
  const n = plan.samples;
  if (outputs.size !== n * (k + 2)) throw new RangeError(`sensitivityOf: ${outputs.size} rows do not fit N = ${n}`);
  const metrics = plan.metrics.map((metric, m): MetricSensitivity => {
    const all = outputs.values[m];
    const keep: number[] = [];
    for (let j = 0; j < n; j++) {
      let finite = true;
      for (let b = 0; b < k + 2 && finite; b++) finite = Number.isFinite(all[b * n + j]);
      if (finite) keep.push(j);
    }
    const basis = keep.length === n ? 'all' : 'complete-blocks';
    if (keep.length < 2) return { metric, kept: keep.length, basis, indices: null };
    const packed = new Float64Array(keep.length * (k + 2));
    for (let b = 0; b < k + 2; b++) {
      for (let t = 0; t < keep.length; t++) packed[b * keep.length + t] = all[b * n + keep[t]];
    }
    return { metric, kept: keep.length, basis, indices: indicesOrNull(packed, k, options) };
  });
  const indicator = new Float64Array(outputs.size);
  let feasible = 0;
  let impossible = 0;
  for (let r = 0; r < outputs.size; r++) {
    indicator[r] = outputs.outcome[r] === ROW_FEASIBLE ? 1 : 0;
    if (r < 2 * n) {
      feasible += indicator[r];
      impossible += outputs.outcome[r] === ROW_IMPOSSIBLE ? 1 : 0;
    }
  }
  const feasibility = { feasible, impossible, points: 2 * n, indices: indicesOrNull(indicator, k, options) };
  return { metrics, feasibility };
}

/** Evaluates the N·(k + 2) Saltelli rows in memory, in batches of `batchSize`, and estimates the indices. */
export async function spaceSensitivity(
  plan: SensitivityPlan,
  evaluator: BatchEvaluator,
  options: SobolOptions & { batchSize?: number } = {},
): Promise<SpaceSensitivity> {
  const k = plan.definition.dimensions.length;
  const design = new SaltelliDesign(k, plan.samples, plan.definition.seed);
  const outputs = new SaltelliOutputs(plan.metrics.length, design.size);
  const batchSize = options.batchSize ?? 256;
  const pending: Promise<void>[] = [];
  for (let start = 0; start < design.size; start += batchSize) {
    const count = Math.min(batchSize, design.size - start);
    const task = saltelliTask(plan.definition, design, start, count);
    pending.push(evaluator.evaluate(task).then((result) => recordSaltelliRows(plan, outputs, start, result)));
  }
  await Promise.all(pending);
  return sensitivityOf(plan, outputs, options);
}
