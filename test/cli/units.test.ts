import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readQuantity } from '../../cli/units.ts';
import { designFromValue } from '../../cli/load-design.ts';
import { must } from '../../core/must.ts';

describe('readQuantity(input, kind)', () => {
  // Conversion factors: NIST SP 811 (2008), appendix B (inch = 0.0254 m exactly, foot = 0.3048 m exactly).
  const cases: Array<[unknown, Parameters<typeof readQuantity>[1], number]> = [
    ['160 mm', 'length', 0.16],
    ['6.5 in', 'length', 0.1651],
    ['2 ft', 'length', 0.6096],
    ['30 nF', 'capacitance', 30e-9],
    ['2.2 µF', 'capacitance', 2.2e-6],
    ['2.2 uF', 'capacitance', 2.2e-6],
    ['44 mH', 'inductance', 0.044],
    ['14 kV', 'voltage', 14000],
    ['120 Hz', 'frequency', 120],
    ['1.5 kW', 'power', 1500],
    ['30 deg', 'angle', Math.PI / 6],
    ['20 degC', 'temperature', 293.15],
    ['68 degF', 'temperature', 293.15],
    ['300 K', 'temperature', 300],
    [0.25, 'length', 0.25],
    ['1e-3 m', 'length', 0.001],
  ];
  for (const [input, kind, expected] of cases) {
    it(`reads ${JSON.stringify(input)} as ${expected} (${kind})`, () => {
      const result = readQuantity(input, kind);
      expect(result.ok).toBe(true);
      if (result.ok) expect(result.value).toBeCloseTo(expected, 12);
    });
  }

  it('refuses a unit of another kind and says which kind it is', () => {
    const result = readQuantity('14 kV', 'length');
    expect(result).toEqual({ ok: false, reason: expect.stringMatching(/is a voltage/) });
  });

  it('refuses NaN, infinities, lists and garbage without throwing', () => {
    fc.assert(
      fc.property(fc.oneof(fc.constant(Number.NaN), fc.constant(Infinity), fc.anything(), fc.string()), (input) => {
        const result = readQuantity(input, 'length');
        if (result.ok) expect(Number.isFinite(result.value)).toBe(true);
        else expect(result.reason).not.toMatch(/\n/);
      }),
      { numRuns: 2000, seed: 11 },
    );
  });
});

describe('design files round-trip through the parser to the same SI numbers', () => {
  it('mm and m spellings of random sizes give the same design', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.05, max: 0.5, noNaN: true }),
        fc.integer({ min: 100, max: 3000 }),
        fc.double({ min: 0, max: 2, noNaN: true }),
        (diameter, turns, base) => {
          const inMetres = { secondary: { form_diameter: diameter, wire: 'AWG 24', turns, base_height: base } };
          const inMillimetres = {
            secondary: {
              form_diameter: `${diameter * 1000} mm`,
              wire: 'AWG 24',
              turns,
              base_height: `${base * 1000} mm`,
            },
          };
          const a = designFromValue(inMetres, 'a.yaml').design;
          const b = designFromValue(inMillimetres, 'b.yaml').design;
          expect(must(b.secondary).formDiameter).toBeCloseTo(must(a.secondary).formDiameter, 12);
          expect(must(b.secondary).baseHeight).toBeCloseTo(must(a.secondary).baseHeight, 12);
          expect(must(b.secondary).turns).toBe(must(a.secondary).turns);
          // JSON and YAML both carry plain numbers: the SI value comes back unchanged.
          const again = designFromValue(JSON.parse(JSON.stringify(inMetres)), 'c.json').design;
          expect(again).toEqual(a);
        },
      ),
      { numRuns: 300, seed: 5 },
    );
  });
});
