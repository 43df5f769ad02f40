/**
 * Evaluating a batch of designs into flat typed arrays: the unit of work a worker thread does and
 * the shape its results travel in (transferable Float64Arrays, no per-design objects).
 *
 * Row r of a result holds the dimension values of its design (`values`, D per row), every metric of
 * the contract in METRIC_KEYS order (`metrics`, M per row, NaN where the metric is null) and a status:
 * 0 evaluated; 1 the design cannot be built as given (a DesignProblem: infeasible with its reason);
 * 2 the evaluation failed (it threw, or gave a non-finite metric): infeasible, counted as failed.
 * Reasons travel sparsely as [row, text] pairs.
 */
import { warningMask } from '../core/outcome/warnings.ts';
import { evaluateDesign } from '../core/evaluate.ts';
import { METRIC_KEYS } from '../core/metrics.ts';
import type { DesignSpace } from './design-space.ts';
import { QUANTILE_SLOTS, robustMerits } from './tolerance/robust-yield.ts';
import { must } from '../core/must.ts';

export const STATUS_OK = 0;
export const STATUS_PROBLEM = 1;
export const STATUS_FAILED = 2;

/** A batch of work: consecutive sample indices, or explicit dimension values (refinement). */
export type BatchTask =
  | { kind: 'indices'; start: number; count: number }
  | { kind: 'values'; values: Float64Array; count: number };

export interface BatchResult {
  /** First sample index (indices tasks), or −1. */
  start: number;
  count: number;
  values: Float64Array;
  metrics: Float64Array;
  status: Uint8Array;
  reasons: Array<[number, string]>;
  /** The warnings of each row as a bit mask over WARNING_KEYS (the texts stay in the report). */
  warningMasks: Uint32Array;
}

const METRIC_COUNT = METRIC_KEYS.length;
const BUILD_YIELD = METRIC_KEYS.indexOf('build_yield');
const QUANTILE_COLUMNS = QUANTILE_SLOTS.map((key) => METRIC_KEYS.indexOf(key));

/** Evaluates one batch in this thread. Never throws for a design: failures become status rows. */
export function evaluateBatchTask(
  space: DesignSpace,
  task: BatchTask,
  hooks?: { beforeDesign?: (index: number) => void },
): BatchResult {
  const dimensions = space.dimensionCount;
  const count = task.count;
  const result: BatchResult = {
    start: task.kind === 'indices' ? task.start : -1,
    count,
    values: new Float64Array(count * dimensions),
    metrics: new Float64Array(count * METRIC_COUNT).fill(Number.NaN),
    status: new Uint8Array(count),
    reasons: [],
    warningMasks: new Uint32Array(count),
  };
  const values = new Float64Array(dimensions);
  for (let row = 0; row < count; row++) {
    if (task.kind === 'indices') {
      hooks?.beforeDesign?.(task.start + row);
      space.valuesAt(task.start + row, values);
    } else {
      for (let d = 0; d < dimensions; d++) values[d] = task.values[row * dimensions + d];
    }
    result.values.set(values, row * dimensions);
    try {
      const sampled = space.designOf(values, task.kind === 'indices' ? task.start + row : -1);
      if (!sampled.design) {
        result.status[row] = STATUS_PROBLEM;
        const issue = must(sampled.issue);
        result.reasons.push([row, `${issue.path.join('.')}: ${issue.message}`]);
        continue;
      }
      const evaluation = evaluateDesign(sampled.design);
      if (evaluation.problems.length > 0) {
        result.status[row] = STATUS_PROBLEM;
        const problem = evaluation.problems[0];
        result.reasons.push([row, `${problem.field}: ${problem.reason}`]);
        continue;
      }
      let failure: string | null = null;
      for (let m = 0; m < METRIC_COUNT; m++) {
        const value = evaluation.metrics[METRIC_KEYS[m]];
        if (value === null || value === undefined) continue;
        if (!Number.isFinite(value)) {
          failure = `metric ${METRIC_KEYS[m]} is not finite (${value})`;
          break;
        }
        result.metrics[row * METRIC_COUNT + m] = value;
      }
      result.warningMasks[row] = warningMask(evaluation.warnings);
      // Robust merits: the design's yield and quantiles over the sweep's tolerance draws (optimize/tolerance/robust-yield.ts).
      const robust = space.definition.robust;
      if (robust && failure === null) {
        const merits = robustMerits(robust, values);
        result.metrics[row * METRIC_COUNT + BUILD_YIELD] = merits.buildYield;
        for (let q = 0; q < merits.quantiles.length; q++)
          result.metrics[row * METRIC_COUNT + QUANTILE_COLUMNS[q]] = merits.quantiles[q];
      }
      if (failure) {
        result.metrics.fill(Number.NaN, row * METRIC_COUNT, (row + 1) * METRIC_COUNT);
        result.status[row] = STATUS_FAILED;
        result.reasons.push([row, failure]);
      }
    } catch (error) {
      result.metrics.fill(Number.NaN, row * METRIC_COUNT, (row + 1) * METRIC_COUNT);
      result.status[row] = STATUS_FAILED;
      result.reasons.push([row, `evaluation failed: ${error instanceof Error ? error.message : String(error)}`]);
    }
  }
  return result;
}

/** What optimize/ depends on to evaluate designs: in-process in tests, a worker pool in production. */
export interface BatchEvaluator {
  evaluate(task: BatchTask): Promise<BatchResult>;
  close(): Promise<void>;
}

/** A BatchEvaluator that evaluates in this thread (tests, `--workers 0`). */
export function inProcessEvaluator(space: DesignSpace): BatchEvaluator {
  return {
    evaluate: async (task) => evaluateBatchTask(space, task),
    close: async () => {},
  };
}
