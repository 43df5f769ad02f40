/**
 * The run of a tolerance study, free of the command line: every candidate's draws evaluated through the
 * evaluator it is given (optimize/tolerance), each finished candidate appended to a CRC-framed journal
 * (run/durable) under a header naming everything that decides the results, so a stopped study (Ctrl-C,
 * kill -9) resumes where it stopped and a rerun reuses what it has. The results are a pure function of the
 * inputs, so resumed, sharded and uninterrupted studies give the same results.
 */
import { createHash } from 'node:crypto';
import { existsSync, unlinkSync } from 'node:fs';
import { join } from 'node:path';
import type { BatchEvaluator } from '../optimize/evaluate-batch.ts';
import {
  type CandidateTolerance,
  candidateTolerance,
  type ToleranceSettings,
  type ToleranceSpace,
} from '../optimize/tolerance/index.ts';
import { openJournal, readJournal } from './durable/journal.ts';
import { subjectError } from './input-error.ts';
import { checkCoverage, type Shard, shardIndices } from './shard.ts';

/** One candidate of a study: how the files name it, and its values in the sweep's space. */
export interface StudyCandidate {
  /** '3' (candidates.csv), 'r3' (refined), 'e3' (evolved), 'design' (a lone design file). */
  id: string;
  /** Its sample index in the sweep, where it is a sample of the sweep. */
  sampleIndex: number | null;
  values: number[];
}

export interface ToleranceStudy {
  journalPath: string;
  /** What the results depend on besides the settings and fields (the sweep's hash, the design's). */
  identity: string;
  space: ToleranceSpace;
  settings: ToleranceSettings;
  candidates: readonly StudyCandidate[];
  evaluator: BatchEvaluator;
  /** Progress and notices, one line each. */
  notice: (line: string) => void;
  /** The shard this process studies (its contiguous block of candidates), or null for all of them. */
  shard?: Shard | null;
  /** Results already known (the shards' journals, by candidate key): appended to the journal, never evaluated. */
  preloaded?: ReadonlyMap<string, CandidateTolerance>;
}

export interface ToleranceStudyOutcome {
  results: CandidateTolerance[];
  /** Candidates taken from the journal. */
  reused: number;
}

export function hashOf(value: unknown): string {
  return createHash('sha256').update(JSON.stringify(value)).digest('hex');
}

/** The key of a candidate in the journal: the hash of its values. */
export function candidateKey(candidate: StudyCandidate): string {
  return hashOf(candidate.values);
}

/** The hash of everything that decides a study's results (the batch size is scheduling, never results). */
export function studyHeader(study: Pick<ToleranceStudy, 'identity' | 'space' | 'settings'>): string {
  const { batchSize: _batch, ...settings } = study.settings;
  return hashOf({ format: 'coilfront-tolerance', identity: study.identity, fields: study.space.fields, settings });
}

/** The first record of a study's journal: the header hash, and the shard and candidate block it holds. */
interface JournalHeader {
  header: string;
  shard?: { index: number; count: number } | null;
  range?: [number, number];
}

/** The block of candidates [start, end) a study of `total` runs under `shard`. */
function shardRange(shard: Shard | null | undefined, total: number): [number, number] {
  return shard ? shardIndices(shard.index, shard.count, total) : [0, total];
}

/** The journal of a study, opened afresh when it belongs to other settings or another shard, with its finished candidates. */
function openStudyJournal(study: ToleranceStudy) {
  const header: JournalHeader = {
    header: studyHeader(study),
    shard: study.shard ? { index: study.shard.index, count: study.shard.count } : null,
    range: shardRange(study.shard, study.candidates.length),
  };
  let journal = openJournal(study.journalPath);
  const first = journal.recovered.records[0] as JournalHeader | undefined;
  // A journal of the whole study (or of an older version, without shard and range) is reused by any
  // later run of the same settings; a shard's journal only by the same shard.
  const sameShard =
    (first?.shard ?? null) === null
      ? header.shard === null
      : first?.shard?.index === study.shard?.index && first?.shard?.count === study.shard?.count;
  if (first !== undefined && (first.header !== header.header || !sameShard)) {
    study.notice(
      first.header !== header.header
        ? 'tolerance: the journal belongs to other settings; starting afresh'
        : 'tolerance: the journal belongs to another shard; starting afresh',
    );
    journal.close();
    unlinkSync(study.journalPath);
    journal = openJournal(study.journalPath);
  }
  if (journal.recordCount === 0) {
    journal.append(header);
    journal.sync();
  }
  const done = new Map<string, CandidateTolerance>();
  for (const record of journal.recovered.records.slice(1) as { key: string; result: CandidateTolerance }[])
    done.set(record.key, record.result);
  return { journal, done };
}

/** Studies every candidate of the study's block (all, or its shard's) in order, reusing the journal's; closes the evaluator. */
export async function runToleranceStudy(study: ToleranceStudy): Promise<ToleranceStudyOutcome> {
  const { journal, done } = openStudyJournal(study);
  const results: CandidateTolerance[] = [];
  const [start, end] = shardRange(study.shard, study.candidates.length);
  let reused = 0;
  try {
    for (let c = start; c < end; c++) {
      const candidate = study.candidates[c];
      const key = candidateKey(candidate);
      let result = done.get(key);
      const known = study.preloaded?.get(key);
      if (result) reused++;
      else if (known) {
        result = known;
        journal.append({ key, result });
      } else {
        result = await candidateTolerance(study.space, study.evaluator, candidate.values, study.settings);
        journal.append({ key, result });
        journal.sync();
      }
      results.push(result);
      if (!known) study.notice(`tolerance: ${c + 1 - start}/${end - start} candidates`);
    }
    journal.sync();
  } finally {
    await study.evaluator.close();
    journal.close();
  }
  if (reused > 0) study.notice(`tolerance: ${reused} of ${end - start} candidates taken from the journal`);
  return { results, reused };
}

/** The folder of a study's shard directories: `<out>/<journal name without -journal.log>-shards`. */
export function shardFolder(out: string, journalName: string): string {
  return join(out, `${journalName.replace(/-journal\.log$/, '')}-shards`);
}

/** Where shard k of N of a study keeps its journal: `<shard folder>/<k>-of-<N>`. */
export function shardDirectory(out: string, journalName: string, shard: Pick<Shard, 'index' | 'count'>): string {
  return join(shardFolder(out, journalName), `${shard.index}-of-${shard.count}`);
}

/**
 * The results of a sharded study, read from its shards' journals (`directories`, each holding
 * `journalName`): every shard must come from a study with the same header, the shards must cover the
 * candidates once (the sweep's rule, run/shard.ts), and each must have finished its block. Anything
 * else is an InputError naming the shard directory and what to do.
 */
export function readShardResults(
  study: Pick<ToleranceStudy, 'identity' | 'space' | 'settings' | 'candidates'>,
  directories: readonly string[],
  journalName: string,
): Map<string, CandidateTolerance> {
  const header = studyHeader(study);
  const total = study.candidates.length;
  const shards = directories.map((directory) => {
    const path = join(directory, journalName);
    if (!existsSync(path)) throw subjectError(directory, `no ${journalName}: not a shard of a tolerance study`);
    const records = readJournal(path).records as (JournalHeader | { key: string; result: CandidateTolerance })[];
    const first = records[0] as JournalHeader | undefined;
    if (first?.header !== header)
      throw subjectError(directory, 'the shard belongs to another study (other candidates, tolerances, draws or seed)');
    if (!first.shard || !first.range)
      throw subjectError(directory, 'holds a whole study, not a shard of one (started without --shard)');
    const results = new Map<string, CandidateTolerance>();
    for (const record of records.slice(1) as { key: string; result: CandidateTolerance }[])
      results.set(record.key, record.result);
    return { directory, shard: first.shard, range: first.range, results };
  });
  const problems = checkCoverage(
    shards.map(({ directory, shard, range }) => ({ index: shard.index, count: shard.count, range, label: directory })),
    total,
  );
  if (problems.length > 0) throw subjectError('tolerance --merge', `refused: ${problems.join('; ')}`);
  const merged = new Map<string, CandidateTolerance>();
  for (const { directory, shard, range, results } of shards) {
    for (let c = range[0]; c < range[1]; c++) {
      const key = candidateKey(study.candidates[c]);
      const result = results.get(key);
      if (!result) {
        throw subjectError(
          directory,
          `shard ${shard.index}/${shard.count} is not finished (candidate ${c + 1 - range[0]} of ${range[1] - range[0]} missing); run it again with --shard ${shard.index}/${shard.count}`,
        );
      }
      merged.set(key, result);
    }
  }
  return merged;
}
