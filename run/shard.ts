/**
 * Shards: splitting one sweep's sample indices over several machines so that merging the pieces gives
 * exactly the result of one run.
 *
 * Slicing unit: contiguous ranges of sample indices. Shard k of N over T samples evaluates the
 * half-open range [floor((k−1)·T/N), floor(k·T/N)); the N ranges are disjoint, cover 0 … T−1 once,
 * keep index order, and differ in size by at most one. Each shard cuts its own range into batches,
 * which does not change any result: a design depends only on its sample index. `merge` checks
 * coverage by comparing each shard's recorded range with this rule ({@link checkCoverage}).
 *
 * Where k and N come from: `--shard k/N`; else a Slurm job array (SLURM_ARRAY_TASK_ID with
 * SLURM_ARRAY_TASK_MIN/MAX/STEP or SLURM_ARRAY_TASK_COUNT); else a Kubernetes Indexed Job
 * (JOB_COMPLETION_INDEX, 0-based, with the count from --shard-count or the sweep file).
 */
import { environmentError, type InputError, optionError, subjectError } from './input-error.ts';

/** The largest number of shards accepted (far above any array a scheduler allows by default). */
export const MAX_SHARD_COUNT = 1_000_000;

/** Where a shard's index and count came from. */
export type ShardSource = 'flag' | 'slurm' | 'kubernetes';

/** One shard of a sweep: `index` from 1 to `count`. */
export interface Shard {
  index: number;
  count: number;
  source: ShardSource;
}

/** The environment variables read here (process.env fits). */
export type ShardEnvironment = Readonly<Record<string, string | undefined>>;

/**
 * Parses `--shard k/N`: whole numbers with 1 ≤ k ≤ N ≤ MAX_SHARD_COUNT, spaces around '/' allowed.
 * Anything else is an InputError: "--shard: expected k/N with 1 <= k <= N, like 2/8, got '0/8'".
 *
 * @example parseShard('3/8') // { index: 3, count: 8, source: 'flag' }
 */
export function parseShard(text: string, options: { option?: string } = {}): Shard {
  const option = options.option ?? '--shard';
  const match = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  const fail = (hint = ''): InputError =>
    optionError(option, `expected k/N with 1 <= k <= N, like 2/8, got '${text}'${hint}`);
  if (match === null) throw fail();
  const index = Number(match[1]);
  const count = Number(match[2]);
  if (count < 1 || count > MAX_SHARD_COUNT) throw fail(` (N from 1 to ${MAX_SHARD_COUNT})`);
  if (index < 1 || index > count) throw fail(index === 0 ? ' (k counts from 1)' : '');
  return { index, count, source: 'flag' };
}

/**
 * Parses `--shard-count N` (a whole number from 1 to MAX_SHARD_COUNT).
 *
 * @example parseShardCount('8') // 8
 */
export function parseShardCount(text: string, options: { option?: string } = {}): number {
  const option = options.option ?? '--shard-count';
  const count = /^\s*\d+\s*$/.test(text) ? Number(text) : NaN;
  if (!(count >= 1 && count <= MAX_SHARD_COUNT)) {
    throw optionError(option, `expected a whole number of shards from 1 to ${MAX_SHARD_COUNT}, got '${text}'`);
  }
  return count;
}

/** A variable's value, or undefined when unset or blank. */
function variable(env: ShardEnvironment, name: string): string | undefined {
  const value = env[name];
  return value === undefined || value.trim() === '' ? undefined : value.trim();
}

/** A variable that must hold a whole number ≥ 0, or undefined when unset. */
function wholeVariable(env: ShardEnvironment, name: string): number | undefined {
  const value = variable(env, name);
  if (value === undefined) return undefined;
  if (!/^\d+$/.test(value)) throw subjectError(name, `expected a whole number, got '${value}'`);
  return Number(value);
}

/** Options of {@link shardFromEnvironment}. */
export interface ShardEnvironmentOptions {
  /** The shard count from --shard-count or the sweep file; needed with JOB_COMPLETION_INDEX. */
  count?: number;
}

/**
 * The shard a scheduler assigned to this process, read from its environment, or null when no
 * scheduler variables are set.
 *
 * Slurm job array: k = (SLURM_ARRAY_TASK_ID − MIN) / STEP + 1 and N = (MAX − MIN) / STEP + 1 from
 * SLURM_ARRAY_TASK_MIN, _MAX and _STEP (STEP 1 when unset); with only SLURM_ARRAY_TASK_COUNT, ids
 * are taken to run 1 … COUNT (the `--array=1-N` form). An array that is not an evenly spaced range
 * (`--array=1,2,5`), or whose COUNT disagrees with MIN/MAX/STEP, is refused: give --shard instead.
 * Kubernetes Indexed Job: k = JOB_COMPLETION_INDEX + 1, and N is `options.count`; without a count
 * the call fails, naming what is missing. A count given with a Slurm array must agree with it.
 * Both schedulers' variables at once is refused as ambiguous. Errors are InputErrors, one line.
 *
 * @example shardFromEnvironment({ SLURM_ARRAY_TASK_ID: '3', SLURM_ARRAY_TASK_MIN: '1', SLURM_ARRAY_TASK_MAX: '8' })
 *   // { index: 3, count: 8, source: 'slurm' }
 * @example shardFromEnvironment({ JOB_COMPLETION_INDEX: '0' }, { count: 8 }) // { index: 1, count: 8, source: 'kubernetes' }
 */
export function shardFromEnvironment(env: ShardEnvironment, options: ShardEnvironmentOptions = {}): Shard | null {
  const slurmId = wholeVariable(env, 'SLURM_ARRAY_TASK_ID');
  const kubernetesIndex = wholeVariable(env, 'JOB_COMPLETION_INDEX');
  if (slurmId !== undefined && kubernetesIndex !== undefined) {
    throw environmentError(
      'both SLURM_ARRAY_TASK_ID and JOB_COMPLETION_INDEX are set: give --shard k/N to say which shard this is',
    );
  }
  if (slurmId !== undefined) return slurmShard(env, slurmId, options.count);
  if (kubernetesIndex !== undefined) {
    if (options.count === undefined) {
      throw environmentError(
        `JOB_COMPLETION_INDEX is ${kubernetesIndex} but the number of shards is not known: give --shard-count N (the Job's completions) or a shard count in the sweep file`,
      );
    }
    checkCount(options.count, 'the shard count');
    if (kubernetesIndex >= options.count) {
      throw environmentError(
        `JOB_COMPLETION_INDEX is ${kubernetesIndex}, outside 0 … ${options.count - 1} for ${options.count} shards: --shard-count must equal the Job's completions`,
      );
    }
    return { index: kubernetesIndex + 1, count: options.count, source: 'kubernetes' };
  }
  return null;
}

function checkCount(count: number, what: string): void {
  if (!Number.isInteger(count) || count < 1 || count > MAX_SHARD_COUNT) {
    throw environmentError(`${what} must be a whole number from 1 to ${MAX_SHARD_COUNT}, got ${count}`);
  }
}

function slurmShard(env: ShardEnvironment, id: number, givenCount: number | undefined): Shard {
  const minimum = wholeVariable(env, 'SLURM_ARRAY_TASK_MIN');
  const maximum = wholeVariable(env, 'SLURM_ARRAY_TASK_MAX');
  const step = wholeVariable(env, 'SLURM_ARRAY_TASK_STEP') ?? 1;
  const taskCount = wholeVariable(env, 'SLURM_ARRAY_TASK_COUNT');
  const described = `SLURM_ARRAY_TASK_ID=${id}`;
  if (step < 1) throw environmentError(`SLURM_ARRAY_TASK_STEP: expected a step of 1 or more, got ${step}`);
  let index: number;
  let count: number;
  if (minimum !== undefined && maximum !== undefined) {
    if (maximum < minimum || (maximum - minimum) % step !== 0) {
      throw environmentError(
        `the Slurm array ${minimum}-${maximum}:${step} is not an evenly spaced range: give --shard k/N`,
      );
    }
    count = (maximum - minimum) / step + 1;
    if (taskCount !== undefined && taskCount !== count) {
      throw environmentError(
        `the Slurm array has ${taskCount} tasks but runs ${minimum}-${maximum} in steps of ${step} (${count} ids): use --array=A-B[:S] or give --shard k/N`,
      );
    }
    if (id < minimum || id > maximum || (id - minimum) % step !== 0) {
      throw environmentError(`${described} is not one of the array's ids ${minimum}-${maximum}:${step}`);
    }
    index = (id - minimum) / step + 1;
  } else if (taskCount !== undefined) {
    count = taskCount;
    if (id < 1 || id > taskCount) {
      throw environmentError(
        `${described} is outside 1 … ${taskCount} (SLURM_ARRAY_TASK_COUNT) and SLURM_ARRAY_TASK_MIN is not set: give --shard k/N`,
      );
    }
    index = id;
  } else {
    throw environmentError(
      `${described} is set but neither SLURM_ARRAY_TASK_COUNT nor SLURM_ARRAY_TASK_MIN and _MAX are: give --shard k/N`,
    );
  }
  checkCount(count, 'the Slurm array size');
  if (givenCount !== undefined && givenCount !== count) {
    throw environmentError(`the shard count ${givenCount} disagrees with the Slurm array of ${count} tasks`);
  }
  return { index, count, source: 'slurm' };
}

/** Inputs of {@link resolveShard}. */
export interface ResolveShardInput {
  /** The text of --shard, if given. */
  shardFlag?: string;
  /** --shard-count, if given on the command line. */
  countFlag?: number;
  /** A shard count from the sweep file, if it has one (used only under a Kubernetes Indexed Job). */
  specCount?: number;
  /** The environment (process.env). */
  env: ShardEnvironment;
}

/**
 * The shard this process runs, or null for the whole sweep: --shard wins over the environment (and
 * must agree with --shard-count when both are given); else the scheduler's variables
 * ({@link shardFromEnvironment}, with --shard-count before the sweep file's count); else null. A
 * --shard-count with no shard index anywhere is an error, since it would run the whole sweep on every
 * machine.
 *
 * @example resolveShard({ shardFlag: '2/4', env: process.env }) // { index: 2, count: 4, source: 'flag' }
 */
export function resolveShard(input: ResolveShardInput): Shard | null {
  if (input.shardFlag !== undefined) {
    const shard = parseShard(input.shardFlag);
    if (input.countFlag !== undefined && input.countFlag !== shard.count) {
      throw optionError('--shard', `${shard.index}/${shard.count} disagrees with --shard-count ${input.countFlag}`);
    }
    return shard;
  }
  const shard = shardFromEnvironment(input.env, { count: input.countFlag ?? input.specCount });
  if (shard === null && input.countFlag !== undefined) {
    throw optionError(
      '--shard-count',
      'needs a shard index: give --shard k/N, or run under a Slurm job array or a Kubernetes Indexed Job',
    );
  }
  return shard;
}

/**
 * A shard in words for the run's log, saying where it came from, so a sweep that a scheduler's
 * variables cut into a slice never does so silently.
 *
 * @example describeShard({ index: 3, count: 8, source: 'slurm' })
 *   // 'shard 3/8 (from SLURM_ARRAY_TASK_ID; --shard 1/1 runs the whole sweep)'
 */
export function describeShard(shard: Shard): string {
  const origin =
    shard.source === 'flag'
      ? 'from --shard'
      : `from ${shard.source === 'slurm' ? 'SLURM_ARRAY_TASK_ID' : 'JOB_COMPLETION_INDEX'}; --shard 1/1 runs the whole sweep`;
  return `shard ${shard.index}/${shard.count} (${origin})`;
}

/**
 * The sample indices of shard `index` of `count` over `total` samples: the half-open range
 * [floor((index−1)·total/count), floor(index·total/count)), as [start, end]. Exact for any totals
 * up to Number.MAX_SAFE_INTEGER (the products are taken in BigInt). Throws RangeError for
 * arguments that are not whole numbers with 1 ≤ index ≤ count and total ≥ 0 (callers validate first).
 *
 * @example shardIndices(2, 3, 10) // [3, 6]
 */
export function shardIndices(index: number, count: number, total: number): [start: number, end: number] {
  if (!Number.isSafeInteger(count) || count < 1 || !Number.isSafeInteger(index) || index < 1 || index > count) {
    throw new RangeError(`shardIndices needs whole numbers 1 <= index <= count, got ${index}/${count}`);
  }
  if (!Number.isSafeInteger(total) || total < 0)
    throw new RangeError(`shardIndices needs a whole total >= 0, got ${total}`);
  const cut = (k: number): number => Number((BigInt(k) * BigInt(total)) / BigInt(count));
  return [cut(index - 1), cut(index)];
}

/** One shard as `merge` found it: its k/N, the index range it recorded, and a label (its directory). */
export interface ShardCoverageEntry {
  index: number;
  count: number;
  range: readonly [start: number, end: number];
  label: string;
}

/** "shards 2/8 to 4/8" or "shard 2/8". */
function shardSpan(first: number, last: number, count: number): string {
  return first === last ? `shard ${first}/${count}` : `shards ${first}/${count} to ${last}/${count}`;
}

/**
 * The problems that keep `shards` from covering the sample indices 0 … total−1 exactly once, in
 * words, or [] when they do. Reports shards cut with another N than most ("foreign"), indices
 * outside 1 … N, ranges that differ from {@link shardIndices} (another total: another spec), shards
 * given twice or more ("shard 1/3 appears twice: dirA, dirB") and missing shards ("shard 2/3 is
 * missing", runs of them as "shards 4/8 to 6/8 are missing").
 *
 * @example checkCoverage([{ index: 1, count: 2, range: [0, 5], label: 'a' }], 10) // ['shard 2/2 is missing']
 */
export function checkCoverage(shards: readonly ShardCoverageEntry[], total: number): string[] {
  if (shards.length === 0) return ['no shards given'];
  const problems: string[] = [];
  // The N that most shards were cut with (the first seen among equals) is taken as the run's.
  const votes = new Map<number, number>();
  for (const shard of shards) votes.set(shard.count, (votes.get(shard.count) ?? 0) + 1);
  let count = shards[0].count;
  for (const [candidate, tally] of votes) if (tally > (votes.get(count) ?? 0)) count = candidate;

  const byIndex = new Map<number, string[]>();
  for (const shard of shards) {
    if (shard.count !== count) {
      problems.push(
        `${shard.label} holds shard ${shard.index}/${shard.count}, but the other shards are cut into ${count}`,
      );
      continue;
    }
    if (!Number.isInteger(shard.index) || shard.index < 1 || shard.index > count) {
      problems.push(`${shard.label} holds shard ${shard.index}/${count}, outside 1/${count} … ${count}/${count}`);
      continue;
    }
    const [start, end] = shardIndices(shard.index, count, total);
    if (shard.range[0] !== start || shard.range[1] !== end) {
      problems.push(
        `${shard.label} holds shard ${shard.index}/${count} with indices [${shard.range[0]}, ${shard.range[1]}), but shard ${shard.index}/${count} of ${total} samples is [${start}, ${end})`,
      );
      continue;
    }
    const labels = byIndex.get(shard.index) ?? [];
    labels.push(shard.label);
    byIndex.set(shard.index, labels);
  }
  for (const [index, labels] of [...byIndex].sort((a, b) => a[0] - b[0])) {
    if (labels.length > 1) {
      const times = labels.length === 2 ? 'twice' : `${labels.length} times`;
      problems.push(`shard ${index}/${count} appears ${times}: ${labels.join(', ')}`);
    }
  }
  let runStart = 0;
  for (let index = 1; index <= count + 1; index++) {
    const missing = index <= count && !byIndex.has(index);
    if (missing && runStart === 0) runStart = index;
    if (!missing && runStart !== 0) {
      const verb = runStart === index - 1 ? 'is' : 'are';
      problems.push(`${shardSpan(runStart, index - 1, count)} ${verb} missing`);
      runStart = 0;
    }
  }
  return problems;
}
