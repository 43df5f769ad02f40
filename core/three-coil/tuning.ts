/**
 * The tuning of a three-coil system for complete transfer [bieniosek1990] (refs §8.5).
 *
 * Complete transfer of a charged tank's energy onto the resonator's top at t = π/ω_low needs four
 * conditions: the lossless mode frequencies in the ratio 1:2:3, and the tank and the junction empty
 * at that time. Solved in closed form (refs §8.5, derived; checked by Newton's method on the four
 * conditions in test/reference/dynamics-three-coil.test.ts), with ω_a = 1/√(L1C1),
 * ω_b = 1/√(L2C2), ω_c = 1/√(L3C3) and k = M/√(L1L2):
 *   k² = 5/11,  ω_b²/ω_a² = 33/32,  ω_c²/ω_a² = 11/6,  C3/C2 = 15/32,
 * and then ω_low = √(11/24)·ω_a. The tap moves L1 and k together and the line moves C2 (and L3
 * slightly): two knobs for four conditions. The tuner therefore aims at the quantity the four
 * conditions make whole, the lossless fraction of the energy on C3 at π/ω_low, and comes as near it
 * "as far as the geometry allows"; the targets above tell the builder what the rest needs.
 */
import { generalizedSymmetricEigen } from '../resonator/dense-eigen.ts';
import { losslessLoopFrequencies } from '../dynamics/loop-modes.ts';
import { type ThreeCoilCircuit, threeCoilNetwork } from '../dynamics/three-coil.ts';

/** The closed-form complete-transfer targets of the 1:2:3 tuning (refs §8.5, derived). */
export const COMPLETE_TRANSFER = {
  couplingSquared: 5 / 11,
  /** (ω_b/ω_a)² = L1C1 / (L2C2). */
  driverFrequencyRatioSquared: 33 / 32,
  /** (ω_c/ω_a)² = L1C1 / (L3C3). */
  resonatorFrequencyRatioSquared: 11 / 6,
  /** C3/C2. */
  capacitanceRatio: 15 / 32,
} as const;

/** √((f2/f1 − 2)² + (f3/f1 − 3)²) of the lossless circuit, or null when its modes cannot be found. */
export function threeCoilRatioError(circuit: ThreeCoilCircuit): number | null {
  const omega = losslessLoopFrequencies(threeCoilNetwork(circuit));
  if (!omega) return null;
  return Math.hypot(omega[1] / omega[0] - 2, omega[2] / omega[0] - 3);
}

/**
 * Fraction of a charged tank's energy ½C1V² that sits on C3 (½C3v3²) at t = π/ω_low in the
 * lossless circuit (resistances ignored): 1 at complete transfer. By the lossless normal modes
 * (standard linear-systems theory): Q(t) = Σ_j x_j (x_jᵀ L Q0) cos ω_j t, with S x = ω² L x and
 * xᵀ L x = 1. Null when the modes cannot be found.
 */
export function losslessTransferFraction(circuit: ThreeCoilCircuit): number | null {
  const network = threeCoilNetwork(circuit);
  const eigen = generalizedSymmetricEigen(network.elastance, network.inductance, 3);
  if (!eigen || !(eigen.values[0] > 0)) return null;
  const time = Math.PI / Math.sqrt(eigen.values[0]);
  const l = network.inductance;
  const c1 = circuit.primaryCapacitance;
  let q3 = 0;
  for (let j = 0; j < 3; j++) {
    if (!(eigen.values[j] > 0)) return null;
    const x0 = eigen.vectors[j];
    const x1 = eigen.vectors[3 + j];
    const x2 = eigen.vectors[6 + j];
    // x_jᵀ L Q0 with Q0 = (C1·1 V, 0, 0)
    const weight = (x0 * l[0] + x1 * l[3] + x2 * l[6]) * c1;
    q3 += x2 * weight * Math.cos(Math.sqrt(eigen.values[j]) * time);
  }
  const fraction = (q3 * q3) / (circuit.resonatorCapacitance * c1);
  return Number.isFinite(fraction) ? fraction : null;
}

/**
 * The x in [low, high] with the largest f(x): a scan of `count` points (log-spaced when `log`),
 * then golden-section refinement between the best point's neighbours. Null when f is nowhere finite.
 */
function scanMaximum(
  low: number,
  high: number,
  count: number,
  refinements: number,
  log: boolean,
  f: (x: number) => number | null,
): { at: number; value: number } | null {
  const value = (x: number) => f(x) ?? Number.NEGATIVE_INFINITY;
  const to = (u: number) => (log ? Math.exp(u) : u);
  const a = log ? Math.log(low) : low;
  const b = log ? Math.log(high) : high;
  const step = (b - a) / count;
  let bestU = b;
  let best = value(high);
  for (let k = 0; k < count; k++) {
    const u = a + k * step;
    const v = value(to(u));
    if (v > best) {
      best = v;
      bestU = u;
    }
  }
  if (!Number.isFinite(best)) return null;
  if (step > 0) {
    const ratio = (Math.sqrt(5) - 1) / 2;
    let lo = Math.max(a, bestU - step);
    let hi = Math.min(b, bestU + step);
    for (let iteration = 0; iteration < refinements; iteration++) {
      const p = hi - ratio * (hi - lo);
      const q = lo + ratio * (hi - lo);
      if (value(to(p)) > value(to(q))) hi = q;
      else lo = p;
    }
    const refined = value(to(0.5 * (lo + hi)));
    if (refined > best) return { at: to(0.5 * (lo + hi)), value: refined };
  }
  return { at: to(bestU), value: best };
}

/**
 * The tap in [lowest, turns] with the largest lossless transfer fraction: a scan of 200 taps,
 * then golden-section refinement around the best.
 * @param circuitAt the lossless circuit at a tap (its L1 and M follow the tap)
 */
export function threeCoilTap(
  lowest: number,
  turns: number,
  circuitAt: (tap: number) => ThreeCoilCircuit,
): { tapTurns: number; transferFraction: number } | null {
  const best = scanMaximum(lowest, turns, 200, 40, false, (tap) => losslessTransferFraction(circuitAt(tap)));
  return best ? { tapTurns: best.at, transferFraction: best.value } : null;
}

/**
 * The line length in [shortest, longest] whose lossless transfer fraction (at its own best tap, as
 * `transferAt` gives it) is largest: a scan of 40 log-spaced lengths, then golden-section
 * refinement; null when no length gives modes.
 */
export function bestLineLength(
  shortest: number,
  longest: number,
  transferAt: (length: number) => number | null,
): { length: number; transferFraction: number } | null {
  if (!(shortest > 0) || !(longest > shortest)) return null;
  const best = scanMaximum(shortest, longest, 40, 30, true, transferAt);
  return best ? { length: best.at, transferFraction: best.value } : null;
}
