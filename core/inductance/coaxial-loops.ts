/**
 * Mutual inductance of two coaxial circular filaments (Maxwell's formula).
 */
import { VACUUM_PERMEABILITY } from './vacuum.ts';

const MAX_AGM_STEPS = 40;

/**
 * Mutual inductance of two coaxial circles, H:
 * M = μ0 √(ab) [(2/k − k) K(m) − (2/k) E(m)], m = k² = 4ab / ((a + b)² + d²).
 *
 * Computed without cancellation at any distance: with the AGM sequence of A&S 17.6 (a0 = 1,
 * b0 = √m1, c0 = k) one has K − E = K Σ_{n≥0} 2^(n−1) c_n², so the bracket equals
 * (K/k) Σ_{n≥1} 2^n c_n²: the n = 0 term cancels analytically, not numerically. The c_n are formed
 * as c_{n+1} = c_n² / (4 a_{n+1}) and m1 = ((a − b)² + d²)/((a + b)² + d²) is formed directly, so the
 * formula keeps full precision both far away (m → 0, where M → μ0 π a² b² / (2 d³)) and close to
 * the other ring (m → 1).
 * @param radiusA radius of one circle, m, ≥ 0
 * @param radiusB radius of the other, m, ≥ 0
 * @param separation axial distance between their planes, m (sign irrelevant)
 * @returns M in H; 0 if a radius is 0; Infinity for coincident circles (a = b, d = 0)
 * Source: J. C. Maxwell, A Treatise on Electricity and Magnetism (1873) §701; Grover (1946) ch. 11;
 * AGM per Abramowitz & Stegun (1964) §17.6.
 */
export function coaxialLoopMutualInductance(radiusA: number, radiusB: number, separation: number): number {
  if (radiusA === 0 || radiusB === 0) return 0;
  const sumSquared = (radiusA + radiusB) * (radiusA + radiusB) + separation * separation;
  const differenceSquared = (radiusA - radiusB) * (radiusA - radiusB) + separation * separation;
  if (differenceSquared === 0) return Number.POSITIVE_INFINITY;
  const m = (4 * radiusA * radiusB) / sumSquared;
  const m1 = differenceSquared / sumSquared;
  // AGM (A&S 17.6): a0 = 1, b0 = √m1; c1 = (a0 − b0)/2 = m / (2 (1 + b0)).
  let a = 1;
  let b = Math.sqrt(m1);
  let c = m / (2 * (1 + b));
  let power = 2; // 2^n for n = 1
  let series = 0; // Σ_{n≥1} 2^n c_n²
  for (let step = 0; step < MAX_AGM_STEPS; step++) {
    const nextA = 0.5 * (a + b);
    const nextB = Math.sqrt(a * b);
    a = nextA;
    b = nextB;
    const term = power * c * c;
    series += term;
    if (term <= 1e-17 * series) break;
    c = (c * c) / (2 * (a + b)); // c_{n+1} = c_n² / (4 a_{n+1}), a_{n+1} = (a_n + b_n)/2
    power *= 2;
  }
  // Finish the AGM so that K = π / (2 AGM) is converged as well.
  for (let step = 0; step < MAX_AGM_STEPS && Math.abs(a - b) > 1e-16 * a; step++) {
    const nextA = 0.5 * (a + b);
    b = Math.sqrt(a * b);
    a = nextA;
  }
  const completeK = Math.PI / (2 * a);
  return (VACUUM_PERMEABILITY * Math.sqrt(radiusA * radiusB) * completeK * series) / Math.sqrt(m);
}
