import { describe, expect, it } from 'vitest';
import { wilsonInterval } from '../../../optimize/sensitivity/index.ts';

describe('wilsonInterval', () => {
  it("matches Newcombe 1998's worked examples (Table I, method 3; values from memory)", () => {
    // [newcombe1998]: 81/263 → 0.2553 to 0.3662; 15/148 → 0.0624 to 0.1605; 0/20 → 0 to 0.1611.
    const cases: [number, number, number, number][] = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
    ];
    for (const [x, n, low, high] of cases) {
      const r = wilsonInterval(x, n);
      expect(r.low).toBeCloseTo(low, 4);
      expect(r.high).toBeCloseTo(high, 4);
    }
  });

  it('rejects impossible counts', () => {
    expect(() => wilsonInterval(5, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(1, 0)).toThrow(RangeError);
  });
});
