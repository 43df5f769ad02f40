/**
 * The evolutionary stage against more Sobol samples on a real sweep problem (the science-centre
 * example: 6 dimensions, 3 of them discrete, 3 constraints, 2 objectives), in this thread:
 * hypervolume of the feasible front at equal evaluation budgets for
 *   sweep only (the first B Sobol samples),
 *   sweep + evolve (the first B/2 samples, then B/2 evaluations of evolve seeded by all of them),
 *   evolve from random start (B evaluations, no sweep).
 * Hypervolumes are normalised by the best value seen for that budget and seed; reference point: the
 * default of optimize/pareto over every front of the comparison. Part of `npm run bench`; alone:
 * node dist/bench/evolve.js [budgets] [seeds], e.g. node dist/bench/evolve.js 2000,5000 1,2
 */
import { resolve } from 'node:path';
import { loadSweepFile } from '../cli/sweep-spec.ts';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { inProcessEvaluator } from '../optimize/evaluate-batch.ts';
import { designProblem } from '../optimize/evolve/design-problem.ts';
import { evolve, type Individual } from '../optimize/evolve/index.ts';
import { defaultReferencePoint, hypervolume, nondominatedSort } from '../optimize/pareto/index.ts';
import { SweepState } from '../optimize/sweep-state.ts';

function front(members: readonly Individual[]): Float64Array[] {
  const feasible = members.filter((m) => m.violation === 0).map((m) => m.objectives);
  const fronts = nondominatedSort(feasible, 1);
  return (fronts[0] ?? []).map((p) => feasible[p]);
}

/** Lines `budget  method  normalised hypervolume per seed  (mean)`, one per budget and method. */
export async function benchEvolve(options: { budgets?: number[]; seeds?: number[] } = {}): Promise<string[]> {
  const spec = loadSweepFile(resolve('examples/sweeps/science-centre-ceiling.yaml'), { force: true });
  const budgets = options.budgets ?? [2000, 5000];
  const seeds = options.seeds ?? [1, 2];
  const lines = ['budget\tmethod\thypervolume / best, per seed\tmean'];
  for (const budget of budgets) {
    const rows: Record<string, number[]> = { sweep: [], 'sweep+evolve': [], 'evolve (random start)': [] };
    for (const seed of seeds) {
      const space = new DesignSpace({ ...spaceDefinitionOf(spec), seed, samples: budget });
      const evaluator = inProcessEvaluator(space);
      const state = new SweepState(spec.objectives, spec.constraints, 100, seed);
      const swept: Individual[] = [];
      const result = await evaluator.evaluate({ kind: 'indices', start: 0, count: budget });
      for (let row = 0; row < budget; row++) {
        const { violation, objectives } = state.classifyRow(result, row);
        swept.push({ index: row, violation, objectives, genome: new Float64Array(0) });
      }
      const problem = designProblem(spec.dimensions, evaluator, state);
      const half = Math.floor(budget / 2);
      const seedsOfSweep = swept.slice(0, half).map((m) => ({
        ...m,
        genome: problem.genomeOf(
          result.values.subarray(m.index * spec.dimensions.length, (m.index + 1) * spec.dimensions.length),
        ),
      }));
      const evolved: Individual[] = [];
      await evolve(problem, { seed, evaluations: budget - half, population: 100 }, seedsOfSweep, (m) => {
        evolved.push(...m);
      });
      const random: Individual[] = [];
      await evolve(problem, { seed, evaluations: budget, population: 100 }, [], (m) => {
        random.push(...m);
      });
      const fronts = [front(swept), front(seedsOfSweep.concat(evolved)), front(random)];
      const reference = defaultReferencePoint(fronts.flat());
      const volumes = fronts.map((f) => hypervolume(f, reference));
      const best = Math.max(...volumes);
      Object.values(rows).forEach((list, i) => {
        list.push(volumes[i] / best);
      });
    }
    for (const [name, list] of Object.entries(rows)) {
      const mean = list.reduce((a, b) => a + b, 0) / list.length;
      lines.push(`${budget}\t${name}\t${list.map((v) => v.toFixed(3)).join('\t')}\t${mean.toFixed(3)}`);
    }
  }
  return lines;
}

if (process.argv[1]?.endsWith('evolve.js')) {
  const list = (text: string | undefined) => text?.split(',').map(Number);
  for (const line of await benchEvolve({ budgets: list(process.argv[2]), seeds: list(process.argv[3]) }))
    console.log(line);
}
