/**
 * `coilfront merge SHARD_DIR... --out DIR`: combines the shards of one sweep (a Slurm job array, a
 * Kubernetes Indexed Job, GNU parallel) into exactly the outputs one run over all samples writes.
 * Refuses shards of another spec or seed, missing, duplicated or unfinished shards, naming each.
 */
import { copyFileSync } from 'node:fs';
import { join } from 'node:path';
import type { CliIo } from './io.ts';
import {
  prepareOutputDirectory,
  readRunRecord,
  RUN_FILES,
  runDigits,
  writeRunRecord,
  type RunRecord,
} from '../run/run-directory.ts';
import { checkShards, mergeAllCsv, mergeShardStates } from '../run/shard-merge.ts';
import { loadRunSpec } from './sweep-spec.ts';
import { writeSweepOutputs } from './sweep-outputs.ts';
import { SAFETY_LINE } from './safety.ts';
import { commandError, optionError } from './input-errors.ts';

export async function mergeCommand(
  directories: string[],
  options: { out?: string; overwrite?: boolean },
  io: CliIo,
): Promise<number> {
  if (options.out === undefined) throw optionError('--out', 'required: the directory for the merged results');
  if (directories.length === 0) throw commandError('merge', 'give the shard directories');
  const records = directories.map((directory) => ({ directory, record: readRunRecord(directory) }));
  const first = records[0];
  checkShards(records);
  const total = first.record.samples;
  const spec = loadRunSpec(first.directory);
  const state = mergeShardStates(records, spec, first.record.keep);
  prepareOutputDirectory(options.out, options.overwrite ?? false);
  copyFileSync(join(first.directory, RUN_FILES.spec), join(options.out, RUN_FILES.spec));
  const record: RunRecord = { ...first.record, range: [0, total], shard: null, created: new Date().toISOString() };
  writeRunRecord(options.out, record);
  await writeSweepOutputs(
    options.out,
    spec,
    state,
    {
      specHash: spec.hash,
      seed: spec.seed,
      method: spec.method,
      samples: total,
      range: [0, total],
      shard: null,
      keep: record.keep,
      digits: runDigits(record),
    },
    { wallSeconds: 0, designsPerSecond: 0, workers: 0 },
    true,
  );
  mergeAllCsv(records, options.out);
  io.out(
    `merged ${records.length} shards (${state.counts.evaluated} designs, ${state.counts.feasible} feasible) into ${options.out}\n${SAFETY_LINE}\n`,
  );
  return 0;
}
