import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import ExcelJS from 'exceljs';
import { parse as parseCsv } from 'csv-parse/sync';
import { beforeAll, describe, expect, it } from 'vitest';
import { writeFileSync } from 'node:fs';
import { formatCsvNumber, toCsv } from '../../run/csv.ts';
import { cli } from './in-process.ts';

// The worker pool runs the built JS (dist/): `npm test` builds first. The fixture is invented test
// data; the checks are the ones a spreadsheet user makes: every quantity column reads as numbers.

const root = mkdtempSync(join(tmpdir(), 'coilfront-sheet-'));
const run = join(root, 'run');
const TEXT_COLUMNS = new Set(['secondary.wire', 'warnings', 'reason']);
const rowsOf = (file: string): string[][] => parseCsv(readFileSync(file, 'utf8')) as string[][];

beforeAll(async () => {
  const result = await cli(['sweep', 'test/fixtures/sweep-sets.yaml', '--out', run, '--workers', '1', '--quiet']);
  expect(result.err).toBe('');
  expect(result.code).toBe(0);
}, 60_000);

describe('CSV numbers', () => {
  it('rounds to the significant digits asked, keeps whole numbers exact, leaves non-finite cells empty', () => {
    expect(formatCsvNumber(1 / 3)).toBe('0.3333333');
    expect(formatCsvNumber(1 / 3, 17)).toBe(String(1 / 3));
    expect(formatCsvNumber(123456789)).toBe('123456789');
    expect(formatCsvNumber(2.5e-13)).toBe('2.5e-13');
    expect(formatCsvNumber(Number.POSITIVE_INFINITY)).toBe('');
    expect(formatCsvNumber(Number.NaN)).toBe('');
  });
});

describe('candidates.csv as a spreadsheet reads it', () => {
  it('names the unit of a quantity varied as a set as it does for a range', () => {
    const [header] = rowsOf(join(run, 'candidates.csv'));
    expect(header).toContain('secondary.form_diameter_mm');
    expect(header).toContain('tank.capacitance_nF');
    expect(header).toContain('secondary.base_height_mm');
    expect(header).toContain('secondary.wire');
    expect(header).toContain('secondary.wire_bare_diameter_mm');
  });

  it('holds numbers (or empty cells) in every column but the wire label, warnings and reason', () => {
    for (const file of ['candidates.csv', 'front.csv', 'infeasible.csv']) {
      const [header = [], ...body] = rowsOf(join(run, file));
      expect(body.length).toBeGreaterThan(0);
      header.forEach((name, c) => {
        if (TEXT_COLUMNS.has(name)) return;
        for (const row of body) {
          const cell = row[c] ?? '';
          if (cell !== '') expect(Number.isFinite(Number(cell)), `${file} ${name} '${cell}'`).toBe(true);
        }
      });
      const feasible = header.indexOf('feasible');
      for (const row of body) expect(['0', '1']).toContain(row[feasible]);
    }
  });

  it('writes set quantities in display units, numbers to 7 significant digits by default', () => {
    const [header = [], ...body] = rowsOf(join(run, 'candidates.csv'));
    const diameter = header.indexOf('secondary.form_diameter_mm');
    const capacitance = header.indexOf('tank.capacitance_nF');
    for (const row of body) {
      expect(['110', '125', '160']).toContain(row[diameter]);
      expect(['20', '30', '40']).toContain(row[capacitance]);
      for (const cell of row) {
        if (!/^-?[\d.]+(e[-+]?\d+)?$/.test(cell) || Number.isInteger(Number(cell))) continue;
        const mantissa = cell.replace(/e.*$/, '').replace(/[-.]/g, '').replace(/^0+/, '');
        expect(mantissa.length, cell).toBeLessThanOrEqual(7);
      }
    }
    expect(JSON.parse(readFileSync(join(run, 'run.json'), 'utf8')).digits).toBe(7);
  });

  it('gives a gauge its bare diameter by ASTM B258 (Table 1: AWG 22 = 0.0253 in, AWG 24 = 0.0201 in)', () => {
    const [header = [], ...body] = rowsOf(join(run, 'candidates.csv'));
    const wire = header.indexOf('secondary.wire');
    const bare = header.indexOf('secondary.wire_bare_diameter_mm');
    // The table rounds to 0.1 mil; the column holds the unrounded rule, so 0.3 % tolerance.
    const table: Record<string, number> = { 'AWG 22': 0.0253 * 25.4, 'AWG 24': 0.0201 * 25.4, '0.5 mm': 0.5 };
    const seen = new Set<string>();
    for (const row of body) {
      const label = row[wire] ?? '';
      seen.add(label);
      // [astmB258] Table 1
      expect(Math.abs(Number(row[bare]) - (table[label] ?? Number.NaN)) / (table[label] ?? 1)).toBeLessThan(3e-3);
    }
    expect(seen.size).toBeGreaterThan(1);
  });

  /** The workbook LibreOffice Calc makes of a CSV file (soffice --convert-to xlsx, its default CSV import). */
  async function calcWorkbook(csv: string, outdir: string): Promise<ExcelJS.Workbook> {
    const out = join(root, outdir);
    const profile = `-env:UserInstallation=file://${join(root, 'lo-profile')}`;
    execFileSync('/usr/bin/soffice', ['--headless', profile, '--convert-to', 'xlsx', '--outdir', out, csv], {
      stdio: 'ignore',
      timeout: 60_000,
    });
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.readFile(join(out, `${basename(csv, '.csv')}.xlsx`));
    return workbook;
  }

  it.skipIf(!existsSync('/usr/bin/soffice'))(
    'LibreOffice Calc converts it with every quantity column numeric',
    async () => {
      const workbook = await calcWorkbook(join(run, 'candidates.csv'), 'lo');
      const sheet = workbook.worksheets[0];
      const header = (sheet.getRow(1).values as unknown[]).slice(1).map(String);
      let numbers = 0;
      for (let r = 2; r <= sheet.rowCount; r++) {
        header.forEach((name, c) => {
          const value = sheet.getRow(r).getCell(c + 1).value;
          if (TEXT_COLUMNS.has(name) || value === null || value === undefined || value === '') return;
          expect(typeof value, `${name} row ${r}: ${String(value)}`).toBe('number');
          numbers++;
        });
      }
      expect(numbers).toBeGreaterThan(100);
    },
    60_000,
  );

  it.skipIf(!existsSync('/usr/bin/soffice'))(
    'LibreOffice Calc reads the text of labels and reasons as written (ASCII, whatever character set it guesses)',
    async () => {
      // Without the ASCII forms, Calc's default import turned `400×100` into `400Ã—100` (observed here).
      const file = join(root, 'labels.csv');
      writeFileSync(
        file,
        toCsv(
          ['topload', 'reason'],
          [
            ['toroid 400×100 mm', 'primary.turns: primary cannot tune: needs 53.76 µH, has 0.47 µH–37.1 µH'],
            ['sphere 300 mm', 'winding 20 °C ± 2 °C'],
          ],
        ),
      );
      const workbook = await calcWorkbook(file, 'lo-labels');
      const sheet = workbook.worksheets[0];
      const cells = parseCsv(readFileSync(file, 'utf8')) as string[][];
      for (const [r, row] of cells.entries()) {
        for (const [c, text] of row.entries()) expect(sheet.getRow(r + 1).getCell(c + 1).value).toBe(text);
      }
      expect(sheet.getRow(2).getCell(1).value).toBe('toroid 400x100 mm');
    },
    60_000,
  );
});

describe('coilfront spreadsheet', () => {
  it('writes candidates.xlsx with typed cells, a frozen header and the cautions on a second sheet', async () => {
    const result = await cli(['spreadsheet', run]);
    expect(result.code).toBe(0);
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.readFile(join(run, 'candidates.xlsx'));
    const [sheet, safety] = workbook.worksheets;
    expect(sheet.views[0]).toMatchObject({ state: 'frozen', ySplit: 1 });
    const header = (sheet.getRow(1).values as unknown[]).slice(1).map(String);
    const csv = rowsOf(join(run, 'candidates.csv'));
    expect(header).toEqual(csv[0]);
    expect(sheet.rowCount).toBe(csv.length);
    const diameter = header.indexOf('secondary.form_diameter_mm') + 1;
    const wire = header.indexOf('secondary.wire') + 1;
    expect(typeof sheet.getRow(2).getCell(diameter).value).toBe('number');
    expect(typeof sheet.getRow(2).getCell(wire).value).toBe('string');
    const text = safety.getColumn(1).values.map(String).join('\n');
    expect(text).toMatch(/lethal/);
    expect(text).toMatch(/medical implants/);
  });
});
