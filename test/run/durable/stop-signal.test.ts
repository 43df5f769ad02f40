import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ts from 'typescript';
import { installStopSignal, signalNumber, TIME_LIMIT_EXIT_CODE } from '../../../run/durable/stop-signal.ts';

// ----------------------------------------------------------------------------- in this process

describe('installStopSignal(options) in this process', () => {
  it('sets stopRequested when the time limit passes on the injected clock', () => {
    let clock = 1_000_000;
    const stop = installStopSignal({ timeLimitSeconds: 90 * 60, now: () => clock, signals: [] });
    try {
      expect(stop.deadline).toBe(1_000_000 + 5_400_000);
      expect(stop.stopRequested).toBe(false);
      expect(stop.exitCode()).toBe(0);
      clock += 5_400_000 - 1;
      expect(stop.stopRequested).toBe(false);
      clock += 1;
      expect(stop.stopRequested).toBe(true);
      expect(stop.reason).toBe('time-limit');
      expect(stop.signal).toBeNull();
      expect(stop.exitCode()).toBe(TIME_LIMIT_EXIT_CODE);
    } finally {
      stop.dispose();
    }
  });

  it('calls onStop listeners once, and at once when already stopped', () => {
    let clock = 0;
    const stop = installStopSignal({ timeLimitSeconds: 1, now: () => clock, signals: [] });
    const heard: string[] = [];
    stop.onStop((reason) => heard.push(`a:${reason}`));
    const unsubscribe = stop.onStop((reason) => heard.push(`b:${reason}`));
    unsubscribe();
    clock = 1000;
    expect(stop.stopRequested).toBe(true);
    expect(stop.stopRequested).toBe(true);
    stop.onStop((reason) => heard.push(`c:${reason}`));
    stop.dispose();
    expect(heard).toEqual(['a:time-limit', 'c:time-limit']);
  });

  it('uses the POSIX signal numbers for the exit codes: SIGINT 2 → 130, SIGTERM 15 → 143', () => {
    // POSIX.1-2017 (XCU "kill", table of signal numbers: 2 INT, 15 TERM); exit status 128 + n is the
    // shells' report of a command ended by signal n (POSIX XCU 2.8.2 "Exit Status for Commands").
    expect(128 + signalNumber('SIGINT')).toBe(130);
    expect(128 + signalNumber('SIGTERM')).toBe(143);
  });

  it('refuses a time limit that is not a finite number of seconds', () => {
    expect(() => installStopSignal({ timeLimitSeconds: Number.NaN, signals: [] })).toThrow(RangeError);
    expect(() => installStopSignal({ timeLimitSeconds: -1, signals: [] })).toThrow(RangeError);
  });
});

// ----------------------------------------------------------------------------- in a child process

let directory: string;
let script: string;

beforeAll(() => {
  directory = mkdtempSync(join(tmpdir(), 'coilfront-stop-'));
  // Node 20 cannot run TypeScript; the module imports only node builtins, so transpiling it alone suffices.
  const source = readFileSync(new URL('../../../run/durable/stop-signal.ts', import.meta.url), 'utf8');
  const output = ts.transpileModule(source, {
    compilerOptions: { module: ts.ModuleKind.ESNext, target: ts.ScriptTarget.ES2022, verbatimModuleSyntax: true },
  }).outputText;
  writeFileSync(join(directory, 'stop-signal.mjs'), output);
  script = join(directory, 'child.mjs');
  writeFileSync(
    script,
    `import { installStopSignal } from './stop-signal.mjs';
const [mode, limit] = process.argv.slice(2);
const stop = installStopSignal({
  log: (line) => console.log(line),
  timeLimitSeconds: limit === undefined ? undefined : Number(limit),
  checkIntervalMs: 20,
});
if (mode === 'dispose') stop.dispose();
console.log('ready');
// a run: batches until asked to stop; 'stubborn' never finishes its batch in flight
const work = setInterval(() => {
  if (mode !== 'stubborn' && stop.stopRequested) {
    console.log('outputs written after ' + stop.reason + (stop.signal ? ' ' + stop.signal : ''));
    clearInterval(work);
    stop.dispose();
    process.exitCode = stop.exitCode();
  }
}, 10);
`,
  );
});

afterAll(() => {
  rmSync(directory, { recursive: true, force: true });
});

interface ChildResult {
  code: number | null;
  signal: NodeJS.Signals | null;
  lines: string[];
}

/** Runs the child, sends `signals` in turn (each after the previous printed line appears). */
function runChild(args: string[], signals: NodeJS.Signals[]): Promise<ChildResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [script, ...args], { stdio: ['ignore', 'pipe', 'inherit'] });
    const lines: string[] = [];
    let buffered = '';
    let sent = 0;
    const guard = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`child did not finish; printed: ${lines.join(' | ')}`));
    }, 10_000);
    child.stdout.setEncoding('utf8');
    child.stdout.on('data', (chunk: string) => {
      buffered += chunk;
      const parts = buffered.split('\n');
      buffered = parts.pop() ?? '';
      for (const line of parts) {
        lines.push(line);
        // the first signal once the child is ready, each further one once the previous was heard
        if (sent < signals.length && (line === 'ready' || line.startsWith('received'))) {
          child.kill(signals[sent++]);
        }
      }
    });
    child.on('error', reject);
    child.on('exit', (code, signal) => {
      clearTimeout(guard);
      resolve({ code, signal, lines });
    });
  });
}

describe('installStopSignal(options) in a child process', () => {
  it('finishes the run on SIGINT and exits 130', async () => {
    const result = await runChild(['normal'], ['SIGINT']);
    expect(result.lines).toEqual([
      'ready',
      'received SIGINT: finishing the batches in flight, then writing outputs and the checkpoint (press Ctrl-C again to stop at once, without the checkpoint)',
      'outputs written after signal SIGINT',
    ]);
    expect(result.code).toBe(130);
  });

  it('finishes the run on SIGTERM and exits 143', async () => {
    const result = await runChild(['normal'], ['SIGTERM']);
    expect(result.lines).toEqual([
      'ready',
      'received SIGTERM: finishing the batches in flight, then writing outputs and the checkpoint',
      'outputs written after signal SIGTERM',
    ]);
    expect(result.code).toBe(143);
  });

  it('exits 130 at once on a second SIGINT while a batch is still in flight', async () => {
    const result = await runChild(['stubborn'], ['SIGINT', 'SIGINT']);
    expect(result.lines.at(-1)).toBe(
      'received SIGINT again: stopping at once; the last checkpoint written stays resumable',
    );
    expect(result.lines.some((line) => line.startsWith('outputs written'))).toBe(false);
    expect(result.code).toBe(130);
  });

  it('stops by the time limit with exit code 124', async () => {
    const result = await runChild(['normal', '0.15'], []);
    expect(result.lines).toEqual([
      'ready',
      'time limit reached: finishing the batches in flight, then writing outputs and the checkpoint',
      'outputs written after time-limit',
    ]);
    expect(result.code).toBe(TIME_LIMIT_EXIT_CODE);
  });

  it('leaves the default behaviour after dispose: SIGINT ends the process', async () => {
    const result = await runChild(['dispose'], ['SIGINT']);
    expect(result.signal).toBe('SIGINT');
    expect(result.code).toBeNull();
  });
});
