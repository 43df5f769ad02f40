import { describe, expect, it } from 'vitest';
import { assertSeed, hash32, mix32, uniformAt } from '../../optimize/random.ts';

describe('uniformAt(seed, index, stream)', () => {
  it('is a pure function: same coordinates, same value', () => {
    expect(uniformAt(7, 123, 4)).toBe(uniformAt(7, 123, 4));
    expect(uniformAt(7, 123, 4)).not.toBe(uniformAt(8, 123, 4));
    expect(uniformAt(7, 123, 4)).not.toBe(uniformAt(7, 124, 4));
    expect(uniformAt(7, 123, 4)).not.toBe(uniformAt(7, 123, 5));
  });

  it('returns values in [0, 1) that are multiples of 2^-53 and use more than 32 bits', () => {
    let usesLowBits = false;
    for (let i = 0; i < 1000; i++) {
      const u = uniformAt(1, i, 0);
      expect(u >= 0 && u < 1).toBe(true);
      expect(Number.isInteger(u * 2 ** 53)).toBe(true);
      if (!Number.isInteger(u * 2 ** 32)) usesLowBits = true;
    }
    expect(usesLowBits).toBe(true);
  });

  it('separates indices above 2^32 (the high word is hashed too)', () => {
    expect(uniformAt(1, 5, 0)).not.toBe(uniformAt(1, 5 + 2 ** 32, 0));
    expect(uniformAt(1, Number.MAX_SAFE_INTEGER, 0)).toBeLessThan(1);
  });

  it('passes a chi-square test on 100 bins over 10^5 indices (common practice: 99.9 % critical value 148.2 for 99 degrees of freedom, from memory)', () => {
    const bins = new Array<number>(100).fill(0);
    const n = 100_000;
    for (let i = 0; i < n; i++) bins[Math.floor(uniformAt(2024, i, 3) * 100)]++;
    const expected = n / 100;
    const chiSquare = bins.reduce((sum, count) => sum + (count - expected) ** 2 / expected, 0);
    expect(chiSquare).toBeLessThan(148.2);
  });

  it('has mean 1/2 and lag-1 correlation near 0 across consecutive indices (common practice: within 4 standard errors)', () => {
    const n = 100_000;
    let sum = 0;
    let product = 0;
    let previous = uniformAt(5, 0, 0);
    for (let i = 1; i <= n; i++) {
      const u = uniformAt(5, i, 0);
      sum += u;
      product += (u - 0.5) * (previous - 0.5);
      previous = u;
    }
    expect(Math.abs(sum / n - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(product / n / (1 / 12))).toBeLessThan(4 / Math.sqrt(n));
  });
});

describe('mix32, hash32, assertSeed', () => {
  it('mix32 is the MurmurHash3 fmix32 finalizer: mix32(0) = 0 and mix32(1) = 0x514e28b7 (value from memory of the reference implementation)', () => {
    expect(mix32(0)).toBe(0);
    expect(mix32(1)).toBe(0x514e28b7);
  });

  it('mix32 is a bijection on a sample (no collisions among 2^16 consecutive inputs)', () => {
    const seen = new Set<number>();
    for (let i = 0; i < 65536; i++) seen.add(mix32(i));
    expect(seen.size).toBe(65536);
  });

  it('hash32 depends on every argument', () => {
    const base = hash32(1, 2, 3, 4);
    expect(hash32(0, 2, 3, 4)).not.toBe(base);
    expect(hash32(1, 0, 3, 4)).not.toBe(base);
    expect(hash32(1, 2, 0, 4)).not.toBe(base);
    expect(hash32(1, 2, 3, 0)).not.toBe(base);
  });

  it('assertSeed accepts 0 and 2^32 − 1 and rejects −1, 2^32, 1.5 and NaN', () => {
    expect(() => assertSeed(0, 't')).not.toThrow();
    expect(() => assertSeed(2 ** 32 - 1, 't')).not.toThrow();
    for (const bad of [-1, 2 ** 32, 1.5, Number.NaN]) expect(() => assertSeed(bad, 't')).toThrow(RangeError);
  });
});
