import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  expectSameResults,
  requireBuiltCli,
  runCliOk,
  scratchArea,
  SMALL_SWEEP,
  SMALL_SWEEP_SAMPLES,
  summaryCounts,
} from './sweep-harness.ts';

// A worker that exits mid-batch is replaced and its batch retried once; a batch that
// fails twice is recorded as failed designs with the reason, and the sweep goes on. The crash comes
// from the worker's test hook (COILFRONT_TEST_CRASH, read in workers/evaluate-worker.ts), which makes
// the worker thread exit when it reaches one sample index. The check is against a clean run of the
// same CLI; the sweep is the machinery fixture (invented demo data).
const area = scratchArea('worker-crash');
const clean = area.dir('clean');
const COMMON = ['--all', '--keep', '40', '--sync-every', '100ms'];

const rowsOf = (directory: string): string[] => readFileSync(join(directory, 'all.csv'), 'utf8').trimEnd().split('\n');
/** The sample_index column of an all.csv row (rows are in index order after the header). */
const indexColumn = (header: string): number => header.split(',').indexOf('sample_index');

beforeAll(async () => {
  requireBuiltCli();
  await runCliOk(['sweep', SMALL_SWEEP, '--out', clean, '--workers', '2', '--batch-size', '8', '--quiet', ...COMMON]);
});

afterAll(() => area.cleanup());

describe('a worker that exits while evaluating a batch', () => {
  it('once: the batch is retried on a new worker and the run equals a clean run', async () => {
    const marker = area.dir('crashed-once');
    const directory = area.dir('crash-once');
    const result = await runCliOk(
      ['sweep', SMALL_SWEEP, '--out', directory, '--workers', '2', '--batch-size', '8', ...COMMON],
      {
        env: { COILFRONT_TEST_CRASH: `100:once:${marker}` },
      },
    );
    expect(existsSync(marker), 'the worker reached index 100 and exited').toBe(true);
    expect(result.stderr).toContain('a worker failed');
    expect(result.stderr).toContain('retrying the batch at index 96'); // batch 12 of 8 designs: 96 … 103
    expect(summaryCounts(directory).failed).toBe(0);
    expectSameResults(directory, clean, ['candidates.csv', 'front.csv', 'all.csv']);
  });

  it('always: that batch (the last, 6 designs of --batch-size 10) is recorded as failed, the rest equals a clean run', async () => {
    const directory = area.dir('crash-always');
    await runCliOk(
      ['sweep', SMALL_SWEEP, '--out', directory, '--workers', '1', '--batch-size', '10', '--quiet', ...COMMON],
      {
        env: { COILFRONT_TEST_CRASH: '252' },
      },
    );
    // 256 samples in batches of 10: the last batch holds 250 … 255.
    const counts = summaryCounts(directory);
    expect(counts.evaluated).toBe(SMALL_SWEEP_SAMPLES);
    expect(counts.failed).toBe(6);
    const cleanCounts = summaryCounts(clean);
    const failedIndices = [250, 251, 252, 253, 254, 255];
    const crashedRows = rowsOf(directory);
    const cleanRows = rowsOf(clean);
    const column = indexColumn(crashedRows[0]);
    expect(crashedRows).toHaveLength(cleanRows.length);
    for (let row = 1; row < cleanRows.length; row++) {
      const index = Number(crashedRows[row].split(',')[column]);
      expect(index).toBe(row - 1);
      if (failedIndices.includes(index)) {
        expect(crashedRows[row]).toMatch(/worker failed twice on this batch: .*exited/);
        expect(crashedRows[row].split(',')[3]).toBe('0'); // feasible
      } else {
        expect(crashedRows[row], `row of index ${index}`).toBe(cleanRows[row]);
      }
    }
    // The six lost designs are missing from the other counts, nothing else changed.
    const lost = (a: typeof counts, b: typeof counts) =>
      b.feasible + b.infeasible + b.impossible - (a.feasible + a.infeasible + a.impossible);
    expect(lost(counts, cleanCounts)).toBe(6);
    expect(readFileSync(join(directory, 'candidates.csv'), 'utf8')).not.toMatch(/worker failed/);
  });
});
