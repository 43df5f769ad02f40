import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { parse as parseYaml } from 'yaml';
import { checkCoverage, parseShard, parseShardCount, shardFromEnvironment, shardIndices, type Shard } from '../../cli/shard.ts';
import { parseDuration } from '../../cli/duration.ts';

// The cluster examples must cut a sweep into shards that cover it exactly: each is read here the way
// its scheduler would run it, and the shards it would produce are checked for coverage.

const example = (name: string): string => readFileSync(new URL(`../../examples/cluster/${name}`, import.meta.url), 'utf8');
const TOTAL = 100_003; // an arbitrary sample count that no shard count divides evenly

function covers(shards: Shard[]): string[] {
  return checkCoverage(
    shards.map((shard, position) => ({ ...shard, range: shardIndices(shard.index, shard.count, TOTAL), label: `task${position}` })),
    TOTAL,
  );
}

const hasBash = spawnSync('bash', ['--version']).status === 0;

describe('examples/cluster/slurm-array.sh', () => {
  const script = example('slurm-array.sh');

  it('gives every array task a distinct shard from its environment, covering the sweep', () => {
    const [, first, last] = /^#SBATCH --array=(\d+)-(\d+)$/m.exec(script)!.map(Number);
    const shards: Shard[] = [];
    for (let id = first; id <= last; id++) {
      // Slurm sets these for every array task (Slurm documentation, "Job Array Support").
      const env = { SLURM_ARRAY_TASK_ID: String(id), SLURM_ARRAY_TASK_MIN: String(first), SLURM_ARRAY_TASK_MAX: String(last), SLURM_ARRAY_TASK_COUNT: String(last - first + 1), SLURM_ARRAY_TASK_STEP: '1' };
      shards.push(shardFromEnvironment(env)!);
    }
    expect(shards).toHaveLength(8);
    expect(covers(shards)).toEqual([]);
    expect(script).toMatch(/--out "runs\/night-shard-\$SLURM_ARRAY_TASK_ID"/);
  });

  it('stops coilfront by its own time limit before Slurm signals, and Slurm signals before the job limit', () => {
    const [, hours, minutes, seconds] = /^#SBATCH --time=(\d+):(\d+):(\d+)$/m.exec(script)!.map(Number);
    const jobLimit = hours * 3600 + minutes * 60 + seconds;
    const signalLead = Number(/^#SBATCH --signal=B:TERM@(\d+)$/m.exec(script)![1]);
    const command = script.slice(script.indexOf('exec coilfront'));
    const timeLimit = parseDuration(/--time-limit (\S+)/.exec(command)![1]);
    expect(timeLimit).toBeLessThan(jobLimit - signalLead);
    expect(script).toMatch(/^exec coilfront sweep /m);
  });

  it.skipIf(!hasBash)('is valid bash', () => {
    expect(spawnSync('bash', ['-n'], { input: script }).status).toBe(0);
  });
});

describe('examples/cluster/indexed-job.yaml', () => {
  const manifest = parseYaml(example('indexed-job.yaml')) as {
    apiVersion: string;
    kind: string;
    spec: { completionMode: string; completions: number; parallelism: number; template: { spec: { restartPolicy: string; terminationGracePeriodSeconds: number; containers: Array<{ command: string[] }> } } };
  };

  it('is a batch/v1 Job with Indexed completion', () => {
    expect(manifest.apiVersion).toBe('batch/v1');
    expect(manifest.kind).toBe('Job');
    expect(manifest.spec.completionMode).toBe('Indexed');
    expect(manifest.spec.parallelism).toBeLessThanOrEqual(manifest.spec.completions);
    expect(manifest.spec.template.spec.restartPolicy).toBe('Never');
    expect(manifest.spec.template.spec.terminationGracePeriodSeconds).toBeGreaterThan(30);
  });

  it('passes --shard-count equal to completions, so the pods cover the sweep', () => {
    const command = manifest.spec.template.spec.containers[0].command;
    expect(command.slice(0, 2)).toEqual(['coilfront', 'sweep']);
    expect(command[command.indexOf('--out') + 1]).toBe('/runs/shard-$(JOB_COMPLETION_INDEX)');
    const count = parseShardCount(command[command.indexOf('--shard-count') + 1]);
    expect(count).toBe(manifest.spec.completions);
    // Kubernetes numbers the pods of an Indexed Job 0 … completions − 1 (Kubernetes documentation,
    // "Indexed Job for Parallel Processing with Static Work Assignment").
    const shards = Array.from({ length: manifest.spec.completions }, (_, index) =>
      shardFromEnvironment({ JOB_COMPLETION_INDEX: String(index) }, { count })!,
    );
    expect(covers(shards)).toEqual([]);
  });
});

describe('examples/cluster/gnu-parallel.sh', () => {
  const script = example('gnu-parallel.sh');

  it('runs one shard per argument, covering the sweep, then merges them all', () => {
    const line = script.split('\n').find((text) => text.startsWith('parallel '))!;
    const pattern = /--shard \{\}\/(\d+)/.exec(line)!;
    const values = line.split(':::')[1].trim().split(/\s+/);
    const shards = values.map((value) => parseShard(`${value}/${pattern[1]}`));
    expect(covers(shards)).toEqual([]);
    const merged = /coilfront merge runs\/night-shard-\{(\d+)\.\.(\d+)\}/.exec(script)!;
    expect([Number(merged[1]), Number(merged[2])]).toEqual([1, shards.length]);
  });

  it.skipIf(!hasBash)('is valid bash', () => {
    expect(spawnSync('bash', ['-n'], { input: script }).status).toBe(0);
  });
});
