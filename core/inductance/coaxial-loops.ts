/**
 * Mutual inductance of two coaxial circular filaments (Maxwell's formula).
 */
import { agmSeries } from '../elliptic.ts';
import { VACUUM_PERMEABILITY } from './vacuum.ts';

/**
 * Mutual inductance of two coaxial circles, H:
 * M = μ0 √(ab) [(2/k − k) K(m) − (2/k) E(m)], m = k² = 4ab / ((a + b)² + d²).
 *
 * Computed without cancellation at any distance: the bracket equals (1/k)((2 − m)K − 2E) =
 * (K/k) Σ_{n≥1} 2^n c_n² over the AGM sequence (agm-series.ts), the n = 0 term cancelling
 * analytically, not numerically; m1 = ((a − b)² + d²)/((a + b)² + d²) is formed directly, so the
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
  const { completeK, tail } = agmSeries(m, m1); // bracket = (K/k) · tail
  return (VACUUM_PERMEABILITY * Math.sqrt(radiusA * radiusB) * completeK * tail) / Math.sqrt(m);
}
