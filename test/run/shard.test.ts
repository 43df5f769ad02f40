import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  checkCoverage,
  describeShard,
  parseShard,
  parseShardCount,
  resolveShard,
  shardFromEnvironment,
  shardIndices,
} from '../../run/shard.ts';
import { InputError } from '../../run/input-error.ts';

describe('parseShard(text)', () => {
  it('reads k/N', () => {
    expect(parseShard('3/8')).toEqual({ index: 3, count: 8, source: 'flag' });
    expect(parseShard(' 1 / 1 ')).toEqual({ index: 1, count: 1, source: 'flag' });
  });

  it('refuses anything else with one line', () => {
    for (const text of ['0/8', '9/8', '3', '3/0', '-1/4', '1.5/4', 'a/b', '', '1/4/2', '2/2000000']) {
      expect(() => parseShard(text), text).toThrow(InputError);
      expect(() => parseShard(text)).toThrow(/^--shard: expected k\/N with 1 <= k <= N, like 2\/8, got '.*'/);
    }
    expect(() => parseShard('0/8')).toThrow(
      "--shard: expected k/N with 1 <= k <= N, like 2/8, got '0/8' (k counts from 1)",
    );
  });
});

describe('parseShardCount(text)', () => {
  it('reads a whole number of shards and refuses others', () => {
    expect(parseShardCount('8')).toBe(8);
    for (const text of ['0', '-2', '2.5', 'eight', '']) {
      expect(() => parseShardCount(text)).toThrow(/^--shard-count: expected a whole number of shards from 1 to/);
    }
  });
});

describe('shardFromEnvironment(env, options)', () => {
  it('is null outside a scheduler', () => {
    expect(shardFromEnvironment({ HOME: '/home/x' })).toBeNull();
    expect(shardFromEnvironment({ SLURM_ARRAY_TASK_ID: '' })).toBeNull();
  });

  it('reads a Slurm array --array=1-8 (ids 1 … 8)', () => {
    const env = {
      SLURM_ARRAY_TASK_ID: '3',
      SLURM_ARRAY_TASK_MIN: '1',
      SLURM_ARRAY_TASK_MAX: '8',
      SLURM_ARRAY_TASK_COUNT: '8',
      SLURM_ARRAY_TASK_STEP: '1',
    };
    expect(shardFromEnvironment(env)).toEqual({ index: 3, count: 8, source: 'slurm' });
  });

  it('reads a 0-based array --array=0-7 and a stepped one --array=1-7:2', () => {
    expect(
      shardFromEnvironment({ SLURM_ARRAY_TASK_ID: '0', SLURM_ARRAY_TASK_MIN: '0', SLURM_ARRAY_TASK_MAX: '7' }),
    ).toEqual({ index: 1, count: 8, source: 'slurm' });
    expect(
      shardFromEnvironment({
        SLURM_ARRAY_TASK_ID: '5',
        SLURM_ARRAY_TASK_MIN: '1',
        SLURM_ARRAY_TASK_MAX: '7',
        SLURM_ARRAY_TASK_STEP: '2',
        SLURM_ARRAY_TASK_COUNT: '4',
      }),
    ).toEqual({ index: 3, count: 4, source: 'slurm' });
  });

  it('takes ids 1 … COUNT when only SLURM_ARRAY_TASK_COUNT is set', () => {
    expect(shardFromEnvironment({ SLURM_ARRAY_TASK_ID: '4', SLURM_ARRAY_TASK_COUNT: '4' })).toEqual({
      index: 4,
      count: 4,
      source: 'slurm',
    });
    expect(() => shardFromEnvironment({ SLURM_ARRAY_TASK_ID: '0', SLURM_ARRAY_TASK_COUNT: '4' })).toThrow(
      /outside 1 … 4/,
    );
  });

  it('refuses an array that is not an evenly spaced range, or disagrees with a given count', () => {
    // --array=1,2,5: COUNT 3 but MIN 1, MAX 5
    expect(() =>
      shardFromEnvironment({
        SLURM_ARRAY_TASK_ID: '5',
        SLURM_ARRAY_TASK_MIN: '1',
        SLURM_ARRAY_TASK_MAX: '5',
        SLURM_ARRAY_TASK_COUNT: '3',
      }),
    ).toThrow(
      'the Slurm array has 3 tasks but runs 1-5 in steps of 1 (5 ids): use --array=A-B[:S] or give --shard k/N',
    );
    expect(() =>
      shardFromEnvironment({
        SLURM_ARRAY_TASK_ID: '2',
        SLURM_ARRAY_TASK_MIN: '1',
        SLURM_ARRAY_TASK_MAX: '7',
        SLURM_ARRAY_TASK_STEP: '2',
      }),
    ).toThrow(/is not one of the array's ids 1-7:2/);
    expect(() =>
      shardFromEnvironment(
        { SLURM_ARRAY_TASK_ID: '2', SLURM_ARRAY_TASK_MIN: '1', SLURM_ARRAY_TASK_MAX: '8' },
        { count: 4 },
      ),
    ).toThrow('the shard count 4 disagrees with the Slurm array of 8 tasks');
    expect(() => shardFromEnvironment({ SLURM_ARRAY_TASK_ID: '2' })).toThrow(
      /neither SLURM_ARRAY_TASK_COUNT nor SLURM_ARRAY_TASK_MIN and _MAX/,
    );
    expect(() => shardFromEnvironment({ SLURM_ARRAY_TASK_ID: 'two', SLURM_ARRAY_TASK_COUNT: '4' })).toThrow(
      "SLURM_ARRAY_TASK_ID: expected a whole number, got 'two'",
    );
  });

  it('reads a Kubernetes Indexed Job index (0-based) with a count, and names the count when it is missing', () => {
    expect(shardFromEnvironment({ JOB_COMPLETION_INDEX: '7' }, { count: 8 })).toEqual({
      index: 8,
      count: 8,
      source: 'kubernetes',
    });
    expect(() => shardFromEnvironment({ JOB_COMPLETION_INDEX: '3' })).toThrow(
      "JOB_COMPLETION_INDEX is 3 but the number of shards is not known: give --shard-count N (the Job's completions) or a shard count in the sweep file",
    );
    expect(() => shardFromEnvironment({ JOB_COMPLETION_INDEX: '8' }, { count: 8 })).toThrow(
      /outside 0 … 7 for 8 shards/,
    );
  });

  it('refuses both schedulers at once', () => {
    expect(() =>
      shardFromEnvironment(
        { JOB_COMPLETION_INDEX: '1', SLURM_ARRAY_TASK_ID: '1', SLURM_ARRAY_TASK_COUNT: '2' },
        { count: 2 },
      ),
    ).toThrow(/both SLURM_ARRAY_TASK_ID and JOB_COMPLETION_INDEX/);
  });
});

describe('resolveShard(input)', () => {
  const slurm = { SLURM_ARRAY_TASK_ID: '2', SLURM_ARRAY_TASK_MIN: '1', SLURM_ARRAY_TASK_MAX: '4' };
  it('lets --shard win over the environment', () => {
    expect(resolveShard({ shardFlag: '1/3', env: slurm })).toEqual({ index: 1, count: 3, source: 'flag' });
  });
  it('falls back to the environment, then to the whole sweep', () => {
    expect(resolveShard({ env: slurm })).toEqual({ index: 2, count: 4, source: 'slurm' });
    expect(resolveShard({ env: { JOB_COMPLETION_INDEX: '0' }, specCount: 5 })).toEqual({
      index: 1,
      count: 5,
      source: 'kubernetes',
    });
    expect(resolveShard({ env: { JOB_COMPLETION_INDEX: '0' }, countFlag: 6, specCount: 5 })).toEqual({
      index: 1,
      count: 6,
      source: 'kubernetes',
    });
    expect(resolveShard({ env: {}, specCount: 5 })).toBeNull();
  });
  it('refuses --shard-count without an index, and disagreeing --shard and --shard-count', () => {
    expect(() => resolveShard({ env: {}, countFlag: 8 })).toThrow(/^--shard-count: needs a shard index/);
    expect(() => resolveShard({ shardFlag: '1/3', countFlag: 4, env: {} })).toThrow(
      '--shard: 1/3 disagrees with --shard-count 4',
    );
  });
});

describe('describeShard(shard)', () => {
  it('says where the shard came from, and how to run the whole sweep instead', () => {
    expect(describeShard({ index: 2, count: 4, source: 'flag' })).toBe('shard 2/4 (from --shard)');
    expect(describeShard({ index: 3, count: 8, source: 'slurm' })).toBe(
      'shard 3/8 (from SLURM_ARRAY_TASK_ID; --shard 1/1 runs the whole sweep)',
    );
    expect(describeShard({ index: 1, count: 8, source: 'kubernetes' })).toBe(
      'shard 1/8 (from JOB_COMPLETION_INDEX; --shard 1/1 runs the whole sweep)',
    );
  });
});

describe('shardIndices(k, N, total)', () => {
  it('gives [floor((k−1)T/N), floor(kT/N))', () => {
    expect([1, 2, 3].map((k) => shardIndices(k, 3, 10))).toEqual([
      [0, 3],
      [3, 6],
      [6, 10],
    ]);
    expect(shardIndices(1, 1, 0)).toEqual([0, 0]);
    expect([1, 2, 3, 4].map((k) => shardIndices(k, 4, 2))).toEqual([
      [0, 0],
      [0, 1],
      [1, 1],
      [1, 2],
    ]);
  });

  it('partitions 0 … T−1 into N contiguous, ordered ranges whose sizes differ by at most one', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 300 }), fc.integer({ min: 0, max: 100_000 }), (count, total) => {
        let next = 0;
        const sizes: number[] = [];
        for (let k = 1; k <= count; k++) {
          const [start, end] = shardIndices(k, count, total);
          expect(start).toBe(next);
          expect(end).toBeGreaterThanOrEqual(start);
          sizes.push(end - start);
          next = end;
        }
        expect(next).toBe(total);
        expect(Math.max(...sizes) - Math.min(...sizes)).toBeLessThanOrEqual(1);
      }),
      { numRuns: 100, seed: 1 },
    );
  });

  it('is exact for totals beyond 2^53 / N (products in BigInt)', () => {
    const total = Number.MAX_SAFE_INTEGER; // 2^53 − 1
    // floor((2^53 − 1) · 2 / 3) = 6004799503160660 exactly (integer arithmetic)
    expect(shardIndices(2, 3, total)).toEqual([3002399751580330, 6004799503160660]);
  });

  it('refuses arguments out of range', () => {
    expect(() => shardIndices(0, 3, 10)).toThrow(RangeError);
    expect(() => shardIndices(4, 3, 10)).toThrow(RangeError);
    expect(() => shardIndices(1, 3, -1)).toThrow(RangeError);
  });
});

describe('checkCoverage(shards, total)', () => {
  const entry = (index: number, count: number, total: number, label: string) => ({
    index,
    count,
    range: shardIndices(index, count, total),
    label,
  });

  it('finds nothing wrong with a complete set in any order', () => {
    expect(checkCoverage([entry(3, 3, 100, 'c'), entry(1, 3, 100, 'a'), entry(2, 3, 100, 'b')], 100)).toEqual([]);
  });

  it('names missing shards, and runs of them', () => {
    expect(checkCoverage([entry(1, 3, 30, 'a'), entry(3, 3, 30, 'c')], 30)).toEqual(['shard 2/3 is missing']);
    expect(checkCoverage([entry(1, 8, 80, 'a'), entry(2, 8, 80, 'b'), entry(7, 8, 80, 'g')], 80)).toEqual([
      'shards 3/8 to 6/8 are missing',
      'shard 8/8 is missing',
    ]);
  });

  it('names a shard given twice with both directories', () => {
    expect(
      checkCoverage([entry(1, 3, 30, 'dirA'), entry(1, 3, 30, 'dirB'), entry(2, 3, 30, 'b'), entry(3, 3, 30, 'c')], 30),
    ).toEqual(['shard 1/3 appears twice: dirA, dirB']);
    expect(checkCoverage([entry(1, 1, 5, 'x'), entry(1, 1, 5, 'y'), entry(1, 1, 5, 'z')], 5)).toEqual([
      'shard 1/1 appears 3 times: x, y, z',
    ]);
  });

  it('names foreign shards: another N, an index out of range, a range of another total', () => {
    const problems = checkCoverage(
      [
        entry(1, 3, 30, 'a'),
        entry(2, 3, 30, 'b'),
        entry(3, 3, 30, 'c'),
        entry(2, 4, 30, 'stray'),
        { index: 2, count: 3, range: [7, 14], label: 'other-spec' },
      ],
      30,
    );
    expect(problems).toEqual([
      'stray holds shard 2/4, but the other shards are cut into 3',
      'other-spec holds shard 2/3 with indices [7, 14), but shard 2/3 of 30 samples is [10, 20)',
    ]);
    expect(checkCoverage([{ index: 5, count: 3, range: [0, 1], label: 'odd' }], 3)).toEqual([
      'odd holds shard 5/3, outside 1/3 … 3/3',
      'shards 1/3 to 3/3 are missing',
    ]);
    expect(checkCoverage([], 10)).toEqual(['no shards given']);
  });

  it('accepts exactly the sets that hold every k once (random sets)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 12 }),
        fc.array(fc.integer({ min: 1, max: 12 }), { maxLength: 16 }),
        (count, picks) => {
          const indices = picks.filter((k) => k <= count);
          const shards = indices.map((k, position) => entry(k, count, 1000, `dir${position}`));
          const complete = indices.length === count && new Set(indices).size === count;
          expect(checkCoverage(shards, 1000).length === 0).toBe(complete);
        },
      ),
      { numRuns: 300, seed: 2 },
    );
  });
});
