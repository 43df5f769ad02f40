/**
 * A sweep file drawing its form, wire and primary tube from stock catalogues, end to end through the
 * built CLI: check lists the sizes, the sweep writes their labels and numbers in the CSVs like any
 * other set. The scenario is invented test data.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { requireBuiltCli, runCliOk, scratchArea } from './sweep-harness.ts';

const area = scratchArea('stock');
afterAll(() => area.cleanup());
beforeAll(() => requireBuiltCli());

const SWEEP = `design:
  secondary:
    form_diameter: { stock: pipe_inch_sch40, from: 4.5 in, to: 8.625 in }
    wire: { stock: wire_metric, from: 0.3 mm, to: 0.4 mm }
    turns: { from: 700, to: 1100, integer: true }
    base_height: 500 mm
    voltage_profile: linear
  topload: { shape: toroid, outer_diameter: 500 mm, tube_diameter: 120 mm, height_above_winding: 40 mm }
  primary:
    shape: flat_spiral
    inner_diameter: 340 mm
    turns: 12
    conductor_diameter: { stock: tube_inch, to: 0.5 in }
    turn_spacing: 6 mm
    require_tuning: false
  tank: { capacitance: 30 nF, charge_voltage: 14 kV }
  driver: { kind: spark_gap, break_rate: 120 Hz }
objectives:
  - maximize: breakout_voltage
sweep: { method: sobol, samples: 24, seed: 5 }
`;

describe('a sweep over stock sizes', () => {
  it('check lists the chosen stock sizes by their labels', async () => {
    const file = area.dir('stock.yaml');
    writeFileSync(file, SWEEP);
    const { stdout } = await runCliOk(['check', file]);
    // ASTM D1785 sizes from 4 in to 8 in (outside 4.500 to 8.625 in, from memory)
    expect(stdout).toContain('secondary.form_diameter: one of 4 in sch 40 | 5 in sch 40 | 6 in sch 40 | 8 in sch 40');
    // IEC 60317-0-1 nominal diameters 0.300 to 0.400 mm (from memory)
    expect(stdout).toContain('secondary.wire: one of 0.3 mm | 0.315 mm | 0.335 mm | 0.355 mm | 0.375 mm | 0.4 mm');
    expect(stdout).toContain('primary.conductor_diameter: one of 1/4 in tube | 3/8 in tube');
  });

  it('the CSV holds the stock values as numbers (form, tube) and labels with diameters (wire)', async () => {
    const file = area.dir('stock.yaml');
    writeFileSync(file, SWEEP);
    const out = area.dir('run');
    await runCliOk(['sweep', file, '--out', out, '--workers', '1', '--all', '--quiet']);
    const rows = parse(readFileSync(`${out}/all.csv`, 'utf8'), { columns: true }) as Record<string, string>[];
    expect(rows).toHaveLength(24);
    const forms = new Set(rows.map((row) => row['secondary.form_diameter_mm']));
    for (const form of forms) expect(['114.3', '141.3002', '168.275', '219.075']).toContain(form);
    expect(forms.size).toBeGreaterThan(1);
    for (const row of rows) {
      expect(['0.3 mm', '0.315 mm', '0.335 mm', '0.355 mm', '0.375 mm', '0.4 mm']).toContain(row['secondary.wire']);
      expect(['9.525', '12.7']).toContain(row['primary.conductor_diameter_mm']);
    }
  });
});
