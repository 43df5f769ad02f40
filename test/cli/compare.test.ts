import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DIFFERS } from '../../cli/compare-command.ts';
import type { CliIo } from '../../cli/io.ts';
import { runCli } from '../../cli/program.ts';
import { METRIC_KEYS } from '../../core/metrics.ts';

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => (out += t), err: (t) => (err += t), isTty: false };
  const code = await runCli(args, io);
  return { code, out, err };
}

const directory = mkdtempSync(join(tmpdir(), 'coilfront-compare-'));
const design = (
  turns: number,
) => `secondary: { form_diameter: 160 mm, wire: AWG 26, turns: ${turns}, base_height: 450 mm, voltage_profile: linear }
topload: { shape: toroid, outer_diameter: 610 mm, tube_diameter: 150 mm, height_above_winding: 40 mm }
primary: { shape: flat_spiral, inner_diameter: 230 mm, turns: 14, conductor_diameter: 6.35 mm, turn_spacing: 6 mm, elevation: 0 mm }
tank: { capacitance: 30 nF, charge_voltage: 14 kV }
driver: { kind: spark_gap, break_rate: 120 Hz }
environment: { altitude: ${turns === 1100 ? '1500 m' : '0 m'} }
`;
const a = join(directory, 'a.yaml');
const b = join(directory, 'b.yaml');
writeFileSync(a, design(1100));
writeFileSync(b, design(900));

/** The table line whose field column starts with `label`. */
function rowOf(text: string, label: string): string {
  const line = text.split('\n').find((l) => l.slice(3).startsWith(label));
  if (line === undefined) throw new Error(`no row ${label}`);
  return line;
}

describe('coilfront compare a.yaml b.yaml', async () => {
  const svg = join(directory, 'both.svg');
  const result = await run(['compare', a, b, '--svg', svg]);

  it('prints a column per design with every parameter and every metric, and the cautions', () => {
    expect(result.err).toBe('');
    expect(result.code).toBe(0);
    const header = result.out.split('\n')[0];
    expect(header).toContain(a);
    expect(header).toContain(b);
    for (const key of METRIC_KEYS) expect(result.out).toMatch(new RegExp(`\\n.. {1,2}${key}\\b`));
    expect(rowOf(result.out, 'tank.capacitance (nF)')).toMatch(/30\s+30$/);
    expect(result.out).toContain('lethal energy at lethal voltage');
  });

  it('marks the rows that differ and only those', () => {
    expect(rowOf(result.out, 'secondary.turns').startsWith(DIFFERS)).toBe(true);
    expect(rowOf(result.out, 'resonant_frequency (kHz)').startsWith(DIFFERS)).toBe(true);
    expect(rowOf(result.out, 'tank.capacitance (nF)').startsWith(DIFFERS)).toBe(false);
    expect(rowOf(result.out, 'topload.outer_diameter (mm)').startsWith(DIFFERS)).toBe(false);
    expect(rowOf(result.out, 'secondary.wire').startsWith(DIFFERS)).toBe(false);
  });

  it('shows a site length in metres and a machine length in millimetres, one unit per row', () => {
    // lengthDisplay: an altitude is a site length (metres whatever its size); a form diameter of
    // 160 mm stays in millimetres (common practice of builders' drawings, no source).
    expect(rowOf(result.out, 'environment.altitude (m)')).toMatch(/1500\s+0$/);
    expect(rowOf(result.out, 'secondary.form_diameter (mm)')).toMatch(/160\s+160$/);
    expect(result.out).not.toContain('environment.altitude (mm)');
  });

  it('draws both designs side by side at one scale with --svg', () => {
    const text = readFileSync(svg, 'utf8');
    const scales = [...text.matchAll(/data-scale="([\d.]+)"/g)].map((m) => Number(m[1]));
    expect(scales.length).toBe(2);
    expect(scales[0]).toBe(scales[1]);
    expect(text.match(/class="topload"/g)?.length).toBe(2);
  });
});

describe('coilfront compare with bad input', () => {
  it('exits 2 with one design only', async () => {
    const result = await run(['compare', a]);
    expect(result.code).toBe(2);
    expect(result.err).toContain('at least two');
  });
  it('exits 2 for an --svg that is not .svg, naming the option, and writes nothing', async () => {
    const result = await run(['compare', a, b, '--svg', join(directory, 'x.png')]);
    expect(result.code).toBe(2);
    expect(result.err).toContain('--svg');
    expect(result.out).toBe('');
  });
});
