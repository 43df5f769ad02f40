/**
 * The budget split between the stages of a sweep file (sweep → evolve → refine) at equal total
 * evaluations, on a real sweep problem (the science-centre example: 6 dimensions, 3 of them discrete,
 * 3 constraints, 2 objectives), in this thread, through the stages' own run functions (evolveSweep,
 * refineSweep). For each split: hypervolume of the final front, normalised by the best split of that
 * budget and seed; reference point: the default of optimize/pareto over every front of the comparison.
 * Part of `npm run bench`; alone: node dist/bench/stage-split.js [budgets] [seeds], e.g. 2000,5000 1,2
 */
import { resolve } from 'node:path';
import { loadSweepFile } from '../cli/sweep-spec.ts';
import { STAGE_DEFAULTS } from '../cli/sweep-stages.ts';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { type BatchResult, inProcessEvaluator } from '../optimize/evaluate-batch.ts';
import { evolveSweep } from '../optimize/evolve-run.ts';
import { defaultReferencePoint, hypervolume } from '../optimize/pareto/index.ts';
import { refineSweep } from '../optimize/refine-run.ts';
import { SweepState } from '../optimize/sweep-state.ts';

/** Shares of the budget: sweep, evolve, refine. */
export const SPLITS: ReadonlyArray<readonly [number, number, number]> = [
  [1, 0, 0],
  [0.75, 0.25, 0],
  [0.5, 0.5, 0],
  [0.25, 0.75, 0],
  [0.5, 0.4, 0.1],
  [0.5, 0.25, 0.25],
  [0.25, 0.5, 0.25],
  [0.1, 0.9, 0],
  [1 / 11, 9 / 11, 1 / 11],
];
const CHUNK = 50;

/** The first `count` rows of an indices batch (a sweep whose samples end inside a chunk). */
function prefixOf(batch: BatchResult, count: number): BatchResult {
  const dimensions = batch.values.length / batch.count;
  const metrics = batch.metrics.length / batch.count;
  return {
    start: batch.start,
    count,
    values: batch.values.subarray(0, count * dimensions),
    metrics: batch.metrics.subarray(0, count * metrics),
    status: batch.status.subarray(0, count),
    reasons: batch.reasons.filter(([row]) => row < count),
    warningMasks: batch.warningMasks.subarray(0, count),
  };
}

/** Lines `budget  split  normalised hypervolume per seed  mean  evaluations used (seed 1)`. */
export async function benchStageSplit(options: { budgets?: number[]; seeds?: number[] } = {}): Promise<string[]> {
  const spec = loadSweepFile(resolve('examples/sweeps/science-centre-ceiling.yaml'), { force: true });
  const budgets = options.budgets ?? [2000];
  const seeds = options.seeds ?? [1, 2];
  const lines = ['budget\tsweep/evolve/refine\thypervolume / best, per seed\tmean\tevaluations used'];
  for (const budget of budgets) {
    const volumes: number[][] = SPLITS.map(() => []);
    const used: number[] = SPLITS.map(() => 0);
    for (const seed of seeds) {
      const space = new DesignSpace({ ...spaceDefinitionOf(spec), seed, samples: budget });
      const evaluator = inProcessEvaluator(space);
      // The Sobol prefix is shared: chunks of the first `budget` samples, evaluated once.
      const chunks = [];
      for (let start = 0; start < budget; start += CHUNK)
        chunks.push(await evaluator.evaluate({ kind: 'indices', start, count: Math.min(CHUNK, budget - start) }));
      const fronts: Float64Array[][] = [];
      for (const [k, [sweepShare, evolveShare, refineShare]] of SPLITS.entries()) {
        const samples = Math.round(sweepShare * budget);
        const evolveBudget = Math.round((sweepShare + evolveShare) * budget) - samples;
        const state = new SweepState(spec.objectives, spec.constraints, 100, seed);
        for (const chunk of chunks) {
          if (chunk.start + chunk.count <= samples) state.offerBatch(chunk, spec.dimensions.length);
          else if (chunk.start < samples)
            state.offerBatch(prefixOf(chunk, samples - chunk.start), spec.dimensions.length);
        }
        let evaluations = samples;
        let next = samples;
        if (evolveBudget > 0) {
          const evolved = await evolveSweep(
            space,
            state,
            samples,
            evaluator,
            {
              seed,
              evaluations: evolveBudget,
              population: STAGE_DEFAULTS.evolve.population,
              batchSize: 64,
              referencePoint: null,
            },
            { replay: [], append: () => {} },
          );
          for (const entry of evolved.evolved.feasibleEntries()) state.pool.offer(entry.item, entry.payload);
          evaluations += evolved.evaluations;
          next += evolved.evaluations;
        }
        const refineBudget = budget - evaluations;
        if (refineShare > 0 && refineBudget > 0) {
          const refined = await refineSweep(space, state, next, evaluator, {
            starts: 8,
            evaluations: refineBudget,
            referencePoint: null,
            batchSize: 64,
          });
          for (const entry of refined.refined.feasibleEntries()) state.pool.offer(entry.item, entry.payload);
          evaluations += refined.evaluations;
        }
        if (seed === seeds[0]) used[k] = evaluations;
        fronts.push(state.pool.front().map((entry) => entry.item.objectives));
      }
      const reference = defaultReferencePoint(fronts.flat());
      const values = fronts.map((front) => (front.length > 0 ? hypervolume(front, reference) : 0));
      const best = Math.max(...values);
      for (const [k, value] of values.entries()) volumes[k]?.push(value / best);
      await evaluator.close();
    }
    for (const [k, split] of SPLITS.entries()) {
      const list = volumes[k] ?? [];
      const mean = list.reduce((a, b) => a + b, 0) / list.length;
      lines.push(
        `${budget}\t${split.join('/')}\t${list.map((v) => v.toFixed(3)).join('\t')}\t${mean.toFixed(3)}\t${used[k]}`,
      );
    }
  }
  return lines;
}

if (process.argv[1]?.endsWith('stage-split.js')) {
  const list = (text: string | undefined) => text?.split(',').map(Number);
  for (const line of await benchStageSplit({ budgets: list(process.argv[2]), seeds: list(process.argv[3]) }))
    console.log(line);
}
