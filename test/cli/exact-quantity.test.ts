/**
 * `show` writes each quantity in a practical unit with the fewest digits that read back exactly:
 * exact by construction, checked by reading every written text back (readQuantity) over random values.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { exactQuantityText, readQuantity, type QuantityKind } from '../../cli/units.ts';

describe('exactQuantityText', () => {
  it('writes the new user\u2019s cases without SI noise', () => {
    // '15 nF' reads as 1.5000000000000002e-8 (15 × 1e-9 in binary): written back as '15 nF', not as that SI noise.
    const fifteen = readQuantity('15 nF', 'capacitance');
    expect(fifteen.ok && exactQuantityText(fifteen.value, 'capacitance')).toBe('15 nF');
    expect(exactQuantityText(0.16, 'length')).toBe('160 mm');
    expect(exactQuantityText(150, 'length')).toBe('150 m');
    expect(exactQuantityText(293.15, 'temperature')).toBe('20 degC');
    expect(exactQuantityText(14e3, 'voltage')).toBe('14 kV');
  });

  it('reads back to exactly the same SI number for any value (random lengths, capacitances, voltages, temperatures)', () => {
    const kinds: QuantityKind[] = ['length', 'capacitance', 'voltage', 'temperature', 'inductance', 'frequency'];
    fc.assert(
      fc.property(fc.constantFrom(...kinds), fc.double({ min: 1e-13, max: 1e7, noNaN: true }), (kind, value) => {
        const text = exactQuantityText(value, kind);
        if (text === null) return; // the caller then writes the SI number itself
        const back = readQuantity(text, kind);
        expect(back.ok && back.value).toBe(value);
      }),
      { numRuns: 2000 },
    );
  });
});
