import { appendFileSync, existsSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TIME_LIMIT_EXIT_CODE } from '../../run/durable/stop-signal.ts';
import {
  BUSY_RUN,
  durableFingerprint,
  expectOneLine,
  expectSameResults,
  requireBuiltCli,
  runCli,
  runCliOk,
  scratchArea,
  seededRandom,
  sleep,
  SMALL_SWEEP,
  SMALL_SWEEP_SAMPLES,
  startCli,
  summaryCounts,
  waitForProgress,
  type Finished,
  type Running,
} from './sweep-harness.ts';

// A sweep interrupted by kill -9, SIGINT, SIGTERM or its time limit and then
// resumed writes files byte-identical to an uninterrupted run (summary.json's timing aside). The
// reference is the same CLI run once without interruption; the exit codes are the shells' 128 +
// signal number (POSIX signal numbers: SIGINT 2, SIGTERM 15) and 124 for the time limit (the
// `timeout` utility of GNU coreutils). The sweep is the machinery fixture (invented demo data).
const area = scratchArea('overnight');
const KEEP = ['--keep', '40']; // fewer than the samples, so the bounded top-K set is rebuilt on resume
const reference = area.dir('reference');
const referenceAll = area.dir('reference-all');
/** The reference sweep's own run time (summary.json's timing), ms: the scale of the interruptions. */
let referenceLoopMs = 500;
/**
 * Runs that are killed: batches of 4 and a journal sync every 5 ms, so that the state snapshot
 * (every twelve syncs) and the journal's next generation are written several times per run and the
 * kills land before, between and after them. (The references use batches of 8.)
 */
const SNAPSHOTTING = ['--batch-size', '4', '--sync-every', '5ms', '--quiet'];

function resume(directory: string, extra: string[] = ['--quiet']): Running {
  return startCli(['sweep', '--resume', directory, '--workers', '2', '--sync-every', '5ms', ...extra]);
}

/** Waits until checkpoint.json is written anew (it differs from `before`) or the process ends. */
async function waitForSnapshot(directory: string, running: Running): Promise<void> {
  const path = join(directory, 'checkpoint.json');
  const stamp = (): string =>
    existsSync(path) ? String(statSync(path, { throwIfNoEntry: false })?.mtimeMs ?? '') : '';
  const before = stamp();
  let ended = false;
  void running.done.then(() => (ended = true));
  while (!ended && stamp() === before) await sleep(2);
}

/**
 * Kills `running` with SIGKILL and resumes, once per entry of `plan`: each kill comes a seeded-random
 * moment after the run has made progress (a journal record or a snapshot) or, for 'snapshot', after
 * it has written a new state snapshot. Returns how many kills landed mid-run, and how many of those
 * left a snapshot with journal records on top to resume from.
 */
async function killAndResume(
  directory: string,
  first: Running,
  plan: ReadonlyArray<'progress' | 'snapshot'>,
  seed: number,
  firstBefore = '',
): Promise<{ landed: number; afterSnapshot: number; killed: Finished[]; final: Finished }> {
  const random = seededRandom(seed);
  let running = first;
  let before = firstBefore;
  let landed = 0;
  let afterSnapshot = 0;
  const killed: Finished[] = [];
  for (const moment of plan) {
    if (moment === 'snapshot') await waitForSnapshot(directory, running);
    else await waitForProgress(directory, before, running);
    await sleep(random() * 0.2 * referenceLoopMs);
    const snapshotted = existsSync(join(directory, 'checkpoint.json'));
    running.child.kill('SIGKILL');
    const ended = await running.done;
    killed.push(ended);
    if (ended.signal === 'SIGKILL') {
      landed++;
      if (snapshotted) afterSnapshot++;
    } else expect(ended.code, ended.stderr).toBe(0); // finished before the kill: still a valid run
    before = durableFingerprint(directory);
    running = resume(directory);
  }
  return { landed, afterSnapshot, killed, final: await running.done };
}

beforeAll(async () => {
  requireBuiltCli();
  await runCliOk(['sweep', SMALL_SWEEP, '--out', reference, '--workers', '2', ...BUSY_RUN, ...KEEP]);
  referenceLoopMs =
    1000 *
    (JSON.parse(readFileSync(join(reference, 'summary.json'), 'utf8')) as { timing: { wall_seconds: number } }).timing
      .wall_seconds;
  await runCliOk(['sweep', SMALL_SWEEP, '--out', referenceAll, '--workers', '2', '--all', ...BUSY_RUN, ...KEEP]);
});

afterAll(() => area.cleanup());

describe('coilfront sweep --resume after kill -9', () => {
  it('the reference run is complete and --all does not change the ranked outputs', () => {
    expect(summaryCounts(reference).evaluated).toBe(SMALL_SWEEP_SAMPLES);
    expect(readFileSync(join(reference, 'candidates.csv'), 'utf8').trim().split('\n')).toHaveLength(41); // header + --keep 40
    expectSameResults(referenceAll, reference);
    expect(readFileSync(join(referenceAll, 'all.csv'), 'utf8').trim().split('\n')).toHaveLength(
      SMALL_SWEEP_SAMPLES + 1,
    );
  });

  it('three SIGKILLs at seeded-random moments, each resumed, end in byte-identical files', async () => {
    const directory = area.dir('killed');
    const first = startCli(['sweep', SMALL_SWEEP, '--out', directory, '--workers', '2', ...SNAPSHOTTING, ...KEEP]);
    const { landed, afterSnapshot, final } = await killAndResume(
      directory,
      first,
      ['snapshot', 'progress', 'snapshot'],
      20261201,
    );
    expect(final.code, final.stderr).toBe(0);
    expect(landed, 'kills that interrupted a running sweep').toBeGreaterThanOrEqual(2);
    expect(afterSnapshot, 'kills of a run resumed from a state snapshot').toBeGreaterThanOrEqual(1);
    expectSameResults(directory, reference);
  });

  it('with --all: all.csv too is identical, also after a torn record is appended to the journal', async () => {
    const directory = area.dir('killed-all');
    const first = startCli([
      'sweep',
      SMALL_SWEEP,
      '--out',
      directory,
      '--workers',
      '2',
      '--all',
      ...SNAPSHOTTING,
      ...KEEP,
    ]);
    const random = seededRandom(77);
    await waitForProgress(directory, '', first);
    await sleep(random() * 0.4 * referenceLoopMs);
    first.child.kill('SIGKILL');
    expect((await first.done).signal).toBe('SIGKILL');
    // A power cut in the middle of a write: half a record at the end of the live journal.
    const checkpointPath = join(directory, 'checkpoint.json');
    const generation = existsSync(checkpointPath)
      ? (JSON.parse(readFileSync(checkpointPath, 'utf8')) as { generation: number }).generation
      : 0;
    const journal = join(directory, `journal-${generation}.log`);
    const tail = readFileSync(journal).subarray(0, 40);
    appendFileSync(journal, tail.length > 0 ? tail : Buffer.from('torn'));
    const before = durableFingerprint(directory);
    const second = resume(directory, []);
    const { killed, final } = await killAndResume(directory, second, ['progress'], 78, before);
    expect(killed[0].stderr).toContain('a torn last record was dropped');
    expect(final.code, final.stderr).toBe(0);
    expectSameResults(directory, referenceAll, ['candidates.csv', 'front.csv', 'all.csv']);
  });

  it('resuming a finished run rewrites the same files', async () => {
    const result = await runCli(['sweep', '--resume', reference, '--workers', '2', '--quiet']);
    expect(result.code, result.stderr).toBe(0);
    expectSameResults(reference, referenceAll);
  });
});

describe('SIGINT, SIGTERM and --time-limit stop cleanly and resume to the same files', () => {
  it('SIGINT exits 130 with the resume hint; SIGTERM on the resumed run exits 143; the last resume matches', async () => {
    const directory = area.dir('interrupted');
    const first = startCli([
      'sweep',
      SMALL_SWEEP,
      '--out',
      directory,
      '--workers',
      '2',
      '--batch-size',
      '8',
      '--sync-every',
      '100ms',
      ...KEEP,
    ]);
    await waitForProgress(directory, '', first);
    first.child.kill('SIGINT');
    const stopped = await first.done;
    expect(stopped.signal).toBeNull();
    expect(stopped.code, stopped.stderr).toBe(130); // 128 + SIGINT (2)
    expect(stopped.stderr).toContain('received SIGINT');
    expect(stopped.stderr).toContain(`resume with: npx coilfront sweep --resume ${directory}`);
    // Outputs so far are written, marked incomplete.
    const partial = JSON.parse(readFileSync(join(directory, 'summary.json'), 'utf8')) as {
      complete: boolean;
      counts: { evaluated: number };
    };
    expect(partial.complete).toBe(false);
    expect(partial.counts.evaluated).toBeGreaterThan(0);
    expect(partial.counts.evaluated).toBeLessThan(SMALL_SWEEP_SAMPLES);

    const before = durableFingerprint(directory);
    const second = resume(directory, []);
    await waitForProgress(directory, before, second);
    second.child.kill('SIGTERM');
    const terminated = await second.done;
    expect(terminated.code, terminated.stderr).toBe(143); // 128 + SIGTERM (15)
    expect(terminated.stderr).toContain('received SIGTERM');
    expect(terminated.stderr).toContain(`resume with: npx coilfront sweep --resume ${directory}`);
    const last = await resume(directory).done;
    expect(last.code, last.stderr).toBe(0);
    expectSameResults(directory, reference);
  });

  it('a second SIGINT exits 130 at once, and the run still resumes to the same files', async () => {
    const directory = area.dir('interrupted-twice');
    const first = startCli([
      'sweep',
      SMALL_SWEEP,
      '--out',
      directory,
      '--workers',
      '2',
      '--all',
      ...SNAPSHOTTING.filter((flag) => flag !== '--quiet'),
      ...KEEP,
    ]);
    await waitForSnapshot(directory, first);
    first.child.kill('SIGINT');
    while (!first.stderrSoFar().includes('received SIGINT')) await sleep(1);
    first.child.kill('SIGINT');
    const stopped = await first.done;
    expect(stopped.code, stopped.stderr).toBe(130);
    // Almost always the second signal comes while the batches in flight finish; should the clean stop
    // have been faster, the run said so, and resuming must give the same files all the same.
    expect(stopped.stderr).toMatch(/received SIGINT again: stopping at once|stopped: SIGINT was received/);
    const resumed = await resume(directory).done;
    expect(resumed.code, resumed.stderr).toBe(0);
    expectSameResults(directory, referenceAll, ['candidates.csv', 'front.csv', 'all.csv']);
  });

  it(`--time-limit (a tenth of the reference sweep's run time, so that a less loaded machine still stops it) stops with exit code ${TIME_LIMIT_EXIT_CODE} and resumes to the same files`, async () => {
    const directory = area.dir('time-limited');
    const limit = `${Math.max(20, Math.round(0.1 * referenceLoopMs))}ms`;
    const stopped = await runCli([
      'sweep',
      SMALL_SWEEP,
      '--out',
      directory,
      '--workers',
      '2',
      '--batch-size',
      '8',
      '--sync-every',
      '100ms',
      '--time-limit',
      limit,
      ...KEEP,
    ]);
    expect(stopped.code, stopped.stderr).toBe(TIME_LIMIT_EXIT_CODE);
    expect(stopped.stderr).toContain('time limit');
    expect(stopped.stderr).toContain(`resume with: npx coilfront sweep --resume ${directory}`);
    expect(summaryCounts(directory).evaluated).toBeLessThan(SMALL_SWEEP_SAMPLES);
    const resumed = await resume(directory).done;
    expect(resumed.code, resumed.stderr).toBe(0);
    expectSameResults(directory, reference);
  });
});

describe('coilfront sweep --resume refuses a directory of another sweep', () => {
  it('a sweep file with another seed: exit 2, one line naming the seeds', async () => {
    const other = area.dir('other-seed.yaml');
    writeFileSync(other, readFileSync(SMALL_SWEEP, 'utf8').replace('seed: 2026', 'seed: 7'));
    const before = readFileSync(join(reference, 'candidates.csv'));
    const result = await runCli(['sweep', other, '--resume', reference, '--workers', '2']);
    expect(result.code).toBe(2);
    const line = expectOneLine(result.stderr, 'resume with another seed');
    expect(line).toContain(`--resume ${reference}`);
    expect(line).toMatch(/refused/);
    expect(line).toContain('seed 2026');
    expect(line).toContain('seed 7');
    expect(readFileSync(join(reference, 'candidates.csv')).equals(before)).toBe(true);
  });

  it('a sweep file with the same seed but another sample count: exit 2, one line naming the spec', async () => {
    const other = area.dir('other-samples.yaml');
    writeFileSync(other, readFileSync(SMALL_SWEEP, 'utf8').replace(`samples: ${SMALL_SWEEP_SAMPLES}`, 'samples: 200'));
    const result = await runCli(['sweep', other, '--resume', reference, '--workers', '2']);
    expect(result.code).toBe(2);
    const line = expectOneLine(result.stderr, 'resume with another spec');
    expect(line).toContain(other);
    expect(line).toMatch(/refused: .*not the sweep file this run was started from/);
  });

  it('the same sweep file is accepted with --resume', async () => {
    const result = await runCli(['sweep', SMALL_SWEEP, '--resume', referenceAll, '--workers', '2', '--quiet']);
    expect(result.code, result.stderr).toBe(0);
  });

  it('a run directory whose spec.yaml was edited: exit 2, one line', async () => {
    const directory = area.dir('edited');
    const stopped = await runCli([
      'sweep',
      SMALL_SWEEP,
      '--out',
      directory,
      '--workers',
      '2',
      '--time-limit',
      '1ms',
      ...BUSY_RUN,
      ...KEEP,
    ]);
    expect(stopped.code, stopped.stderr).toBe(TIME_LIMIT_EXIT_CODE);
    const spec = join(directory, 'spec.yaml');
    writeFileSync(spec, readFileSync(spec, 'utf8').replace('seed: 2026', 'seed: 2027'));
    const result = await runCli(['sweep', '--resume', directory, '--workers', '2']);
    expect(result.code).toBe(2);
    expect(expectOneLine(result.stderr, 'edited spec.yaml')).toMatch(/refused: spec\.yaml was changed/);
  });
});
