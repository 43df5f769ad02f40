/**
 * The files of a run directory and the identity record that ties them together (run.json). A resumed
 * run, `show`, `refine` and `merge` all start here.
 */
import { DEFAULT_DIGITS } from './csv.ts';
import { existsSync, mkdirSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { writeFileAtomicSync } from './durable/atomic-write.ts';
import { optionError, subjectError } from './input-error.ts';

export const RUN_FILES = {
  run: 'run.json',
  spec: 'spec.yaml',
  checkpoint: 'checkpoint.json',
  candidates: 'candidates.csv',
  infeasible: 'infeasible.csv',
  front: 'front.csv',
  plot: 'front.svg',
  summary: 'summary.json',
  all: 'all.csv',
  refined: 'refined.csv',
  refinedDesigns: 'refined.json',
  refineTrials: 'refine-trials.csv',
  evolved: 'evolved.csv',
  evolvedDesigns: 'evolved.json',
  evolveJournal: 'evolve-journal.log',
  /** The stages of a sweep file's `sweep.stages` finished so far. */
  stages: 'stages.json',
} as const;

export function journalName(generation: number): string {
  return `journal-${generation}.log`;
}

/** What identifies a run: everything that decides its results. */
export interface RunRecord {
  format: 'coilfront-run';
  version: 1;
  spec_hash: string;
  seed: number;
  method: string;
  samples: number;
  range: [number, number];
  shard: { index: number; count: number; source: string } | null;
  keep: number;
  batch_size: number;
  all: boolean;
  /** Significant digits of the run's CSV numbers (absent in older runs: DEFAULT_DIGITS). */
  digits?: number;
  created: string;
}

/** The CSV digits of a run: its own record's, or the default. */
export function runDigits(record: RunRecord): number {
  return record.digits ?? DEFAULT_DIGITS;
}

export function readRunRecord(directory: string): RunRecord {
  const path = join(directory, RUN_FILES.run);
  if (!existsSync(path)) throw subjectError(directory, `not a coilfront run directory (no ${RUN_FILES.run})`);
  try {
    const record = JSON.parse(readFileSync(path, 'utf8')) as RunRecord;
    if (record.format !== 'coilfront-run') throw new Error('wrong format');
    return record;
  } catch {
    throw subjectError(path, `damaged run record; the run cannot be resumed from this directory`);
  }
}

export function writeRunRecord(directory: string, record: RunRecord): void {
  writeFileAtomicSync(join(directory, RUN_FILES.run), `${JSON.stringify(record, null, 2)}\n`);
}

/** Creates the output directory, refusing a non-empty one unless `overwrite`. */
export function prepareOutputDirectory(directory: string, overwrite: boolean): void {
  if (existsSync(directory)) {
    let entries: string[];
    try {
      entries = readdirSync(directory).filter((name) => name !== 'run.lock');
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      throw subjectError(
        `--out ${directory}`,
        `${code === 'ENOTDIR' ? 'is a file, not a directory' : `cannot be read (${code ?? 'error'})`}`,
      );
    }
    if (entries.length > 0 && !overwrite) {
      throw optionError(
        `--out ${directory}`,
        `the directory is not empty; choose another, resume it with --resume ${directory}, or pass --overwrite`,
      );
    }
  } else {
    try {
      mkdirSync(directory, { recursive: true });
    } catch (error) {
      throw optionError(
        `--out ${directory}`,
        `cannot create the directory (${(error as NodeJS.ErrnoException).code ?? 'error'})`,
      );
    }
  }
}
