/**
 * Shared helpers of the real-process sweep tests: run the built CLI (`node dist/cli/main.js`) as a
 * child process, watch a run directory, and compare the outputs of two runs byte for byte.
 *
 * `npm test` builds dist/ first; run `npx tsc -p tsconfig.build.json` before running these files alone.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';
import { must } from '../../core/must.ts';
import { readJournal } from '../../run/durable/journal.ts';

export const REPO = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
/**
 * The built CLI: dist/cli/main.js, or COILFRONT_TEST_CLI (a main.js built elsewhere, so that a build
 * running in the same checkout meanwhile cannot change the program between two runs of one test).
 */
export const CLI = process.env.COILFRONT_TEST_CLI ?? join(REPO, 'dist', 'cli', 'main.js');
/** The machinery fixture: 256 Sobol samples of the science-centre example (invented demo data). */
export const SMALL_SWEEP = join(REPO, 'test', 'fixtures', 'sweep-small.yaml');
export const SMALL_SWEEP_SAMPLES = 256;

/** Fails early with a clear message when dist/ was not built. */
export function requireBuiltCli(): void {
  if (!existsSync(CLI)) throw new Error(`${CLI} is missing: build first (npx tsc -p tsconfig.build.json, or npm test)`);
}

/** A fresh directory under the system temp folder; `cleanup()` removes all of them. */
export function scratchArea(prefix: string): { dir: (name: string) => string; cleanup: () => void } {
  const root = mkdtempSync(join(tmpdir(), `coilfront-${prefix}-`));
  return { dir: (name) => join(root, name), cleanup: () => rmSync(root, { recursive: true, force: true }) };
}

/** The environment for a child: ours without scheduler variables or the crash hook, plus `extra`. */
export function childEnvironment(extra: Record<string, string> = {}): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [key, value] of Object.entries(process.env)) {
    if (key.startsWith('SLURM_') || key === 'JOB_COMPLETION_INDEX' || key.startsWith('COILFRONT_')) continue;
    env[key] = value;
  }
  return { ...env, ...extra };
}

export interface Finished {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

export interface Running {
  child: ChildProcess;
  done: Promise<Finished>;
  /** What the process has written to stderr so far. */
  stderrSoFar(): string;
}

/** Starts `node dist/cli/main.js ...args`. */
export function startCli(args: string[], options: { env?: Record<string, string>; cwd?: string } = {}): Running {
  const child = spawn(process.execPath, [CLI, ...args], {
    cwd: options.cwd ?? REPO,
    env: childEnvironment(options.env),
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let stdout = '';
  let stderr = '';
  must(child.stdout)
    .setEncoding('utf8')
    .on('data', (chunk: string) => (stdout += chunk));
  must(child.stderr)
    .setEncoding('utf8')
    .on('data', (chunk: string) => (stderr += chunk));
  const done = new Promise<Finished>((resolveDone, reject) => {
    child.on('error', reject);
    child.on('close', (code, signal) => resolveDone({ code, signal, stdout, stderr }));
  });
  return { child, done, stderrSoFar: () => stderr };
}

/** Runs the CLI to the end. */
export function runCli(
  args: string[],
  options: { env?: Record<string, string>; cwd?: string } = {},
): Promise<Finished> {
  return startCli(args, options).done;
}

/** Runs the CLI and expects exit code 0, showing stderr otherwise. */
export async function runCliOk(args: string[], options: { env?: Record<string, string> } = {}): Promise<Finished> {
  const result = await runCli(args, options);
  expect(result.code, `coilfront ${args.join(' ')}\n${result.stderr}`).toBe(0);
  return result;
}

export const sleep = (ms: number): Promise<void> => new Promise((resolveSleep) => setTimeout(resolveSleep, ms));

/**
 * Starts the CLI and sends it `signal` once `journal` holds at least `records` records (an identity
 * or header record and the units after it), or lets it end if it finishes first; how it ended.
 */
export async function signalWhenJournalled(
  args: string[],
  journal: string,
  records: number,
  signal: NodeJS.Signals,
): Promise<Finished> {
  const running = startCli(args);
  let ended = false;
  void running.done.then(() => (ended = true));
  while (!ended && !(existsSync(journal) && readJournal(journal).records.length >= records)) await sleep(2);
  running.child.kill(signal);
  return running.done;
}

/** A fingerprint of a run directory's durable files (journal sizes and the checkpoint's mtime). */
export function durableFingerprint(directory: string): string {
  if (!existsSync(directory)) return '';
  const parts: string[] = [];
  for (const name of readdirSync(directory).sort()) {
    if (!name.startsWith('journal-') && name !== 'checkpoint.json') continue;
    try {
      const stat = statSync(join(directory, name));
      parts.push(`${name}:${stat.size}:${stat.mtimeMs}`);
    } catch {
      // renamed or removed between the listing and the stat
    }
  }
  return parts.join(',');
}

/**
 * Waits until the run directory's journal or checkpoint changes from `before` (the run has finished a
 * batch since), the process ends, or `timeoutMs` passes. Returns true when the files changed.
 */
export async function waitForProgress(
  directory: string,
  before: string,
  running: Running,
  timeoutMs = 20_000,
): Promise<boolean> {
  let ended = false;
  void running.done.then(() => (ended = true));
  const started = Date.now();
  while (!ended && Date.now() - started < timeoutMs) {
    const now = durableFingerprint(directory);
    if (now !== before && (/journal-\d+\.log:[1-9]/.test(now) || now.includes('checkpoint.json'))) return true;
    await sleep(5);
  }
  return false;
}

/** The files a sweep writes that must not depend on how the run went (interruptions, workers, shards). */
export const RESULT_FILES = ['candidates.csv', 'front.csv'] as const;

/** summary.json without its timing field, as text. */
export function summaryWithoutTiming(directory: string): string {
  const summary = JSON.parse(readFileSync(join(directory, 'summary.json'), 'utf8')) as Record<string, unknown>;
  expect(summary).toHaveProperty('timing');
  delete summary.timing;
  return JSON.stringify(summary, null, 2);
}

/** Expects the result files of two run directories to be byte-identical (summary.json timing aside). */
export function expectSameResults(actual: string, expected: string, files: readonly string[] = RESULT_FILES): void {
  for (const name of files) {
    const a = readFileSync(join(actual, name));
    const b = readFileSync(join(expected, name));
    expect(b.length, `${expected}/${name} is empty`).toBeGreaterThan(0);
    if (!a.equals(b)) expect(a.toString('utf8'), `${name} differs: ${actual} vs ${expected}`).toBe(b.toString('utf8'));
  }
  expect(summaryWithoutTiming(actual), `summary.json differs: ${actual} vs ${expected}`).toBe(
    summaryWithoutTiming(expected),
  );
}

/** The summary's counts. */
export function summaryCounts(directory: string): {
  evaluated: number;
  feasible: number;
  infeasible: number;
  impossible: number;
  failed: number;
} {
  return (
    JSON.parse(readFileSync(join(directory, 'summary.json'), 'utf8')) as { counts: ReturnType<typeof summaryCounts> }
  ).counts;
}

/** A small seeded generator (mulberry32) for the moments the tests interrupt a run. */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The sweep options every machinery test uses: small batches, frequent journal syncs and snapshots. */
export const BUSY_RUN = ['--batch-size', '8', '--sync-every', '100ms', '--quiet'];

/** Expects stderr to be exactly one line. */
export function expectOneLine(stderr: string, context: string): string {
  const text = stderr.replace(/\n$/, '');
  expect(text, `${context}: stderr was empty`).not.toBe('');
  expect(text.includes('\n'), `${context}: stderr has more than one line:\n${stderr}`).toBe(false);
  expect(text).not.toMatch(/internal error|\n\s+at |\bat .*\.(js|ts):\d+/);
  return text;
}
