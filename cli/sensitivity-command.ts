/**
 * `coilfront sensitivity spec.yaml`: first-order and total Sobol indices of every field of a sweep file on
 * each objective and constrained metric and on feasibility (optimize/sensitivity), evaluated in the sweep's
 * worker pool with a journal (run/sensitivity-run.ts: kill -9 and a rerun give the same files), whole or as
 * `--shard k/N` blocks merged with `--merge`. Writes sensitivity.csv and sensitivity.json into --out, each
 * written whole then renamed.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { spaceDefinitionOf } from '../optimize/design-space.ts';
import type { ShouldStop } from '../optimize/stage-stop.ts';
import type { SaltelliOutputs, SensitivityPlan } from '../optimize/sensitivity/index.ts';
import {
  readSensitivityShards,
  runSensitivityStudy,
  SENSITIVITY_JOURNAL,
  sensitivityShardDirectory,
  sensitivityShardFolder,
} from '../run/sensitivity-run.ts';
import { openEvaluator } from '../run/evaluator.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { describeShard, resolveShard, type Shard } from '../run/shard.ts';
import { lockRunOrRefuse } from '../run/sweep-setup.ts';
import { defaultWorkerCount } from '../workers/pool.ts';
import { commandError, fileError, optionError } from './input-errors.ts';
import type { CliIo } from './io.ts';
import { shardDirectoriesToMerge } from './shard-directories.ts';
import { stageStop } from './stage-signal.ts';
import { SAFETY_LINE } from './safety.ts';
import { writeSensitivityOutputs } from './sensitivity-outputs.ts';

export { FEASIBLE_ROW } from './sensitivity-outputs.ts';
import { writeSummarySection } from './stage-outputs.ts';
import { loadRunSpec, loadSweepFile, type SweepSpec } from './sweep-spec.ts';

export interface SensitivityOptions {
  samples?: number;
  workers?: number;
  out?: string;
  /** `k/N`: evaluate only the k-th of N blocks of the design's rows, into its own shard directory. */
  shard?: string;
  /** Merge the shards (these directories, or every one under `<out>/sensitivity-shards` when `true`). */
  merge?: string[] | boolean;
}

function planOf(file: string, samples: number): { plan: SensitivityPlan; identity: string } {
  return planOfSpec(loadSweepFile(file), file, samples);
}

/** The study of a read sweep file (`file` names it in messages): its plan, and its identity (the spec hash). */
function planOfSpec(spec: SweepSpec, file: string, samples: number): { plan: SensitivityPlan; identity: string } {
  const k = spec.dimensions.length;
  if (k < 1 || k > 32) throw fileError(file, `sensitivity needs 1 to 32 swept fields, the file has ${k}`);
  const metrics = [...new Set([...spec.objectives.map((o) => o.metric), ...spec.constraints.map((c) => c.metric)])];
  if (metrics.length === 0) throw fileError(file, `no objectives or constraints to analyse`);
  const required = spec.objectives.map((o) => o.metric);
  const plan = { definition: spaceDefinitionOf(spec), samples, metrics, constraints: spec.constraints, required };
  return { plan, identity: spec.hash };
}

export async function sensitivityCommand(file: string, options: SensitivityOptions, io: CliIo): Promise<number> {
  const samples = options.samples ?? 512;
  if (!Number.isInteger(samples) || samples < 2) throw optionError('--samples', `expected at least 2, got ${samples}`);
  if (options.merge && options.shard !== undefined)
    throw commandError(
      'sensitivity',
      '--shard and --merge do not go together: merge the finished shards without --shard',
    );
  const { plan, identity } = planOf(file, samples);
  const out = options.out ?? '.';
  if (options.merge) {
    const outputs = readSensitivityShards(
      identity,
      plan,
      shardDirectoriesToMerge(sensitivityShardFolder(out), options.merge),
    );
    mkdirSync(out, { recursive: true });
    writeSensitivityOutputs(out, plan, outputs, io);
    return 0;
  }
  const shard = resolveShard({ shardFlag: options.shard, env: process.env });
  const directory = shard ? sensitivityShardDirectory(out, shard) : out;
  mkdirSync(directory, { recursive: true });
  // Run by its own command, Ctrl-C or SIGTERM stops it between batches, the journal kept (cli/stage-signal.ts).
  const stop = stageStop(undefined, io);
  let outputs: SaltelliOutputs;
  try {
    if (shard) io.err(`sensitivity: ${describeShard(shard)}\n`);
    outputs = await lockedStudy(directory, plan, identity, { ...options, shard, shouldStop: stop.shouldStop }, io);
  } catch (error) {
    const kept = `every finished batch is kept in ${join(directory, SENSITIVITY_JOURNAL)}`;
    const again = `npx coilfront sensitivity ${file} --samples ${samples} --out ${out}${shard ? ` --shard ${shard.index}/${shard.count}` : ''}`;
    const code = stop.stopped(error, kept, again);
    if (code === null) throw error;
    return code;
  } finally {
    stop.dispose();
  }
  if (shard) {
    io.out(
      `sensitivity shard ${shard.index}/${shard.count}: its rows are evaluated into ${directory}\n` +
        `when every shard has finished: npx coilfront sensitivity ${file} --merge (with the same --samples and --out)\n${SAFETY_LINE}\n`,
    );
    return 0;
  }
  writeSensitivityOutputs(out, plan, outputs, io);
  return 0;
}

/** The study evaluated into `directory` (locked while it runs) through its journal. */
async function lockedStudy(
  directory: string,
  plan: SensitivityPlan,
  identity: string,
  options: { workers?: number; shard?: Shard | null; shouldStop?: ShouldStop },
  io: CliIo,
): Promise<SaltelliOutputs> {
  const lock = lockRunOrRefuse(directory);
  try {
    const threads = options.workers ?? defaultWorkerCount();
    return await runSensitivityStudy({
      journalPath: join(directory, SENSITIVITY_JOURNAL),
      identity,
      plan,
      evaluator: openEvaluator(plan.definition, threads),
      threads,
      shard: options.shard ?? null,
      notice: (line) => io.err(`${line}\n`),
      ...(options.shouldStop ? { shouldStop: options.shouldStop } : {}),
    });
  } finally {
    lock.release();
  }
}

/** The name of the section of summary.json that a sweep's sensitivity stage writes. */
export const SOBOL_SECTION = 'sobol';

export interface SensitivityStageOptions {
  samples: number;
  workers?: number;
  /** Polled between batches (the stages' stop request): true stops with StageStopped, the journal kept. */
  shouldStop?: ShouldStop;
}

/**
 * A sweep's `- sensitivity: { samples }` stage on its finished run directory: the study of `coilfront
 * sensitivity DIR/spec.yaml --samples N --out DIR` (the same plan, identity and journal, so the same files),
 * and the `sobol` section of summary.json, which holds what sensitivity.json holds less its safety line.
 */
export async function sensitivityStage(
  directory: string,
  options: SensitivityStageOptions,
  io: CliIo,
): Promise<number> {
  const file = join(directory, RUN_FILES.spec);
  const { plan, identity } = planOfSpec(loadRunSpec(directory), file, options.samples);
  const outputs = await lockedStudy(directory, plan, identity, options, io);
  const study = writeSensitivityOutputs(directory, plan, outputs, io);
  const path = writeSummarySection(directory, SOBOL_SECTION, study);
  io.out(`the same indices are in the '${SOBOL_SECTION}' section of ${path}\n`);
  return 0;
}
