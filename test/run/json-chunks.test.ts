import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { jsonChunks, PRIMITIVE_SLICE } from '../../run/json-chunks.ts';

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

  it('writes a long array of plain values in slices that concatenate to JSON.stringify (reference: the built-in JSON.stringify)', () => {
    const row = Array.from({ length: 2 * PRIMITIVE_SLICE + 7 }, (_, i) =>
      i % 5 === 0 ? Number.NaN : i % 7 === 0 ? null : i % 11 === 0 ? `s${i}` : i / 3,
    );
    const value = { rows: [row, row.slice(0, PRIMITIVE_SLICE)], holes: new Array(100), tail: [row, { n: 1 }] };
    const chunks = [...jsonChunks(value, 4)];
    expect(chunks.join('')).toBe(JSON.stringify(value));
    // A slice per PRIMITIVE_SLICE elements, not a chunk per element.
    expect(chunks.length).toBeLessThan(40);
  });
});
