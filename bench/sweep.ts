/**
 * Benchmarks of whole sweeps, as real processes: designs per second with 1 and 2 workers (the
 * speed-up), peak RSS against the number of samples (flat, by design), and the hypervolume that
 * `refine` gains per 1,000 evaluations against 1,000 more Sobol samples on the demo scenario.
 * Figures are printed, never asserted: a slow machine is not a failure.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parse, stringify } from 'yaml';
import { hypervolume } from '../optimize/pareto/hypervolume.ts';

const ROOT = resolve(import.meta.dirname, '..', '..');
const DEMO = join(ROOT, 'examples', 'sweeps', 'science-centre-ceiling.yaml');

function specWith(samples: number, mutate?: (spec: Record<string, any>) => void): string {
  const spec = parse(readFileSync(DEMO, 'utf8')) as Record<string, any>;
  spec.sweep.samples = samples;
  mutate?.(spec);
  const directory = mkdtempSync(join(tmpdir(), 'coilfront-bench-'));
  const path = join(directory, 'spec.yaml');
  writeFileSync(path, stringify(spec));
  return path;
}

/** Runs the CLI in a child process that reports its peak RSS (main thread and workers) at exit. */
function runCli(args: string[]): { seconds: number; maxRssMb: number; status: number; stderr: string } {
  const script = `import(${JSON.stringify(join(ROOT, 'dist', 'cli', 'program.js'))}).then(async (m) => {
    const io = { out: () => {}, err: (t) => process.stderr.write(t), isTty: false };
    const code = await m.runCli(${JSON.stringify(args)}, io);
    process.stderr.write('MAXRSS ' + process.resourceUsage().maxRSS + '\\n');
    process.exit(code);
  });`;
  const started = performance.now();
  const child = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8' });
  const seconds = (performance.now() - started) / 1000;
  const match = /MAXRSS (\d+)/.exec(child.stderr ?? '');
  return { seconds, maxRssMb: match ? Number(match[1]) / 1024 : NaN, status: child.status ?? -1, stderr: child.stderr };
}

function frontObjectives(directory: string, metrics: { column: string; maximize: boolean }[]): number[][] {
  const lines = readFileSync(join(directory, 'front.csv'), 'utf8').trim().split('\n');
  const header = lines[0].split(',');
  const columns = metrics.map((m) => header.indexOf(m.column));
  return lines.slice(1).map((line) => {
    const cells = line.split(',');
    return columns.map((c, j) => (metrics[j].maximize ? -1 : 1) * Number(cells[c]));
  });
}

export async function benchSweep(options: { samples?: number; rssSamples?: number[] } = {}): Promise<string[]> {
  const lines: string[] = [];
  const samples = options.samples ?? 12_000;
  const spec = specWith(samples);
  const out1 = mkdtempSync(join(tmpdir(), 'coilfront-bench-w1-'));
  const out2 = mkdtempSync(join(tmpdir(), 'coilfront-bench-w2-'));
  const one = runCli(['sweep', spec, '--out', out1, '--overwrite', '--workers', '1', '--quiet']);
  const two = runCli(['sweep', spec, '--out', out2, '--overwrite', '--workers', '2', '--quiet']);
  const loop = (directory: string) =>
    (JSON.parse(readFileSync(join(directory, 'summary.json'), 'utf8')) as { timing: { wall_seconds: number } }).timing
      .wall_seconds;
  const [loop1, loop2] = [loop(out1), loop(out2)];
  lines.push(`sweep, demo scenario, full model, ${samples} designs (process wall time; sweep loop from summary.json):`);
  lines.push(
    `  1 worker : ${one.seconds.toFixed(2)} s (loop ${loop1.toFixed(2)} s, ${(samples / loop1).toFixed(0)} designs/s per core), peak RSS ${one.maxRssMb.toFixed(0)} MB`,
  );
  lines.push(
    `  2 workers: ${two.seconds.toFixed(2)} s (loop ${loop2.toFixed(2)} s, ${(samples / loop2).toFixed(0)} designs/s), peak RSS ${two.maxRssMb.toFixed(0)} MB`,
  );
  lines.push(
    `  speed-up 2 vs 1 workers: ${(one.seconds / two.seconds).toFixed(2)}x whole process, ${(loop1 / loop2).toFixed(2)}x sweep loop (target >= 1.8)`,
  );
  const identical =
    readFileSync(join(out1, 'candidates.csv'), 'utf8') === readFileSync(join(out2, 'candidates.csv'), 'utf8');
  lines.push(`  candidates.csv identical for 1 and 2 workers: ${identical}`);

  // Memory against the sample count, on the demo scenario (the full model).
  for (const count of options.rssSamples ?? [20_000, 100_000]) {
    const out = mkdtempSync(join(tmpdir(), 'coilfront-bench-rss-'));
    const run = runCli(['sweep', specWith(count), '--out', out, '--overwrite', '--workers', '2', '--quiet']);
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8')) as { front_size: number };
    lines.push(
      `peak RSS, demo scenario, ${count} samples (default --keep 1000, 2 workers): ${run.maxRssMb.toFixed(0)} MB in ${run.seconds.toFixed(1)} s, front ${summary.front_size}${run.status !== 0 ? ` (exit ${run.status})` : ''}`,
    );
  }

  // refine vs more Sobol samples, both from the same 1024-sample sweep.
  const base = 1024;
  const budget = 1000;
  const baseSpec = specWith(base);
  const moreSpec = specWith(base + budget);
  const refined = mkdtempSync(join(tmpdir(), 'coilfront-bench-refine-'));
  const more = mkdtempSync(join(tmpdir(), 'coilfront-bench-more-'));
  runCli(['sweep', baseSpec, '--out', refined, '--overwrite', '--quiet']);
  runCli(['sweep', moreSpec, '--out', more, '--overwrite', '--quiet']);
  const objectives = [
    { column: 'breakout_voltage_kV', maximize: true },
    { column: 'wire_mass_kg', maximize: false },
  ];
  const frontBefore = frontObjectives(refined, objectives);
  const frontMore = frontObjectives(more, objectives);
  runCli(['refine', refined, '--evaluations', String(budget)]);
  const frontRefined = frontObjectives(refined, objectives);
  // One reference point for all three: 10 % beyond the worst of the base front in each objective.
  const reference = [0, 1].map((j) => {
    const values = frontBefore.map((p) => p[j]);
    const worst = Math.max(...values);
    const range = worst - Math.min(...values) || 1;
    return worst + 0.1 * range;
  });
  const hv0 = hypervolume(frontBefore, reference);
  const hvRefine = hypervolume(frontRefined, reference);
  const hvMore = hypervolume(frontMore, reference);
  lines.push(
    `refine vs Sobol on the demo scenario (${base} samples, then ${budget} evaluations each; objectives in kV and kg):`,
  );
  lines.push(
    `  hypervolume: base ${hv0.toFixed(3)}, +refine ${hvRefine.toFixed(3)} (gain ${(hvRefine - hv0).toFixed(3)}), +${budget} Sobol ${hvMore.toFixed(3)} (gain ${(hvMore - hv0).toFixed(3)})`,
  );
  lines.push(
    `  ratio of gains refine/Sobol: ${((hvRefine - hv0) / Math.max(1e-12, hvMore - hv0)).toFixed(2)}x (target >= 3)`,
  );
  return lines;
}
