/**
 * The run of a tolerance study, free of the command line: every candidate's draws evaluated through the
 * evaluator it is given (optimize/tolerance), each finished candidate appended to a CRC-framed journal
 * (run/durable) under a header naming everything that decides the results, so a stopped study (Ctrl-C,
 * kill -9) resumes where it stopped and a rerun reuses what it has. The results are a pure function of the
 * inputs, so resumed, sharded and uninterrupted studies give the same results.
 */
import { createHash } from 'node:crypto';
import { unlinkSync } from 'node:fs';
import type { BatchEvaluator } from '../optimize/evaluate-batch.ts';
import {
  type CandidateTolerance,
  candidateTolerance,
  type ToleranceSettings,
  type ToleranceSpace,
} from '../optimize/tolerance/index.ts';
import { openJournal } from './durable/journal.ts';

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
}

export interface ToleranceStudyOutcome {
  results: CandidateTolerance[];
  /** Candidates taken from the journal. */
  reused: number;
}

export function hashOf(value: unknown): string {
  return createHash('sha256').update(JSON.stringify(value)).digest('hex');
}

/** The journal of a study, opened afresh when it belongs to other settings, with its finished candidates. */
function openStudyJournal(study: ToleranceStudy) {
  // The batch size is a matter of scheduling, never of the results: it stays out of the header.
  const { batchSize: _batch, ...settings } = study.settings;
  const headerHash = hashOf({
    format: 'coilfront-tolerance',
    identity: study.identity,
    fields: study.space.fields,
    settings,
  });
  let journal = openJournal(study.journalPath);
  const first = journal.recovered.records[0] as { header?: string } | undefined;
  if (first !== undefined && first.header !== headerHash) {
    study.notice('tolerance: the journal belongs to other settings; starting afresh');
    journal.close();
    unlinkSync(study.journalPath);
    journal = openJournal(study.journalPath);
  }
  if (journal.recordCount === 0) {
    journal.append({ header: headerHash });
    journal.sync();
  }
  const done = new Map<string, CandidateTolerance>();
  for (const record of journal.recovered.records.slice(1) as { key: string; result: CandidateTolerance }[])
    done.set(record.key, record.result);
  return { journal, done };
}

/** Studies every candidate in order, reusing the journal's; closes the evaluator. */
export async function runToleranceStudy(study: ToleranceStudy): Promise<ToleranceStudyOutcome> {
  const { journal, done } = openStudyJournal(study);
  const results: CandidateTolerance[] = [];
  let reused = 0;
  try {
    for (let c = 0; c < study.candidates.length; c++) {
      const candidate = study.candidates[c];
      const key = hashOf(candidate.values);
      let result = done.get(key);
      if (result) reused++;
      else {
        result = await candidateTolerance(study.space, study.evaluator, candidate.values, study.settings);
        journal.append({ key, result });
        journal.sync();
      }
      results.push(result);
      study.notice(`tolerance: ${c + 1}/${study.candidates.length} candidates`);
    }
  } finally {
    await study.evaluator.close();
    journal.close();
  }
  if (reused > 0) study.notice(`tolerance: ${reused} of ${study.candidates.length} candidates taken from the journal`);
  return { results, reused };
}
