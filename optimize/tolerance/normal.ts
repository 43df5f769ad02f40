/**
 * The standard normal distribution by hand: density, distribution function and its inverse, accurate to
 * about 1e-14 relative over the range the tolerance draws use (|x| ≤ 8).
 *
 * Distribution function [abramowitz1964]: for |x| < 3 the series 26.2.11,
 * P(x) = 1/2 + Z(x) Σₙ x^(2n+1) / (1·3·5···(2n+1)), all of whose terms share the sign of x; beyond, the
 * upper tail Q(x) = Z(x) / (x + 1/(x + 2/(x + 3/(x + …)))) of the continued fraction 26.2.14, evaluated
 * backwards from a fixed depth, so the far tail keeps its relative accuracy.
 * Inverse: the rational start of 26.2.23 (error below 4.5e-4), then Halley steps on P(x) − p.
 */

const INV_SQRT_2PI = 0.3989422804014327;

/** Z(x) = exp(−x²/2)/√(2π). */
export function normalDensity(x: number): number {
  return INV_SQRT_2PI * Math.exp(-0.5 * x * x);
}

/** Σ x^(2n+1)/(1·3···(2n+1)) of A&S 26.2.11, for |x| < 3 (positive terms for x > 0). */
function seriesSum(x: number): number {
  let term = x;
  let sum = x;
  const x2 = x * x;
  for (let n = 1; n < 200; n++) {
    term *= x2 / (2 * n + 1);
    sum += term;
    if (Math.abs(term) < 1e-17 * Math.abs(sum)) break;
  }
  return sum;
}

/** Upper tail Q(x) for x ≥ 3 by the continued fraction of A&S 26.2.14, evaluated from depth 120 back. */
function upperTailFraction(x: number): number {
  let t = x;
  for (let k = 120; k >= 1; k--) t = x + k / t;
  return normalDensity(x) / t;
}

/** P(x) = Pr(X ≤ x) for a standard normal X; 0 and 1 at ∓Infinity, NaN for NaN. */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) return Number.NaN;
  if (x >= 3) return 1 - upperTailFraction(x);
  if (x <= -3) return upperTailFraction(-x);
  return 0.5 + normalDensity(x) * seriesSum(x);
}

/** The smaller tail min(P(x), Q(x)) with full relative accuracy: Pr(X ≤ −|x|). */
export function normalTail(x: number): number {
  const a = Math.abs(x);
  if (a >= 3) return upperTailFraction(a);
  return 0.5 - normalDensity(a) * seriesSum(a);
}

/**
 * The quantile x with P(x) = p, for 0 < p < 1 (−Infinity at 0, Infinity at 1).
 * @throws RangeError outside [0, 1] or for NaN.
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`normalQuantile: p must be in [0, 1], got ${p}`);
  if (p === 0) return Number.NEGATIVE_INFINITY;
  if (p === 1) return Number.POSITIVE_INFINITY;
  if (p === 0.5) return 0;
  // Work in the lower tail q = min(p, 1 − p), solving Pr(X ≤ −y) = q for y ≥ 0; x = ∓y.
  const lower = p < 0.5;
  const q = lower ? p : 1 - p;
  // A&S 26.2.23: y ≈ t − (c0 + c1 t + c2 t²)/(1 + d1 t + d2 t² + d3 t³), t = √(−2 ln q).
  const t = Math.sqrt(-2 * Math.log(q));
  let y =
    t - (2.515517 + 0.802853 * t + 0.010328 * t * t) / (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
  // Halley's method on f(y) = Pr(X ≤ −y) − q, f' = −Z(y), f'' = y·Z(y).
  for (let step = 0; step < 6; step++) {
    const f = normalCdf(-y) - q;
    const z = normalDensity(y);
    const u = f / -z;
    const change = u / (1 + 0.5 * y * u);
    y -= change;
    if (Math.abs(change) <= 1e-15 * Math.max(1, Math.abs(y))) break;
  }
  return lower ? -y : y;
}
