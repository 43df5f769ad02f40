/**
 * `npm run fixtures`: re-evaluates the examples behind the two metric snapshots in test/fixtures/
 * with the built code, keeping each snapshot's own keys, and prints every metric that moved by more
 * than 1e-6 relative. Run it only when a change is meant to move the physics, and say in the commit
 * by how much the printed metrics moved.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { loadDesignFile } from '../dist/cli/load-design.js';
import { evaluateDesign } from '../dist/core/evaluate.js';

const SNAPSHOTS = [
  // The two-coil snapshot holds whole warnings, keyed by the example's file name.
  { file: 'test/fixtures/two-coil-metrics.json', example: (key) => `examples/${key}`, wholeWarnings: true },
  // The topload-parts snapshot holds warning keys, keyed by the example's name without extension.
  {
    file: 'test/fixtures/metrics-before-topload-parts.json',
    example: (key) => `examples/${key}.yaml`,
    wholeWarnings: false,
  },
];

for (const { file, example, wholeWarnings } of SNAPSHOTS) {
  const text = readFileSync(file, 'utf8');
  const old = JSON.parse(text);
  const fresh = {};
  for (const [key, entry] of Object.entries(old)) {
    const evaluation = evaluateDesign(loadDesignFile(example(key)).design);
    const metrics = {};
    for (const name of Object.keys(entry.metrics)) {
      metrics[name] = evaluation.metrics[name] ?? null;
      const before = entry.metrics[name];
      const after = metrics[name];
      if (typeof before === 'number' && typeof after === 'number' && before !== after) {
        const relative = Math.abs(after - before) / Math.max(Math.abs(before), Number.MIN_VALUE);
        if (relative > 1e-6) console.log(`${key} ${name}: ${before} -> ${after} (${relative.toExponential(2)})`);
      } else if (before !== after) console.log(`${key} ${name}: ${before} -> ${after}`);
    }
    fresh[key] = { metrics, warnings: wholeWarnings ? evaluation.warnings : evaluation.warnings.map((w) => w.key) };
  }
  const indent = text.startsWith('{\n  ') ? 2 : 1;
  writeFileSync(file, `${JSON.stringify(fresh, null, indent)}\n`);
}
