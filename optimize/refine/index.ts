/**
 * The refinement engine: Nelder–Mead with Deb's feasibility order, Chebyshev scalarisation over a
 * front, and a neighbour pass over discrete parameters with a shared evaluation cache. Pure
 * algorithms: no physics, no I/O, no threads; evaluation comes in as an async batch function.
 *
 * Driving many starts through one pool (sketch; `pool.evaluate` returns, per point, the
 * objectives to minimise and the total violation):
 *
 * ```ts
 * const batch = coalesceBatches((points: MixedPoint[]) => pool.evaluate(points), { maxBatchSize: 512 });
 * const cache = new EvaluationCache(batch);                      // shared: no design twice
 * const plan = planChebyshevStarts(frontObjectives, 16);         // starts, weights, reference
 * const results = await refineStarts(
 *   plan.starts.map((s) => frontDesigns[s.frontIndex]),          // { continuous, levels }
 *   cache,
 *   (i) => (record) => ({
 *     violation: record.violation,
 *     value: chebyshevMerit(record.objectives, plan.starts[i].weights, plan.reference, plan.nadir),
 *   }),
 *   { levelCounts, maxEvaluations: Math.floor(totalBudget / plan.starts.length) },
 * );
 * const everything = cache.entries();                            // every design evaluated, for the front merge
 * ```
 */

// --- merits and their order ---
export { compareMerits, isBetterMerit, isFeasibleMerit, meritDistance, toMerit, WORST_MERIT } from './merit.ts';
export type { Merit } from './merit.ts';

// --- Nelder–Mead ---
export { NelderMead, nelderMeadCoefficients } from './nelder-mead.ts';
export type { MinimizeResult, MinimizeStatus, NelderMeadCoefficients, NelderMeadOptions } from './nelder-mead.ts';
export { minimize, minimizeAsync, minimizeManyAsync } from './minimize.ts';
export type { BatchObjective, PointObjective } from './minimize.ts';

// --- several objectives ---
export {
  chebyshevMerit,
  chooseStarts,
  frontExtent,
  planChebyshevStarts,
  utopianPoint,
  weightsForFrontPoint,
} from './chebyshev.ts';
export type { ChebyshevOptions, ChebyshevPlan, ChebyshevStart, FrontExtent } from './chebyshev.ts';

// --- mixed variables, caching, batching ---
export { copyMixedPoint, mixedPoint, mixedPointKey } from './mixed-point.ts';
export type { MixedBatchEvaluator, MixedPoint } from './mixed-point.ts';
export { EvaluationCache } from './evaluation-cache.ts';
export type { CachedEvaluation } from './evaluation-cache.ts';
export { coalesceBatches } from './batch-coalescer.ts';
export { StartLedger } from './start-ledger.ts';
export type { MeritOf } from './start-ledger.ts';
export { neighbourPass, neighboursOf } from './neighbour-pass.ts';
export type { NeighbourPassResult } from './neighbour-pass.ts';
export { refineStart, refineStarts } from './refine-start.ts';
export type { RefineStartOptions, RefineStartResult, RefineStartStatus, RefineTraceEntry } from './refine-start.ts';

// --- errors ---
export { refineRangeError, refineStateError } from './refine-errors.ts';
