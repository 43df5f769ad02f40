import { describe, expect, it } from 'vitest';
import { probit } from 'simple-statistics';
import { normalCdf, normalQuantile, normalTail } from '../../../optimize/tolerance/normal.ts';

// Values of the standard normal distribution function P(x) and its upper tail Q(x), as tabulated in
// Abramowitz & Stegun 1964, Table 26.1 [abramowitz1964] (15 and 10 significant figures; quoted from memory).
const TABLE: Array<[number, number]> = [
  [0, 0.5],
  [0.5, 0.691462461274013],
  [1, 0.841344746068543],
  [1.5, 0.933192798731142],
  [2, 0.977249868051821],
  [2.5, 0.993790334674224],
  [3, 0.99865010196837],
];
const TAILS: Array<[number, number]> = [
  [3, 1.34989803163e-3],
  [4, 3.167124183312e-5],
  [5, 2.866515718791e-7],
  [6, 9.865876450377e-10],
];
// Quantiles of the standard normal used in every statistics text (A&S Table 26.5; from memory).
const QUANTILES: Array<[number, number]> = [
  [0.975, 1.959963984540054],
  [0.95, 1.644853626951472],
  [0.995, 2.575829303548901],
  [0.999, 3.090232306167813],
  [0.9, 1.281551565544601],
];

describe('the standard normal distribution function', () => {
  it('matches the tabulated P(x) of Abramowitz & Stegun Table 26.1 to 1e-14', () => {
    for (const [x, p] of TABLE) {
      expect(normalCdf(x)).toBeCloseTo(p, 14);
      expect(normalCdf(-x)).toBeCloseTo(1 - p, 14);
    }
  });
  it('keeps the relative accuracy of the far tail (Table 26.1, Q(x)) to 1e-10', () => {
    for (const [x, q] of TAILS) {
      expect(Math.abs(normalTail(x) / q - 1)).toBeLessThan(1e-10);
      expect(Math.abs(normalCdf(-x) / q - 1)).toBeLessThan(1e-10);
    }
  });
  it('is continuous where the series hands over to the continued fraction', () => {
    expect(Math.abs(normalCdf(3 - 1e-12) - normalCdf(3))).toBeLessThan(1e-13);
    expect(Math.abs(normalTail(3 - 1e-12) / normalTail(3) - 1)).toBeLessThan(1e-10);
  });
  it('gives 0 and 1 at the infinities and NaN for NaN', () => {
    expect(normalCdf(Number.NEGATIVE_INFINITY)).toBe(0);
    expect(normalCdf(Number.POSITIVE_INFINITY)).toBe(1);
    expect(normalCdf(Number.NaN)).toBeNaN();
  });
});

describe('the standard normal quantile', () => {
  it('matches the textbook quantiles to 1e-13', () => {
    for (const [p, x] of QUANTILES) {
      expect(normalQuantile(p)).toBeCloseTo(x, 13);
      expect(normalQuantile(1 - p)).toBeCloseTo(-x, 12);
    }
  });
  it('inverts the distribution function over the whole range, tails included', () => {
    // Upper values stop at 5: beyond, 1 − P(x) itself has lost the digits (the tails are checked below).
    for (const x of [-8, -6, -4.5, -3, -2, -0.7, -1e-6, 0, 1e-6, 0.3, 1, 2.2, 3, 5]) {
      const p = normalCdf(x);
      expect(Math.abs(normalQuantile(p) - x)).toBeLessThan(1e-9 * Math.max(1, Math.abs(x)));
    }
    for (const q of [1e-300, 1e-100, 1e-20]) {
      const x = normalQuantile(q);
      expect(Math.abs(normalTail(x) / q - 1)).toBeLessThan(1e-9);
    }
  });
  it('agrees with simple-statistics probit within its stated approximation error (about 2e-3)', () => {
    for (const p of [0.01, 0.1, 0.3, 0.5, 0.7, 0.9, 0.99]) {
      expect(Math.abs(normalQuantile(p) - probit(p))).toBeLessThan(5e-3);
    }
  });
  it('is infinite at 0 and 1 and refuses values outside [0, 1]', () => {
    expect(normalQuantile(0)).toBe(Number.NEGATIVE_INFINITY);
    expect(normalQuantile(1)).toBe(Number.POSITIVE_INFINITY);
    expect(() => normalQuantile(1.5)).toThrow(RangeError);
    expect(() => normalQuantile(Number.NaN)).toThrow(RangeError);
  });
});
