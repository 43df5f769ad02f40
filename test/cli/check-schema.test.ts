import { describe, expect, it } from 'vitest';
import { runCli } from '../../cli/program.ts';
import type { CliIo } from '../../cli/io.ts';
import { METRIC_KEYS } from '../../core/metrics.ts';
import { DESIGN_SECTIONS } from '../../cli/design-fields.ts';

async function cli(args: string[]) {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => (out += t), err: (t) => (err += t), isTty: false };
  const code = await runCli(args, io);
  return { code, out, err };
}

describe('coilfront check SPEC', () => {
  it('lists the dimensions, the discrete part, the objectives and a measured estimate, then the caution', async () => {
    const result = await cli(['check', 'examples/sweeps/science-centre-ceiling.yaml', '--workers', '2']);
    expect(result.code).toBe(0);
    expect(result.out).toContain('dimensions (6):');
    expect(result.out).toContain('secondary.wire: one of AWG 22 | AWG 24 | AWG 26');
    expect(result.out).toContain('secondary.turns: 600 to 1400 (integers, 801 levels)');
    expect(result.out).toMatch(/discrete part of the space: 7209 combinations × 3 continuous dimensions/);
    expect(result.out).toMatch(/measured [\d.]+ ms per design on this machine: about \S+ with 2 workers/);
    expect(result.out).toMatch(/DANGER: lethal/);
  });

  it('a bad sweep file is exit 2 with one line', async () => {
    const result = await cli(['check', 'examples/tabletop-teaching-coil.yaml']);
    expect(result.code).toBe(2);
    expect(result.err.trimEnd().split('\n')).toHaveLength(1);
    expect(result.err).toMatch(/secondary: unknown key 'secondary': a sweep file puts the design tree under 'design:'/);
  });
});

describe('coilfront schema', () => {
  it('prints a JSON Schema whose metric names are exactly the contract', async () => {
    const result = await cli(['schema']);
    expect(result.code).toBe(0);
    const schema = JSON.parse(result.out);
    expect(schema.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    expect(Object.keys(schema.properties)).toEqual(['design', 'constraints', 'objectives', 'sweep', 'tolerances']);
    expect(schema.properties.constraints.propertyNames.enum).toEqual([...METRIC_KEYS]);
    expect(Object.keys(schema.properties.design.properties)).toEqual(Object.keys(DESIGN_SECTIONS));
  });

  it('--design prints the schema of design files', async () => {
    const schema = JSON.parse((await cli(['schema', '--design'])).out);
    expect(schema.title).toBe('coilfront design file');
    expect(schema.properties.secondary.properties.turns).toBeDefined();
  });
});
