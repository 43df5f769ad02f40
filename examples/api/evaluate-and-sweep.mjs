// coilfront as a library: read a design with units, evaluate it, run a small sweep in memory.
// Run from the checkout after `npm run build`: node examples/api/evaluate-and-sweep.mjs
// (Node resolves 'coilfront' to this package through the `exports` of its package.json.)
// The coil below is the invented classroom scenario of examples/tabletop-teaching-coil.yaml.
import { readFileSync } from 'node:fs';
import { evaluateDesign, readDesign, SAFETY_NOTE, sweep } from 'coilfront';

const designFile = new URL('../tabletop-teaching-coil.yaml', import.meta.url);
const design = readDesign(readFileSync(designFile, 'utf8'), { name: 'tabletop-teaching-coil.yaml' });
const { metrics, warnings } = evaluateDesign(design);
console.log('classroom coil (SI units):');
for (const key of ['resonant_frequency', 'secondary_inductance', 'total_capacitance', 'coupling', 'breakout_voltage'])
  console.log(`  ${key} = ${metrics[key]}`);
console.log(`  warnings: ${warnings.map((w) => w.key).join(', ') || 'none'}`);

// A small sweep around the same coil (an invented scenario): which turns and toroid suit a 1.2 m shelf?
const result = await sweep(
  {
    design: {
      secondary: {
        form_diameter: '110 mm',
        wire: 'AWG 28',
        turns: { from: 600, to: 1200, integer: true },
        base_height: '300 mm',
      },
      topload: {
        shape: 'toroid',
        outer_diameter: { from: '250 mm', to: '400 mm' },
        tube_diameter: '75 mm',
        height_above_winding: '50 mm',
      },
      primary: {
        shape: 'flat_spiral',
        inner_diameter: '160 mm',
        turns: 12,
        conductor_diameter: '6.35 mm',
        turn_spacing: '6 mm',
        elevation: '0 mm',
      },
      tank: { capacitance: '10 nF', charge_voltage: '12 kV', voltage_rating: '24 kV' },
      driver: { kind: 'spark_gap', gap: 'static', break_rate: '120 Hz' },
      environment: { altitude: '150 m', temperature: '20 degC' },
    },
    constraints: { overall_height: { max: '1.2 m' } },
    objectives: [{ maximize: 'breakout_voltage' }, { minimize: 'wire_length' }],
    sweep: { method: 'sobol', samples: 48, seed: 7 },
  },
  { workers: 2 },
);
console.log(
  `sweep: ${result.counts.evaluated} designs, ${result.counts.feasible} feasible, ${result.front.length} on the front`,
);
for (const candidate of result.candidates.slice(0, 3)) {
  const turns = candidate.parameters['secondary.turns'];
  const toroid = candidate.parameters['topload.outer_diameter'];
  console.log(
    `  rank ${candidate.rank}: sample ${candidate.sampleIndex}, turns ${turns}, toroid ${toroid} m, breakout_voltage ${candidate.metrics.breakout_voltage} V`,
  );
}
console.log(SAFETY_NOTE);
