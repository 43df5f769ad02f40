/**
 * Self-inductance of a circular loop of round wire.
 */
import type { CurrentDistribution } from './current-distribution.ts';
import { VACUUM_PERMEABILITY } from './vacuum.ts';

/**
 * Self-inductance of a circular loop of round wire, H:
 * uniform current (DC): L = μ0 a [ln(8a/ρ) − 7/4]; surface current (HF): L = μ0 a [ln(8a/ρ) − 2].
 * The two differ by the wire's internal inductance μ0 a / 4.
 * @param radius loop radius to the wire's centre line, m
 * @param wireRadius radius ρ of the wire (for a tube: its outer radius, with 'surface'), m
 * @param distribution 'uniform' or 'surface' (see current-distribution.ts)
 * Valid for ρ ≪ a (leading terms of the expansion in ρ/a; relative error of order (ρ/a)²).
 * Source: Grover (1946) ch. 13 / Rosa (1908), standard; consistent with the GMD method
 * (GMD of a round wire: ρ e^(−1/4) uniform, ρ surface).
 */
export function loopSelfInductance(radius: number, wireRadius: number, distribution: CurrentDistribution): number {
  const constant = distribution === 'uniform' ? 1.75 : 2;
  return VACUUM_PERMEABILITY * radius * (Math.log((8 * radius) / wireRadius) - constant);
}
