/**
 * `coilfront retune`: the report and its JSON for the invented exhibit example, and bad input (one
 * line naming the option or field, exit 2).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { cli } from './in-process.ts';

const EXHIBIT = 'examples/exhibit-two-metre-coil.yaml';
const dir = mkdtempSync(join(tmpdir(), 'retune-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function refused(args: string[]): Promise<string> {
  const result = await cli(args);
  expect(result.code).toBe(2);
  expect(result.out).toBe('');
  expect(result.err.trim().split('\n')).toHaveLength(1);
  return result.err.trim();
}

describe('coilfront retune', () => {
  it('reports the fit, the tap to set, the move and the margins, then the safety cautions', async () => {
    const { code, out } = await cli(['retune', EXHIBIT, '--measured', 'frequency_with_topload=75kHz']);
    expect(code).toBe(0);
    expect(out).toContain('measured: frequency_with_topload 75 kHz');
    expect(out).toContain('from the resonance with the topload in place');
    expect(out).toMatch(/set the tap to: [\d.]+ turns from the inner end, tank 75 kHz \(\+0\.00 % against/);
    expect(out).toContain('outward: more turns');
    expect(out).toContain('margins:');
    expect(out).toContain('SAFETY');
    expect(out).toContain('lethal');
  });

  it('--json gives the taps in SI, and several measurements combine', async () => {
    const { code, out } = await cli([
      'retune',
      EXHIBIT,
      '--measured',
      'secondary_inductance=42mH',
      '--measured',
      'frequency_with_topload=80 kHz',
      '--json',
    ]);
    expect(code).toBe(0);
    const json = JSON.parse(out) as {
      fit: { capacitanceFrom: string; frequency: number };
      fitted_tap: { tap_turns: number; tank_frequency: number };
      model_tap: { tap_turns: number };
    };
    expect(json.fit.capacitanceFrom).toBe('frequency_with_topload');
    expect(json.fit.frequency).toBe(80e3);
    expect(json.fitted_tap.tap_turns).toBeLessThan(json.model_tap.tap_turns);
    expect(json.fitted_tap.tank_frequency / 80e3).toBeCloseTo(1, 10);
  });

  it('bad measurements: one line naming the option, exit 2', async () => {
    expect(await refused(['retune', EXHIBIT])).toContain('--measured: give at least one measurement');
    expect(await refused(['retune', EXHIBIT, '--measured', 'secondary_frequncy=212kHz'])).toContain(
      "unknown measurement 'secondary_frequncy' (did you mean 'secondary_frequency'?)",
    );
    expect(await refused(['retune', EXHIBIT, '--measured', '212kHz'])).toContain('--measured: expected key=value');
    expect(await refused(['retune', EXHIBIT, '--measured', 'secondary_frequency=212 pF'])).toContain(
      '--measured secondary_frequency:',
    );
    expect(await refused(['retune', EXHIBIT, '--measured', 'secondary_frequency=-5kHz'])).toContain(
      '--measured secondary_frequency: expected a positive value',
    );
    expect(
      await refused([
        'retune',
        EXHIBIT,
        '--measured',
        'secondary_frequency=200kHz',
        '--measured',
        'self_capacitance=12pF',
      ]),
    ).toContain('give one of them');
  });

  it('a design without a tank: one line naming the section, exit 2', async () => {
    const file = join(dir, 'no-tank.yaml');
    writeFileSync(
      file,
      `secondary: { form_diameter: 160 mm, wire: AWG 26, turns: 900, base_height: 450 mm, voltage_profile: linear }
topload: { shape: toroid, outer_diameter: 500 mm, tube_diameter: 120 mm, height_above_winding: 40 mm }
primary: { shape: flat_spiral, inner_diameter: 240 mm, turns: 10, conductor_diameter: 6 mm, turn_spacing: 6 mm }
`,
    );
    expect(await refused(['retune', file, '--measured', 'frequency_with_topload=200kHz'])).toBe(
      `coilfront: ${file}: tank: retuning needs the tank capacitor`,
    );
  });
});
