import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { jsonChunks } from '../../run/json-chunks.ts';

describe('jsonChunks(value)', () => {
  it('concatenates to exactly JSON.stringify(value) for any JSON-like value (reference: the built-in JSON.stringify)', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (value) => {
        expect([...jsonChunks(value, 2)].join('')).toBe(JSON.stringify(value));
      }),
      { numRuns: 2000, seed: 3 },
    );
  });

  it('writes NaN and Infinity as null and honours toJSON, as JSON.stringify does', () => {
    const value = {
      a: [Number.NaN, Infinity, undefined, 1],
      b: undefined,
      c: { toJSON: () => ({ d: 2 }) },
      e: new Array(200).fill(0.5),
    };
    expect([...jsonChunks(value, 4)].join('')).toBe(JSON.stringify(value));
  });
});
