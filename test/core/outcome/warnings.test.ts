/**
 * Warning keys: the bit mask a sweep row stores and the key list the CSV writes. Exact by
 * construction (bit i ↔ WARNING_KEYS[i]); checked on every key and on every pair.
 */
import { describe, expect, test } from 'vitest';
import { WARNING_KEYS, warningCountOf, warningKeysOf, warningMask } from '../../../core/outcome/warnings.ts';

describe('warning masks', () => {
  test('there are at most 32 keys (a mask is one unsigned 32-bit integer) and no key repeats', () => {
    expect(WARNING_KEYS.length).toBeLessThanOrEqual(32);
    expect(new Set(WARNING_KEYS).size).toBe(WARNING_KEYS.length);
  });

  test('an empty list is mask 0, no keys, count 0', () => {
    expect(warningMask([])).toBe(0);
    expect(warningKeysOf(0)).toEqual([]);
    expect(warningCountOf(0)).toBe(0);
  });

  test('every single key and every pair round-trips through the mask, in key order', () => {
    for (let i = 0; i < WARNING_KEYS.length; i++) {
      for (let j = i; j < WARNING_KEYS.length; j++) {
        const a = WARNING_KEYS[i] as (typeof WARNING_KEYS)[number];
        const b = WARNING_KEYS[j] as (typeof WARNING_KEYS)[number];
        const mask = warningMask([
          { key: b, message: 'second' },
          { key: a, message: 'first' },
        ]);
        expect(warningKeysOf(mask)).toEqual(i === j ? [a] : [a, b]);
        expect(warningCountOf(mask)).toBe(i === j ? 1 : 2);
        expect(mask).toBeGreaterThanOrEqual(0);
      }
    }
  });
});
