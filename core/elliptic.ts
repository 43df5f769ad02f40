/**
 * Complete elliptic integrals of the first and second kind, K(m) and E(m).
 *
 * Convention: the *parameter* m = k² (k the modulus), as in Abramowitz & Stegun (1964) ch. 17,
 * mpmath `ellipk(m)` and scipy `ellipk(m)`. Inductance texts that write K(k) use the modulus:
 * translate with m = k² before calling.
 *
 * Method: the arithmetic-geometric mean (A&S §17.6; NIST DLMF §19.8). Quadratic convergence:
 * five or six steps reach double precision. Near m → 1 the caller should pass the complementary
 * parameter m1 = 1 − m directly (`ellipticKEComplement`), because forming 1 − (1 − m1) loses every
 * digit close to a source ring.
 */

/** The pair K(m), E(m) from one AGM sequence. */
export interface EllipticPair {
  /** K(m), complete elliptic integral of the first kind. */
  k: number;
  /** E(m), complete elliptic integral of the second kind. */
  e: number;
}

const MAX_AGM_STEPS = 40;

/**
 * K and E from the parameter m and its complement m1 = 1 − m, both given so that neither is
 * formed by subtraction. Valid for 0 ≤ m < 1 (m1 > 0). Returns NaN for arguments outside.
 */
function agmPair(m: number, m1: number): EllipticPair {
  if (!(m >= 0) || !(m1 > 0) || m > 1) return { k: Number.NaN, e: Number.NaN };
  // A&S 17.6.1–17.6.4: a0 = 1, b0 = sqrt(m1), c0 = sqrt(m); K = π / (2 a_N);
  // E = K (1 − Σ_{n≥0} 2^{n−1} c_n²).
  let a = 1;
  let b = Math.sqrt(m1);
  let sum = 0.5 * m; // n = 0 term: 2^{-1} c0², c0² = m
  let power = 0.5;
  for (let step = 0; step < MAX_AGM_STEPS; step++) {
    const c = 0.5 * (a - b);
    const nextA = 0.5 * (a + b);
    const nextB = Math.sqrt(a * b);
    power *= 2;
    sum += power * c * c;
    a = nextA;
    b = nextB;
    // Once a and b agree to about an ulp the next term (≈ c²/4a) is far below double precision.
    if (Math.abs(c) <= 1e-15 * a) break;
  }
  const k = Math.PI / (2 * a);
  return { k, e: k * (1 - sum) };
}

/**
 * Complete elliptic integrals K(m) and E(m) for the parameter m = k², 0 ≤ m < 1.
 * A&S 17.6 (AGM). Returns NaN outside the range.
 */
export function ellipticKE(m: number): EllipticPair {
  return agmPair(m, 1 - m);
}

/**
 * Complete elliptic integrals for the complementary parameter m1 = 1 − m (0 < m1 ≤ 1), exact near
 * m → 1 where K has its logarithmic singularity (K ≈ ln(4/√m1), A&S 17.3.26).
 */
export function ellipticKEComplement(m1: number): EllipticPair {
  return agmPair(1 - m1, m1);
}

/** K(m), first kind, parameter convention (A&S 17.6). */
export function ellipticK(m: number): number {
  return ellipticKE(m).k;
}

/** E(m), second kind, parameter convention (A&S 17.6). */
export function ellipticE(m: number): number {
  return ellipticKE(m).e;
}
