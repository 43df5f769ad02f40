/** Sample quantiles of sorted values [hyndman1996]. */

/** Quantile p of ascending `sorted` values, definition 7 of Hyndman & Fan (1996): x[h] with h = (n − 1)p. */
export function sortedQuantile(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) throw new RangeError('sortedQuantile: no values');
  if (!(p >= 0 && p <= 1)) throw new RangeError(`sortedQuantile: p must be in [0, 1], got ${p}`);
  const h = (n - 1) * p;
  const lower = Math.floor(h);
  const upper = Math.min(n - 1, lower + 1);
  return sorted[lower] + (h - lower) * (sorted[upper] - sorted[lower]);
}
