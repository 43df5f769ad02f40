/**
 * `coilfront sensitivity spec.yaml`: first-order and total Sobol indices of every field of a sweep file on
 * each objective and constrained metric and on feasibility (optimize/sensitivity), evaluated in the sweep's
 * worker pool with a journal (run/sensitivity-run.ts: kill -9 and a rerun give the same files), whole or as
 * `--shard k/N` blocks merged with `--merge`. Writes sensitivity.csv and sensitivity.json into --out, each
 * written whole then renamed.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { SaltelliOutputs, SensitivityPlan } from '../optimize/sensitivity/index.ts';
import {
  readSensitivityShards,
  SENSITIVITY_JOURNAL,
  sensitivityShardDirectory,
  sensitivityShardFolder,
} from '../run/sensitivity-run.ts';
import { describeShard, resolveShard } from '../run/shard.ts';
import { commandError, optionError } from './input-errors.ts';
import type { CliIo } from './io.ts';
import { SAFETY_LINE } from './safety.ts';
import { writeSensitivityOutputs } from './sensitivity-outputs.ts';
import { lockedStudy, planOfSpec } from './sensitivity-study.ts';
import { shardDirectoriesToMerge } from './shard-directories.ts';
import { stageStop } from './stage-signal.ts';
import { loadSweepFile } from './sweep-spec.ts';

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
