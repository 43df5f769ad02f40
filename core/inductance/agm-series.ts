/**
 * The arithmetic-geometric mean sequence of Abramowitz & Stegun §17.6, arranged so that the
 * combinations of complete elliptic integrals that cancel in inductance formulas come out without
 * cancellation.
 */

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
