import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { asciiText, csvChunks, guardText, toCsv } from '../../run/csv.js';

// The character set a spreadsheet assumes for a CSV opened by double click is a Western 8-bit one
// (observed here with LibreOffice Calc's headless import, with and without a byte-order mark; Excel's
// default import is the same, from memory), so a CSV's text cells are kept to ASCII.
describe('CSV text cells in ASCII', () => {
  it('writes the symbols of labels, reasons and warnings in ASCII', () => {
    expect(asciiText('toroid 450×110 mm')).toBe('toroid 450x110 mm');
    expect(asciiText('needs 24.51 µH, has 0.3879 µH–11.18 µH')).toBe('needs 24.51 uH, has 0.3879 uH-11.18 uH');
    expect(asciiText('±2 % at 20 °C, ≤ 3 ≥ 1 ≈ 2, 50 Ω')).toBe('+/-2 % at 20 degC, <= 3 >= 1 ~ 2, 50 ohm');
    expect(asciiText('Kühler – große Düse')).toBe('Kuhler - grosse Duse');
  });

  it('returns ASCII text as it is and leaves a character with no ASCII form', () => {
    const plain = 'sphere 300 mm, AWG 24';
    expect(asciiText(plain)).toBe(plain);
    expect(asciiText('coil 线圈')).toBe('coil 线圈');
  });

  it('guards a formula-like cell after the transliteration', () => {
    expect(guardText('−5 kV')).toBe("'-5 kV");
    expect(guardText('=SUM(A1)')).toBe("'=SUM(A1)");
  });

  it('a whole CSV of such cells is ASCII and reads back cell for cell (csv-parse)', () => {
    const text = toCsv(['topload', 'reason'], [['toroid 400×100 mm', 'primary cannot tune: needs 53.76 µH']]);
    expect(/^[\x20-\x7e\n]*$/.test(text)).toBe(true);
    expect(parse(text)).toEqual([
      ['topload', 'reason'],
      ['toroid 400x100 mm', 'primary cannot tune: needs 53.76 uH'],
    ]);
  });
});

describe('csvChunks', () => {
  // The streamed form must be the same text as the whole one (RFC 4180 quoting by csv-stringify in both).
  it('concatenates to exactly what toCsv writes, across chunk boundaries and with quoted cells', () => {
    const header = ['rank', 'label', 'value'];
    const rows = Array.from({ length: 150 }, (_, i) => [i + 1, i % 7 === 0 ? 'a, "quoted" cell' : `d${i}`, i / 3]);
    const whole = toCsv(header, rows, 6);
    const chunks = [...csvChunks(header, rows, 6)];
    expect(chunks.length).toBe(1 + 3);
    expect(chunks.join('')).toBe(whole);
    expect([...csvChunks(header, [], 6)].join('')).toBe(toCsv(header, [], 6));
  });
});
