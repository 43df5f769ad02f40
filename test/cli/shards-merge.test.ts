import { cpSync, existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TIME_LIMIT_EXIT_CODE } from '../../run/durable/stop-signal.ts';
import {
  expectOneLine,
  expectSameResults,
  requireBuiltCli,
  runCli,
  runCliOk,
  scratchArea,
  SMALL_SWEEP,
  SMALL_SWEEP_SAMPLES,
} from './sweep-harness.ts';

// Shards of one sweep, whether given by --shard k/N, a Slurm job array
// (SLURM_ARRAY_TASK_ID with SLURM_ARRAY_TASK_COUNT, as documented by Slurm's sbatch --array) or a
// Kubernetes Indexed Job (JOB_COMPLETION_INDEX, 0-based, as documented for batch/v1 Jobs with
// completionMode: Indexed), merged by `coilfront merge`, give exactly the files one run over all
// samples writes (summary.json's timing aside). The check is against that single run of the same CLI.
const area = scratchArea('shards');
const reference = area.dir('single');
const COMMON = ['--batch-size', '8', '--checkpoint-every', '100ms', '--quiet', '--keep', '40'];
const shardDirs = [1, 2, 3].map((k) => area.dir(`flag-${k}`));

interface RunRecord {
  range: [number, number];
  shard: { index: number; count: number; source: string } | null;
}
const runRecord = (directory: string): RunRecord =>
  JSON.parse(readFileSync(join(directory, 'run.json'), 'utf8')) as RunRecord;

beforeAll(async () => {
  requireBuiltCli();
  await Promise.all([
    runCliOk(['sweep', SMALL_SWEEP, '--out', reference, '--workers', '1', '--all', ...COMMON]),
    ...shardDirs.map((directory, i) =>
      runCliOk([
        'sweep',
        SMALL_SWEEP,
        '--out',
        directory,
        '--workers',
        '1',
        '--all',
        '--shard',
        `${i + 1}/3`,
        ...COMMON,
      ]),
    ),
  ]);
});

afterAll(() => area.cleanup());

describe('coilfront sweep --shard k/N and coilfront merge', () => {
  it('three shards cover 0 … 255 in contiguous disjoint ranges [floor((k-1)T/N), floor(kT/N))', () => {
    const records = shardDirs.map(runRecord);
    expect(records.map((r) => r.range)).toEqual([
      [0, 85],
      [85, 170],
      [170, 256],
    ]);
    expect(records.map((r) => r.shard)).toEqual([1, 2, 3].map((index) => ({ index, count: 3, source: 'flag' })));
  });

  it('merged, they equal the single run: candidates.csv, front.csv, all.csv and summary.json', async () => {
    const merged = area.dir('merged-flag');
    const result = await runCliOk(['merge', ...[...shardDirs].reverse(), '--out', merged]);
    expect(result.stdout).toContain(`merged 3 shards (${SMALL_SWEEP_SAMPLES} designs`);
    expectSameResults(merged, reference, ['candidates.csv', 'front.csv', 'all.csv']);
  });

  it('shards from a Slurm job array (SLURM_ARRAY_TASK_ID, SLURM_ARRAY_TASK_COUNT) and a Kubernetes Indexed Job (JOB_COMPLETION_INDEX, --shard-count) take the same slices and merge to the single run', async () => {
    const slurm1 = area.dir('slurm-1');
    const indexed2 = area.dir('indexed-1'); // JOB_COMPLETION_INDEX counts from 0
    const slurm3 = area.dir('slurm-3');
    await Promise.all([
      runCliOk(['sweep', SMALL_SWEEP, '--out', slurm1, '--workers', '1', ...COMMON], {
        env: { SLURM_ARRAY_TASK_ID: '1', SLURM_ARRAY_TASK_COUNT: '3' },
      }),
      runCliOk(['sweep', SMALL_SWEEP, '--out', indexed2, '--workers', '1', '--shard-count', '3', ...COMMON], {
        env: { JOB_COMPLETION_INDEX: '1' },
      }),
      runCliOk(['sweep', SMALL_SWEEP, '--out', slurm3, '--workers', '1', ...COMMON], {
        env: { SLURM_ARRAY_TASK_ID: '3', SLURM_ARRAY_TASK_COUNT: '3' },
      }),
    ]);
    const dirs = [slurm1, indexed2, slurm3];
    expect(dirs.map((d) => runRecord(d).shard)).toEqual([
      { index: 1, count: 3, source: 'slurm' },
      { index: 2, count: 3, source: 'kubernetes' },
      { index: 3, count: 3, source: 'slurm' },
    ]);
    expect(dirs.map((d) => runRecord(d).range)).toEqual(shardDirs.map((d) => runRecord(d).range));
    const merged = area.dir('merged-scheduler');
    await runCliOk(['merge', ...dirs, '--out', merged]);
    expectSameResults(merged, reference);
  });
});

describe('coilfront merge refuses an incomplete or mixed set of shards, naming each', () => {
  async function refused(args: string[], context: string): Promise<string> {
    const out = area.dir(`refused-${context.replace(/\W+/g, '-')}`);
    const result = await runCli(['merge', ...args, '--out', out]);
    expect(result.code, result.stderr).toBe(2);
    expect(result.stdout).toBe('');
    expect(existsSync(join(out, 'candidates.csv'))).toBe(false);
    return expectOneLine(result.stderr, context);
  }

  it('a missing shard', async () => {
    const line = await refused([shardDirs[0], shardDirs[2]], 'missing shard');
    expect(line).toContain('shard 2/3 is missing');
  });

  it('a duplicated shard, naming both directories', async () => {
    const copy = area.dir('flag-1-copy');
    cpSync(shardDirs[0], copy, { recursive: true });
    const line = await refused([...shardDirs, copy], 'duplicate shard');
    expect(line).toContain('shard 1/3 appears twice');
    expect(line).toContain(shardDirs[0]);
    expect(line).toContain(copy);
  });

  it('a shard of another sweep (another seed), naming its directory', async () => {
    const otherSpec = area.dir('seed-7.yaml');
    writeFileSync(otherSpec, readFileSync(SMALL_SWEEP, 'utf8').replace('seed: 2026', 'seed: 7'));
    const foreign = area.dir('foreign-2');
    await runCliOk(['sweep', otherSpec, '--out', foreign, '--workers', '2', '--shard', '2/3', ...COMMON]);
    const line = await refused([shardDirs[0], foreign, shardDirs[2]], 'foreign shard');
    expect(line).toContain(foreign);
    expect(line).toMatch(/another sweep file|seed 7/);
  });

  it('an unfinished shard, naming it and how to finish it', async () => {
    const unfinished = area.dir('unfinished-3');
    const stopped = await runCli([
      'sweep',
      SMALL_SWEEP,
      '--out',
      unfinished,
      '--workers',
      '1',
      '--shard',
      '3/3',
      '--time-limit',
      '1ms',
      ...COMMON,
    ]);
    expect(stopped.code, stopped.stderr).toBe(TIME_LIMIT_EXIT_CODE);
    const line = await refused([shardDirs[0], shardDirs[1], unfinished], 'unfinished shard');
    expect(line).toContain(`${unfinished} is not finished`);
    expect(line).toContain(`coilfront sweep --resume ${unfinished}`);
  });
});
