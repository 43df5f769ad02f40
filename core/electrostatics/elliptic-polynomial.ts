/**
 * Fast complete elliptic integrals K and E from the complementary parameter m1 = 1 − m, by the
 * polynomial-and-logarithm approximations of Hastings (1955) as printed in Abramowitz & Stegun
 * (1964), eqs. 17.3.34 (K) and 17.3.36 (E): |error| ≤ 2·10⁻⁸ for 0 < m1 ≤ 1.
 *
 * Why here: the boundary-element assembly evaluates the ring kernel tens of thousands of times per
 * field solve; one logarithm and two short polynomials are several times cheaper than the AGM of
 * core/elliptic.ts and take m1 directly, so nothing is lost near the source ring. The split form
 * K = P(m1) + Q(m1)·ln(1/m1) also exposes the logarithmic singularity for the self-panel integral
 * (Q(0) = 1/2 exactly, so K ≈ ln 4 + ½ ln(1/m1), A&S 17.3.26).
 */

// A&S 17.3.34 (K): a0..a4 and b0..b4.
const KA0 = 1.38629436112;
const KA1 = 0.09666344259;
const KA2 = 0.03590092383;
const KA3 = 0.03742563713;
const KA4 = 0.01451196212;
const KB0 = 0.5;
const KB1 = 0.12498593597;
const KB2 = 0.06880248576;
const KB3 = 0.03328355346;
const KB4 = 0.00441787012;
// A&S 17.3.36 (E): a1..a4 and b1..b4 (a0 = 1, b0 = 0).
const EA1 = 0.44325141463;
const EA2 = 0.0626060122;
const EA3 = 0.04757383546;
const EA4 = 0.01736506451;
const EB1 = 0.2499836831;
const EB2 = 0.09200180037;
const EB3 = 0.04069697526;
const EB4 = 0.00526449639;

/** Smooth part P(m1) of K = P + Q·ln(1/m1) (A&S 17.3.34). Dimensionless, 0 ≤ m1 ≤ 1. */
export function ellipticKSmoothPart(m1: number): number {
  return KA0 + m1 * (KA1 + m1 * (KA2 + m1 * (KA3 + m1 * KA4)));
}

/** Coefficient Q(m1) of ln(1/m1) in K = P + Q·ln(1/m1) (A&S 17.3.34); Q(0) = 1/2. */
export function ellipticKLogPart(m1: number): number {
  return KB0 + m1 * (KB1 + m1 * (KB2 + m1 * (KB3 + m1 * KB4)));
}

/**
 * K(m) from the complementary parameter m1 = 1 − m, 0 < m1 ≤ 1 (A&S 17.3.34, |error| ≤ 2·10⁻⁸).
 * Returns Infinity at m1 = 0 (the source ring itself).
 */
export function ellipticKFromComplement(m1: number): number {
  return ellipticKSmoothPart(m1) - ellipticKLogPart(m1) * Math.log(m1);
}

/** E(m) from the complementary parameter m1 = 1 − m, 0 ≤ m1 ≤ 1 (A&S 17.3.36, |error| ≤ 2·10⁻⁸). */
export function ellipticEFromComplement(m1: number): number {
  const smooth = 1 + m1 * (EA1 + m1 * (EA2 + m1 * (EA3 + m1 * EA4)));
  if (m1 <= 0) return smooth;
  const logCoefficient = m1 * (EB1 + m1 * (EB2 + m1 * (EB3 + m1 * EB4)));
  return smooth - logCoefficient * Math.log(m1);
}
