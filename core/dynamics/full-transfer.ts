/**
 * Couplings at which all the tank's energy reaches the secondary at the first envelope null.
 *
 * For two equally tuned lossless resonators started from a charged tank, v1 = V cos Δt cos Σt
 * with Σ/Δ = (ω₊ + ω₋)/(ω₊ − ω₋); full transfer at the first null needs Σ/Δ = 2n + 1, i.e.
 * k = (2n + 1)/(2n² + 2n + 1), n = 1, 2, … (refs §8.2 [X], after Drude 1904).
 */

/** The n-th full-transfer coupling (2n + 1)/(2n² + 2n + 1), n ≥ 1 (n = 1: 0.6, n = 2: 0.3846…). */
export function fullTransferCoupling(n: number): number {
  return (2 * n + 1) / (2 * n * n + 2 * n + 1);
}

/**
 * The full-transfer coupling nearest to k, and its n.
 * @param coupling k, 0 < k < 1
 * The values decrease with n (≈ 1/n for large n); the search stops at n = 10 000 (k ≈ 1e-4).
 */
export function nearestFullTransferCoupling(coupling: number): { n: number; coupling: number } {
  // k(n) ≈ 1/(n + ½) for large n: start near there and look at the neighbours.
  const estimate = Math.max(1, Math.min(10_000, Math.round(1 / coupling - 0.5)));
  let bestN = 1;
  let bestDistance = Infinity;
  for (let n = Math.max(1, estimate - 3); n <= Math.min(10_000, estimate + 3); n++) {
    const distance = Math.abs(fullTransferCoupling(n) - coupling);
    if (distance < bestDistance) {
      bestDistance = distance;
      bestN = n;
    }
  }
  return { n: bestN, coupling: fullTransferCoupling(bestN) };
}
