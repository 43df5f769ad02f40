/**
 * `coilfront merge SHARD_DIR... --out DIR`: combines the shards of one sweep (a Slurm job array, a
 * Kubernetes Indexed Job, GNU parallel) into exactly the outputs one run over all samples writes.
 * Refuses shards of another spec or seed, missing, duplicated or unfinished shards, naming each.
 */
import { copyFileSync, existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { SweepState } from '../optimize/sweep-state.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import type { CliIo } from './io.ts';
import {
  prepareOutputDirectory,
  readRunRecord,
  RUN_FILES,
  runDigits,
  writeRunRecord,
  type RunRecord,
} from '../run/run-directory.ts';
import { checkCoverage } from '../run/shard.ts';
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
  for (const { directory, record } of records) {
    if (record.seed !== first.record.seed)
      throw commandError(
        'merge',
        `${directory} used seed ${record.seed}, ${first.directory} seed ${first.record.seed}`,
      );
    if (record.spec_hash !== first.record.spec_hash) {
      throw commandError(
        'merge',
        `${directory} comes from another sweep file than ${first.directory} (spec hash ${record.spec_hash.slice(0, 12)} ≠ ${first.record.spec_hash.slice(0, 12)})`,
      );
    }
    if (record.keep !== first.record.keep)
      throw commandError(
        'merge',
        `${directory} kept ${record.keep} candidates, ${first.directory} ${first.record.keep}; use the same --keep`,
      );
  }
  const total = first.record.samples;
  const problems = checkCoverage(
    records.map(({ directory, record }) => ({
      index: record.shard?.index ?? 1,
      count: record.shard?.count ?? 1,
      range: record.range,
      label: directory,
    })),
    total,
  );
  if (problems.length > 0) throw commandError('merge', `refused: ${problems.join('; ')}`);
  const spec = loadRunSpec(first.directory);
  const state = new SweepState(spec.objectives, spec.constraints, first.record.keep, spec.seed);
  for (const { directory } of records) {
    const path = join(directory, RUN_FILES.checkpoint);
    if (!existsSync(path))
      throw commandError(
        'merge',
        `${directory} has no checkpoint; finish it with npx coilfront sweep --resume ${directory}`,
      );
    const checkpoint = JSON.parse(readFileSync(path, 'utf8')) as {
      complete: boolean;
      state: Parameters<typeof SweepState.restore>[0];
    };
    if (!checkpoint.complete)
      throw commandError(
        'merge',
        `${directory} is not finished; finish it with npx coilfront sweep --resume ${directory}`,
      );
    state.merge(SweepState.restore(checkpoint.state, spec.objectives, spec.constraints, first.record.keep, spec.seed));
  }
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
  // all.csv: the shards hold contiguous index ranges, so their files in range order are in index order.
  const withAll = records.filter(({ directory }) => existsSync(join(directory, RUN_FILES.all)));
  if (withAll.length === records.length) {
    const sorted = [...records].sort((a, b) => a.record.range[0] - b.record.range[0]);
    let text = '';
    sorted.forEach(({ directory }, i) => {
      const content = readFileSync(join(directory, RUN_FILES.all), 'utf8');
      text += i === 0 ? content : content.slice(content.indexOf('\n') + 1);
    });
    writeFileAtomicSync(join(options.out, RUN_FILES.all), text);
  }
  io.out(
    `merged ${records.length} shards (${state.counts.evaluated} designs, ${state.counts.feasible} feasible) into ${options.out}\n${SAFETY_LINE}\n`,
  );
  return 0;
}
