import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { METRIC_KEYS } from '../../core/metrics.ts';
import { runCli } from '../../cli/program.ts';
import type { CliIo } from '../../cli/io.ts';

const EXAMPLES = [
  'tabletop-teaching-coil',
  'exhibit-two-metre-coil',
  'solid-state-bench-coil',
  'topload-alone',
  'gallery-coil-breakout-point',
];

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => (out += t), err: (t) => (err += t), isTty: false };
  const code = await runCli(args, io);
  return { code, out, err };
}

const directory = mkdtempSync(join(tmpdir(), 'coilfront-evaluate-'));
function designFile(name: string, text: string): string {
  const path = join(directory, name);
  writeFileSync(path, text);
  return path;
}

const GOOD = `secondary: { form_diameter: 160 mm, wire: AWG 26, turns: 1100, base_height: 450 mm }
topload: { shape: toroid, outer_diameter: 610 mm, tube_diameter: 150 mm, height_above_winding: 40 mm }
primary: { shape: flat_spiral, inner_diameter: 230 mm, turns: 14, conductor_diameter: 6.35 mm, turn_spacing: 6 mm, elevation: 0 mm }
tank: { capacitance: 30 nF, charge_voltage: 14 kV }
driver: { kind: spark_gap, break_rate: 120 Hz }
environment: { altitude: 200 m, temperature: 20 degC }
`;

describe('coilfront evaluate on the example designs', () => {
  for (const name of EXAMPLES) {
    it(`evaluate examples/${name}.yaml --json prints the whole metric contract`, async () => {
      const result = await run(['evaluate', `examples/${name}.yaml`, '--json']);
      expect(result.err).toBe('');
      expect(result.code).toBe(0);
      const parsed = JSON.parse(result.out);
      expect(Object.keys(parsed)).toEqual(['design', 'metrics', 'warnings', 'profile']);
      // the fundamental along the winding at every tenth (null without a winding or with an assumed profile)
      if (parsed.profile !== null) {
        expect(parsed.profile.fraction).toHaveLength(11);
        expect(parsed.profile.voltage[10]).toBeCloseTo(1, 12);
      }
      expect(Object.keys(parsed.metrics)).toEqual([...METRIC_KEYS]);
      for (const value of Object.values(parsed.metrics)) expect(value === null || Number.isFinite(value)).toBe(true);
    });
  }

  it('a tuning error of rounding size (the tap is solved exactly) reads 0, not 2e-16', async () => {
    // An invented workshop design whose exact tap leaves tuning_error = -2.2e-16 in the JSON.
    const file = designFile(
      'exact-tap.yaml',
      `secondary: { form_diameter: 160 mm, wire: AWG 28, turns: 1234, base_height: 400 mm }
topload: { shape: toroid, outer_diameter: 400 mm, tube_diameter: 100 mm, height_above_winding: 40 mm }
primary: { shape: flat_spiral, inner_diameter: 188.08460695669055 mm, turns: 12, conductor_diameter: 6.35 mm, turn_spacing: 6 mm, elevation: 0 mm }
tank: { capacitance: 33 nF, charge_voltage: 14 kV, voltage_rating: 30 kV }
driver: { kind: spark_gap, gap: static, break_rate: 120 Hz }
environment: { altitude: 300 m, temperature: 18 degC }
`,
    );
    const json = await run(['evaluate', file, '--json']);
    const error = JSON.parse(json.out).metrics.tuning_error as number;
    expect(Math.abs(error)).toBeLessThan(1e-12);
    const text = await run(['evaluate', file]);
    expect(text.out).toMatch(/\(tuning error\) +0\n/);
  });

  it('the readable report places every metric of every example in a titled section (no catch-all)', async () => {
    for (const name of [...EXAMPLES, 'rotary-bank-coil', 'three-coil-exhibit']) {
      const result = await run(['evaluate', `examples/${name}.yaml`]);
      expect(result.code, name).toBe(0);
      expect(result.out, name).not.toMatch(/^Other$/m);
    }
  });

  it('the readable report ends with the safety cautions', async () => {
    const result = await run(['evaluate', 'examples/tabletop-teaching-coil.yaml']);
    expect(result.code).toBe(0);
    expect(result.out).toContain('SAFETY');
    expect(result.out).toMatch(/lethal/);
    expect(result.out).toMatch(/implanted medical devices/);
  });

  it('a topload alone has no secondary metrics: they are null, never made up', async () => {
    const result = await run(['evaluate', 'examples/topload-alone.yaml', '--json']);
    const parsed = JSON.parse(result.out);
    expect(parsed.metrics.secondary_inductance).toBeNull();
    expect(parsed.metrics.coupling).toBeNull();
  });

  it('the design block of --json is in SI base units', async () => {
    const result = await run(['evaluate', designFile('good.yaml', GOOD), '--json']);
    const parsed = JSON.parse(result.out);
    expect(parsed.design.secondary.form_diameter).toBeCloseTo(0.16, 15);
    expect(parsed.design.tank.capacitance).toBeCloseTo(30e-9, 20);
    expect(parsed.design.environment.temperature).toBeCloseTo(293.15, 12);
  });
});

describe('coilfront evaluate with bad input: exit 2, one line, the field named', () => {
  const cases: Array<[string, string, RegExp]> = [
    ['does not parse', 'secondary: { form_diameter: 160 mm, wire: [AWG 26\n', /cannot parse/],
    [
      'negative turns',
      GOOD.replace('turns: 1100', 'turns: -5'),
      /secondary\.turns: expected a positive number, got -5/,
    ],
    [
      'zero size',
      GOOD.replace('form_diameter: 160 mm', 'form_diameter: 0 mm'),
      /secondary\.form_diameter: expected a positive length/,
    ],
    [
      'a unit of the wrong kind',
      GOOD.replace('capacitance: 30 nF', 'capacitance: 30 kV'),
      /tank\.capacitance: '30 kV' is a voltage/,
    ],
    ['an unknown unit', GOOD.replace('160 mm', '160 furlongs'), /secondary\.form_diameter: unknown unit 'furlongs'/],
    [
      'a wrong type',
      GOOD.replace('turns: 1100', 'turns: [1, 2]'),
      /secondary\.turns: expected a plain number, got a list/,
    ],
    ['an unknown wire gauge', GOOD.replace('AWG 26', 'AWG 99'), /secondary\.wire: unknown wire gauge 'AWG 99'/],
    [
      'an unknown key with a suggestion',
      GOOD.replace('turns: 1100', 'tunrs: 1100'),
      /secondary\.tunrs: unknown key 'tunrs' \(did you mean 'turns'\?\)/,
    ],
    ['a missing required field', GOOD.replace('form_diameter: 160 mm, ', ''), /secondary\.form_diameter: required/],
    [
      'an unknown section',
      `${GOOD}secondery: {}\n`,
      /secondery: unknown key 'secondery' \(did you mean 'secondary'\?\)/,
    ],
    ['NaN', GOOD.replace('turns: 1100', 'turns: .nan'), /secondary\.turns: expected/],
    [
      'a primary inside the form',
      GOOD.replace('inner_diameter: 230 mm', 'inner_diameter: 120 mm'),
      /primary\.inner_diameter: /,
    ],
    [
      'a tube not smaller than the outer diameter',
      GOOD.replace('tube_diameter: 150 mm', 'tube_diameter: 610 mm'),
      /topload\.tube_diameter: the tube/,
    ],
    ['an empty file', '', /the file is empty/],
  ];
  for (const [what, text, message] of cases) {
    it(`${what}`, async () => {
      const file = designFile(`bad-${what.replace(/\W+/g, '-')}.yaml`, text);
      const result = await run(['evaluate', file, '--json']);
      expect(result.code).toBe(2);
      expect(result.out).toBe('');
      expect(result.err.trimEnd().split('\n')).toHaveLength(1);
      expect(result.err).toMatch(message);
      expect(result.err).not.toMatch(/at .*\.ts:\d+/);
    });
  }

  it('a missing file', async () => {
    const result = await run(['evaluate', join(directory, 'nope.yaml')]);
    expect(result.code).toBe(2);
    expect(result.err).toMatch(/no such file/);
  });

  it('an unknown option is a usage error with exit 2', async () => {
    const result = await run(['evaluate', 'examples/topload-alone.yaml', '--jsno']);
    expect(result.code).toBe(2);
  });
});
