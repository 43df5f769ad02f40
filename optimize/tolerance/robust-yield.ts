/**
 * Robust merits inside a sweep, over a few tolerance draws (the same common random numbers as
 * `coilfront tolerance`, draws 0 … n − 1):
 * - `build_yield`: the fraction of the draws that would be feasible candidates: built, evaluated, every
 *   constraint met, every required metric available;
 * - `build_quantile_k`: quantile p of a metric over the draws that have it (linear interpolation between
 *   order statistics, Hyndman & Fan 1996 definition 7 [hyndman1996], as the tolerance study computes it).
 * Evaluated in the worker with the design, so they cost n more evaluations per design, and refine and
 * evolve see the same merits. A pure function of the design's values, the tolerances and the seed.
 */
import { evaluateDesign } from '../../core/evaluate.ts';
import { DesignSpace } from '../design-space.ts';
import { totalViolation } from '../pareto/constraint-violation.ts';
import { ToleranceDraws } from './tolerance-draws.ts';
import { sortedQuantile } from './quantile.ts';
import type { RobustDefinition } from '../space-definition.ts';
import { drawRow } from './tolerance-space.ts';

/** The metric columns of the quantile merits, in slot order (core/metrics.ts). */
export const QUANTILE_SLOTS: readonly string[] = [
  'build_quantile_1',
  'build_quantile_2',
  'build_quantile_3',
  'build_quantile_4',
];

/** Whether a metric is a robust merit (computed over the draws, never a build's own metric). */
export function isRobustMetric(metric: string): boolean {
  return metric === 'build_yield' || QUANTILE_SLOTS.includes(metric);
}

/** The robust merits of one design. */
export interface RobustMerits {
  buildYield: number;
  /** One per quantile merit; NaN where no draw has the metric. */
  quantiles: number[];
}

interface Prepared {
  space: DesignSpace;
  deviates: Float64Array[];
  row: Float64Array;
}

const prepared = new WeakMap<RobustDefinition, Prepared>();

function prepare(robust: RobustDefinition): Prepared {
  let ready = prepared.get(robust);
  if (!ready) {
    const draws = new ToleranceDraws(robust.tolerance.fields, robust.seed);
    const deviates = Array.from({ length: robust.draws }, (_, j) => {
      const z = new Float64Array(robust.tolerance.fields.length);
      draws.deviatesAt(j, z);
      return z;
    });
    const space = new DesignSpace(robust.tolerance.definition);
    ready = { space, deviates, row: new Float64Array(robust.tolerance.definition.dimensions.length) };
    prepared.set(robust, ready);
  }
  return ready;
}

/** The metrics of one build, or null where it cannot be built or evaluated (a problem, a throw, a non-finite metric). */
function buildMetrics(space: DesignSpace, row: Float64Array): Record<string, number | null> | null {
  const sampled = space.designOf(row);
  if (!sampled.design) return null;
  let evaluation: ReturnType<typeof evaluateDesign>;
  try {
    evaluation = evaluateDesign(sampled.design);
  } catch {
    return null;
  }
  if (evaluation.problems.length > 0) return null;
  for (const value of Object.values(evaluation.metrics)) if (value !== null && !Number.isFinite(value)) return null;
  return evaluation.metrics;
}

/** Whether an evaluated build passes: constraints met, required metrics available. */
function buildPasses(robust: RobustDefinition, metrics: Record<string, number | null>): boolean {
  const values = robust.constraints.map((c) => metrics[c.metric] ?? null);
  if (totalViolation(values, robust.constraints) > 0) return false;
  return robust.required.every((key) => metrics[key] !== null && metrics[key] !== undefined);
}

/** The robust merits of a design with these sweep values. */
export function robustMerits(robust: RobustDefinition, values: ArrayLike<number>): RobustMerits {
  const { space, deviates, row } = prepare(robust);
  const quantiles = robust.quantiles ?? [];
  const samples = quantiles.map(() => [] as number[]);
  let passing = 0;
  for (const z of deviates) {
    drawRow(robust.tolerance, values, z, row);
    const metrics = buildMetrics(space, row);
    if (metrics === null) continue;
    if (buildPasses(robust, metrics)) passing++;
    for (let q = 0; q < quantiles.length; q++) {
      const value = metrics[quantiles[q].metric];
      if (value !== null && value !== undefined) samples[q].push(value);
    }
  }
  return {
    buildYield: passing / robust.draws,
    quantiles: quantiles.map((q, k) => {
      const kept = samples[k].sort((a, b) => a - b);
      return kept.length === 0 ? Number.NaN : sortedQuantile(kept, q.p);
    }),
  };
}

/** The build_yield of a design with these sweep values. */
export function robustYield(robust: RobustDefinition, values: ArrayLike<number>): number {
  return robustMerits(robust, values).buildYield;
}
