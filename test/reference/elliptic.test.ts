/**
 * Complete elliptic integrals K(m), E(m) (core/elliptic.ts) against published values and an
 * independent general-purpose library.
 */
import { describe, expect, test } from 'vitest';
import stdlibEllipk from '@stdlib/math/base/special/ellipk';
import stdlibEllipe from '@stdlib/math/base/special/ellipe';
import { ellipticE, ellipticK, ellipticKE, ellipticKEComplement } from '../../core/elliptic.ts';

function relativeError(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}

describe('ellipticKE(m) against @stdlib/math ellipk/ellipe (parameter convention m = k², per its README)', () => {
  // Source: @stdlib/math 0.4.1, base/special/ellipk and ellipe (independent implementations).
  const parameters: number[] = [];
  for (let i = 0; i <= 200; i++) parameters.push(i / 200 - (i === 200 ? 1e-9 : 0));
  for (let e = 3; e <= 12; e++) parameters.push(1 - 10 ** -e);
  parameters.push(1e-10, 1e-5, 0.3333333333);

  test(`K(m) and E(m) agree to 1e-13 at ${parameters.length} points of [0, 1 − 1e-12]`, () => {
    for (const m of parameters) {
      const { k, e } = ellipticKE(m);
      expect(relativeError(k, stdlibEllipk(m)), `K at m = ${m}`).toBeLessThan(1e-13);
      expect(relativeError(e, stdlibEllipe(m)), `E at m = ${m}`).toBeLessThan(1e-13);
    }
  });

  test('ellipticK and ellipticE return the pair members', () => {
    expect(ellipticK(0.37)).toBe(ellipticKE(0.37).k);
    expect(ellipticE(0.37)).toBe(ellipticKE(0.37).e);
  });
});

describe('ellipticKE(m) against mpmath values (refs §1 [X]; A&S Table 17.1 where it has entries)', () => {
  const table: Array<[number, number, number]> = [
    [0, 1.570796326794897, 1.570796326794897],
    [0.1, 1.612441348720219, 1.530757636897763],
    [0.25, 1.685750354812596, 1.467462209339427],
    [0.5, 1.854074677301372, 1.350643881047676], // K(0.5) also in A&S Table 17.1
    [0.7, 2.075363135292469, 1.241670567945823],
    [0.75, 2.1565156475, 1.21105602757],
    [0.9, 2.578092113348173, 1.104774732704073],
    [0.99, 3.695637362989875, 1.015993545025224],
    [0.999999, 8.29405146361544, 1.000003897026172],
  ];
  test.each(table)('m = %d', (m, expectedK, expectedE) => {
    const { k, e } = ellipticKE(m);
    // 0.75 is printed to 12 digits; the double nearest 0.999999 has 1 − m off by 2.9e-11 relative,
    // which moves K by about 2e-12 relative (dK/dm1 = −1/(2 m1) near m = 1).
    const tolerance = m === 0.75 ? 1e-11 : m === 0.999999 ? 5e-12 : 1e-14;
    expect(relativeError(k, expectedK)).toBeLessThan(tolerance);
    expect(relativeError(e, expectedE)).toBeLessThan(tolerance);
  });

  test('ellipticKE returns NaN outside 0 ≤ m < 1', () => {
    expect(ellipticKE(-0.1).k).toBeNaN();
    expect(ellipticKE(1).k).toBeNaN();
    expect(ellipticKE(Number.NaN).e).toBeNaN();
  });
});

describe('ellipticKEComplement(m1) near m → 1', () => {
  test('K approaches ln(4/√m1) with the next term (m1/4)(ln(4/√m1) − 1) (A&S 17.3.26, from memory)', () => {
    for (const m1 of [1e-6, 1e-9, 1e-12, 1e-15, 1e-20, 1e-30]) {
      const leading = Math.log(4 / Math.sqrt(m1));
      const { k, e } = ellipticKEComplement(m1);
      // A&S 17.3.26: K = ln(4/√m1) + (m1/4)(ln(4/√m1) − 1) + O(m1² ln m1)
      const remainder = 2 * m1 * m1 * leading; // bound on the O(m1² ln m1) terms
      expect(Math.abs(k - (leading + (m1 / 4) * (leading - 1)))).toBeLessThan(1e-14 * leading + remainder);
      // A&S 17.3.36: E = 1 + (m1/2)(ln(4/√m1) − 1/2) + …
      expect(Math.abs(e - (1 + (m1 / 2) * (leading - 0.5)))).toBeLessThan(1e-14 + remainder);
    }
  });

  test('matches @stdlib/math where 1 − m1 is exact, and beats forming 1 − (1 − m1) at tiny m1', () => {
    const m1 = 2 ** -30; // 1 − m1 is representable exactly
    expect(relativeError(ellipticKEComplement(m1).k, stdlibEllipk(1 - m1))).toBeLessThan(1e-13);
    const tiny = 1e-20; // 1 − 1e-20 rounds to 1: only the complement form can see it
    expect(Number.isFinite(ellipticKEComplement(tiny).k)).toBe(true);
    expect(ellipticKE(1 - tiny).k).toBeNaN();
  });
});
