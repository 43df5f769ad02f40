import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PackedRow, packRow, unpackRow } from '../../optimize/packed-row.ts';

describe('PackedRow', () => {
  it('survives JSON exactly, NaN included (reference: JavaScript shortest round-trip number text, ECMA-262 Number::toString)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.double(), fc.constant(Number.NaN)), { maxLength: 70 }),
        fc.integer({ min: 0, max: 5 }),
        (numbers, dimensions) => {
          const row = new PackedRow(Float64Array.from(numbers), Math.min(dimensions, numbers.length), 1, 'why', 3);
          const back = PackedRow.revive(JSON.parse(JSON.stringify(row)));
          expect(Array.from(back.packed).map((v) => (Number.isFinite(v) ? v : null))).toEqual(
            Array.from(row.packed).map((v) => (Number.isFinite(v) ? v : null)),
          );
          expect(back.dimensions).toBe(row.dimensions);
          expect(back.reason).toBe('why');
        },
      ),
      { numRuns: 500, seed: 4 },
    );
  });

  it('unpackRow(packRow(row)) gives the row back', () => {
    const row = { values: [0.16, 2, 1098], metrics: [1.5, null, -3e-9, null], status: 0, reason: null, warningMask: 2 };
    expect(unpackRow(packRow(row))).toEqual(row);
  });
});
