import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseYaml } from 'yaml';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  expectSameResults,
  requireBuiltCli,
  runCliOk,
  scratchArea,
  SMALL_SWEEP,
  summaryWithoutTiming,
} from './sweep-harness.ts';

// The same file and seed give byte-identical CSVs for --workers 1 and --workers 2: a
// design is a pure function of the file, the seed and its index, so neither the number of workers,
// the batch boundaries, the thread that evaluates nor the file's formatting may change any output.
// Checked on the real CLI against its own run with other settings; the sweep is the machinery
// fixture (invented demo data).
const area = scratchArea('determinism');
const reference = area.dir('w2-b8');
const KEEP = ['--keep', '40'];

beforeAll(async () => {
  requireBuiltCli();
  await runCliOk([
    'sweep',
    SMALL_SWEEP,
    '--out',
    reference,
    '--workers',
    '2',
    '--batch-size',
    '8',
    '--all',
    '--quiet',
    ...KEEP,
  ]);
});

afterAll(() => area.cleanup());

describe('coilfront sweep is deterministic', () => {
  it('--workers 1 and --workers 2 give byte-identical candidates.csv, front.csv, all.csv and summary.json', async () => {
    const directory = area.dir('w1-b8');
    await runCliOk([
      'sweep',
      SMALL_SWEEP,
      '--out',
      directory,
      '--workers',
      '1',
      '--batch-size',
      '8',
      '--all',
      '--quiet',
      ...KEEP,
    ]);
    expectSameResults(directory, reference, ['candidates.csv', 'front.csv', 'all.csv']);
  });

  it('the main thread (--workers 0), other batch boundaries and the same sweep written as JSON change nothing', async () => {
    const asJson = area.dir('sweep-small.json');
    writeFileSync(asJson, JSON.stringify(parseYaml(readFileSync(SMALL_SWEEP, 'utf8')), null, 1));
    const directory = area.dir('w0-b13');
    await runCliOk([
      'sweep',
      asJson,
      '--out',
      directory,
      '--workers',
      '0',
      '--batch-size',
      '13',
      '--all',
      '--quiet',
      ...KEEP,
    ]);
    const run = JSON.parse(readFileSync(join(directory, 'run.json'), 'utf8')) as { batch_size: number };
    expect(run.batch_size).toBe(13);
    expectSameResults(directory, reference, ['candidates.csv', 'front.csv', 'all.csv']);
  });

  it('another seed gives other candidates (the comparison above can fail)', async () => {
    const otherSeed = area.dir('seed-7.yaml');
    writeFileSync(otherSeed, readFileSync(SMALL_SWEEP, 'utf8').replace('seed: 2026', 'seed: 7'));
    const directory = area.dir('seed-7');
    await runCliOk(['sweep', otherSeed, '--out', directory, '--workers', '2', '--batch-size', '8', '--quiet', ...KEEP]);
    expect(readFileSync(join(directory, 'candidates.csv'), 'utf8')).not.toBe(
      readFileSync(join(reference, 'candidates.csv'), 'utf8'),
    );
    expect(summaryWithoutTiming(directory)).not.toBe(summaryWithoutTiming(reference));
  });

  for (const method of ['lhs', 'random'] as const) {
    it(`sampling by ${method}: --workers 1 and --workers 2 give the same files`, async () => {
      const file = area.dir(`${method}.yaml`);
      writeFileSync(
        file,
        readFileSync(SMALL_SWEEP, 'utf8').replace(
          /sweep: \{.*\}/,
          `sweep: { method: ${method}, samples: 64, seed: 99 }`,
        ),
      );
      const one = area.dir(`${method}-w1`);
      const two = area.dir(`${method}-w2`);
      await Promise.all([
        runCliOk(['sweep', file, '--out', one, '--workers', '1', '--batch-size', '7', '--quiet', ...KEEP]),
        runCliOk(['sweep', file, '--out', two, '--workers', '2', '--batch-size', '16', '--quiet', ...KEEP]),
      ]);
      expect((JSON.parse(readFileSync(join(one, 'summary.json'), 'utf8')) as { method: string }).method).toBe(method);
      expectSameResults(one, two);
    });
  }
});
