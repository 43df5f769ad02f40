/**
 * The build sheet (`coilfront sheet`) of every example against its own evaluation: every figure
 * that repeats a metric shows the metric's value, the workshop rules (margins, spare, leads) and the
 * loaded tap are recomputed by hand, the parts CSV holds the sheet's parts, the cautions are there,
 * and a ranked candidate of a small sweep gets the sheet of the design `show` prints. The examples
 * are invented scenarios; the figures they repeat are checked elsewhere against their sources.
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { describe, expect, test } from 'vitest';
import { parse as parseYaml, stringify as stringifyYaml } from 'yaml';
import {
  buildSheet,
  FORM_END_MARGIN,
  LEAD_LENGTH,
  partsCsv,
  SPARE_FRACTION,
  sheetMarkdown,
} from '../../cli/build-sheet.ts';
import { METRIC_DISPLAY, formatNumber } from '../../cli/display-units.ts';
import { loadDesignFile } from '../../cli/load-design.ts';
import { SAFETY_CAUTIONS } from '../../cli/safety.ts';
import { evaluateDesign } from '../../core/evaluate.ts';
import { primaryInductanceAtTap, primaryInductanceTable } from '../../core/primary/inductance.ts';
import { primaryRings } from '../../core/primary/rings.ts';
import { cli } from './in-process.ts';

const examples = readdirSync('examples')
  .filter((name) => name.endsWith('.yaml'))
  .map((name) => join('examples', name));

describe.each(examples)('the sheet of %s', (file) => {
  const design = loadDesignFile(file).design;
  const evaluation = evaluateDesign(design);
  const sheet = buildSheet(design, evaluation, file);
  const figures = sheet.sections.flatMap((section) => section.figures);
  const find = (label: string) => figures.find((f) => f.label === label);

  test('every figure taken from a metric shows that metric of the evaluation', () => {
    const fromMetrics = figures.filter((f) => f.metric !== undefined);
    expect(fromMetrics.length).toBeGreaterThan(0);
    for (const figure of fromMetrics) {
      const key = figure.metric ?? '';
      if (figure.source === `metric ${key}`) {
        expect(figure.value).toBe(evaluation.metrics[key]);
        const display = METRIC_DISPLAY[key];
        const shown = formatNumber((evaluation.metrics[key] ?? 0) / (display?.divisor ?? 1));
        if (key !== 'safety_gap_spacing') expect(figure.text.startsWith(shown)).toBe(true);
      }
    }
  });

  test('every figure names where it comes from', () => {
    for (const figure of figures) expect(figure.source).toMatch(/^(metric|design|rule|computed)/);
  });

  test('the workshop rules recomputed by hand: form length, wire to buy, copper mass', () => {
    if (!design.secondary) return;
    const winding = evaluation.metrics.winding_length ?? 0;
    const margin = Math.max(FORM_END_MARGIN.minimum, FORM_END_MARGIN.fraction * winding);
    expect(find('form length to cut')?.value).toBeCloseTo(winding + 2 * margin, 12);
    const buy = (evaluation.metrics.wire_length ?? 0) * (1 + SPARE_FRACTION) + 2 * LEAD_LENGTH;
    expect(find('wire to buy')?.value).toBeCloseTo(buy, 9);
    // copper: 8890 kg/m³ (the IEC 60028 figure for annealed copper, from memory) × π d²/4 × length
    const d = design.secondary.wire.bareDiameter;
    expect(find('copper to buy')?.value).toBeCloseTo(8890 * ((Math.PI * d * d) / 4) * buy, 9);
    // and the winding's own copper is the metric wire_mass with the same density
    expect(evaluation.metrics.wire_mass).toBeCloseTo(
      8890 * ((Math.PI * d * d) / 4) * (evaluation.metrics.wire_length ?? 0),
      9,
    );
  });

  test('the streamer-loaded tap tunes the tank to the loaded frequency', () => {
    const loadedTap = find('tap for the streamer-loaded frequency');
    const loaded = figures.find((f) => f.label.startsWith('with streamer loading'));
    if (!loadedTap || !loaded || !design.primary || !design.secondary || !design.tank) return;
    const rings = primaryRings(design.primary, design.secondary.baseHeight);
    const l1 = primaryInductanceAtTap(
      primaryInductanceTable(rings, design.primary.conductorDiameter / 2),
      loadedTap.value ?? 0,
    );
    const c1 = evaluation.metrics.tank_bank_capacitance ?? design.tank.capacitance;
    expect(1 / (2 * Math.PI * Math.sqrt(l1 * c1)) / (loaded.value ?? 0)).toBeCloseTo(1, 9);
    // streamers lower the frequency, so the tap moves outward
    expect(loadedTap.value).toBeGreaterThan(evaluation.metrics.primary_tap_turns ?? Infinity);
  });

  test('the Markdown carries every figure, the parts and the full cautions; the CSV the same parts', () => {
    const markdown = sheetMarkdown(sheet);
    for (const figure of figures) expect(markdown).toContain(figure.text.replace(/\|/g, '\\|'));
    for (const line of SAFETY_CAUTIONS) expect(markdown).toContain(line.trim());
    const rows = parseCsv(partsCsv(sheet), { columns: true }) as Record<string, string>[];
    expect(rows.map((r) => r.item)).toEqual(sheet.parts.map((p) => p.item));
    for (const [i, row] of rows.entries()) expect(Number(row.quantity)).toBeCloseTo(sheet.parts[i].quantity, 4);
  });
});

describe('the rotary-bank example sheet', () => {
  const design = loadDesignFile('examples/rotary-bank-coil.yaml').design;
  const evaluation = evaluateDesign(design);
  const sheet = buildSheet(design, evaluation, 'x');

  test('orders the parts the bank needs: series × parallel parts and one bleeder each', () => {
    const parts = evaluation.metrics.tank_bank_part_count;
    expect(parts).toBe((evaluation.metrics.tank_bank_series ?? 0) * (evaluation.metrics.tank_bank_parallel ?? 0));
    expect(sheet.parts.find((p) => p.item === 'tank capacitor part')?.quantity).toBe(parts);
    expect(sheet.parts.find((p) => p.item === 'bleeder resistor')?.quantity).toBe(parts);
    expect(sheet.parts.find((p) => p.item === 'safety-gap sphere')?.quantity).toBe(2);
  });
});

describe('coilfront sheet', () => {
  const root = mkdtempSync(join(tmpdir(), 'coilfront-sheet-'));

  test('writes the Markdown to --out and the parts list beside it', async () => {
    const out = join(root, 'bench.md');
    const result = await cli(['sheet', 'examples/tabletop-teaching-coil.yaml', '--out', out]);
    expect(result.code).toBe(0);
    expect(readFileSync(out, 'utf8')).toMatch(/^# Build sheet: examples\/tabletop-teaching-coil.yaml/);
    expect(readFileSync(join(root, 'bench.parts.csv'), 'utf8')).toMatch(/^item,specification,quantity,unit,from\n/);
  });

  test('prints to stdout without --out', async () => {
    const result = await cli(['sheet', 'examples/tabletop-teaching-coil.yaml']);
    expect(result.code).toBe(0);
    expect(result.out).toContain('## Predicted tuning');
    expect(result.out).toContain('## Safety');
  });

  test('refuses an --out in a missing directory with one line, exit 2, nothing written', async () => {
    const out = join(root, 'missing', 'x.md');
    const result = await cli(['sheet', 'examples/tabletop-teaching-coil.yaml', '--out', out]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(/^coilfront: --out: cannot write/);
    expect(existsSync(out)).toBe(false);
  });

  test('refuses a design that cannot be built, naming the field', async () => {
    const value = parseYaml(readFileSync('examples/rotary-bank-coil.yaml', 'utf8'));
    value.tank.bank.part.rms_current_rating = '0.5 A';
    const file = join(root, 'weak-bank.yaml');
    writeFileSync(file, stringifyYaml(value));
    const result = await cli(['sheet', file]);
    expect(result.code).toBe(2);
    expect(result.err).toContain('tank.bank.part.rms_current_rating: cannot be built');
  });

  test('of a ranked candidate is the sheet of the design show prints for it', async () => {
    const spec = parseYaml(readFileSync('test/fixtures/sweep-small.yaml', 'utf8'));
    spec.sweep.samples = 16;
    const specFile = join(root, 'tiny.yaml');
    writeFileSync(specFile, stringifyYaml(spec));
    const run = join(root, 'run');
    const swept = await cli(['sweep', specFile, '--out', run, '--workers', '0', '--quiet']);
    expect(swept.code).toBe(0);
    const shown = await cli(['show', run, '1']);
    expect(shown.code).toBe(0);
    const designFile = join(root, 'first.yaml');
    writeFileSync(designFile, shown.out);
    const fromRun = await cli(['sheet', run, '1']);
    const fromFile = await cli(['sheet', designFile]);
    expect(fromRun.code).toBe(0);
    const body = (text: string) => text.slice(text.indexOf('\n'));
    expect(body(fromRun.out)).toBe(body(fromFile.out));
    expect(fromRun.out).toMatch(/^# Build sheet: candidate 1 of /);
  });
});

describe('a sweep over the parallel count of a bank with weak parts, written as tank_bank (the older spelling)', () => {
  test('keeps the banks that hold and lists the others as infeasible with the rating they exceed', async () => {
    const root = mkdtempSync(join(tmpdir(), 'coilfront-bank-sweep-'));
    const spec = parseYaml(readFileSync('test/fixtures/sweep-small.yaml', 'utf8'));
    spec.design.tank = { capacitance: '30 nF', charge_voltage: '15 kV' };
    spec.design.tank_bank = {
      part_capacitance: '150 nF',
      part_voltage_rating: '2 kV',
      part_rms_current_rating: '4 A',
      parallel: { from: 1, to: 6, integer: true },
    };
    spec.constraints = {};
    spec.sweep.samples = 48;
    const specFile = join(root, 'bank.yaml');
    writeFileSync(specFile, stringifyYaml(spec));
    const run = join(root, 'run');
    expect((await cli(['sweep', specFile, '--out', run, '--workers', '0', '--quiet'])).code).toBe(0);
    const read = (name: string) =>
      parseCsv(readFileSync(join(run, name), 'utf8'), { columns: true }) as Record<string, string>[];
    const kept = read('candidates.csv');
    const refused = read('infeasible.csv').filter((row) => row.reason.includes('tank.bank.part.rms_current_rating'));
    expect(kept.length).toBeGreaterThan(0);
    expect(refused.length).toBeGreaterThan(0);
    for (const row of kept) {
      expect(Number(row.tank_bank_part_rms_current_A)).toBeLessThanOrEqual(4);
      // 15 kV × 2 on 2 kV parts: 15 in series; the parallel count as sampled
      expect(Number(row.tank_bank_series)).toBe(15);
      expect(Number(row.tank_bank_capacitance_nF)).toBeCloseTo((Number(row['tank_bank.parallel']) * 150) / 15, 4);
    }
  });
});
