import { cpSync, existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readJournal } from '../../run/durable/journal.ts';
import { SAFETY_CAUTIONS } from '../../cli/safety.ts';
import { expectOneLine, requireBuiltCli, SMALL_SWEEP, scratchArea, signalWhenJournalled } from './sweep-harness.ts';
import { cli } from './in-process.ts';

// The worker pool and the killed child run the built JS (dist/): `npm test` builds first. The fixture
// is machinery test data (an invented scenario), not a physics check. The checks are the ones a user
// can make on the files: byte-identical reruns, non-domination against the swept front, a hypervolume
// recomputed from front.csv by an exact 2-D sweep (sum of rectangles), and `show eN` read back through
// `evaluate` to the metrics evolved.csv lists.

type Row = Record<string, string>;
const readRows = (file: string): Row[] => parseCsv(readFileSync(file, 'utf8'), { columns: true }) as Row[];
/** The two objectives of a row in the minimisation convention, SI (breakout voltage in kV, mass in kg). */
const objectives = (row: Row): number[] => [-Number(row.breakout_voltage_kV) * 1e3, Number(row.wire_mass_kg)];

/** Exact 2-D hypervolume of minimisation points: sorted by the first objective, a sum of rectangles. */
function hypervolume2d(points: number[][], reference: number[]): number {
  const sorted = points
    .filter((p) => (p[0] ?? 0) < (reference[0] ?? 0) && (p[1] ?? 0) < (reference[1] ?? 0))
    .sort((a, b) => (a[0] ?? 0) - (b[0] ?? 0) || (a[1] ?? 0) - (b[1] ?? 0));
  let area = 0;
  let lastY = reference[1] ?? 0;
  for (const [x = 0, y = 0] of sorted) {
    if (y >= lastY) continue;
    area += ((reference[0] ?? 0) - x) * (lastY - y);
    lastY = y;
  }
  return area;
}

const area = scratchArea('evolve');
const swept = area.dir('swept');
const BUDGET = ['--evaluations', '160', '--population', '16'];
const OUTPUTS = ['evolved.csv', 'evolved.json', 'front.csv'];
const evolveSection = (directory: string): Record<string, unknown> => {
  const section = JSON.parse(readFileSync(join(directory, 'summary.json'), 'utf8')).evolve;
  delete section.timing;
  return section;
};
const copyOfSweep = (name: string): string => {
  const directory = area.dir(name);
  cpSync(swept, directory, { recursive: true });
  return directory;
};

beforeAll(async () => {
  requireBuiltCli();
  const result = await cli(['sweep', SMALL_SWEEP, '--out', swept, '--workers', '0', '--quiet']);
  expect(result.code).toBe(0);
}, 60_000);
afterAll(() => area.cleanup());

describe('coilfront evolve RUN_DIR', () => {
  let first = '';

  it('gives the same files twice (one worker or two), and prints units, the reference point and the cautions', async () => {
    first = copyOfSweep('first');
    const second = copyOfSweep('second');
    const a = await cli(['evolve', first, ...BUDGET, '--workers', '1']);
    const b = await cli(['evolve', second, ...BUDGET, '--workers', '2']);
    expect(a.code, a.err).toBe(0);
    expect(b.code, b.err).toBe(0);
    for (const name of OUTPUTS)
      expect(readFileSync(join(second, name), 'utf8')).toBe(readFileSync(join(first, name), 'utf8'));
    expect(evolveSection(second)).toEqual(evolveSection(first));
    expect(a.out).toMatch(/^evolved 10 generations with 160 evaluations \(seed 2026\)/);
    expect(a.out).toMatch(/e1 {2}breakout_voltage [\d.]+ kV, wire_mass [\d.]+ kg/);
    expect(a.out).toMatch(
      /hypervolume of the front .* → .* \(\+[\d.]+ %\): .*reference point \(breakout_voltage [\d.]+ kV, wire_mass [\d.]+ kg\)/,
    );
    for (const line of SAFETY_CAUTIONS) expect(a.out).toContain(line);
    expect(existsSync(join(first, 'evolve-journal.log'))).toBe(false);
  }, 60_000);

  it('keeps or raises the hypervolume: evolved designs are not dominated by the swept front', () => {
    const section = evolveSection(first) as {
      hypervolume_before: number;
      hypervolume_after: number;
      reference_point: number[];
      evaluations: number;
    };
    expect(section.evaluations).toBe(160);
    expect(section.hypervolume_after).toBeGreaterThanOrEqual(section.hypervolume_before);
    const sweptFront = readRows(join(swept, 'front.csv')).map(objectives);
    const mergedFront = readRows(join(first, 'front.csv')).map(objectives);
    // The hypervolumes recomputed from the files (7 significant digits) by the exact 2-D sum agree with
    // summary.json to a few parts in a million.
    const close = (actual: number, expected: number) =>
      expect(Math.abs(actual - expected) / expected).toBeLessThan(1e-5);
    close(hypervolume2d(sweptFront, section.reference_point), section.hypervolume_before);
    close(hypervolume2d(mergedFront, section.reference_point), section.hypervolume_after);
    const evolved = readRows(join(first, 'evolved.csv'));
    expect(evolved.length).toBeGreaterThan(0);
    expect(evolved.map((row) => row.sample_index)).toEqual(evolved.map(() => ''));
    const dominates = (p: number[], q: number[]) =>
      (p[0] ?? 0) <= (q[0] ?? 0) &&
      (p[1] ?? 0) <= (q[1] ?? 0) &&
      ((p[0] ?? 0) < (q[0] ?? 0) || (p[1] ?? 0) < (q[1] ?? 0));
    for (const row of evolved) for (const q of sweptFront) expect(dominates(q, objectives(row))).toBe(false);
    // front.csv names each design of evolved.csv by its id in the rank column (the other evolved ones
    // on the front lie within 1 % of the front's extent of one of them, and have none).
    const ids = readRows(join(first, 'front.csv'))
      .filter((row) => row.sample_index === '')
      .map((row) => row.rank);
    expect(ids.filter((id) => id !== '').sort()).toEqual(evolved.map((_, i) => `e${i + 1}`).sort());
  });

  it('shows an evolved design by its id, and evaluate reads it back to the metrics of evolved.csv', async () => {
    const shown = await cli(['show', first, 'e1']);
    expect(shown.code, shown.err).toBe(0);
    const file = join(first, 'e1.yaml');
    writeFileSync(file, shown.out);
    const metrics = JSON.parse((await cli(['evaluate', file, '--json'])).out).metrics;
    const row = readRows(join(first, 'evolved.csv'))[0] as Row;
    expect(metrics.breakout_voltage / 1e3).toBeCloseTo(Number(row.breakout_voltage_kV), 3);
    expect(metrics.wire_mass).toBeCloseTo(Number(row.wire_mass_kg), 6);
    const missing = await cli(['show', first, 'e999']);
    expect(missing.code).toBe(2);
  });

  it('lets refine follow: it starts from the evolved front, at the same reference point', async () => {
    const chained = copyOfSweep('chained');
    expect((await cli(['evolve', chained, ...BUDGET, '--workers', '0'])).code).toBe(0);
    const refined = await cli(['refine', chained, '--evaluations', '120', '--starts', '2', '--workers', '0']);
    expect(refined.code, refined.err).toBe(0);
    const summary = JSON.parse(readFileSync(join(chained, 'summary.json'), 'utf8'));
    expect(summary.refine.reference_point).toEqual(summary.evolve.reference_point);
    expect(summary.refine.hypervolume_before).toBe(summary.evolve.hypervolume_after);
    expect(summary.refine.hypervolume_after).toBeGreaterThanOrEqual(summary.refine.hypervolume_before);
    // front.csv still names the evolved designs that stay on it by their e-ids, the refined by r-ids.
    for (const row of readRows(join(chained, 'front.csv')).filter((r) => r.sample_index === ''))
      expect(row.rank).toMatch(/^([er]\d+)?$/);
    expect((await cli(['show', chained, 'e1'])).code).toBe(0);
  }, 60_000);

  it('after kill -9 mid-run, the same command continues from its journal to byte-identical files', async () => {
    const killed = copyOfSweep('killed');
    const journal = join(killed, 'evolve-journal.log');
    // Kill once the identity record and at least two generations are journaled.
    const stopped = await signalWhenJournalled(['evolve', killed, ...BUDGET, '--workers', '1'], journal, 3, 'SIGKILL');
    expect(stopped.signal).toBe('SIGKILL');
    expect(existsSync(join(killed, 'evolved.csv'))).toBe(false);
    const generations = readJournal(journal).records.length - 1;
    expect(generations).toBeGreaterThanOrEqual(2);
    expect(generations).toBeLessThan(11);
    const resumed = await cli(['evolve', killed, ...BUDGET, '--workers', '1']);
    expect(resumed.code, resumed.err).toBe(0);
    expect(resumed.err).toMatch(/resuming evolve in .*: \d+ generations from the journal/);
    for (const name of OUTPUTS)
      expect(readFileSync(join(killed, name), 'utf8')).toBe(readFileSync(join(first, name), 'utf8'));
    expect(evolveSection(killed)).toEqual(evolveSection(first));
  }, 60_000);

  it('refuses --evaluations 0 and --population 3 in one line naming the option, exit 2, nothing written', async () => {
    const untouched = copyOfSweep('bad');
    for (const [option, value] of [
      ['--evaluations', '0'],
      ['--population', '3'],
    ] as const) {
      const result = await cli(['evolve', untouched, option, value]);
      expect(result.code).toBe(2);
      expect(expectOneLine(result.err, option)).toContain(option);
    }
    expect(existsSync(join(untouched, 'evolved.csv'))).toBe(false);
    expect(readFileSync(join(untouched, 'front.csv'), 'utf8')).toBe(readFileSync(join(swept, 'front.csv'), 'utf8'));
  });
});
