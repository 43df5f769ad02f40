/**
 * A robust merit inside a sweep: the `build_yield` metric of a design, the fraction of a few tolerance
 * draws (the same common random numbers as `coilfront tolerance`, draws 0 … n − 1) that would be feasible
 * candidates: built, evaluated, every constraint met, every required metric available. Evaluated in the
 * worker with the design, so it costs n more evaluations per design, and refine and evolve see the same
 * merit. A pure function of the design's values, the tolerances and the seed.
 */
import { evaluateDesign } from '../../core/evaluate.ts';
import { DesignSpace } from '../design-space.ts';
import { totalViolation } from '../pareto/constraint-violation.ts';
import { ToleranceDraws } from './tolerance-draws.ts';
import type { ToleranceConstraint } from './tolerance-run.ts';
import { drawRow, type ToleranceSpace } from './tolerance-space.ts';

export interface RobustDefinition {
  tolerance: ToleranceSpace;
  draws: number;
  seed: number;
  /** The sweep's constraints (build_yield's own left out). */
  constraints: ToleranceConstraint[];
  /** Metrics a build must have (the sweep's objectives, build_yield left out). */
  required: string[];
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

/** Whether one build passes: evaluated without problems, constraints met, required metrics finite. */
function buildPasses(robust: RobustDefinition, space: DesignSpace, row: Float64Array): boolean {
  const sampled = space.designOf(row);
  if (!sampled.design) return false;
  let evaluation: ReturnType<typeof evaluateDesign>;
  try {
    evaluation = evaluateDesign(sampled.design);
  } catch {
    return false;
  }
  if (evaluation.problems.length > 0) return false;
  const metrics = evaluation.metrics;
  for (const value of Object.values(metrics)) if (value !== null && !Number.isFinite(value)) return false;
  const values = robust.constraints.map((c) => metrics[c.metric] ?? null);
  if (totalViolation(values, robust.constraints) > 0) return false;
  return robust.required.every((key) => metrics[key] !== null && metrics[key] !== undefined);
}

/** The build_yield of a design with these sweep values. */
export function robustYield(robust: RobustDefinition, values: ArrayLike<number>): number {
  const { space, deviates, row } = prepare(robust);
  let passing = 0;
  for (const z of deviates) {
    drawRow(robust.tolerance, values, z, row);
    if (buildPasses(robust, space, row)) passing++;
  }
  return passing / robust.draws;
}
