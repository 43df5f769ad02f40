/**
 * coilfront's default pipeline (the rule of `sweep.stages`: sweep S samples, evolve 9·S at population
 * 60, refine S; S an eleventh of the budget) against a general-purpose NSGA-II (DEAP, population 100) that drives
 * `coilfront evaluate --batch -` through one open pipe, at equal evaluation budgets, on the
 * science-centre example (2 objectives), the same problem with the overall height as a third
 * objective, and with the axial gradient as a fourth. Hypervolume of each final front (feasible designs only; every evaluation counts for both),
 * against one reference point per problem and seed: the default of optimize/pareto over both fronts.
 *
 * Not part of `npm test` or `npm run bench` (it needs Python and DEAP: Debian `apt-get install
 * python3-deap`). After `npm run build`: node dist/bench/external/nsga2-compare.js [budgets] [seeds]
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parse, stringify } from 'yaml';
import { loadSweepFile } from '../../cli/sweep-spec.ts';
import { stageDefaults } from '../../cli/sweep-stages.ts';
import { DesignSpace, spaceDefinitionOf } from '../../optimize/design-space.ts';
import { inProcessEvaluator } from '../../optimize/evaluate-batch.ts';
import { evolveSweep } from '../../optimize/evolve-run.ts';
import { defaultReferencePoint, hypervolume } from '../../optimize/pareto/index.ts';
import { refineSweep } from '../../optimize/refine-run.ts';
import { SweepState } from '../../optimize/sweep-state.ts';

const ROOT = resolve(import.meta.dirname, '..', '..', '..');
const EXAMPLE = join(ROOT, 'examples', 'sweeps', 'science-centre-ceiling.yaml');
const CHUNK = 125;

function problemFile(extraObjectives: Array<Record<string, string>>): string {
  const spec = parse(readFileSync(EXAMPLE, 'utf8')) as Record<string, unknown[]>;
  spec.objectives = [...(spec.objectives ?? []), ...extraObjectives];
  const path = join(mkdtempSync(join(tmpdir(), 'coilfront-nsga2-')), 'problem.yaml');
  writeFileSync(path, stringify(spec));
  return path;
}

/** The pipeline's front (minimisation convention, SI), from the stages' own run functions. */
async function pipelineFront(file: string, budget: number, seed: number): Promise<Float64Array[]> {
  const spec = loadSweepFile(file, { force: true });
  // The default rule of sweep.stages: samples S, evolve 9·S, refine S, so S is an eleventh of the budget.
  const samples = Math.round(budget / 11);
  const defaults = stageDefaults({ samples, dimensions: spec.dimensions.length, objectives: spec.objectives.length });
  const space = new DesignSpace({ ...spaceDefinitionOf(spec), seed, samples });
  const evaluator = inProcessEvaluator(space);
  const state = new SweepState(spec.objectives, spec.constraints, 100, seed);
  for (let start = 0; start < samples; start += CHUNK) {
    const count = Math.min(CHUNK, samples - start);
    state.offerBatch(await evaluator.evaluate({ kind: 'indices', start, count }), spec.dimensions.length);
  }
  const evolved = await evolveSweep(
    space,
    state,
    samples,
    evaluator,
    { seed, ...defaults.evolve, batchSize: 64, referencePoint: null },
    { replay: [], append: () => {} },
  );
  for (const entry of evolved.evolved.feasibleEntries()) state.pool.offer(entry.item, entry.payload);
  const used = samples + evolved.evaluations;
  const refined = await refineSweep(space, state, used, evaluator, {
    starts: defaults.refine.starts,
    evaluations: budget - used,
    referencePoint: null,
    batchSize: 64,
  });
  for (const entry of refined.refined.feasibleEntries()) state.pool.offer(entry.item, entry.payload);
  await evaluator.close();
  return state.pool.front().map((entry) => Float64Array.from(entry.item.objectives));
}

/** DEAP's feasible points, non-dominated, in the minimisation convention (maximised objectives negated). */
function deapFront(file: string, budget: number, seed: number): { front: Float64Array[]; evaluations: number } {
  const out = join(mkdtempSync(join(tmpdir(), 'coilfront-nsga2-')), 'deap.json');
  const script = join(ROOT, 'bench', 'external', 'nsga2_deap.py');
  execFileSync(
    '/usr/bin/python3',
    [script, file, String(budget), String(seed), join(ROOT, 'dist', 'cli', 'main.js'), out],
    {
      stdio: 'inherit',
    },
  );
  const result = JSON.parse(readFileSync(out, 'utf8')) as { evaluations: number; points: number[][] };
  const spec = loadSweepFile(file, { force: true });
  const signs = spec.objectives.map((o) => (o.sense === 'maximize' ? -1 : 1));
  const points = result.points.map((p) => Float64Array.from(p, (v, i) => v * (signs[i] ?? 1)));
  const dominated = (a: Float64Array, b: Float64Array) =>
    b.every((v, i) => v <= (a[i] ?? 0)) && b.some((v, i) => v < (a[i] ?? 0));
  return { front: points.filter((a) => !points.some((b) => dominated(a, b))), evaluations: result.evaluations };
}

export async function compareWithNsga2(budgets: number[], seeds: number[]): Promise<string[]> {
  const lines = [
    'problem\tbudget\tseed\tpipeline HV / NSGA-II HV\tfront sizes (pipeline, NSGA-II)\tNSGA-II evaluations',
  ];
  const problems: Array<[string, Array<Record<string, string>>]> = [
    ['2 objectives', []],
    ['3 objectives (+ overall_height)', [{ minimize: 'overall_height' }]],
    [
      '4 objectives (+ overall_height, axial_gradient)',
      [{ minimize: 'overall_height' }, { minimize: 'axial_gradient' }],
    ],
  ];
  for (const [name, extra] of problems) {
    const file = problemFile(extra);
    for (const budget of budgets) {
      const ratios: number[] = [];
      for (const seed of seeds) {
        const ours = await pipelineFront(file, budget, seed);
        const theirs = deapFront(file, budget, seed);
        const reference = defaultReferencePoint([...ours, ...theirs.front]);
        const ratio = hypervolume(ours, reference) / hypervolume(theirs.front, reference);
        ratios.push(ratio);
        lines.push(
          `${name}\t${budget}\t${seed}\t${ratio.toFixed(3)}\t${ours.length}, ${theirs.front.length}\t${theirs.evaluations}`,
        );
      }
      lines.push(`${name}\t${budget}\tmean\t${(ratios.reduce((a, b) => a + b, 0) / ratios.length).toFixed(3)}`);
    }
  }
  return lines;
}

if (process.argv[1]?.endsWith('nsga2-compare.js')) {
  const list = (text: string | undefined, fallback: number[]) => text?.split(',').map(Number) ?? fallback;
  for (const line of await compareWithNsga2(list(process.argv[2], [2000, 5000]), list(process.argv[3], [1, 2, 3, 4])))
    console.log(line);
}
