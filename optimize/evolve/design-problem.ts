/**
 * The design space of a sweep as the evolutionary stage sees it: one gene per dimension, in dimension
 * order; a continuous dimension is its unit-cube coordinate (a real field on [0, 1], so log ranges are
 * searched on their log scale), a discrete one (set, integer range, stepped range) its level index.
 * Genomes are evaluated as one `values` task through a BatchEvaluator (the worker pool in production)
 * and scored by the sweep's own rules (objective senses, Deb's constraint violation), so an evolved
 * design ranks exactly as a swept one would.
 */
import type { Dimension } from '../design-tree.ts';
import type { BatchEvaluator, BatchResult } from '../evaluate-batch.ts';
import { type MixedSpace, mixedSpaceOf, pointOfValues, valuesOfPoint } from '../mixed-space.ts';
import type { EvolveProblem, Outcome } from './evolve.ts';
import type { EvolveField } from './operators.ts';

/** How a result row ranks (SweepState.classifyRow has this shape). */
export interface RowScorer {
  classifyRow(result: BatchResult, row: number): { violation: number; objectives: Float64Array };
}

export interface DesignProblem extends EvolveProblem {
  /** The genome of a design's dimension values (continuous clamped into range, levels to the nearest). */
  genomeOf(values: ArrayLike<number>): Float64Array;
  /** The dimension values of a genome. */
  valuesOf(genome: Float64Array): Float64Array;
}

/**
 * @param onResult sees every batch result (with its genomes), e.g. to keep the candidates and write
 *   evolved.csv; called before the outcomes are returned.
 */
export function designProblem(
  dimensions: readonly Dimension[],
  evaluator: BatchEvaluator,
  scorer: RowScorer,
  onResult?: (result: BatchResult, genomes: readonly Float64Array[]) => void | Promise<void>,
): DesignProblem {
  const space: MixedSpace = mixedSpaceOf(dimensions);
  const fields: EvolveField[] = dimensions.map(() => ({ kind: 'real', lower: 0, upper: 1 }));
  space.discrete.forEach((d, i) => {
    fields[d] = { kind: 'levels', count: space.levelCounts[i] };
  });
  const valuesOf = (genome: Float64Array): Float64Array => {
    const continuous = Float64Array.from(space.continuous, (d) => genome[d]);
    const levels = Int32Array.from(space.discrete, (d) => genome[d]);
    return valuesOfPoint(dimensions, space, { continuous, levels });
  };
  const genomeOf = (values: ArrayLike<number>): Float64Array => {
    const point = pointOfValues(dimensions, space, values);
    const genome = new Float64Array(dimensions.length);
    space.continuous.forEach((d, i) => {
      genome[d] = point.continuous[i];
    });
    space.discrete.forEach((d, i) => {
      genome[d] = point.levels[i];
    });
    return genome;
  };
  return {
    fields,
    genomeOf,
    valuesOf,
    evaluate: async (genomes): Promise<Outcome[]> => {
      const count = genomes.length;
      const values = new Float64Array(count * dimensions.length);
      genomes.forEach((genome, row) => {
        values.set(valuesOf(genome), row * dimensions.length);
      });
      const result = await evaluator.evaluate({ kind: 'values', values, count });
      await onResult?.(result, genomes);
      return genomes.map((_, row) => {
        const { violation, objectives } = scorer.classifyRow(result, row);
        return { violation, objectives };
      });
    },
  };
}
