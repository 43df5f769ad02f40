/**
 * A bare number (no unit) is SI; outside a plausible range for its field it is refused with the unit
 * it probably meant — the new user's exact cases: a form of 110 (metres), a conductor of 6.35
 * (metres), a tank of 15 (farads), a charge of 14 (volts), wire 24. Checks every range and set of a
 * sweep file as well. (The designs are invented test data.)
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../../cli/program.ts';
import type { CliIo } from '../../cli/io.ts';

const GOOD = `secondary: { form_diameter: 160 mm, wire: AWG 26, turns: 1100, base_height: 450 mm }
topload: { shape: toroid, outer_diameter: 610 mm, tube_diameter: 150 mm, height_above_winding: 40 mm }
primary: { shape: flat_spiral, inner_diameter: 230 mm, turns: 14, conductor_diameter: 6.35 mm, turn_spacing: 6 mm, elevation: 0 mm }
tank: { capacitance: 30 nF, charge_voltage: 14 kV }
driver: { kind: spark_gap, break_rate: 120 Hz }
`;

const dir = mkdtempSync(join(tmpdir(), 'coilfront-plausible-'));
let counter = 0;
async function run(args: string[], text: string) {
  const file = join(dir, `f${counter++}.yaml`);
  writeFileSync(file, text);
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => (out += t), err: (t) => (err += t), isTty: false };
  const code = await runCli([...args, file], io);
  return { code, out, err };
}

describe('bare numbers outside a plausible range are answered with the unit they probably meant', () => {
  const cases: Array<[string, string, string, RegExp]> = [
    [
      'a form of 110 (metres)',
      'form_diameter: 160 mm',
      'form_diameter: 110',
      /secondary\.form_diameter: 110 \(metres\?\) is not a plausible length here \(5 mm to 5 m\); did you mean '110 mm'\?$/,
    ],
    [
      'a conductor of 6.35 (metres)',
      'conductor_diameter: 6.35 mm',
      'conductor_diameter: 6.35',
      /primary\.conductor_diameter: 6\.35 \(metres\?\) is not a plausible length here .*did you mean '6\.35 mm'\?$/,
    ],
    [
      'a tank of 15 (farads)',
      'capacitance: 30 nF',
      'capacitance: 15',
      /tank\.capacitance: 15 \(farads\?\) is not a plausible capacitance .*did you mean '15 nF'\?$/,
    ],
    [
      'a charge of 14 (volts)',
      'charge_voltage: 14 kV',
      'charge_voltage: 14',
      /tank\.charge_voltage: 14 \(volts\?\) is not a plausible voltage .*did you mean '14 kV'\?$/,
    ],
    ['wire 24', 'wire: AWG 26', 'wire: 24', /secondary\.wire: .*did you mean 'AWG 24'\?\)$/],
  ];
  for (const [name, from, to, pattern] of cases) {
    it(`evaluate: ${name}`, async () => {
      const result = await run(['evaluate'], GOOD.replace(from, to));
      expect(result.code).toBe(2);
      expect(result.out).toBe('');
      expect(result.err.trim().split('\n')).toHaveLength(1);
      expect(result.err.trim()).toMatch(pattern);
    });
  }

  it('a plausible bare number in SI is still read as SI (0.16 is a 160 mm form)', async () => {
    const result = await run(['evaluate', '--json'], GOOD.replace('form_diameter: 160 mm', 'form_diameter: 0.16'));
    expect(result.code).toBe(0);
    expect(JSON.parse(result.out).design.secondary.form_diameter).toBe(0.16);
  });

  it('check answers the same over a range and a set of a sweep file', async () => {
    const design = GOOD.split('\n')
      .filter((line) => line.length > 0)
      .map((line) => `  ${line}`)
      .join('\n');
    const sweep = (secondary: string) =>
      `design:\n${design.replace('form_diameter: 160 mm', secondary)}\nobjectives:\n  - maximize: breakout_voltage\nsweep: { method: sobol, samples: 16, seed: 1 }\n`;
    const ranged = await run(['check'], sweep('form_diameter: { from: 110, to: 200 mm }'));
    expect(ranged.code).toBe(2);
    expect(ranged.err).toMatch(/secondary\.form_diameter.*110 \(metres\?\).*did you mean '110 mm'\?/);
    const chosen = await run(['check'], sweep('form_diameter: { choose: [160 mm, 250] }'));
    expect(chosen.code).toBe(2);
    expect(chosen.err).toMatch(/secondary\.form_diameter.*250 \(metres\?\).*did you mean '250 mm'\?/);
  });
});
