/**
 * Benchmarks of whole sweeps, as real processes: designs per second with 1 and 2 workers and with
 * two separate one-worker processes on the two halves of the same sweep (`--shard 1/2` and `2/2` at
 * once), in interleaved rounds so a shared machine's load falls on all three alike (medians, with the
 * load average); peak RSS against the number of samples (flat, by design); and the hypervolume that
 * `refine` gains per 1,000 evaluations against 1,000 more Sobol samples on the demo scenario.
 * Figures are printed, never asserted: a slow machine is not a failure.
 */
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parse, stringify } from 'yaml';
import { hypervolume } from '../optimize/pareto/hypervolume.ts';

const ROOT = resolve(import.meta.dirname, '..', '..');
const DEMO = join(ROOT, 'examples', 'sweeps', 'science-centre-ceiling.yaml');

export function specWith(samples: number, mutate?: (spec: Record<string, any>) => void): string {
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

/** runCli without waiting, so two shard processes run at once. */
function runCliAsync(args: string[]): Promise<{ seconds: number; status: number }> {
  const script = `import(${JSON.stringify(join(ROOT, 'dist', 'cli', 'program.js'))}).then(async (m) => {
    const io = { out: () => {}, err: (t) => process.stderr.write(t), isTty: false };
    process.exit(await m.runCli(${JSON.stringify(args)}, io));
  });`;
  const started = performance.now();
  return new Promise((done) => {
    const child = spawn(process.execPath, ['--input-type=module', '-e', script], { stdio: 'ignore' });
    child.on('close', (status) => done({ seconds: (performance.now() - started) / 1000, status: status ?? -1 }));
  });
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}

const loopSeconds = (directory: string) =>
  (JSON.parse(readFileSync(join(directory, 'summary.json'), 'utf8')) as { timing: { wall_seconds: number } }).timing
    .wall_seconds;

/**
 * Rounds of (1 worker, 2 workers, two 1-worker shard processes at once) on the same sweep. Ratios are
 * the one-worker time over the other's, per round (whole process, and the sweep loop of summary.json;
 * for the shards, the slower of the two), then the median over the rounds.
 */
export async function benchScaling(spec: string, samples: number, rounds: number): Promise<string[]> {
  const lines: string[] = [];
  const ratios = { pool: [] as number[], poolLoop: [] as number[], shards: [] as number[], shardsLoop: [] as number[] };
  const rates = { one: [] as number[], two: [] as number[], shards: [] as number[] };
  let identical = true;
  for (let round = 0; round < rounds; round++) {
    const [out1, out2, shard1, shard2] = ['w1', 'w2', 's1', 's2'].map((name) =>
      mkdtempSync(join(tmpdir(), `coilfront-bench-${name}-`)),
    );
    const base = ['sweep', spec, '--overwrite', '--quiet', '--workers'];
    const load = loadavg()[0];
    const one = await runCliAsync([...base, '1', '--out', out1]);
    const two = await runCliAsync([...base, '2', '--out', out2]);
    const pair = await Promise.all([
      runCliAsync([...base, '1', '--out', shard1, '--shard', '1/2']),
      runCliAsync([...base, '1', '--out', shard2, '--shard', '2/2']),
    ]);
    const pairSeconds = Math.max(pair[0].seconds, pair[1].seconds);
    const [loop1, loop2] = [loopSeconds(out1), loopSeconds(out2)];
    const pairLoop = Math.max(loopSeconds(shard1), loopSeconds(shard2));
    ratios.pool.push(one.seconds / two.seconds);
    ratios.poolLoop.push(loop1 / loop2);
    ratios.shards.push(one.seconds / pairSeconds);
    ratios.shardsLoop.push(loop1 / pairLoop);
    rates.one.push(samples / loop1);
    rates.two.push(samples / loop2);
    rates.shards.push(samples / pairLoop);
    identical &&=
      readFileSync(join(out1, 'candidates.csv'), 'utf8') === readFileSync(join(out2, 'candidates.csv'), 'utf8');
    lines.push(
      `  round ${round + 1} (load average ${load.toFixed(2)}): 1 worker ${one.seconds.toFixed(2)} s (loop ${loop1.toFixed(2)} s), 2 workers ${two.seconds.toFixed(2)} s (loop ${loop2.toFixed(2)} s), 2 shard processes ${pairSeconds.toFixed(2)} s (loop ${pairLoop.toFixed(2)} s)`,
    );
  }
  const x = (values: number[]) => `${median(values).toFixed(2)}x`;
  lines.push(
    `  designs/s in the sweep loop (medians): 1 worker ${median(rates.one).toFixed(0)}, 2 workers ${median(rates.two).toFixed(0)}, 2 shard processes ${median(rates.shards).toFixed(0)}`,
    `  2 workers vs 1: ${x(ratios.pool)} whole process, ${x(ratios.poolLoop)} sweep loop (target >= 1.9 on a quiet machine)`,
    `  2 shard processes vs 1 worker: ${x(ratios.shards)} whole process, ${x(ratios.shardsLoop)} sweep loop (what the machine gives; the pool should reach it)`,
    `  pool / shard pair, whole process: ${(median(ratios.pool) / median(ratios.shards)).toFixed(2)} (target >= 1)`,
    `  candidates.csv identical for 1 and 2 workers: ${identical}`,
    `  load average now ${loadavg()[0].toFixed(2)}`,
  );
  return lines;
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

export async function benchSweep(
  options: { samples?: number; rounds?: number; rssSamples?: number[] } = {},
): Promise<string[]> {
  const lines: string[] = [];
  const samples = options.samples ?? 12_000;
  const spec = specWith(samples);
  const rounds = options.rounds ?? 3;
  lines.push(`sweep, demo scenario, full model, ${samples} designs, ${rounds} interleaved rounds:`);
  lines.push(...(await benchScaling(spec, samples, rounds)));

  // Memory against the sample count, on the demo scenario (the full model).
  for (const count of options.rssSamples ?? [20_000, 200_000]) {
    const out = mkdtempSync(join(tmpdir(), 'coilfront-bench-rss-'));
    const run = runCli(['sweep', specWith(count), '--out', out, '--overwrite', '--workers', '2', '--quiet']);
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8')) as { front_size: number };
    lines.push(
      `peak RSS, demo scenario, ${count} samples (default --keep 1000, 2 workers, load average ${loadavg()[0].toFixed(2)}): ${run.maxRssMb.toFixed(0)} MB in ${run.seconds.toFixed(1)} s, front ${summary.front_size}${run.status !== 0 ? ` (exit ${run.status})` : ''}`,
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
