/**
 * A tank capacitor assembled from identical parts: n_s in series per string, n_p strings in
 * parallel, one bleed resistor across each part.
 *
 * - Counts: n_s = ⌈margin · V_work / V_part⌉ (the part's DC rating against the largest tank voltage
 *   of either polarity, the reversal of the ringing primary included; margin 2 by default, common
 *   practice [bank-practice]); n_p = max(1, round(C_target · n_s / C_part)); the bank's capacitance
 *   C = n_p·C_part/n_s (series and parallel capacitors, exact).
 * - Bleeders: each part's bleeder discharges its own part, so the whole bank decays with
 *   τ = R·C_part; below V_safe within t when R ≤ t / (C_part · ln(V_work / V_safe)); each dissipates
 *   (V_work/n_s)²/R at the working voltage (Ohm and Joule, exact).
 * - Currents: every part of a string carries the string's current, i1/n_p; its rms over the shots is
 *   √(BPS · ∫ i1² dt)/n_p, the integral over one shot (rms of a repetitive pulse, exact).
 */
import type { CoupledModes } from '../dynamics/coupled-modes.ts';

/** Default ratio of the part's rating to its working voltage (common practice, [bank-practice]). */
export const DEFAULT_VOLTAGE_MARGIN = 2;
/** Bank voltage the bleeders must reach, V (common practice, [bank-practice]). */
export const BLEED_SAFE_VOLTAGE = 50;
/** Time in which the bleeders bring the bank below BLEED_SAFE_VOLTAGE when none is given, s (common practice, [bank-practice]). */
export const DEFAULT_BLEED_TIME = 60;

/** The part and the layout asked for, SI. */
export interface BankPart {
  capacitance: number;
  voltageRating: number;
  rmsCurrentRating: number;
  peakCurrentRating?: number;
}

export interface BankLayout {
  series: number;
  parallel: number;
  capacitance: number;
  partCount: number;
}

/**
 * The series and parallel counts, given (a positive integer) or chosen (undefined).
 * @param workingVoltage largest tank voltage of either polarity, V
 */
export function bankLayout(
  part: BankPart,
  targetCapacitance: number,
  workingVoltage: number,
  margin: number,
  series?: number,
  parallel?: number,
): BankLayout {
  const ns = series ?? Math.max(1, Math.ceil((margin * workingVoltage) / part.voltageRating - 1e-12));
  const np = parallel ?? Math.max(1, Math.round((targetCapacitance * ns) / part.capacitance));
  return { series: ns, parallel: np, capacitance: (np * part.capacitance) / ns, partCount: ns * np };
}

/** Largest bleeder resistance per part that brings the bank from V_work below V_safe within t, Ω; null when V_work ≤ V_safe. */
export function bleederResistance(
  partCapacitance: number,
  workingVoltage: number,
  time: number,
  safeVoltage = BLEED_SAFE_VOLTAGE,
): number | null {
  if (!(workingVoltage > safeVoltage) || !(partCapacitance > 0) || !(time > 0)) return null;
  return time / (partCapacitance * Math.log(workingVoltage / safeVoltage));
}

/**
 * ∫₀ᵀ i1(t)² dt over the modal solution, A²·s, in closed form (T = Infinity: the whole decay).
 * With z(t) = Σ a_j e^{s_j t} and i1 = Re z: i1² = ½(Re z² + |z|²), and
 * ∫₀ᵀ e^{σt} dt = (e^{σT} − 1)/σ (→ T as σ → 0) for each pair of modes (exact).
 */
export function primaryCurrentSquaredIntegral(modes: CoupledModes, end: number): number {
  const component = 2; // i1
  let realSquare = 0; // Re ∫ z²
  let modulus = 0; // ∫ |z|²
  for (let j = 0; j < 4; j++) {
    const ajRe = modes.ampRe[j * 4 + component];
    const ajIm = modes.ampIm[j * 4 + component];
    for (let k = 0; k < 4; k++) {
      const akRe = modes.ampRe[k * 4 + component];
      const akIm = modes.ampIm[k * 4 + component];
      // a_j a_k with σ = s_j + s_k
      const [pRe, pIm] = [ajRe * akRe - ajIm * akIm, ajRe * akIm + ajIm * akRe];
      const [iRe, iIm] = exponentialIntegral(modes.rateRe[j] + modes.rateRe[k], modes.rateIm[j] + modes.rateIm[k], end);
      realSquare += pRe * iRe - pIm * iIm;
      // a_j conj(a_k) with σ = s_j + conj(s_k)
      const [qRe, qIm] = [ajRe * akRe + ajIm * akIm, ajIm * akRe - ajRe * akIm];
      const [jRe, jIm] = exponentialIntegral(modes.rateRe[j] + modes.rateRe[k], modes.rateIm[j] - modes.rateIm[k], end);
      modulus += qRe * jRe - qIm * jIm;
    }
  }
  return 0.5 * (realSquare + modulus);
}

/** ∫₀ᵀ e^{σt} dt for complex σ = re + j·im, as [re, im]; T = Infinity needs re < 0. */
function exponentialIntegral(re: number, im: number, end: number): [number, number] {
  const norm = re * re + im * im;
  if (!Number.isFinite(end)) {
    if (!(re < 0)) return [Number.POSITIVE_INFINITY, 0];
    return [-re / norm, im / norm]; // −1/σ
  }
  const x = re * end;
  const y = im * end;
  if (Math.hypot(x, y) < 1e-6) {
    // series: T (1 + σT/2 + (σT)²/6)
    const sq = [x * x - y * y, 2 * x * y];
    return [end * (1 + x / 2 + sq[0] / 6), end * (y / 2 + sq[1] / 6)];
  }
  const magnitude = Math.exp(x);
  const numRe = magnitude * Math.cos(y) - 1;
  const numIm = magnitude * Math.sin(y);
  // (num)/σ
  return [(numRe * re + numIm * im) / norm, (numIm * re - numRe * im) / norm];
}
