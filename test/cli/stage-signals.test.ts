import { cpSync, existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  type Finished,
  requireBuiltCli,
  runCliOk,
  SMALL_SWEEP,
  scratchArea,
  sleep,
  startCli,
  signalWhenJournalled,
} from './sweep-harness.ts';

// Machinery tests of `coilfront refine RUN` and `coilfront evolve RUN` run by themselves (not as the
// sweep's stages) and stopped by a signal, on the invented small-sweep fixture. The reference is the
// same command run to its end without a stop: the stopped run, resumed with the command it prints,
// must end in the same files byte for byte (timing fields aside). The children run the built JS (dist/).

const area = scratchArea('stage-signals');
const swept = area.dir('swept');
const REFINE = ['--starts', '2', '--evaluations', '300'];
const EVOLVE = ['--evaluations', '96', '--population', '16'];
const REFINE_FILES = ['candidates.csv', 'front.csv', 'refined.csv', 'refined.json', 'refine-trials.csv'];
const EVOLVE_FILES = ['candidates.csv', 'front.csv', 'evolved.csv', 'evolved.json'];

/** A copy of the finished sweep, for one command to work on. */
function copyOfSweep(name: string): string {
  const directory = area.dir(name);
  cpSync(swept, directory, { recursive: true });
  return directory;
}

/** summary.json without the timing fields of the sweep and of each stage. */
function summaryWithoutTiming(directory: string): Record<string, unknown> {
  const summary = JSON.parse(readFileSync(join(directory, 'summary.json'), 'utf8'));
  delete summary.timing;
  for (const section of ['evolve', 'refine']) if (summary[section]) delete summary[section].timing;
  return summary;
}

function expectSameFiles(actual: string, expected: string, files: readonly string[]): void {
  for (const name of files)
    expect(readFileSync(join(actual, name), 'utf8'), name).toBe(readFileSync(join(expected, name), 'utf8'));
  expect(summaryWithoutTiming(actual)).toEqual(summaryWithoutTiming(expected));
}

/** The stderr of a stopped stage ends in its two stop lines; returns the arguments of the resume command. */
function resumeArguments(stopped: Finished, directory: string, what: string, command: string): string[] {
  const lines = stopped.stderr.trimEnd().split('\n');
  expect(lines.filter((line) => line.includes('resume with:'))).toHaveLength(1);
  expect(lines.at(-2)).toMatch(new RegExp(`^stopped: SIG(INT|TERM) was received; ${what}`));
  const last = lines.at(-1) ?? '';
  expect(last).toBe(
    `  resume with: npx coilfront ${command} ${directory} ${command === 'refine' ? REFINE.join(' ') : EVOLVE.join(' ')}`,
  );
  return last.replace('  resume with: npx coilfront ', '').split(' ');
}

beforeAll(async () => {
  requireBuiltCli();
  await runCliOk(['sweep', SMALL_SWEEP, '--out', swept, '--workers', '1', '--batch-size', '8', '--quiet']);
}, 120_000);
afterAll(() => area.cleanup());

describe('a stage run by its own command and stopped by a signal', () => {
  it('refine on SIGINT writes nothing, prints one resume line, exits 130, and resumes to the same files', async () => {
    const reference = copyOfSweep('refine-reference');
    await runCliOk(['refine', reference, ...REFINE, '--workers', '0']);
    // There is no file to watch while a refine runs: the signal goes after a delay. Too early, and the
    // process dies of it before its handler is installed; too late, and the refine has ended. Either
    // way the try starts over on a fresh copy with the next delay.
    let stopped: Finished | null = null;
    let directory = '';
    for (const [k, delay] of [1500, 800, 3000, 400, 5000].entries()) {
      directory = copyOfSweep(`refine-interrupted-${k}`);
      const running = startCli(['refine', directory, ...REFINE, '--workers', '1']);
      await sleep(delay);
      running.child.kill('SIGINT');
      const finished = await running.done;
      if (finished.code === 130) {
        stopped = finished;
        break;
      }
    }
    if (stopped === null) throw new Error('no try stopped the refine mid-run');
    expect(stopped.stdout).toBe('');
    resumeArguments(stopped, directory, `nothing was written to ${directory}`, 'refine');
    for (const name of ['refined.csv', 'refined.json', 'refine-trials.csv'])
      expect(existsSync(join(directory, name))).toBe(false);
    expect(readFileSync(join(directory, 'front.csv'), 'utf8')).toBe(readFileSync(join(swept, 'front.csv'), 'utf8'));
    const resumed = await runCliOk([...resumeArguments(stopped, directory, 'nothing', 'refine'), '--workers', '1']);
    expect(resumed.stdout).toContain('refined 2 starts');
    expectSameFiles(directory, reference, REFINE_FILES);
  }, 180_000);

  it('evolve on SIGTERM keeps its journal, prints one resume line, exits 143, and resumes to the same files', async () => {
    const reference = copyOfSweep('evolve-reference');
    await runCliOk(['evolve', reference, ...EVOLVE, '--workers', '0']);
    const directory = copyOfSweep('evolve-interrupted');
    const journal = join(directory, 'evolve-journal.log');
    const stopped = await signalWhenJournalled(
      ['evolve', directory, ...EVOLVE, '--workers', '1'],
      journal,
      3,
      'SIGTERM',
    );
    expect(stopped.code, stopped.stderr).toBe(143); // 128 + SIGTERM (15), the shells' convention
    const args = resumeArguments(stopped, directory, `every finished generation is kept in ${journal}`, 'evolve');
    expect(existsSync(join(directory, 'evolved.csv'))).toBe(false);
    expect(existsSync(journal)).toBe(true);
    const resumed = await runCliOk([...args, '--workers', '1']);
    expect(resumed.stderr).toMatch(/resuming evolve in .*: \d+ generations from the journal/);
    expectSameFiles(directory, reference, EVOLVE_FILES);
    expect(existsSync(journal)).toBe(false);
  }, 180_000);
});
