/**
 * A BatchEvaluator that cuts a large `values` task into chunks of at most `chunkSize` designs, sends
 * them to the underlying evaluator at once (the worker pool runs them in parallel) and joins the
 * answers in order, so the caller sees one result exactly as if the task had gone whole.
 */
import type { BatchEvaluator, BatchResult, BatchTask } from './evaluate-batch.ts';

export function splitValuesTasks(evaluator: BatchEvaluator, chunkSize: number): BatchEvaluator {
  if (!Number.isInteger(chunkSize) || chunkSize < 1)
    throw new RangeError(`splitValuesTasks: chunkSize must be a whole number of at least 1, got ${chunkSize}`);
  return {
    close: () => evaluator.close(),
    evaluate: async (task: BatchTask): Promise<BatchResult> => {
      if (task.kind !== 'values' || task.count <= chunkSize) return evaluator.evaluate(task);
      const width = task.values.length / Math.max(1, task.count);
      const chunks: Promise<BatchResult>[] = [];
      for (let first = 0; first < task.count; first += chunkSize) {
        const count = Math.min(chunkSize, task.count - first);
        const values = task.values.slice(first * width, (first + count) * width);
        chunks.push(evaluator.evaluate({ kind: 'values', values, count }));
      }
      return joinResults(await Promise.all(chunks), task.count);
    },
  };
}

/** The results of consecutive chunks as one result (reasons renumbered to the joined rows). */
export function joinResults(parts: readonly BatchResult[], count: number): BatchResult {
  const first = parts[0];
  if (!first) throw new RangeError('joinResults: no parts');
  const valueWidth = first.values.length / Math.max(1, first.count);
  const metricWidth = first.metrics.length / Math.max(1, first.count);
  const joined: BatchResult = {
    start: -1,
    count,
    values: new Float64Array(count * valueWidth),
    metrics: new Float64Array(count * metricWidth),
    status: new Uint8Array(count),
    reasons: [],
    warningMasks: new Uint32Array(count),
  };
  let row = 0;
  for (const part of parts) {
    joined.values.set(part.values, row * valueWidth);
    joined.metrics.set(part.metrics, row * metricWidth);
    joined.status.set(part.status, row);
    joined.warningMasks.set(part.warningMasks, row);
    for (const [r, reason] of part.reasons) joined.reasons.push([row + r, reason]);
    row += part.count;
  }
  if (row !== count) throw new RangeError(`joinResults: the parts hold ${row} rows, expected ${count}`);
  return joined;
}
