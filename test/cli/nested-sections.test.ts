/**
 * Sections nested in sections (`tank: { bank: { part: { … } } }`) in design files, sweep files, the
 * CSV columns, `show` and the JSON Schema; and `tank_bank:`, the older flat spelling, read as the same
 * bank. The checks are exact: two spellings of one design give byte-identical evaluations, the bank
 * counts of each sampled design are the ones its sweep columns name, and the messages name the full
 * dotted path. The designs are the invented examples/rotary-bank-coil.yaml and test fixtures.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { describe, expect, test } from 'vitest';
import { parse as parseYaml, stringify as stringifyYaml } from 'yaml';
import { designSchema } from '../../cli/json-schema.ts';
import { designFromValue, loadDesignFile } from '../../cli/load-design.ts';
import { treeToJson } from '../../cli/tree-json.ts';
import { evaluateDesign } from '../../core/evaluate.ts';
import { cli } from './in-process.ts';

/** The message of the InputError a design value is refused with ('' when it is read). */
function refusal(value: unknown): string {
  try {
    designFromValue(value, 'bank.yaml');
    return '';
  } catch (error) {
    return (error as Error).message;
  }
}

const nested = parseYaml(readFileSync('examples/rotary-bank-coil.yaml', 'utf8'));
/** The same design with the bank spelled the older way, as a top-level tank_bank section. */
function flatSpelling(): Record<string, unknown> {
  const { bank, ...tank } = nested.tank;
  const flat: Record<string, unknown> = { ...nested, tank };
  flat.tank_bank = {
    ...Object.fromEntries(Object.entries(bank.part).map(([key, value]) => [`part_${key}`, value])),
    series: bank.series,
    parallel: bank.parallel,
  };
  return flat;
}
const clone = <T>(value: T): T => structuredClone(value);

describe('a design with tank.bank.part nested', () => {
  test('is the same design as its tank_bank spelling, with a byte-identical evaluation', () => {
    const a = designFromValue(clone(nested), 'nested.yaml').design;
    const b = designFromValue(flatSpelling(), 'flat.yaml').design;
    expect(a.tankBank).toEqual({
      partCapacitance: 150 * 1e-9, // '150 nF' as cli/units.ts reads it
      partVoltageRating: 2e3,
      partRmsCurrentRating: 10,
      partPeakCurrentRating: 500,
      voltageMargin: 2,
      bleedTime: 60,
    });
    expect(JSON.stringify(evaluateDesign(a))).toBe(JSON.stringify(evaluateDesign(b)));
  });

  test('prints its bank nested in --json, as the file wrote it', () => {
    const { tree } = loadDesignFile('examples/rotary-bank-coil.yaml');
    const tank = treeToJson(tree).tank as { capacitance: number; bank: { part: { voltage_rating: number } } };
    expect(tank.capacitance).toBeCloseTo(30e-9, 20);
    expect(tank.bank.part.voltage_rating).toBe(2e3);
  });

  test('names tank.bank.part.voltage_rating when it is missing, wrong or misspelt', () => {
    const missing = clone(nested);
    delete missing.tank.bank.part.voltage_rating;
    expect(refusal(missing)).toBe('bank.yaml: tank.bank.part.voltage_rating: required: DC voltage rating of one part');
    const negative = clone(nested);
    negative.tank.bank.part.voltage_rating = '-2 kV';
    expect(refusal(negative)).toMatch(/^bank\.yaml: tank\.bank\.part\.voltage_rating: expected a positive voltage/);
    const misspelt = clone(nested);
    misspelt.tank.bank.part.votage_rating = '2 kV';
    expect(refusal(misspelt)).toMatch(/^bank\.yaml: tank\.bank\.part\.votage_rating: unknown key .*'voltage_rating'/);
  });

  test('names the sub-section when the part is missing or not a mapping', () => {
    const noPart = clone(nested);
    delete noPart.tank.bank.part;
    expect(refusal(noPart)).toMatch(/^bank\.yaml: tank\.bank\.part: required: /);
    const scalar = clone(nested);
    scalar.tank.bank = 3;
    expect(refusal(scalar)).toMatch(/^bank\.yaml: tank\.bank: expected a mapping of bank fields, got 3/);
  });

  test('refuses the bank given twice, nested and as tank_bank', () => {
    const both = { ...clone(nested), tank_bank: flatSpelling().tank_bank };
    expect(refusal(both)).toMatch(/^bank\.yaml: tank_bank: give the bank once/);
  });

  test('whose parts cannot hold the charge is infeasible naming tank.bank.part.voltage_rating', () => {
    const weak = clone(nested);
    weak.tank.bank.part.voltage_rating = '50 V';
    weak.tank.bank.voltage_margin = 500; // 500 × the charge on 50 V parts needs more than 1000 in series
    const result = evaluateDesign(designFromValue(weak, 'weak.yaml').design);
    expect(result.problems[0]?.field).toBe('tank.bank.part.voltage_rating');
  });

  test('is described nested in the JSON Schema of design files', () => {
    const tank = designSchema().properties as Record<string, { properties: Record<string, unknown> }>;
    const bank = tank.tank.properties.bank as { properties: Record<string, unknown>; required: string[] };
    expect(Object.keys(bank.properties)).toEqual(['series', 'parallel', 'voltage_margin', 'bleed_time', 'part']);
    expect(bank.required).toEqual(['part']);
    const part = bank.properties.part as { properties: Record<string, unknown>; required: string[] };
    expect(part.required).toEqual(['capacitance', 'voltage_rating', 'rms_current_rating']);
  });
});

describe('a sweep inside tank.bank', () => {
  const root = mkdtempSync(join(tmpdir(), 'coilfront-nested-'));
  const read = (run: string, name: string) =>
    parseCsv(readFileSync(join(run, name), 'utf8'), { columns: true }) as Record<string, string>[];
  const spec = parseYaml(readFileSync('test/fixtures/sweep-small.yaml', 'utf8'));
  spec.constraints = {};
  spec.sweep.samples = 24;

  test('varies tank.bank.series: its column is the count built, and too few parts are infeasible naming it', async () => {
    const swept = clone(spec);
    swept.design.tank = {
      capacitance: '40 nF',
      charge_voltage: '15 kV',
      bank: {
        part: { capacitance: '150 nF', voltage_rating: '2 kV', rms_current_rating: '40 A' },
        series: { from: 10, to: 20, integer: true },
      },
    };
    const file = join(root, 'series.yaml');
    writeFileSync(file, stringifyYaml(swept));
    const run = join(root, 'series');
    expect((await cli(['sweep', file, '--out', run, '--workers', '0', '--quiet'])).code).toBe(0);
    const kept = read(run, 'candidates.csv');
    const refused = read(run, 'infeasible.csv').filter((row) => row.reason.includes('tank.bank.series'));
    expect(kept.length).toBeGreaterThan(0);
    expect(refused.length).toBeGreaterThan(0);
    for (const row of kept) {
      const ns = Number(row['tank.bank.series']);
      // 2 × 15 kV on 2 kV parts needs 15 in series (hand arithmetic); the parallel count the nearest to 40 nF
      expect(ns).toBeGreaterThanOrEqual(15);
      expect(Number(row.tank_bank_series)).toBe(ns);
      expect(Number(row.tank_bank_parallel)).toBe(Math.max(1, Math.round((40 * ns) / 150)));
    }
    for (const row of refused) expect(Number(row['tank.bank.series'])).toBeLessThan(15);

    // show prints the bank nested, and the file it prints reads back to the same design
    const shown = await cli(['show', run, '1']);
    expect(shown.code).toBe(0);
    expect(shown.out).toMatch(/\ntank:\n {2}capacitance: .*\n(?: {2}\w+: .*\n)* {2}bank:\n {4}series: \d+\n/);
    expect(shown.out).toMatch(/\n {4}part:\n {6}capacitance: 150 nF\n/);
    const shownFile = join(root, 'shown.yaml');
    writeFileSync(shownFile, shown.out);
    const back = loadDesignFile(shownFile).design.tankBank;
    expect(back?.series).toBe(Number(kept.find((row) => row.rank === '1')?.['tank.bank.series']));
  });

  test('chooses among whole parts: a label column and a number column per field of the part', async () => {
    const swept = clone(spec);
    swept.design.tank = {
      capacitance: '40 nF',
      charge_voltage: '15 kV',
      bank: {
        part: {
          choose: [
            { label: 'film 150n', capacitance: '150 nF', voltage_rating: '2 kV', rms_current_rating: '40 A' },
            { label: 'film 47n', capacitance: '47 nF', voltage_rating: '3 kV', rms_current_rating: '40 A' },
          ],
        },
      },
    };
    const file = join(root, 'parts.yaml');
    writeFileSync(file, stringifyYaml(swept));
    const run = join(root, 'parts');
    expect((await cli(['sweep', file, '--out', run, '--workers', '0', '--quiet'])).code).toBe(0);
    const rows = read(run, 'candidates.csv');
    expect(rows.length).toBeGreaterThan(0);
    const labels = new Set(rows.map((row) => row['tank.bank.part']));
    expect(labels.size).toBe(2);
    for (const row of rows) {
      const part = Number(row['tank.bank.part.capacitance_nF']);
      const rating = Number(row['tank.bank.part.voltage_rating_kV']);
      expect(part).toBe(row['tank.bank.part'] === 'film 150n' ? 150 : 47);
      // n_s = ⌈2 · 15 kV / rating⌉, C = n_p · C_part / n_s (core/tank/bank.ts, exact)
      const ns = Math.ceil((2 * 15) / rating);
      expect(Number(row.tank_bank_series)).toBe(ns);
      expect(Number(row.tank_bank_capacitance_nF)).toBeCloseTo((Number(row.tank_bank_parallel) * part) / ns, 6);
    }
  });
});
