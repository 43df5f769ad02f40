/**
 * examples/api/evaluate-and-sweep.mjs, run as a user runs it (`node examples/api/…` after the build):
 * it imports the package by name through package.json `exports`, and the figures it prints for the
 * classroom coil equal those of `coilfront evaluate --json` on the same design file, to the last digit.
 *
 * Needs the built package (npm test builds first; alone: npx tsc -p tsconfig.build.json).
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { must } from '../../core/must.ts';
import { SAFETY_NOTE } from '../../api/index.ts';
import { childEnvironment, REPO, requireBuiltCli, startCli } from '../cli/sweep-harness.ts';

const SCRIPT = join(REPO, 'examples', 'api', 'evaluate-and-sweep.mjs');

/** Runs the example with node from the repository root, as the README says. */
function runExample(): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [SCRIPT], { cwd: REPO, env: childEnvironment(), stdio: 'pipe' });
    let stdout = '';
    let stderr = '';
    must(child.stdout)
      .setEncoding('utf8')
      .on('data', (chunk: string) => (stdout += chunk));
    must(child.stderr)
      .setEncoding('utf8')
      .on('data', (chunk: string) => (stderr += chunk));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

describe('examples/api/evaluate-and-sweep.mjs', () => {
  it('imports coilfront by name and prints the figures that evaluate --json gives, then a sweep and the safety line', async () => {
    requireBuiltCli();
    expect(existsSync(join(REPO, 'dist', 'api', 'index.js'))).toBe(true);
    const [example, cli] = await Promise.all([
      runExample(),
      startCli(['evaluate', join(REPO, 'examples', 'tabletop-teaching-coil.yaml'), '--json']).done,
    ]);
    expect(example.stderr).toBe('');
    expect(example.code).toBe(0);
    expect(cli.code).toBe(0);
    const metrics = (JSON.parse(cli.stdout) as { metrics: Record<string, number | null> }).metrics;
    const printed = [...example.stdout.matchAll(/^ {2}([a-z_]+) = (\S+)$/gm)];
    expect(printed.map((m) => m[1])).toEqual([
      'resonant_frequency',
      'secondary_inductance',
      'total_capacitance',
      'coupling',
      'breakout_voltage',
    ]);
    for (const [, key, text] of printed) expect(Number(text)).toBe(metrics[key]);
    const sweepLine = /^sweep: 48 designs, (\d+) feasible, (\d+) on the front$/m.exec(example.stdout);
    expect(sweepLine).not.toBeNull();
    expect(Number(sweepLine?.[1])).toBeGreaterThan(0);
    expect(example.stdout).toMatch(/^ {2}rank 1: sample \d+, turns \d+, /m);
    expect(example.stdout.trimEnd().endsWith(SAFETY_NOTE)).toBe(true);
  });
});
