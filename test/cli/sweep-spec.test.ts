import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { sweepFromValue } from '../../cli/sweep-spec.ts';
import { InputError } from '../../run/input-error.ts';
import { must } from '../../core/must.ts';

const demo = () => parse(readFileSync('examples/sweeps/science-centre-ceiling.yaml', 'utf8')) as Record<string, any>;

function problem(mutate: (spec: Record<string, any>) => void, options = {}): string {
  const spec = demo();
  mutate(spec);
  try {
    sweepFromValue(spec, 'night.yaml', options);
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    expect((error as Error).message).not.toMatch(/\n/);
    return (error as Error).message;
  }
  throw new Error('expected the sweep file to be refused');
}

describe('sweepFromValue(value, file)', () => {
  it('reads the example sweep: six dimensions, SI constraint bounds, two objectives', () => {
    const spec = sweepFromValue(demo(), 'night.yaml');
    expect(spec.dimensions.map((d) => d.path.join('.'))).toEqual([
      'secondary.form_diameter',
      'secondary.wire',
      'secondary.turns',
      'secondary.base_height',
      'topload.outer_diameter',
      'topload.tube_diameter',
    ]);
    const turns = spec.dimensions[2];
    expect(turns).toMatchObject({ kind: 'range', from: 600, to: 1400, integer: true });
    const base = spec.dimensions[3];
    expect(base).toMatchObject({ kind: 'range', quantity: 'length', from: 0.4, to: 0.9, integer: false });
    expect(spec.constraints).toEqual([
      { metric: 'overall_height', max: 2.4 },
      { metric: 'resonant_frequency', min: 90e3, max: 300e3 },
      { metric: 'wire_length', max: 900 },
    ]);
    expect(spec.objectives).toEqual([
      { metric: 'breakout_voltage', sense: 'maximize' },
      { metric: 'wire_mass', sense: 'minimize' },
    ]);
    expect(spec).toMatchObject({ method: 'sobol', samples: 4096, seed: 2026 });
  });

  it('gives the same spec hash for the same content in another key order', () => {
    const a = demo();
    const b = Object.fromEntries(Object.entries(demo()).reverse());
    expect(sweepFromValue(a, 'a').hash).toBe(sweepFromValue(b, 'b').hash);
    const c = demo();
    c.sweep.seed = 7;
    expect(sweepFromValue(c, 'c').hash).not.toBe(sweepFromValue(a, 'a').hash);
  });

  it('sizes a grid as the product of its levels: sets and integers use theirs, ranges sweep.levels', () => {
    const spec = demo();
    spec.sweep = { method: 'grid', levels: 3 };
    spec.design.secondary.turns = { from: 800, to: 803, integer: true };
    const read = sweepFromValue(spec, 'grid.yaml');
    expect(read.gridLevels).toEqual([3, 3, 4, 3, 3, 3]);
    expect(read.samples).toBe(3 * 3 * 4 * 3 * 3 * 3);
  });

  it('takes a whole section as a set (the toroids on hand)', () => {
    const spec = demo();
    spec.design.topload = {
      choose: [
        { shape: 'toroid', outer_diameter: '600 mm', tube_diameter: '150 mm', height_above_winding: '50 mm' },
        { shape: 'sphere', diameter: '400 mm', height_above_winding: '250 mm' },
      ],
    };
    const read = sweepFromValue(spec, 'sets.yaml');
    const set = must(read.dimensions.find((d) => d.path.join('.') === 'topload'));
    expect(set.kind).toBe('choose');
    if (set.kind === 'choose') expect(set.values).toHaveLength(2);
  });

  const refusals: Array<[string, (spec: Record<string, any>) => void, RegExp, object?]> = [
    [
      'a reversed range',
      (s) => (s.design.secondary.base_height = { from: '900 mm', to: '400 mm' }),
      /design\.secondary\.base_height: reversed range/,
    ],
    [
      'an empty set',
      (s) => (s.design.secondary.wire = { choose: [] }),
      /design\.secondary\.wire\.choose: the set is empty/,
    ],
    [
      'NaN in a range',
      (s) => (s.design.secondary.turns = { from: Number.NaN, to: 5 }),
      /design\.secondary\.turns\.from: expected/,
    ],
    [
      'infinity in a range',
      (s) => (s.design.secondary.turns = { from: 1, to: Infinity }),
      /design\.secondary\.turns\.to: expected/,
    ],
    [
      'a unit of the wrong kind',
      (s) => (s.design.topload.outer_diameter = { from: '40 nF', to: '90 nF' }),
      /outer_diameter\.from: '40 nF' is a capacitance/,
    ],
    [
      'a range on a wire',
      (s) => (s.design.secondary.wire = { from: 'AWG 22', to: 'AWG 26' }),
      /design\.secondary\.wire: a range needs a numeric field/,
    ],
    [
      'an unknown key with a suggestion',
      (s) => (s.design.secondary.turns = { from: 600, too: 1400 }),
      /turns\.too: unknown key 'too' \(did you mean 'to'\?\)/,
    ],
    [
      'an unknown metric',
      (s) => (s.constraints.resonant_frequncy = { max: 1 }),
      /constraints\.resonant_frequncy: unknown metric 'resonant_frequncy' \(did you mean 'resonant_frequency'\?\)/,
    ],
    [
      'a constraint with min above max',
      (s) => (s.constraints.overall_height = { min: '3 m', max: '2 m' }),
      /constraints\.overall_height: min \('3 m'\) is above max/,
    ],
    [
      'a constraint bound of the wrong kind',
      (s) => (s.constraints.overall_height = { max: '2 kV' }),
      /constraints\.overall_height\.max: '2 kV' is a voltage/,
    ],
    [
      'five objectives',
      (s) =>
        (s.objectives = [
          'maximize: breakout_voltage',
          'minimize: wire_mass',
          'minimize: wire_length',
          'minimize: overall_height',
          'minimize: energy_per_shot',
        ]),
      /objectives: expected 1 to 4 objectives, got 5/,
    ],
    [
      'a repeated objective',
      (s) => s.objectives.push({ minimize: 'wire_mass' }),
      /objectives\[2\]\.minimize: 'wire_mass' is already an objective/,
    ],
    [
      'samples on a grid',
      (s) => (s.sweep = { method: 'grid', samples: 10 }),
      /sweep\.samples: a grid has no sample count/,
    ],
    [
      'an unknown method',
      (s) => (s.sweep.method = 'sobel'),
      /sweep\.method: expected one of sobol, lhs, grid, random, got 'sobel' \(did you mean 'sobol'\?\)/,
    ],
    [
      'too many samples without --force',
      (s) => (s.sweep.samples = 50_000_000),
      /sweep\.samples: 50000000 designs is more than 20000000; run with --force/,
    ],
    [
      'a fractional sample count',
      (s) => (s.sweep.samples = 10.5),
      /sweep\.samples: expected a whole number of samples/,
    ],
    [
      'nothing varied',
      (s) => (s.design = { secondary: { form_diameter: '160 mm', wire: 'AWG 26', turns: 900 } }),
      /design: nothing varies/,
    ],
    [
      'a missing required field',
      (s) => delete s.design.secondary.form_diameter,
      /design\.secondary\.form_diameter: required/,
    ],
    [
      'an unknown top-level key',
      (s) => (s.constrains = {}),
      /constrains: unknown key 'constrains' \(did you mean 'constraints'\?\)/,
    ],
  ];
  for (const [what, mutate, message, options] of refusals) {
    it(`refuses ${what} with one line naming the path`, () => {
      expect(problem(mutate, options)).toMatch(message);
    });
  }

  it('accepts a large sample count with --force', () => {
    const spec = demo();
    spec.sweep.samples = 50_000_000;
    expect(sweepFromValue(spec, 'big.yaml', { force: true }).samples).toBe(50_000_000);
  });
});
