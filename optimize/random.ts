/**
 * Counter-based (stateless) pseudo-random numbers: every value is a pure function of a seed and a few
 * integer coordinates, so any sample of a sweep can be regenerated anywhere, in any order, on any worker.
 *
 * The mixing function is the 32-bit finalizer of MurmurHash3 (A. Appleby, public domain, 2011), applied in a
 * chain to the words of the input; two chains with different starting constants give 64 bits of state, of
 * which 53 become the mantissa of the result. This is a hash, not a cryptographic generator; it passes the
 * uniformity checks in test/optimize/sampling-random.test.ts (common practice: chi-square on bins, mean).
 */

const TWO_POW_32 = 4294967296;
const TWO_POW_53 = 9007199254740992;

/**
 * The MurmurHash3 32-bit finalizer ("fmix32"): a bijection of the 32-bit integers with full avalanche.
 * @param value any number; its low 32 bits are used.
 * @returns an unsigned 32-bit integer.
 */
export function mix32(value: number): number {
  let h = value | 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** One step of a hash chain: absorb a 32-bit word into the state. */
function absorb(state: number, word: number, salt: number): number {
  return mix32(state ^ mix32((word + salt) | 0));
}

/**
 * A 32-bit hash of a seed and up to three unsigned 32-bit words.
 * @param seed unsigned 32-bit integer.
 * @param first,second,third unsigned 32-bit integers (low 32 bits used).
 * @returns an unsigned 32-bit integer; different inputs give unrelated outputs.
 */
export function hash32(seed: number, first: number, second = 0, third = 0): number {
  let h = mix32((seed ^ 0x3c6ef372) | 0);
  h = absorb(h, first, 0x9e3779b9);
  h = absorb(h, second, 0x7f4a7c15);
  h = absorb(h, third, 0x165667b1);
  return h;
}

/**
 * Checks that `seed` is an unsigned 32-bit integer, as every seeded function here expects.
 * @throws RangeError otherwise.
 */
export function assertSeed(seed: number, caller: string): void {
  if (!Number.isInteger(seed) || seed < 0 || seed >= TWO_POW_32) {
    throw new RangeError(`${caller}: seed must be an integer from 0 to 4294967295, got ${seed}`);
  }
}

/**
 * The uniform pseudo-random number at coordinates (seed, index, stream): a pure function, no state.
 *
 * @param seed unsigned 32-bit integer (0 to 2^32 − 1).
 * @param index non-negative integer up to 2^53 − 1 (the sample index); split into two 32-bit words.
 * @param stream unsigned 32-bit integer that separates independent uses (e.g. the dimension).
 * @returns a number in [0, 1) with 53 random bits (a multiple of 2^−53).
 * @example uniformAt(7, 0, 0) // the same value on every machine, every run
 */
export function uniformAt(seed: number, index: number, stream: number): number {
  const indexLow = index >>> 0;
  const indexHigh = Math.floor(index / TWO_POW_32) >>> 0;
  // Two independent chains (different starting constants and salts): 64 bits of state.
  let a = mix32((seed ^ 0x6a09e667) | 0);
  a = absorb(a, indexLow, 0x9e3779b9);
  a = absorb(a, indexHigh, 0x85ebca77);
  a = absorb(a, stream, 0xc2b2ae3d);
  let b = mix32((seed ^ 0xbb67ae85) | 0);
  b = absorb(b, indexLow, 0x27d4eb2f);
  b = absorb(b, indexHigh, 0x165667b1);
  b = absorb(b, stream, 0xd3a2646c);
  // 27 high bits of a and 26 high bits of b form a 53-bit integer; divide by 2^53.
  return ((a >>> 5) * 67108864 + (b >>> 6)) / TWO_POW_53;
}
