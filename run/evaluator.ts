/**
 * The evaluator a run's commands hand to the engines: the worker pool with `threads` threads, or the
 * in-process evaluator when `threads` is 0 (the tests and a machine without worker threads).
 */
import { DesignSpace, type SpaceDefinition, spaceDefinitionOf } from '../optimize/design-space.ts';
import { type BatchEvaluator, type BatchTask, inProcessEvaluator } from '../optimize/evaluate-batch.ts';
import { createWorkerPool } from '../workers/pool.ts';

/** The pool of `threads` workers over the space of `problem`, or the in-process evaluator for 0. */
export function openEvaluator(
  problem: SpaceDefinition,
  threads: number,
  /** Called for each batch the pool had to retry, with the reason (for the log). */
  onRetry?: (task: BatchTask, reason: string) => void,
): BatchEvaluator {
  if (threads === 0) return inProcessEvaluator(new DesignSpace(spaceDefinitionOf(problem)));
  return createWorkerPool(spaceDefinitionOf(problem), { threads, ...(onRetry ? { onRetry } : {}) });
}
