/**
 * `evaluate --batch` as an external optimiser drives it: a real child process reading JSON lines and
 * writing answers to a pipe that this process drains. Printed per input size: peak RSS of the child
 * (main thread and workers), designs per second, and the time to the first answer (answers stream
 * chunk by chunk, so it should not grow with the input). The designs are the invented classroom coil
 * of examples/tabletop-teaching-coil.yaml with its turns and topload size stepped line by line.
 * Figures are printed, never asserted: a slow machine is not a failure.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parse } from 'yaml';

const ROOT = resolve(import.meta.dirname, '..', '..');
const EXAMPLE = join(ROOT, 'examples', 'tabletop-teaching-coil.yaml');

/** A JSONL file of `count` distinct designs. */
function designsFile(count: number): string {
  const base = parse(readFileSync(EXAMPLE, 'utf8')) as Record<string, Record<string, unknown>>;
  const lines: string[] = [];
  for (let i = 0; i < count; i++) {
    const secondary = { ...base.secondary, turns: 700 + (i % 400) };
    const topload = { ...base.topload, outer_diameter: `${280 + (i % 37)} mm` };
    lines.push(JSON.stringify({ ...base, secondary, topload }));
  }
  const path = join(mkdtempSync(join(tmpdir(), 'coilfront-bench-batch-')), 'designs.jsonl');
  writeFileSync(path, `${lines.join('\n')}\n`);
  return path;
}

interface BatchRun {
  seconds: number;
  firstAnswerSeconds: number;
  answers: number;
  maxRssMb: number;
  status: number;
}

/** Runs `evaluate --batch FILE` in a child that writes to a drained pipe and reports its peak RSS. */
function runBatch(file: string, workers: number): Promise<BatchRun> {
  const script = `import(${JSON.stringify(join(ROOT, 'dist', 'cli', 'program.js'))}).then(async (m) => {
    const io = { out: (t) => process.stdout.write(t), err: (t) => process.stderr.write(t), isTty: false };
    const code = await m.runCli(['evaluate', '--batch', ${JSON.stringify(file)}, '--workers', '${workers}'], io);
    process.stdout.write('', () => {
      process.stderr.write('MAXRSS ' + process.resourceUsage().maxRSS + '\\n');
      process.exit(code);
    });
  });`;
  const started = performance.now();
  return new Promise((done) => {
    const child = spawn(process.execPath, ['--input-type=module', '-e', script], { stdio: ['ignore', 'pipe', 'pipe'] });
    let answers = 0;
    let firstAnswerSeconds = Number.NaN;
    let stderr = '';
    child.stdout.on('data', (chunk: Buffer) => {
      if (answers === 0) firstAnswerSeconds = (performance.now() - started) / 1000;
      for (const byte of chunk) if (byte === 10) answers++;
    });
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    child.on('close', (status) => {
      const match = /MAXRSS (\d+)/.exec(stderr);
      done({
        seconds: (performance.now() - started) / 1000,
        firstAnswerSeconds,
        answers,
        maxRssMb: match ? Number(match[1]) / 1024 : Number.NaN,
        status: status ?? -1,
      });
    });
  });
}

export async function benchBatch(options: { sizes?: number[]; workers?: number } = {}): Promise<string[]> {
  const workers = options.workers ?? 2;
  const lines: string[] = [];
  for (const size of options.sizes ?? [300, 3000]) {
    const run = await runBatch(designsFile(size), workers);
    const rate = run.answers / run.seconds;
    lines.push(
      `evaluate --batch, ${size} designs, ${workers} workers (load average ${loadavg()[0].toFixed(2)}): peak RSS ${run.maxRssMb.toFixed(0)} MB, ${rate.toFixed(0)} designs/s, first answer after ${run.firstAnswerSeconds.toFixed(2)} s, ${run.answers} answers${run.status !== 0 || run.answers !== size ? ` (exit ${run.status}, ${run.answers} of ${size} answered: non-finite run)` : ''}`,
    );
  }
  return lines;
}
