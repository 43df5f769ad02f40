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

/** K(m) and the AGM tail Σ_{n≥1} 2^n c_n². */
export interface AgmSeries {
  /** K(m), complete elliptic integral of the first kind (parameter convention). */
  completeK: number;
  /** Σ_{n≥1} 2^n c_n², with K − E = K (m + tail) / 2 (A&S 17.6.3–17.6.4). */
  tail: number;
}

/**
 * K(m) and the AGM tail from the parameter m and its complement m1 = 1 − m, both given (neither is
 * formed by subtraction). Sequence a0 = 1, b0 = √m1, c0 = √m (A&S 17.6.1–17.6.2), with
 * c1 = m / (2 (1 + b0)) and c_{n+1} = c_n² / (4 a_{n+1}), which follow from c_n² = a_n² − b_n² and
 * avoid the subtraction a_n − b_n. Since E = K (1 − Σ_{n≥0} 2^(n−1) c_n²) (A&S 17.6.4) and the
 * n = 0 term is m/2, K − E = K (m + tail)/2 and (2 − m) K − 2E = K · tail exactly.
 * @param m parameter, 0 < m < 1
 * @param m1 complementary parameter 1 − m, 0 < m1 < 1
 * Source: Abramowitz & Stegun (1964) §17.6.
 */
export function agmSeries(m: number, m1: number): AgmSeries {
  let a = 1;
  let b = Math.sqrt(m1);
  let c = m / (2 * (1 + b));
  let power = 2; // 2^n for n = 1
  let tail = 0;
  for (let step = 0; step < MAX_AGM_STEPS; step++) {
    const nextA = 0.5 * (a + b);
    const nextB = Math.sqrt(a * b);
    a = nextA;
    b = nextB;
    const term = power * c * c;
    tail += term;
    if (term <= 1e-17 * tail) break;
    c = (c * c) / (2 * (a + b)); // c_{n+1} = c_n² / (4 a_{n+1}), a_{n+1} = (a_n + b_n)/2
    power *= 2;
  }
  // No further AGM steps are needed: a_n differs from the limit by about c_{n+1} = c_n²/(4 a_{n+1}),
  // and the stopping rule (2^n c_n² ≤ 10⁻¹⁷ · tail) makes that below 10⁻¹⁷ relative.
  return { completeK: Math.PI / (2 * a), tail };
}

/**
 * K and E from the parameter m and its complement m1 = 1 − m, both given so that neither is
 * formed by subtraction. Valid for 0 ≤ m < 1 (m1 > 0). Returns NaN for arguments outside.
 * (E is summed directly here: forming it from agmSeries' tail as K (1 − (m + tail)/2) loses about a
 * digit near m → 1, where the tail approaches 2 − m.)
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
