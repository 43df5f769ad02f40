import { describe, expect, it } from 'vitest';
import { chmodSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';
import { parse as parseYaml } from 'yaml';
import {
  checkCoverage,
  parseShard,
  parseShardCount,
  shardFromEnvironment,
  shardIndices,
  type Shard,
} from '../../run/shard.ts';
import { parseDuration } from '../../cli/duration.ts';
import { must } from '../../core/must.ts';

// The cluster examples must cut a sweep into shards that cover it exactly: each is read here the way
// its scheduler would run it, and the shards it would produce are checked for coverage.

const example = (name: string): string =>
  readFileSync(new URL(`../../examples/cluster/${name}`, import.meta.url), 'utf8');
const TOTAL = 100_003; // an arbitrary sample count that no shard count divides evenly

function covers(shards: Shard[]): string[] {
  return checkCoverage(
    shards.map((shard, position) => ({
      ...shard,
      range: shardIndices(shard.index, shard.count, TOTAL),
      label: `task${position}`,
    })),
    TOTAL,
  );
}

const hasBash = spawnSync('bash', ['--version']).status === 0;

/**
 * Runs a shell script with a stand-in `coilfront` first on PATH that prints its arguments, in a
 * fresh folder, twice: before and after the shard directory holds a run.json. Returns both lines.
 */
function runWithStandIn(
  shell: string,
  script: string,
  env: Record<string, string>,
  runDirectory: (cwd: string) => string,
): [string, string] {
  const cwd = mkdtempSync(join(tmpdir(), 'coilfront-example-'));
  try {
    const bin = join(cwd, 'bin');
    mkdirSync(bin);
    writeFileSync(join(bin, 'coilfront'), '#!/bin/sh\necho "coilfront $*"\n');
    chmodSync(join(bin, 'coilfront'), 0o755);
    const run = () =>
      spawnSync(shell, ['-c', script], {
        cwd,
        encoding: 'utf8',
        env: { PATH: `${bin}:${process.env.PATH ?? ''}`, ...env },
      }).stdout.trim();
    const first = run();
    mkdirSync(runDirectory(cwd), { recursive: true });
    writeFileSync(join(runDirectory(cwd), 'run.json'), '{}');
    return [first, run()];
  } finally {
    rmSync(cwd, { recursive: true, force: true });
  }
}

describe('examples/cluster/slurm-array.sh', () => {
  const script = example('slurm-array.sh');

  it('gives every array task a distinct shard from its environment, covering the sweep', () => {
    const [, first, last] = must(/^#SBATCH --array=(\d+)-(\d+)$/m.exec(script)).map(Number);
    const shards: Shard[] = [];
    for (let id = first; id <= last; id++) {
      // Slurm sets these for every array task (Slurm documentation, "Job Array Support").
      const env = {
        SLURM_ARRAY_TASK_ID: String(id),
        SLURM_ARRAY_TASK_MIN: String(first),
        SLURM_ARRAY_TASK_MAX: String(last),
        SLURM_ARRAY_TASK_COUNT: String(last - first + 1),
        SLURM_ARRAY_TASK_STEP: '1',
      };
      shards.push(must(shardFromEnvironment(env)));
    }
    expect(shards).toHaveLength(8);
    expect(covers(shards)).toEqual([]);
    expect(script).toContain('out="runs/night-shard-$SLURM_ARRAY_TASK_ID"');
    expect(script).toMatch(/^exec coilfront sweep spec\.yaml --out "\$out" /m);
  });

  it('stops coilfront by its own time limit before Slurm signals, and Slurm signals before the job limit', () => {
    const [, hours, minutes, seconds] = must(/^#SBATCH --time=(\d+):(\d+):(\d+)$/m.exec(script)).map(Number);
    const jobLimit = hours * 3600 + minutes * 60 + seconds;
    const signalLead = Number(must(/^#SBATCH --signal=B:TERM@(\d+)$/m.exec(script))[1]);
    const commands = script.split('\n').filter((line) => /^\s*exec coilfront sweep /.test(line));
    expect(commands).toHaveLength(2); // a first start and a resumed one
    for (const command of commands) {
      const timeLimit = parseDuration(must(/--time-limit (\S+)/.exec(command))[1]);
      expect(timeLimit).toBeLessThan(jobLimit - signalLead);
    }
    expect(commands[0]).toMatch(/sweep --resume "\$out" /);
  });

  it.skipIf(!hasBash)('is valid bash', () => {
    expect(spawnSync('bash', ['-n'], { input: script }).status).toBe(0);
  });

  it.skipIf(!hasBash)('starts a shard in its own directory, and resumes it when run again', () => {
    const env = { SLURM_ARRAY_TASK_ID: '3', SLURM_CPUS_PER_TASK: '8' };
    const [first, again] = runWithStandIn('bash', script, env, (cwd) => join(cwd, 'runs', 'night-shard-3'));
    expect(first).toBe('coilfront sweep spec.yaml --out runs/night-shard-3 --workers 8 --time-limit 9h30m');
    expect(again).toBe('coilfront sweep --resume runs/night-shard-3 --workers 8 --time-limit 9h30m');
  });
});

describe('examples/cluster/indexed-job.yaml', () => {
  const manifest = parseYaml(example('indexed-job.yaml')) as {
    apiVersion: string;
    kind: string;
    spec: {
      completionMode: string;
      completions: number;
      parallelism: number;
      template: {
        spec: {
          restartPolicy: string;
          terminationGracePeriodSeconds: number;
          containers: Array<{ command: string[]; args: string[] }>;
        };
      };
    };
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
    const container = manifest.spec.template.spec.containers[0];
    expect(container.command).toEqual(['sh', '-c']);
    const script = container.args[0];
    expect(script).toContain('out=/runs/shard-$JOB_COMPLETION_INDEX');
    // no $(…) in the script: Kubernetes would expand it as a variable reference before the shell runs
    expect(script).not.toContain('$(');
    const start = must(/exec coilfront sweep \/spec\/night\.yaml --out "\$out" --shard-count (\d+)/.exec(script));
    const count = parseShardCount(start[1]);
    expect(count).toBe(manifest.spec.completions);
    expect(script).toMatch(/if \[ -e "\$out\/run\.json" \]; then exec coilfront sweep --resume "\$out"; fi/);
    // Kubernetes numbers the pods of an Indexed Job 0 … completions − 1 (Kubernetes documentation,
    // "Indexed Job for Parallel Processing with Static Work Assignment").
    const shards = Array.from({ length: manifest.spec.completions }, (_, index) =>
      must(shardFromEnvironment({ JOB_COMPLETION_INDEX: String(index) }, { count })),
    );
    expect(covers(shards)).toEqual([]);
  });

  it.skipIf(!hasBash)('has a container script that starts the shard, and resumes it in a replaced pod', () => {
    const script = manifest.spec.template.spec.containers[0].args[0];
    // /runs is absolute in the pod; here it is redirected into a temporary folder
    const cwd = mkdtempSync(join(tmpdir(), 'coilfront-k8s-'));
    try {
      const local = script.replaceAll('/runs/', `${cwd}/runs/`);
      const [first, again] = runWithStandIn('sh', local, { JOB_COMPLETION_INDEX: '5' }, () =>
        join(cwd, 'runs', 'shard-5'),
      );
      expect(first).toBe(`coilfront sweep /spec/night.yaml --out ${cwd}/runs/shard-5 --shard-count 8 --overwrite`);
      expect(again).toBe(`coilfront sweep --resume ${cwd}/runs/shard-5`);
    } finally {
      rmSync(cwd, { recursive: true, force: true });
    }
  });
});

describe('examples/cluster/gnu-parallel.sh', () => {
  const script = example('gnu-parallel.sh');

  it('runs one shard per argument, covering the sweep, then merges them all', () => {
    const line = must(script.split('\n').find((text) => text.startsWith('parallel ')));
    const pattern = must(/--shard \{\}\/(\d+)/.exec(line));
    const values = line.split(':::')[1].trim().split(/\s+/);
    const shards = values.map((value) => parseShard(`${value}/${pattern[1]}`));
    expect(covers(shards)).toEqual([]);
    const merged = must(/coilfront merge runs\/night-shard-\{(\d+)\.\.(\d+)\}/.exec(script));
    expect([Number(merged[1]), Number(merged[2])]).toEqual([1, shards.length]);
  });

  it.skipIf(!hasBash)('is valid bash', () => {
    expect(spawnSync('bash', ['-n'], { input: script }).status).toBe(0);
  });
});
