/**
 * The shard directories a study's `--merge` reads: those named after it, or else every `k-of-N`
 * directory in the study's shards folder, in shard order (tolerance and sensitivity studies alike).
 */
import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { optionError } from './input-errors.ts';

export function shardDirectoriesToMerge(folder: string, merge: string[] | boolean): string[] {
  if (Array.isArray(merge) && merge.length > 0) return merge;
  const found = existsSync(folder) ? readdirSync(folder).filter((name) => /^\d+-of-\d+$/.test(name)) : [];
  if (found.length === 0) throw optionError('--merge', `no shard directories given, and none in ${folder}`);
  return found.sort((a, b) => Number(a.split('-')[0]) - Number(b.split('-')[0])).map((name) => join(folder, name));
}
