/**
 * A whole refinement of a sweep's result: starts from the best candidates (one objective) or spread
 * over the Pareto front (Chebyshev scalarisations, several objectives), the engine of
 * optimize/refine/ driven through a BatchEvaluator, and the refined designs merged with the front.
 * Deterministic: the same state and budget give the same designs, whatever the number of workers.
 */
import { METRIC_KEYS } from '../core/metrics.ts';
import type { Dimension } from './design-tree.ts';
import type { DesignSpace } from './design-space.ts';
import type { PoolEntry } from './pareto/candidate-pool.ts';
import { packRow, type PackedRow } from './packed-row.ts';
import { STATUS_OK, type BatchEvaluator } from './evaluate-batch.ts';
import { mixedSpaceOf, pointOfValues, valuesOfPoint } from './mixed-space.ts';
import { CandidatePool } from './pareto/candidate-pool.ts';
import { hypervolume, defaultReferencePoint } from './pareto/hypervolume.ts';
import { coalesceBatches } from './refine/batch-coalescer.ts';
import { chebyshevMerit, planChebyshevStarts } from './refine/chebyshev.ts';
import { EvaluationCache } from './refine/evaluation-cache.ts';
import type { Merit } from './refine/merit.ts';
import { mixedPointKey, type MixedPoint } from './refine/mixed-point.ts';
import { refineStarts, type RefineStartResult } from './refine/refine-start.ts';
import type { CandidateRow, SweepState } from './sweep-state.ts';
import { type ShouldStop, stopIfAsked } from './stage-stop.ts';

export interface RefineOptions {
  starts: number;
  /** Total evaluation budget, shared evenly by the starts. */
  evaluations: number;
  /** Hypervolume reference point (minimisation convention), or null for the default from the sweep's front. */
  referencePoint: number[] | null;
  /** Batch size of pool tasks. */
  batchSize: number;
  /** Polled before each pool task: true stops the stage with StageStopped (a refine runs again from the start). */
  shouldStop?: ShouldStop;
}

interface RefineRecord {
  row: CandidateRow;
  violation: number;
  objectives: Float64Array | null;
}

export interface RefineOutcome {
  /** Every feasible design the refinement evaluated, ranked, with exact dimension values. */
  refined: CandidatePool<PackedRow>;
  /** The sweep's front merged with the refined designs (non-dominated feasible set). */
  merged: CandidatePool<PackedRow>;
  hypervolumeBefore: number | null;
  hypervolumeAfter: number | null;
  referencePoint: number[] | null;
  evaluations: number;
  startResults: RefineStartResult[];
}

export async function refineSweep(
  designSpace: DesignSpace,
  state: SweepState,
  sampleCount: number,
  evaluator: BatchEvaluator,
  options: RefineOptions,
): Promise<RefineOutcome> {
  const dimensions: readonly Dimension[] = designSpace.definition.dimensions;
  const space = mixedSpaceOf(dimensions);
  const evaluateMixed = mixedEvaluator(dimensions, space, state, evaluator, options.shouldStop);
  const cache = new EvaluationCache<RefineRecord>(coalesceBatches(evaluateMixed, { maxBatchSize: options.batchSize }));

  // Starts and their merits.
  const feasible = state.pool.front();
  const before = feasible.map((entry) => entry.item.objectives);
  const reference = options.referencePoint
    ? Float64Array.from(options.referencePoint)
    : before.length > 0
      ? defaultReferencePoint(before)
      : null;
  const { startValues, meritOfStart } = startsOf(state, feasible, options.starts);
  const budget = Math.max(dimensions.length + 2, Math.floor(options.evaluations / Math.max(1, startValues.length)));
  const startPoints = startValues.map((values) => pointOfValues(dimensions, space, values));
  const startResults = await refineStarts(
    startPoints.map((point) => ({ continuous: point.continuous, levels: point.levels })),
    cache,
    meritOfStart,
    { levelCounts: space.levelCounts, maxEvaluations: budget },
  );

  const { refined, merged } = refinedPools(cache, state, feasible, sampleCount);
  const after = merged.front().map((entry) => entry.item.objectives);
  return {
    refined,
    merged,
    hypervolumeBefore: reference && before.length > 0 ? hypervolume(before, reference) : null,
    hypervolumeAfter: reference && after.length > 0 ? hypervolume(after, reference) : null,
    referencePoint: reference ? Array.from(reference) : null,
    evaluations: cache.evaluations,
    startResults,
  };
}

/** The evaluator of mixed points: dimension values to the pool as one 'values' task per chunk. */
function mixedEvaluator(
  dimensions: readonly Dimension[],
  space: ReturnType<typeof mixedSpaceOf>,
  state: SweepState,
  evaluator: BatchEvaluator,
  shouldStop: ShouldStop | undefined,
): (points: MixedPoint[]) => Promise<RefineRecord[]> {
  const metricCount = METRIC_KEYS.length;
  return async (points) => {
    stopIfAsked(shouldStop, 'refine');
    const values = new Float64Array(points.length * dimensions.length);
    points.forEach((point, i) => {
      values.set(valuesOfPoint(dimensions, space, point), i * dimensions.length);
    });
    const result = await evaluator.evaluate({ kind: 'values', values, count: points.length });
    return points.map((_, row) => {
      // The sweep's own classification; a design that could not be built or evaluated ranks last.
      const { violation, reason } = state.classifyRow(result, row);
      const ok = result.status[row] === STATUS_OK;
      return {
        violation: ok ? violation : Number.POSITIVE_INFINITY,
        objectives: ok ? state.objectiveVector(result.metrics, row * metricCount) : null,
        row: state.rowOf(result, row, dimensions.length, reason),
      };
    });
  };
}

/**
 * The starts' dimension values and merits: spread over the front by Chebyshev scalarisations (several
 * objectives), else the best ranked candidates by their single objective.
 */
function startsOf(
  state: SweepState,
  feasible: PoolEntry<PackedRow>[],
  starts: number,
): { startValues: number[][]; meritOfStart: (start: number) => (record: RefineRecord) => Merit } {
  const objectiveCount = state.objectives.length;
  // A start's dimension values: its own row, or regenerated from its sample index.
  const valuesOfEntry = (entry: PoolEntry<PackedRow>): number[] =>
    Array.from(entry.payload.packed.subarray(0, entry.payload.dimensions));
  if (objectiveCount >= 2 && feasible.length > 0) {
    const ordered = [...feasible].sort((a, b) => a.item.index - b.item.index);
    const plan = planChebyshevStarts(
      ordered.map((entry) => entry.item.objectives),
      Math.min(starts, ordered.length),
    );
    return {
      startValues: plan.starts.map((start) => valuesOfEntry(ordered[start.frontIndex])),
      meritOfStart: (start) => (record) => ({
        violation: record.violation,
        value: record.objectives
          ? chebyshevMerit(record.objectives, plan.starts[start].weights, plan.reference, plan.nadir)
          : Number.POSITIVE_INFINITY,
      }),
    };
  }
  const ranked = state.pool.ranked(starts);
  return {
    startValues: ranked.map((entry) => valuesOfEntry(entry)),
    meritOfStart: () => (record) => ({
      violation: record.violation,
      value: record.objectives && objectiveCount === 1 ? record.objectives[0] : 0,
    }),
  };
}

/**
 * Every evaluated design, in a deterministic order (by its key), gets an index after the samples: the
 * feasible ones are ranked in `refined` and merged with the sweep's front in `merged`.
 */
function refinedPools(
  cache: EvaluationCache<RefineRecord>,
  state: SweepState,
  feasible: PoolEntry<PackedRow>[],
  sampleCount: number,
): { refined: CandidatePool<PackedRow>; merged: CandidatePool<PackedRow> } {
  const objectiveCount = state.objectives.length;
  const entries = cache
    .entries()
    .map((entry) => ({ key: mixedPointKey(entry.point), entry }))
    .sort((a, b) => (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
  const refined = new CandidatePool<PackedRow>(state.keep, objectiveCount);
  const merged = new CandidatePool<PackedRow>(state.keep, objectiveCount);
  for (const entry of feasible) merged.offer(entry.item, entry.payload);
  entries.forEach(({ entry }, k) => {
    const record = entry.record;
    if (record.violation !== 0 || !record.objectives) return;
    const item = { index: sampleCount + k, violation: 0, objectives: record.objectives };
    const packed = packRow(record.row);
    refined.offer(item, packed);
    merged.offer(item, packed);
  });
  return { refined, merged };
}
