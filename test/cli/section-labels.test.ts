/**
 * A whole section chosen from a set: a short label (the user's `label:`, or its shape and size) in
 * `check`, the console and the CSV, with its numeric fields in their own number columns. The coils
 * here are invented test data.
 */
import { writeFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { requireBuiltCli, runCli, runCliOk, scratchArea } from './sweep-harness.ts';

const area = scratchArea('labels');
afterAll(() => area.cleanup());
beforeAll(() => requireBuiltCli());

const SWEEP = `design:
  secondary: { form_diameter: 160 mm, wire: AWG 24, turns: 900, base_height: 500 mm, voltage_profile: linear }
  topload:
    choose:
      - { shape: toroid, outer_diameter: 450 mm, tube_diameter: 110 mm, height_above_winding: 50 mm }
      - { label: big duct, shape: toroid, outer_diameter: 700 mm, tube_diameter: 200 mm, height_above_winding: 60 mm }
      - { shape: sphere, diameter: 300 mm, height_above_winding: 100 mm }
  environment: { altitude: 100 m, temperature: 20 degC }
objectives:
  - maximize: breakout_voltage
sweep: { method: sobol, samples: 12, seed: 1 }
`;

describe('labels of whole sections chosen from a set', () => {
  it('check names each choice by its label or by its shape and size', async () => {
    const file = area.dir('labels.yaml');
    writeFileSync(file, SWEEP);
    const result = await runCliOk(['check', file]);
    expect(result.stdout).toContain('toroid 450×110 mm | big duct | sphere 300 mm');
  });

  it('the CSV has the label and each numeric field as a number column in display units (empty where absent)', async () => {
    const file = area.dir('labels.yaml');
    writeFileSync(file, SWEEP);
    const out = area.dir('run');
    await runCliOk(['sweep', file, '--out', out, '--workers', '1', '--all']);
    const rows = parse(readFileSync(`${out}/all.csv`, 'utf8'), { columns: true }) as Record<string, string>[];
    const big = rows.find((row) => row.topload === 'big duct');
    expect(big?.['topload.outer_diameter_mm']).toBe('700');
    expect(big?.['topload.tube_diameter_mm']).toBe('200');
    expect(big?.['topload.diameter_mm']).toBe('');
    // Text cells are ASCII, so a spreadsheet that guesses a Western character set reads the label as written.
    expect(rows.some((row) => row.topload === 'toroid 450x110 mm')).toBe(true);
    expect(/^[\t\n\r\x20-\x7e]*$/.test(readFileSync(`${out}/all.csv`, 'latin1'))).toBe(true);
    const sphere = rows.find((row) => row.topload === 'sphere 300 mm');
    expect(sphere?.['topload.diameter_mm']).toBe('300');
    expect(sphere?.['topload.outer_diameter_mm']).toBe('');
  });

  it('a label that is not text: one line naming the field, exit 2', async () => {
    const file = area.dir('bad-label.yaml');
    writeFileSync(file, SWEEP.replace('label: big duct', 'label: 12'));
    const result = await runCli(['check', file]);
    expect(result.code).toBe(2);
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).toContain('topload.choose[1].label');
  });
});
