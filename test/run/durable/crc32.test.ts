import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { crc32 as zlibCrc32 } from 'node:zlib';
import { crc32, crc32Table } from '../../../run/durable/crc32.ts';

const ascii = (text: string): Uint8Array => new TextEncoder().encode(text);

describe('crc32(bytes)', () => {
  it('gives the check value 0xCBF43926 for "123456789"', () => {
    // CRC-32/ISO-HDLC check value, Greg Cook's "Catalogue of parametrised CRC algorithms" (also the
    // CRC-32 check value of ISO/IEC 13239 and of the zlib/PNG specification's reference code).
    expect(crc32(ascii('123456789'))).toBe(0xcbf43926);
  });

  it('is 0 for no bytes and 0xD202EF8D for one zero byte', () => {
    // 0xD202EF8D: CRC-32 of a single 0x00 byte, as computed by zlib (checked below against node:zlib).
    expect(crc32(new Uint8Array(0))).toBe(0);
    expect(crc32(Uint8Array.of(0))).toBe(0xd202ef8d);
    expect(zlibCrc32(Uint8Array.of(0))).toBe(0xd202ef8d);
  });

  it('gives the CRC-32 of "The quick brown fox jumps over the lazy dog" as 0x414FA339', () => {
    // A widely published CRC-32 test vector; node:zlib (the zlib library's crc32) agrees.
    expect(crc32(ascii('The quick brown fox jumps over the lazy dog'))).toBe(0x414fa339);
  });

  it('agrees with zlib (node:zlib crc32) on random bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 600 }), (bytes) => {
        expect(crc32(bytes)).toBe(zlibCrc32(bytes));
      }),
      { numRuns: 400, seed: 42 },
    );
  });

  it('continues over pieces: crc32(b, crc32(a)) is the CRC of a followed by b', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 200 }), fc.uint8Array({ maxLength: 200 }), (a, b) => {
        const joined = new Uint8Array(a.length + b.length);
        joined.set(a, 0);
        joined.set(b, a.length);
        expect(crc32(b, crc32(a))).toBe(crc32(joined));
      }),
      { numRuns: 200, seed: 3 },
    );
  });
});

describe('crc32Table(bytes) — the hand-written table, used where Node has no zlib.crc32', () => {
  it('gives the check value 0xCBF43926 for "123456789" (catalogue of parametrised CRC algorithms, CRC-32/ISO-HDLC)', () => {
    expect(crc32Table(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
  });

  it('equals crc32 on random bytes, also when continued from a previous value', () => {
    let seed = 7;
    for (let trial = 0; trial < 50; trial++) {
      const bytes = new Uint8Array(1 + trial * 37);
      for (let i = 0; i < bytes.length; i++) {
        seed = (seed * 1103515245 + 12345) >>> 0;
        bytes[i] = seed >>> 24;
      }
      expect(crc32Table(bytes)).toBe(crc32(bytes));
      expect(crc32Table(bytes, 0x1234)).toBe(crc32(bytes, 0x1234));
    }
  });
});
