/**
 * The run of a sensitivity study, free of the command line: the rows of the Saltelli design (all of them, or
 * a shard's contiguous block, the sweep's rule in run/shard.ts) evaluated through the evaluator it is given
 * in a bounded number of batches in flight (run/batch-scheduler.ts), every finished batch appended to a
 * CRC-framed journal (run/durable) under a header naming everything that decides the results. A study
 * stopped at any instant (kill -9) continues from its journal when run again, and because every recorded
 * value is a pure function of its row, resumed, sharded-and-merged and uninterrupted studies give the same
 * outputs and so the same indices, byte for byte. The journal is read one record at a time: the memory
 * held is the outputs themselves (rows × metrics numbers), which the estimators need whole.
 */
import { existsSync, unlinkSync } from 'node:fs';
import { join } from 'node:path';
import type { BatchEvaluator } from '../optimize/evaluate-batch.ts';
import { type ShouldStop, StageStopped } from '../optimize/stage-stop.ts';
import {
  recordSaltelliRows,
  SaltelliDesign,
  SaltelliOutputs,
  type SensitivityPlan,
  saltelliTask,
} from '../optimize/sensitivity/index.ts';
import { scheduleBatches } from './batch-scheduler.ts';
import { journalRecords, openJournal } from './durable/journal.ts';
import { subjectError } from './input-error.ts';
import { checkCoverage, type Shard, shardIndices } from './shard.ts';
import { hashOf } from './tolerance-run.ts';

/** Rows per batch: fixed, so that the journal's batches do not depend on the number of workers. */
export const SENSITIVITY_BATCH_ROWS = 32;

export const SENSITIVITY_JOURNAL = 'sensitivity-journal.log';

export interface SensitivityStudy {
  journalPath: string;
  /** What the results depend on besides the plan (the sweep file's hash). */
  identity: string;
  plan: SensitivityPlan;
  evaluator: BatchEvaluator;
  /** Worker threads behind the evaluator (0: this thread). */
  threads: number;
  shard?: Shard | null;
  notice: (line: string) => void;
  /**
   * Polled between batches (a sweep's stages pass their stop request): true starts no further batch, awaits
   * those in flight, keeps the journal and throws StageStopped.
   */
  shouldStop?: ShouldStop;
}

/** The first record of a study's journal. */
interface SensitivityHeader {
  header: string;
  shard: { index: number; count: number } | null;
  range: [number, number];
}

/** One journaled batch: its rows, each metric's values (null where NaN) and each row's outcome. */
interface RowsRecord {
  start: number;
  values: (number | null)[][];
  outcome: number[];
}

/** The hash of everything that decides a study's outputs. */
export function sensitivityHeader(identity: string, plan: SensitivityPlan): string {
  return hashOf({
    format: 'coilfront-sensitivity',
    identity,
    dimensions: plan.definition.dimensions,
    seed: plan.definition.seed,
    samples: plan.samples,
    metrics: plan.metrics,
    constraints: plan.constraints,
    required: plan.required,
  });
}

/** The number of rows of a plan's design, N·(k + 2). */
export function planRows(plan: SensitivityPlan): number {
  return plan.samples * (plan.definition.dimensions.length + 2);
}

function replay(outputs: SaltelliOutputs, record: RowsRecord): void {
  for (let row = 0; row < record.outcome.length; row++) {
    const r = record.start + row;
    for (let m = 0; m < outputs.values.length; m++) outputs.values[m][r] = record.values[m][row] ?? Number.NaN;
    outputs.outcome[r] = record.outcome[row];
    outputs.recorded[r] = 1;
  }
}

/** Reads a journal's header and replays its rows into `outputs`; null when the file has no header. */
function readStudyJournal(path: string, outputs: SaltelliOutputs | null): SensitivityHeader | null {
  let header: SensitivityHeader | null = null;
  for (const record of journalRecords(path)) {
    if (header === null) {
      header = record as SensitivityHeader;
      if (outputs === null) break;
    } else if (outputs) replay(outputs, record as RowsRecord);
  }
  return header;
}

function sameShard(a: SensitivityHeader['shard'], b: SensitivityHeader['shard']): boolean {
  return a === null || b === null ? a === b : a.index === b.index && a.count === b.count;
}

/** Evaluates the rows of the study's block that its journal lacks; returns the outputs (other rows unrecorded). */
export async function runSensitivityStudy(study: SensitivityStudy): Promise<SaltelliOutputs> {
  const { plan } = study;
  const k = plan.definition.dimensions.length;
  const design = new SaltelliDesign(k, plan.samples, plan.definition.seed);
  const [start, end] = study.shard ? shardIndices(study.shard.index, study.shard.count, design.size) : [0, design.size];
  const header: SensitivityHeader = {
    header: sensitivityHeader(study.identity, plan),
    shard: study.shard ? { index: study.shard.index, count: study.shard.count } : null,
    range: [start, end],
  };
  let outputs = new SaltelliOutputs(plan.metrics.length, design.size);
  let journal = openJournal(study.journalPath, { keepRecords: false });
  const found = journal.recordCount > 0 ? readStudyJournal(study.journalPath, outputs) : null;
  if (found !== null && (found.header !== header.header || !sameShard(found.shard, header.shard))) {
    study.notice('sensitivity: the journal belongs to other settings or another shard; starting afresh');
    journal.close();
    unlinkSync(study.journalPath);
    journal = openJournal(study.journalPath);
    outputs = new SaltelliOutputs(plan.metrics.length, design.size);
  }
  if (journal.recordCount === 0) {
    journal.append(header);
    journal.sync();
  }
  const batches: [number, number][] = [];
  for (const [runStart, runCount] of outputs.missingRuns(start, end)) {
    for (let s = runStart; s < runStart + runCount; s += SENSITIVITY_BATCH_ROWS)
      batches.push([s, Math.min(SENSITIVITY_BATCH_ROWS, runStart + runCount - s)]);
  }
  const reused = end - start - batches.reduce((sum, [, count]) => sum + count, 0);
  if (reused > 0) study.notice(`sensitivity: ${reused} of ${end - start} rows taken from the journal`);
  let done = 0;
  try {
    const failure = await scheduleBatches({
      evaluator: study.evaluator,
      batchCount: batches.length,
      threads: study.threads,
      taskOf: (b) => saltelliTask(plan.definition, design, batches[b][0], batches[b][1]),
      stopRequested: () => study.shouldStop?.() ?? false,
      take: (b, result) => {
        const [s, count] = batches[b];
        recordSaltelliRows(plan, outputs, s, result);
        const values = outputs.values.map((v) =>
          Array.from(v.subarray(s, s + count), (x) => (Number.isNaN(x) ? null : x)),
        );
        journal.append({ start: s, values, outcome: Array.from(outputs.outcome.subarray(s, s + count)) });
        done++;
      },
      afterRound: () => {
        journal.sync();
        if (done % 64 === 0 || done === batches.length) study.notice(`sensitivity: ${done}/${batches.length} batches`);
      },
    });
    if (failure) throw failure.error;
    if (done < batches.length) throw new StageStopped('sensitivity');
  } finally {
    await study.evaluator.close();
    journal.close();
  }
  return outputs;
}

/** The folder of a study's shard directories. */
export function sensitivityShardFolder(out: string): string {
  return join(out, 'sensitivity-shards');
}

/** Where shard k of N of a study keeps its journal. */
export function sensitivityShardDirectory(out: string, shard: Pick<Shard, 'index' | 'count'>): string {
  return join(sensitivityShardFolder(out), `${shard.index}-of-${shard.count}`);
}

/**
 * The outputs of a sharded study, read from its shards' journals: every shard must come from a study with
 * the same header, the shards must cover the rows once (run/shard.ts), and each must have recorded its whole
 * block. Anything else is an InputError naming the shard directory and what to do.
 */
export function readSensitivityShards(
  identity: string,
  plan: SensitivityPlan,
  directories: readonly string[],
): SaltelliOutputs {
  const expected = sensitivityHeader(identity, plan);
  const size = planRows(plan);
  const outputs = new SaltelliOutputs(plan.metrics.length, size);
  const shards = directories.map((directory) => {
    const path = join(directory, SENSITIVITY_JOURNAL);
    if (!existsSync(path))
      throw subjectError(directory, `no ${SENSITIVITY_JOURNAL}: not a shard of a sensitivity study`);
    const header = readStudyJournal(path, null);
    if (header?.header !== expected)
      throw subjectError(directory, 'the shard belongs to another study (other sweep file, --samples or seed)');
    if (header.shard === null)
      throw subjectError(directory, 'holds a whole study, not a shard of one (started without --shard)');
    return { directory, path, shard: header.shard, range: header.range };
  });
  const problems = checkCoverage(
    shards.map(({ directory, shard, range }) => ({ index: shard.index, count: shard.count, range, label: directory })),
    size,
  );
  if (problems.length > 0) throw subjectError('sensitivity --merge', `refused: ${problems.join('; ')}`);
  for (const { directory, path, shard, range } of shards) {
    readStudyJournal(path, outputs);
    const missing = outputs.missingRuns(range[0], range[1]).reduce((sum, [, count]) => sum + count, 0);
    if (missing > 0) {
      throw subjectError(
        directory,
        `shard ${shard.index}/${shard.count} is not finished (${missing} of ${range[1] - range[0]} rows missing); run it again with --shard ${shard.index}/${shard.count}`,
      );
    }
  }
  return outputs;
}
