import { describe, expect, it } from 'vitest';
import { mapUnitToChoice, mapUnitToRange } from '../../../optimize/sampling/unit-interval-mapping.ts';
import { GridSampler } from '../../../optimize/sampling/grid-sampler.ts';

describe('mapUnitToRange(u, range)', () => {
  it('linear: gives from at 0, to at 1 and the midpoint at 0.5 (exact)', () => {
    const range = { from: 0.6, to: 1.6 };
    expect(mapUnitToRange(0, range)).toBe(0.6);
    expect(mapUnitToRange(1, range)).toBe(1.6);
    expect(mapUnitToRange(0.5, range)).toBeCloseTo(1.1, 15);
  });

  it('log: the midpoint is the geometric mean, sqrt(0.1 × 0.9) = 0.3', () => {
    expect(mapUnitToRange(0.5, { from: 0.1, to: 0.9, scale: 'log' })).toBeCloseTo(0.3, 14);
    expect(mapUnitToRange(1, { from: 0.1, to: 0.9, scale: 'log' })).toBe(0.9);
    expect(mapUnitToRange(0.5, { from: -4, to: -1, scale: 'log' })).toBeCloseTo(-2, 14);
  });

  it('log: rejects a range that touches or crosses zero', () => {
    expect(() => mapUnitToRange(0.5, { from: 0, to: 1, scale: 'log' })).toThrow(RangeError);
    expect(() => mapUnitToRange(0.5, { from: -1, to: 1, scale: 'log' })).toThrow(/same sign/);
  });

  it('integer: 600..1600 gives each integer an equal share, 1600 only at the top share, and u = 1 gives 1600', () => {
    const range = { from: 600, to: 1600, integer: true };
    expect(mapUnitToRange(0, range)).toBe(600);
    expect(mapUnitToRange(1, range)).toBe(1600);
    expect(mapUnitToRange(1000 / 1001 - 1e-12, range)).toBe(1599);
    expect(mapUnitToRange(1000 / 1001 + 1e-12, range)).toBe(1600);
  });

  it('integer with a grid of count levels visits each integer exactly once', () => {
    const grid = new GridSampler([11]);
    const out = new Float64Array(1);
    const values: number[] = [];
    for (let i = 0; i < 11; i++) {
      grid.pointAt(i, out);
      values.push(mapUnitToRange(out[0], { from: 20, to: 30, integer: true }));
    }
    expect(values).toEqual([20, 21, 22, 23, 24, 25, 26, 27, 28, 29, 30]);
  });

  it('integer log: 1..1000 maps u = 0.5 to floor(sqrt(1001)) = 31, stays within [1, 1000]', () => {
    const range = { from: 1, to: 1000, integer: true, scale: 'log' as const };
    expect(mapUnitToRange(0.5, range)).toBe(31);
    expect(mapUnitToRange(0, range)).toBe(1);
    expect(mapUnitToRange(1, range)).toBe(1000);
  });

  it('clamps u outside [0, 1], passes NaN through, rejects an integer range with no integer', () => {
    expect(mapUnitToRange(-0.5, { from: 2, to: 3 })).toBe(2);
    expect(mapUnitToRange(7, { from: 2, to: 3 })).toBe(3);
    expect(mapUnitToRange(Number.NaN, { from: 2, to: 3 })).toBeNaN();
    expect(() => mapUnitToRange(0.5, { from: 2.2, to: 2.8, integer: true })).toThrow(RangeError);
  });
});

describe('mapUnitToChoice(u, count)', () => {
  it('splits [0, 1] into equal shares and gives the last choice at u = 1', () => {
    expect([0, 0.33, 0.34, 0.99, 1].map((u) => mapUnitToChoice(u, 3))).toEqual([0, 0, 1, 2, 2]);
  });

  it('rejects a count of 0', () => {
    expect(() => mapUnitToChoice(0.5, 0)).toThrow(RangeError);
  });
});
