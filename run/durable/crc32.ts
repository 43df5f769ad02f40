import * as zlib from 'node:zlib';

/**
 * CRC-32 as used by zlib, gzip, PNG and Ethernet: the IEEE 802.3 polynomial 0x04C11DB7 in its
 * reflected form 0xEDB88320, initial value 0xFFFFFFFF, input and output reflected, final XOR
 * 0xFFFFFFFF ("CRC-32/ISO-HDLC" in Greg Cook's catalogue of parametrised CRC algorithms, whose check
 * value for the ASCII bytes "123456789" is 0xCBF43926). Byte-wise table method (Sarwate, "Computation
 * of cyclic redundancy checks via table look-up", Comm. ACM 31(8), 1988).
 */

/** The 256-entry table: the CRC register after shifting one byte value through it. */
const TABLE: Uint32Array = (() => {
  const table = new Uint32Array(256);
  for (let byte = 0; byte < 256; byte++) {
    let register = byte;
    for (let bit = 0; bit < 8; bit++) {
      register = register & 1 ? (register >>> 1) ^ 0xedb88320 : register >>> 1;
    }
    table[byte] = register >>> 0;
  }
  return table;
})();

/**
 * The CRC-32 of `bytes`, as an unsigned 32-bit integer. Pass the CRC of earlier bytes as `previous`
 * to continue over a stream in pieces: crc32(b, crc32(a)) === crc32(a ++ b). O(n).
 *
 * @example crc32(new TextEncoder().encode('123456789')) // 0xcbf43926
 */
export function crc32Table(bytes: Uint8Array, previous = 0): number {
  let register = ~previous >>> 0;
  for (let index = 0; index < bytes.length; index++) {
    register = TABLE[(register ^ bytes[index]) & 0xff] ^ (register >>> 8);
  }
  return ~register >>> 0;
}

/** Node's own CRC-32 (zlib, the same IEEE polynomial and convention), where this Node has it (≥ 20.15). */
const nativeCrc32 = (zlib as { crc32?: (data: Uint8Array, value?: number) => number }).crc32;

/**
 * CRC-32 (IEEE 802.3, reflected, as zlib and PNG): zlib's native implementation when Node has it
 * (several times faster on the journal's large records), else the table above; both give the same
 * numbers (tested against each other and against the check value 0xCBF43926 of "123456789").
 */
export function crc32(bytes: Uint8Array, previous = 0): number {
  return nativeCrc32 ? nativeCrc32(bytes, previous) >>> 0 : crc32Table(bytes, previous);
}
