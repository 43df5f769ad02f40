/**
 * Coaxial circular filaments and round-wire loops: Maxwell's mutual inductance, loop
 * self-inductance, and the quadrature rule used over current sheets.
 */
import { describe, expect, test } from 'vitest';
import { coaxialLoopMutualInductance } from '../../core/inductance/coaxial-loops.ts';
import { loopSelfInductance } from '../../core/inductance/loop.ts';
import { gaussLegendreRule } from '../../core/gauss-legendre.ts';
import { ellipticKE, ellipticKEComplement } from '../../core/elliptic.ts';

const MU0 = 4e-7 * Math.PI;

function relativeError(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}

/** Maxwell's formula written out literally with the elliptic integrals of core/elliptic.ts. */
function maxwellLiteral(a: number, b: number, d: number): number {
  const sum = (a + b) ** 2 + d * d;
  const m = (4 * a * b) / sum;
  const m1 = ((a - b) ** 2 + d * d) / sum;
  const { k: bigK, e: bigE } = m < 0.5 ? ellipticKE(m) : ellipticKEComplement(m1);
  const k = Math.sqrt(m);
  return MU0 * Math.sqrt(a * b) * ((2 / k - k) * bigK - (2 / k) * bigE);
}

describe('coaxialLoopMutualInductance (Maxwell 1873 §701)', () => {
  // refs §3.1 [X] (mpmath)
  const table: Array<[number, number, number, string]> = [
    [1, 1, 1, '494.0784631'],
    [1, 1, 0.1, '3002.876304'],
    [0.1, 0.1, 0.1, '49.40784631'],
    [0.1, 0.2, 0.05, '95.93293994'],
    [0.05, 0.15, 0, '34.37310823'],
    [0.5, 0.1, 0.3, '24.79638092'],
  ];
  test.each(table)('a = %d m, b = %d m, d = %d m: M = %s nH', (a, b, d, printed) => {
    const decimals = printed.split('.')[1].length;
    expect(Math.abs(coaxialLoopMutualInductance(a, b, d) * 1e9 - Number(printed))).toBeLessThanOrEqual(
      0.5 * 10 ** -decimals,
    );
  });

  test('agrees with the literal elliptic formula where that has no cancellation', () => {
    for (const [a, b, d] of [
      [1, 1, 1],
      [0.2, 0.3, 0.05],
      [0.1, 0.1, 0.002],
      [0.3, 0.1, 0.4],
      [1, 0.5, 2],
    ]) {
      expect(relativeError(coaxialLoopMutualInductance(a, b, d), maxwellLiteral(a, b, d))).toBeLessThan(1e-12);
    }
  });

  test('far field: M → μ0 π a² b² / (2 d³) (two magnetic dipoles on a common axis; exact limit)', () => {
    for (const d of [1e2, 1e3, 1e5]) {
      const a = 0.3;
      const b = 0.7;
      const dipole = (MU0 * Math.PI * a * a * b * b) / (2 * d ** 3);
      // next term of the expansion is of relative order (a² + b²)/d²
      expect(relativeError(coaxialLoopMutualInductance(a, b, d), dipole)).toBeLessThan(
        (3 * (a * a + b * b)) / (d * d) + 1e-13,
      );
    }
    // at d = 1e5 m the literal formula has lost most digits; the AGM tail form has not
    expect(relativeError(maxwellLiteral(0.3, 0.7, 1e5), (MU0 * Math.PI * 0.09 * 0.49) / 2e15)).toBeGreaterThan(1e-6);
  });

  test('close spacing: M → μ0 a (ln(8a/d) − 2) for equal loops, d ≪ a (Grover 1946)', () => {
    for (const d of [1e-4, 1e-5, 1e-6]) {
      const a = 0.1;
      // the next term is of order (d/a)² ln(a/d)
      expect(Math.abs(coaxialLoopMutualInductance(a, a, d) / (MU0 * a) - (Math.log((8 * a) / d) - 2))).toBeLessThan(
        1e-5,
      );
    }
  });

  test('edge cases: zero radius gives 0, coincident circles give Infinity', () => {
    expect(coaxialLoopMutualInductance(0, 1, 0.5)).toBe(0);
    expect(coaxialLoopMutualInductance(0.2, 0.2, 0)).toBe(Number.POSITIVE_INFINITY);
    expect(coaxialLoopMutualInductance(0.2, 0.2, -0.1)).toBe(coaxialLoopMutualInductance(0.2, 0.2, 0.1));
  });
});

describe('loopSelfInductance (Grover 1946; Rosa 1908)', () => {
  // refs §3.2 [X]: L_DC = μ0 a (ln(8a/ρ) − 7/4), L_HF = μ0 a (ln(8a/ρ) − 2)
  const table: Array<[number, number, string, string]> = [
    [0.1, 0.001, '620.1016', '588.6857'],
    [1, 0.001, '9094.530', '8780.371'],
    [0.05, 0.0005, '310.0508', '294.3428'],
    [0.25, 0.003175, '1475.165', '1396.625'],
  ];
  test.each(table)('a = %d m, ρ = %d m: %s nH (DC), %s nH (HF)', (radius, wireRadius, dc, hf) => {
    // 8780.371 is mis-rounded in the reference table (the formula gives 8780.37048): one unit allowed there
    const halfUnit = (printed: string) => (printed === '8780.371' ? 1 : 0.5) * 10 ** -printed.split('.')[1].length;
    expect(Math.abs(loopSelfInductance(radius, wireRadius, 'uniform') * 1e9 - Number(dc))).toBeLessThanOrEqual(
      halfUnit(dc),
    );
    expect(Math.abs(loopSelfInductance(radius, wireRadius, 'surface') * 1e9 - Number(hf))).toBeLessThanOrEqual(
      halfUnit(hf),
    );
  });

  test('the surface-current self-inductance equals M(a, a, ρ) to O((ρ/a)²)', () => {
    // GMD of a circle's perimeter to itself is its radius: the surface-current self-inductance is
    // the mutual inductance of two coaxial filaments a distance ρ apart (GMD method, Grover ch. 13).
    const radius = 0.2;
    const wireRadius = 1e-4;
    expect(
      relativeError(
        loopSelfInductance(radius, wireRadius, 'surface'),
        coaxialLoopMutualInductance(radius, radius, wireRadius),
      ),
    ).toBeLessThan(1e-6);
  });
});

describe('gaussLegendreRule (A&S §25.4.29, Table 25.4)', () => {
  test('two and three points: ±1/√3 with weight 1; 0, ±√(3/5) with weights 8/9, 5/9', () => {
    const two = gaussLegendreRule(2);
    expect(two.nodes[1]).toBeCloseTo(1 / Math.sqrt(3), 15);
    expect(two.weights[0]).toBeCloseTo(1, 15);
    const three = gaussLegendreRule(3);
    expect(Math.abs(three.nodes[1])).toBeLessThan(1e-16);
    expect(three.nodes[2]).toBeCloseTo(Math.sqrt(0.6), 15);
    expect(three.weights[1]).toBeCloseTo(8 / 9, 15);
    expect(three.weights[0]).toBeCloseTo(5 / 9, 15);
  });

  test('A&S Table 25.4, n = 12: largest node 0.981560634246719, its weight 0.047175336386512', () => {
    const rule = gaussLegendreRule(12);
    expect(rule.nodes[11]).toBeCloseTo(0.981560634246719, 14);
    expect(rule.weights[11]).toBeCloseTo(0.047175336386512, 14);
  });

  test('an n-point rule integrates x^k exactly for k ≤ 2n − 1, and not x^(2n)', () => {
    for (const n of [1, 4, 12, 30]) {
      const rule = gaussLegendreRule(n);
      for (let power = 0; power <= 2 * n; power++) {
        let sum = 0;
        for (let i = 0; i < n; i++) sum += rule.weights[i] * rule.nodes[i] ** power;
        const exact = power % 2 === 1 ? 0 : 2 / (power + 1);
        if (power < 2 * n) expect(Math.abs(sum - exact)).toBeLessThan(1e-13);
        else if (n <= 12) expect(Math.abs(sum - exact)).toBeGreaterThan(1e-9); // the error constant is below rounding for larger n
      }
    }
  });

  test('rejects n outside 1..200', () => {
    expect(() => gaussLegendreRule(0)).toThrow(RangeError);
    expect(() => gaussLegendreRule(2.5)).toThrow(RangeError);
  });
});
