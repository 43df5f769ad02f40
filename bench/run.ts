/**
 * `npm run bench`: every benchmark, printed as figures. Nothing here fails on a slow machine.
 * `npm run bench -- quick` skips the sweep benchmarks; `npm run bench -- long` runs the Pareto
 * machinery at 10⁶ offers, `evaluate --batch` at 3·10⁴ designs, and the sweep memory benchmark at 2·10⁴, 2·10⁵ and 10⁶ samples (an hour or more; without it 2·10⁴ and 2·10⁵).
 */
import { benchBatch } from './batch.ts';
import { benchDynamics } from './dynamics.ts';
import { benchElectrostatics } from './electrostatics.ts';
import { benchEvaluation } from './evaluation.ts';
import { benchEvolve } from './evolve.ts';
import { benchPareto } from './pareto.ts';
import { benchRefine } from './refine.ts';
import { benchStageSplit } from './stage-split.ts';
import { benchSweep } from './sweep.ts';

const quick = process.argv.includes('quick');
const long = process.argv.includes('long');
const sections: Array<[string, () => Promise<string[]>]> = [
  ['electrostatics', () => benchElectrostatics()],
  ['dynamics', () => benchDynamics()],
  ['full evaluation, one thread (per-stage profile)', () => benchEvaluation()],
  ['pareto machinery', () => benchPareto(long ? {} : { offers: 200_000 })],
  ['refinement engine (ZDT)', () => benchRefine()],
  // Quick: one budget and seed; otherwise two of each (a few minutes on one thread).
  [
    'evolutionary stage vs more samples (science-centre example)',
    () => benchEvolve(quick ? { budgets: [1000], seeds: [1] } : {}),
  ],
  // The default split of sweep.stages (about four minutes on one thread; quick: one seed at 1000).
  [
    'budget split between sweep, evolve and refine (science-centre example)',
    () => benchStageSplit(quick ? { budgets: [1000], seeds: [1] } : {}),
  ],
];
if (!quick)
  sections.push([
    'evaluate --batch: memory and streaming against the input size (real process)',
    () => benchBatch(long ? { sizes: [300, 3000, 30_000] } : {}),
  ]);
if (!quick)
  sections.push([
    'sweeps (real processes)',
    () => benchSweep(long ? { rssSamples: [20_000, 200_000, 1_000_000] } : {}),
  ]);

for (const [title, run] of sections) {
  console.log(`\n== ${title}`);
  const started = performance.now();
  for (const line of await run()) {
    console.log(line);
    // A non-finite figure is a broken physics path, not a slow machine: the bench run fails on it.
    if (line.includes('non-finite')) process.exitCode = 1;
  }
  console.log(`(${((performance.now() - started) / 1000).toFixed(1)} s)`);
}
