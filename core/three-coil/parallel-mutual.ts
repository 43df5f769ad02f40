/**
 * Mutual inductance of two circular filaments with parallel axes a distance d apart, and of two
 * side-by-side solenoids made of such filaments, for the driver–resonator separation of a
 * three-coil system.
 *
 * The flux of loop A through loop B is the line integral of A's vector potential around B
 * (Stokes). A's vector potential is azimuthal about A's axis, and 2πρ A_φ(ρ, z) is the flux
 * through the coaxial circle of radius ρ at height z, i.e. Maxwell's coaxial mutual inductance
 * M_coax(a, ρ, z) (coaxial-loops.ts; Maxwell 1873 §701). On B, at angle φ around B's centre
 * (d, 0, h), ρ² = d² + b² + 2db cos φ and A·dl = A_φ b (b + d cos φ)/ρ dφ, so
 *   M = ∫₀^{2π} M_coax(a, ρ(φ), h) · b (b + d cos φ) / (2π ρ²) dφ,
 * exact; at d = 0 it is M_coax(a, b, h). The integrand is smooth and periodic, so the trapezoid
 * rule converges geometrically (Trefethen & Weideman 2014, from memory).
 */
import { coaxialLoopMutualInductance } from '../inductance/coaxial-loops.ts';

/**
 * M between a loop of radius `a` (centre on the z axis, z = 0) and a loop of radius `b` centred at
 * (d, 0, h) with a parallel axis, H. `points` trapezoid nodes (64 by default).
 */
export function parallelLoopMutualInductance(a: number, b: number, d: number, h: number, points = 64): number {
  if (d === 0) return coaxialLoopMutualInductance(a, b, h);
  let sum = 0;
  for (let k = 0; k < points; k++) {
    const phi = (2 * Math.PI * k) / points;
    const cos = Math.cos(phi);
    const rho2 = d * d + b * b + 2 * d * b * cos;
    if (rho2 === 0) continue; // the loop passes through A's axis: A_φ·ρ → 0 there
    sum += (coaxialLoopMutualInductance(a, Math.sqrt(rho2), h) * b * (b + d * cos)) / rho2;
  }
  return sum / points; // (2π / points) · Σ / (2π)
}

/** A vertical solenoid standing on the floor: axis position x, radius, bottom and top heights, turns. */
export interface StandingWinding {
  x: number;
  radius: number;
  bottomZ: number;
  topZ: number;
  turns: number;
}

/**
 * M between two side-by-side solenoids, H: each as `loops` filaments at the centres of equal
 * sections carrying turns/loops turns each (the midpoint rule in height; converged when the axes
 * are farther apart than the windings are long, as here).
 */
export function parallelSolenoidMutualInductance(one: StandingWinding, other: StandingWinding, loops = 8): number {
  const d = Math.abs(other.x - one.x);
  let sum = 0;
  const dz1 = (one.topZ - one.bottomZ) / loops;
  const dz2 = (other.topZ - other.bottomZ) / loops;
  for (let i = 0; i < loops; i++) {
    const z1 = one.bottomZ + (i + 0.5) * dz1;
    for (let j = 0; j < loops; j++) {
      const z2 = other.bottomZ + (j + 0.5) * dz2;
      sum += parallelLoopMutualInductance(one.radius, other.radius, d, z2 - z1, 48);
    }
  }
  return (sum * one.turns * other.turns) / (loops * loops);
}

/**
 * The smallest axis distance at which |M(d)|/√(L_one L_other) falls below `target` (a coupling),
 * m, by bisection on log d from the windings touching outward; null when not found within 1 km.
 */
export function separationForCoupling(
  one: StandingWinding & { inductance: number },
  other: StandingWinding & { inductance: number },
  target: number,
): number | null {
  const norm = Math.sqrt(one.inductance * other.inductance);
  const coupling = (d: number) => Math.abs(parallelSolenoidMutualInductance(one, { ...other, x: one.x + d })) / norm;
  let low = one.radius + other.radius;
  if (coupling(low) <= target) return low;
  let high = 2 * low;
  while (coupling(high) > target) {
    low = high;
    high *= 2;
    if (high > 1000) return null;
  }
  for (let iteration = 0; iteration < 20; iteration++) {
    const middle = Math.sqrt(low * high);
    if (coupling(middle) > target) low = middle;
    else high = middle;
  }
  return high;
}
