/**
 * `npm run bench`: every benchmark, printed as figures. Nothing here fails on a slow machine.
 * `npm run bench -- quick` skips the long sweep benchmarks.
 */
import { benchDynamics } from './dynamics.ts';
import { benchElectrostatics } from './electrostatics.ts';
import { benchPareto } from './pareto.ts';
import { benchRefine } from './refine.ts';
import { benchSweep } from './sweep.ts';

const quick = process.argv.includes('quick');
const sections: Array<[string, () => Promise<string[]>]> = [
  ['electrostatics', () => benchElectrostatics()],
  ['dynamics', () => benchDynamics()],
  ['pareto machinery', () => benchPareto()],
  ['refinement engine (ZDT)', () => benchRefine()],
];
if (!quick) sections.push(['sweeps (real processes)', () => benchSweep()]);

for (const [title, run] of sections) {
  console.log(`\n== ${title}`);
  const started = performance.now();
  for (const line of await run()) console.log(line);
  console.log(`(${((performance.now() - started) / 1000).toFixed(1)} s)`);
}
