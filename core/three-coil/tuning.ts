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

/** Scratch of the closed-form modes: A = R⁻¹SR⁻ᵀ, R (lower Cholesky factor of L), the values and vectors. */
const scratchA = new Float64Array(9);
const scratchR = new Float64Array(9);
const scratchValues = new Float64Array(3);
const scratchVectors = new Float64Array(9);

/**
 * The lossless normal modes of the three-coil circuit in closed form: S x = ω² L x with
 * L = [[L1, M, 0], [M, L2, 0], [0, 0, L3]] and S the elastance of `threeCoilNetwork`. L = R Rᵀ
 * (Cholesky), A = R⁻¹ S R⁻ᵀ (symmetric), its eigenvalues by the trigonometric solution of the
 * characteristic cubic of a symmetric 3×3 matrix [smith1961], each eigenvector y the largest cross
 * product of two rows of A − λI, normalised, and x = R⁻ᵀ y (so that xᵀ L x = 1). Values ascending
 * into `scratchValues`, vector j's component i at `scratchVectors[3i + j]` (the layout of
 * generalizedSymmetricEigen). False when L is not positive definite or a mode is degenerate.
 */
function closedFormModes(circuit: ThreeCoilCircuit): boolean {
  const l1 = circuit.primaryInductance;
  const m = circuit.mutualInductance;
  const l2 = circuit.driverInductance;
  const l3 = circuit.resonatorInductance;
  const r00 = Math.sqrt(l1);
  const r10 = m / r00;
  const d11 = l2 - r10 * r10;
  if (!(r00 > 0) || !(d11 > 0) || !(l3 > 0)) return false;
  const r11 = Math.sqrt(d11);
  const r22 = Math.sqrt(l3);
  const s00 = 1 / circuit.primaryCapacitance;
  const c2 = 1 / circuit.junctionCapacitance;
  const s22 = c2 + 1 / circuit.resonatorCapacitance;
  // Rows of R⁻¹ (lower): [1/r00, 0, 0], [−r10/(r00 r11), 1/r11, 0], [0, 0, 1/r22].
  const i00 = 1 / r00;
  const i10 = -r10 / (r00 * r11);
  const i11 = 1 / r11;
  const i22 = 1 / r22;
  // A = R⁻¹ S R⁻ᵀ with S = [[s00, 0, 0], [0, c2, −c2], [0, −c2, s22]].
  const a00 = i00 * i00 * s00;
  const a01 = i00 * i10 * s00;
  const a11 = i10 * i10 * s00 + i11 * i11 * c2;
  const a02 = 0;
  const a12 = -i11 * i22 * c2;
  const a22 = i22 * i22 * s22;
  scratchR.set([r00, 0, 0, r10, r11, 0, 0, 0, r22]);
  scratchA.set([a00, a01, a02, a01, a11, a12, a02, a12, a22]);
  // Eigenvalues [smith1961]: q = tr/3, p = √(‖A − qI‖²_F / 6), B = (A − qI)/p, cos 3φ = det(B)/2.
  const q = (a00 + a11 + a22) / 3;
  const off = a01 * a01 + a02 * a02 + a12 * a12;
  const p = Math.sqrt(((a00 - q) ** 2 + (a11 - q) ** 2 + (a22 - q) ** 2 + 2 * off) / 6);
  if (!(p > 0)) return false;
  const b00 = (a00 - q) / p;
  const b11 = (a11 - q) / p;
  const b22 = (a22 - q) / p;
  const b01 = a01 / p;
  const b02 = a02 / p;
  const b12 = a12 / p;
  const det = b00 * (b11 * b22 - b12 * b12) - b01 * (b01 * b22 - b12 * b02) + b02 * (b01 * b12 - b11 * b02);
  const phi = Math.acos(Math.min(1, Math.max(-1, det / 2))) / 3;
  const largest = q + 2 * p * Math.cos(phi);
  const smallest = q + 2 * p * Math.cos(phi + (2 * Math.PI) / 3);
  scratchValues[0] = smallest;
  scratchValues[1] = 3 * q - largest - smallest;
  scratchValues[2] = largest;
  for (let j = 0; j < 3; j++) if (!modeVector(scratchValues[j], j)) return false;
  return true;
}

/** Eigenvector j of scratchA for λ, mapped back by R⁻ᵀ into scratchVectors (see closedFormModes). */
function modeVector(lambda: number, j: number): boolean {
  const a = scratchA;
  const rows = [
    [a[0] - lambda, a[1], a[2]],
    [a[3], a[4] - lambda, a[5]],
    [a[6], a[7], a[8] - lambda],
  ];
  let best = [0, 0, 0];
  let bestNorm = 0;
  for (const [u, v] of [
    [0, 1],
    [0, 2],
    [1, 2],
  ] as const) {
    const x = rows[u];
    const y = rows[v];
    const cross = [x[1] * y[2] - x[2] * y[1], x[2] * y[0] - x[0] * y[2], x[0] * y[1] - x[1] * y[0]];
    const norm = Math.hypot(cross[0], cross[1], cross[2]);
    if (norm > bestNorm) {
      bestNorm = norm;
      best = cross;
    }
  }
  if (!(bestNorm > 0)) return false;
  const y0 = best[0] / bestNorm;
  const y1 = best[1] / bestNorm;
  const y2 = best[2] / bestNorm;
  // x = R⁻ᵀ y: back substitution with Rᵀ (upper: [r00, r10, 0], [0, r11, 0], [0, 0, r22]).
  const r = scratchR;
  const x2 = y2 / r[8];
  const x1 = y1 / r[4];
  const x0 = (y0 - r[3] * x1) / r[0];
  scratchVectors[j] = x0;
  scratchVectors[3 + j] = x1;
  scratchVectors[6 + j] = x2;
  return true;
}

/**
 * Fraction of a charged tank's energy ½C1V² that sits on C3 (½C3v3²) at t = π/ω_low in the
 * lossless circuit (resistances ignored): 1 at complete transfer. By the lossless normal modes
 * (standard linear-systems theory): Q(t) = Σ_j x_j (x_jᵀ L Q0) cos ω_j t, with S x = ω² L x and
 * xᵀ L x = 1, the modes in closed form (`closedFormModes`; the general dense solver of
 * resonator/dense-eigen.ts when the closed form does not apply). Null when the modes cannot be found.
 */
export function losslessTransferFraction(circuit: ThreeCoilCircuit): number | null {
  let values: ArrayLike<number>;
  let vectors: ArrayLike<number>;
  if (closedFormModes(circuit)) {
    values = scratchValues;
    vectors = scratchVectors;
  } else {
    const network = threeCoilNetwork(circuit);
    const eigen = generalizedSymmetricEigen(network.elastance, network.inductance, 3);
    if (!eigen) return null;
    values = eigen.values;
    vectors = eigen.vectors;
  }
  if (!(values[0] > 0)) return null;
  const time = Math.PI / Math.sqrt(values[0]);
  const c1 = circuit.primaryCapacitance;
  const l1 = circuit.primaryInductance;
  const m = circuit.mutualInductance;
  let q3 = 0;
  for (let j = 0; j < 3; j++) {
    if (!(values[j] > 0)) return null;
    const x0 = vectors[j];
    const x1 = vectors[3 + j];
    const x2 = vectors[6 + j];
    // x_jᵀ L Q0 with Q0 = (C1·1 V, 0, 0): (x0·L1 + x1·M)·C1
    const weight = (x0 * l1 + x1 * m) * c1;
    q3 += x2 * weight * Math.cos(Math.sqrt(values[j]) * time);
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
