/**
 * Maps from a unit-cube coordinate u ∈ [0, 1] to a design parameter. u = 1 (a grid's top level) is
 * accepted and gives the upper end.
 */

/** A continuous or integer range of a sweep file (`{ from, to, scale?, integer? }`), in SI units. */
export interface UnitRange {
  from: number;
  to: number;
  /** 'log': uniform in log(value); needs from and to of the same sign, neither zero. Default 'linear'. */
  scale?: 'linear' | 'log';
  /** true: the integers from ceil(min(from, to)) to floor(max(from, to)), each equally likely. */
  integer?: boolean;
}

/**
 * The parameter value at unit coordinate u of a range.
 * - linear: (1 − u)·from + u·to (exact at both ends);
 * - log: from·(to/from)^u, i.e. exp((1 − u)·ln|from| + u·ln|to|) with the sign of the range;
 * - integer: the integers lo..hi split the unit interval into equal parts (lo + floor(u·count), with u = 1
 *   giving hi), so a grid with count levels visits each integer once; with scale 'log' the integer is
 *   the floor of the log-mapped value over [lo, hi + 1), clamped to hi.
 * @param u number in [0, 1]; values outside are clamped.
 * NaN gives NaN.
 * @throws RangeError for a log range that touches or crosses zero, an integer range with no integer, or a
 *   log integer range below 1.
 * @example mapUnitToRange(0.5, { from: 100e-3, to: 900e-3, scale: 'log' }) // 0.3 (m)
 */
export function mapUnitToRange(u: number, range: UnitRange): number {
  const t = Math.min(1, Math.max(0, u));
  const isLog = range.scale === 'log';
  if (isLog && !(range.from * range.to > 0)) {
    throw new RangeError(
      `mapUnitToRange: a log range needs from and to of the same sign, got ${range.from} to ${range.to}`,
    );
  }
  if (range.integer === true) {
    const low = Math.ceil(Math.min(range.from, range.to));
    const high = Math.floor(Math.max(range.from, range.to));
    if (low > high) {
      throw new RangeError(
        `mapUnitToRange: an integer range needs an integer inside, got ${range.from} to ${range.to}`,
      );
    }
    const count = high - low + 1;
    if (!isLog) return Math.min(high, low + Math.floor(t * count));
    if (low < 1) {
      throw new RangeError(
        `mapUnitToRange: a log integer range must start at 1 or above, got ${range.from} to ${range.to}`,
      );
    }
    const value = Math.floor(logInterpolate(t, low, high + 1));
    return Math.min(high, Math.max(low, value));
  }
  if (t === 0) return range.from;
  if (t === 1) return range.to;
  return isLog ? logInterpolate(t, range.from, range.to) : (1 - t) * range.from + t * range.to;
}

function logInterpolate(t: number, from: number, to: number): number {
  const sign = from < 0 ? -1 : 1;
  return sign * Math.exp((1 - t) * Math.log(Math.abs(from)) + t * Math.log(Math.abs(to)));
}

/**
 * The position (0 .. count − 1) chosen from a set of `count` choices at unit coordinate u: equal parts of
 * the unit interval, u = 1 giving the last, so a grid with count levels visits each choice once.
 * @example mapUnitToChoice(0.99, 2) // 1
 */
export function mapUnitToChoice(u: number, count: number): number {
  if (!Number.isInteger(count) || count < 1) {
    throw new RangeError(`mapUnitToChoice: count must be an integer of at least 1, got ${count}`);
  }
  const t = Math.min(1, Math.max(0, u));
  return Math.min(count - 1, Math.floor(t * count));
}
