/**
 * Properties of the wire functions (fast-check, seeded).
 */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { awgDiameter, insulatedDiameter, wireDcResistance } from '../../core/wire.ts';

const SEED = 777;

describe('insulatedDiameter(d, grade)', () => {
  test('is continuous and increasing in d for every grade, across table rows and the extrapolated ends', () => {
    for (const grade of ['grade1', 'grade2', 'grade3'] as const) {
      let previous = insulatedDiameter(0.05e-3, grade);
      for (let d = 0.06e-3; d < 4e-3; d += 0.01e-3) {
        const value = insulatedDiameter(d, grade);
        expect(value).toBeGreaterThan(previous);
        expect(value - previous).toBeLessThan(0.02e-3); // no jump larger than the step plus build change
        previous = value;
      }
    }
  });

  test('grades are ordered: none < grade1 < grade2 < grade3 at any diameter', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05e-3, max: 5e-3, noNaN: true }), (d) => {
        expect(insulatedDiameter(d, 'none')).toBe(d);
        expect(insulatedDiameter(d, 'grade1')).toBeGreaterThan(d);
        expect(insulatedDiameter(d, 'grade2')).toBeGreaterThan(insulatedDiameter(d, 'grade1'));
        expect(insulatedDiameter(d, 'grade3')).toBeGreaterThan(insulatedDiameter(d, 'grade2'));
      }),
      { seed: SEED, numRuns: 200 },
    );
  });
});

describe('awgDiameter and wireDcResistance', () => {
  test('three gauges halve the area, so resistance doubles (ASTM B258: 92^(3/39) ≈ √2 per 3 gauges)', () => {
    fc.assert(
      fc.property(fc.integer({ min: -3, max: 50 }), (gauge) => {
        const ratio =
          wireDcResistance(1, awgDiameter(gauge + 3), 293.15) / wireDcResistance(1, awgDiameter(gauge), 293.15);
        expect(ratio).toBeCloseTo(92 ** (6 / 39), 12);
        expect(Math.abs(ratio - 2)).toBeLessThan(0.01);
      }),
      { seed: SEED, numRuns: 50 },
    );
  });
});
