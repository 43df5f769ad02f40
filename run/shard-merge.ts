/**
 * The machinery of `coilfront merge`: the checks that the shard directories are one sweep's and
 * cover its samples once, the sweep state merged from their checkpoints (order-independent, so the
 * merged outputs equal those of one run over all samples), and all.csv joined in index order.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { type ConstraintDefinition, type ObjectiveDefinition, SweepState } from '../optimize/sweep-state.ts';
import { writeFileAtomicSync } from './durable/atomic-write.ts';
import { subjectError } from './input-error.ts';
import { RUN_FILES, type RunRecord } from './run-directory.ts';
import { checkCoverage } from './shard.ts';

/** A shard directory and its run.json. */
export interface ShardRun {
  directory: string;
  record: RunRecord;
}

/** Refuses shards of another seed, sweep file or --keep than the first, and missing or overlapping ones. */
export function checkShards(records: readonly ShardRun[]): void {
  const first = records[0] as ShardRun;
  for (const { directory, record } of records) {
    if (record.seed !== first.record.seed)
      throw subjectError(
        'merge',
        `${directory} used seed ${record.seed}, ${first.directory} seed ${first.record.seed}`,
      );
    if (record.spec_hash !== first.record.spec_hash) {
      throw subjectError(
        'merge',
        `${directory} comes from another sweep file than ${first.directory} (spec hash ${record.spec_hash.slice(0, 12)} ≠ ${first.record.spec_hash.slice(0, 12)})`,
      );
    }
    if (record.keep !== first.record.keep)
      throw subjectError(
        'merge',
        `${directory} kept ${record.keep} candidates, ${first.directory} ${first.record.keep}; use the same --keep`,
      );
  }
  const problems = checkCoverage(
    records.map(({ directory, record }) => ({
      index: record.shard?.index ?? 1,
      count: record.shard?.count ?? 1,
      range: record.range,
      label: directory,
    })),
    first.record.samples,
  );
  if (problems.length > 0) throw subjectError('merge', `refused: ${problems.join('; ')}`);
}

/** The sweep state of all the shards, from their finished checkpoints; refuses an unfinished shard. */
export function mergeShardStates(
  records: readonly ShardRun[],
  problem: { objectives: readonly ObjectiveDefinition[]; constraints: readonly ConstraintDefinition[]; seed: number },
  keep: number,
): SweepState {
  const { objectives, constraints, seed } = problem;
  const state = new SweepState(objectives, constraints, keep, seed);
  for (const { directory } of records) {
    const path = join(directory, RUN_FILES.checkpoint);
    if (!existsSync(path))
      throw subjectError(
        'merge',
        `${directory} has no checkpoint; finish it with npx coilfront sweep --resume ${directory}`,
      );
    const checkpoint = JSON.parse(readFileSync(path, 'utf8')) as {
      complete: boolean;
      state: Parameters<typeof SweepState.restore>[0];
    };
    if (!checkpoint.complete)
      throw subjectError(
        'merge',
        `${directory} is not finished; finish it with npx coilfront sweep --resume ${directory}`,
      );
    state.merge(SweepState.restore(checkpoint.state, objectives, constraints, keep, seed));
  }
  return state;
}

/**
 * all.csv of the merged run, when every shard wrote one: the shards hold contiguous index ranges, so
 * their files in range order (each header but the first dropped) are in index order.
 */
export function mergeAllCsv(records: readonly ShardRun[], out: string): void {
  const withAll = records.filter(({ directory }) => existsSync(join(directory, RUN_FILES.all)));
  if (withAll.length !== records.length) return;
  const sorted = [...records].sort((a, b) => a.record.range[0] - b.record.range[0]);
  let text = '';
  for (const [i, { directory }] of sorted.entries()) {
    const content = readFileSync(join(directory, RUN_FILES.all), 'utf8');
    text += i === 0 ? content : content.slice(content.indexOf('\n') + 1);
  }
  writeFileAtomicSync(join(out, RUN_FILES.all), text);
}
