/**
 * Exact solution of the unforced coupled circuit (circuit.ts) by its normal modes.
 *
 * With e = 0 the state y = [v1, v2, i1, i2] obeys the linear system dy/dt = A y, so
 * y(t) = Σ_j c_j φ_j e^{s_j t}: the s_j are the four roots of the characteristic quartic
 *   det [[Z1(s), sM], [sM, Z2(s)]] = 0,  Z_k(s) = s L_k + R_k + 1/(s C_k), i.e.
 *   (L1L2 − M²)s⁴ + (L1R2 + L2R1)s³ + (L1/C2 + L2/C1 + R1R2)s² + (R1/C2 + R2/C1)s + 1/(C1C2) = 0,
 * the φ_j their null vectors (currents (I1, I2) with V_k = I_k/(s C_k)), and the c_j solve
 * Σ c_j φ_j = y(0). Standard linear-systems theory; the roots are found by the Durand–Kerner
 * (Weierstrass) iteration (E. Durand 1960; I. O. Kerner, Numer. Math. 8, 1966) with Newton polish,
 * the 4×4 complex system by Gaussian elimination with partial pivoting. Complex arithmetic is
 * written out on (re, im) pairs.
 */
import type { CoupledCircuit } from './circuit.ts';
import { losslessModeFrequencies } from './circuit.ts';

/** The modal solution: y_c(t) = Re Σ_j (ampRe + j·ampIm)[j·4 + c] · e^{(rateRe_j + j rateIm_j) t}. */
export interface CoupledModes {
  readonly circuit: CoupledCircuit;
  /** Real parts of the four eigenvalues s_j (decay rates, ≤ 0), 1/s. */
  readonly rateRe: Float64Array;
  /** Imaginary parts of the eigenvalues (angular frequencies, rad/s; in ± pairs). */
  readonly rateIm: Float64Array;
  /** Modal amplitudes c_j φ_j, mode-major: index j·4 + component (v1, v2, i1, i2). */
  readonly ampRe: Float64Array;
  readonly ampIm: Float64Array;
}

/**
 * Normal modes of the coupled circuit started with the tank at `initialTankVoltage` and everything
 * else at rest (v2 = i1 = i2 = 0), or null when the system cannot be decomposed (k = 0, k ≥ 1, or
 * a repeated eigenvalue, e.g. exact critical damping).
 * @param circuit lumped values, SI; M must satisfy 0 < M² < L1 L2
 * @param initialTankVoltage v1 at t = 0, V
 * Cost: a few microseconds.
 */
export function coupledModes(circuit: CoupledCircuit, initialTankVoltage: number): CoupledModes | null {
  const rates = modeRates(circuit);
  if (!rates) return null;
  const { vecRe, vecIm } = modeVectors(circuit, rates.rootRe, rates.rootIm);
  // Solve Σ_j c_j φ_j = y0 (4 complex equations, one per component).
  const coefficients = solveComplex4(vecRe, vecIm, [initialTankVoltage, 0, 0, 0]);
  if (coefficients === null) return null;
  const ampRe = new Float64Array(16);
  const ampIm = new Float64Array(16);
  for (let j = 0; j < 4; j++) {
    const cRe = coefficients[0][j];
    const cIm = coefficients[1][j];
    for (let c = 0; c < 4; c++) {
      ampRe[j * 4 + c] = cRe * vecRe[j * 4 + c] - cIm * vecIm[j * 4 + c];
      ampIm[j * 4 + c] = cRe * vecIm[j * 4 + c] + cIm * vecRe[j * 4 + c];
    }
  }
  if (!reconstructsStart(circuit, initialTankVoltage, ampRe, ampIm)) return null;
  return { circuit, rateRe: rates.rootRe, rateIm: rates.rootIm, ampRe, ampIm };
}

/** The four eigenvalues s_j of the loop equations (the roots of their quartic), 1/s; null when there are none. */
function modeRates(circuit: CoupledCircuit): { rootRe: Float64Array; rootIm: Float64Array } | null {
  const { primaryInductance: l1, primaryCapacitance: c1, primaryResistance: r1 } = circuit;
  const { secondaryInductance: l2, secondaryCapacitance: c2, secondaryResistance: r2 } = circuit;
  const m = circuit.mutualInductance;
  const leading = l1 * l2 - m * m;
  if (!(leading > 0) || m === 0 || !(c1 > 0) || !(c2 > 0) || !(l1 > 0) || !(l2 > 0)) return null;
  // Scale s = σ·w with σ = (a0/a4)^{1/4} so that the monic quartic in w has coefficients of order 1.
  const a0 = 1 / (c1 * c2);
  const scale = Math.sqrt(Math.sqrt(a0 / leading));
  const b3 = (l1 * r2 + l2 * r1) / leading / scale;
  const b2 = (l1 / c2 + l2 / c1 + r1 * r2) / leading / (scale * scale);
  const b1 = (r1 / c2 + r2 / c1) / leading / (scale * scale * scale);
  const b0 = 1; // a0 / leading / scale⁴
  const rootRe = new Float64Array(4);
  const rootIm = new Float64Array(4);
  // Start from the lossless modes ±jω± shifted by a mean decay rate, each guess nudged by a
  // different small amount so that no two coincide and conjugate symmetry is broken (the
  // iteration needs distinct starts, and real roots of an overdamped mode need asymmetric ones).
  const [omegaLow, omegaHigh] = losslessModeFrequencies(circuit);
  const decay = (r1 / l1 + r2 / l2) / 4 / scale;
  const guesses = [omegaLow, -omegaLow, omegaHigh * 1.0001, -omegaHigh * 1.0001];
  for (let j = 0; j < 4; j++) {
    rootRe[j] = -decay * (1 + 0.01 * j) - 1e-4 * j;
    rootIm[j] = guesses[j] / scale + 1e-5 * (j - 1.5);
  }
  if (!durandKerner(b3, b2, b1, b0, rootRe, rootIm)) return null;
  for (let j = 0; j < 4; j++) {
    rootRe[j] *= scale;
    rootIm[j] *= scale;
  }
  return { rootRe, rootIm };
}

/**
 * The mode vectors (v1, v2, i1, i2) of the eigenvalues, component-major per mode ([j·4 + c]): the
 * currents the null vector of [[Z1, sM], [sM, Z2]] from its better-conditioned row, V_k = I_k / (s C_k).
 */
function modeVectors(
  circuit: CoupledCircuit,
  rootRe: Float64Array,
  rootIm: Float64Array,
): { vecRe: Float64Array; vecIm: Float64Array } {
  const { primaryInductance: l1, primaryCapacitance: c1, primaryResistance: r1 } = circuit;
  const { secondaryInductance: l2, secondaryCapacitance: c2, secondaryResistance: r2 } = circuit;
  const m = circuit.mutualInductance;
  const vecRe = new Float64Array(16);
  const vecIm = new Float64Array(16);
  for (let j = 0; j < 4; j++) {
    const sRe = rootRe[j];
    const sIm = rootIm[j];
    const sNorm = sRe * sRe + sIm * sIm;
    // 1/s
    const invRe = sRe / sNorm;
    const invIm = -sIm / sNorm;
    const z1Re = sRe * l1 + r1 + invRe / c1;
    const z1Im = sIm * l1 + invIm / c1;
    const z2Re = sRe * l2 + r2 + invRe / c2;
    const z2Im = sIm * l2 + invIm / c2;
    const smRe = sRe * m;
    const smIm = sIm * m;
    let i1Re: number, i1Im: number, i2Re: number, i2Im: number;
    if (z1Re * z1Re + z1Im * z1Im >= z2Re * z2Re + z2Im * z2Im) {
      // row 1: Z1 I1 + sM I2 = 0 → (I1, I2) = (sM, −Z1)
      i1Re = smRe;
      i1Im = smIm;
      i2Re = -z1Re;
      i2Im = -z1Im;
    } else {
      // row 2: sM I1 + Z2 I2 = 0 → (I1, I2) = (−Z2, sM)
      i1Re = -z2Re;
      i1Im = -z2Im;
      i2Re = smRe;
      i2Im = smIm;
    }
    // V_k = I_k / (s C_k)
    vecRe[j * 4 + 0] = (i1Re * invRe - i1Im * invIm) / c1;
    vecIm[j * 4 + 0] = (i1Re * invIm + i1Im * invRe) / c1;
    vecRe[j * 4 + 1] = (i2Re * invRe - i2Im * invIm) / c2;
    vecIm[j * 4 + 1] = (i2Re * invIm + i2Im * invRe) / c2;
    vecRe[j * 4 + 2] = i1Re;
    vecIm[j * 4 + 2] = i1Im;
    vecRe[j * 4 + 3] = i2Re;
    vecIm[j * 4 + 3] = i2Im;
  }
  return { vecRe, vecIm };
}

/** Whether the modal amplitudes rebuild y(0): an ill-conditioned (near-repeated) mode set is refused. */
function reconstructsStart(
  circuit: CoupledCircuit,
  initialTankVoltage: number,
  ampRe: Float64Array,
  ampIm: Float64Array,
): boolean {
  const { primaryInductance: l1, primaryCapacitance: c1 } = circuit;
  const { secondaryInductance: l2, secondaryCapacitance: c2 } = circuit;
  for (let c = 0; c < 4; c++) {
    let sum = 0;
    let magnitude = 0;
    for (let j = 0; j < 4; j++) {
      sum += ampRe[j * 4 + c];
      magnitude += Math.hypot(ampRe[j * 4 + c], ampIm[j * 4 + c]);
    }
    const target = c === 0 ? initialTankVoltage : 0;
    const reference =
      c < 2 ? Math.abs(initialTankVoltage) : Math.abs(initialTankVoltage) * Math.sqrt(Math.max(c1 / l1, c2 / l2));
    if (Math.abs(sum - target) > 1e-9 * reference || magnitude > 1e6 * reference) return false;
  }
  return true;
}

/**
 * The state [v1, v2, i1, i2] (V, A) of the modal solution at time t (s), written into `out`.
 */
export function coupledStateAt(modes: CoupledModes, time: number, out: Float64Array): Float64Array {
  out[0] = 0;
  out[1] = 0;
  out[2] = 0;
  out[3] = 0;
  for (let j = 0; j < 4; j++) {
    const magnitude = Math.exp(modes.rateRe[j] * time);
    const phase = modes.rateIm[j] * time;
    const eRe = magnitude * Math.cos(phase);
    const eIm = magnitude * Math.sin(phase);
    for (let c = 0; c < 4; c++) out[c] += modes.ampRe[j * 4 + c] * eRe - modes.ampIm[j * 4 + c] * eIm;
  }
  return out;
}

/**
 * Marches the modal solution on an even time grid t0 + n·h with one complex multiplication per
 * mode and step (e^{s(t+h)} = e^{st}·e^{sh}); rounding grows by about 1e-16 per step.
 */
export class ModalMarch {
  readonly state = new Float64Array(4);
  private readonly phaseRe = new Float64Array(4);
  private readonly phaseIm = new Float64Array(4);
  private readonly stepRe = new Float64Array(4);
  private readonly stepIm = new Float64Array(4);
  time: number;

  constructor(
    private readonly modes: CoupledModes,
    startTime: number,
    readonly step: number,
  ) {
    this.time = startTime;
    for (let j = 0; j < 4; j++) {
      const magnitude = Math.exp(modes.rateRe[j] * startTime);
      this.phaseRe[j] = magnitude * Math.cos(modes.rateIm[j] * startTime);
      this.phaseIm[j] = magnitude * Math.sin(modes.rateIm[j] * startTime);
      const stepMagnitude = Math.exp(modes.rateRe[j] * step);
      this.stepRe[j] = stepMagnitude * Math.cos(modes.rateIm[j] * step);
      this.stepIm[j] = stepMagnitude * Math.sin(modes.rateIm[j] * step);
    }
    this.evaluate();
  }

  /** Moves one step forward and updates `state`. */
  advance(): void {
    for (let j = 0; j < 4; j++) {
      const re = this.phaseRe[j] * this.stepRe[j] - this.phaseIm[j] * this.stepIm[j];
      this.phaseIm[j] = this.phaseRe[j] * this.stepIm[j] + this.phaseIm[j] * this.stepRe[j];
      this.phaseRe[j] = re;
    }
    this.time += this.step;
    this.evaluate();
  }

  private evaluate(): void {
    const { ampRe, ampIm } = this.modes;
    const out = this.state;
    out[0] = 0;
    out[1] = 0;
    out[2] = 0;
    out[3] = 0;
    for (let j = 0; j < 4; j++) {
      const eRe = this.phaseRe[j];
      const eIm = this.phaseIm[j];
      for (let c = 0; c < 4; c++) out[c] += ampRe[j * 4 + c] * eRe - ampIm[j * 4 + c] * eIm;
    }
  }
}

/** Durand–Kerner iteration for w⁴ + b3w³ + b2w² + b1w + b0 in place; true when converged. */
function durandKerner(b3: number, b2: number, b1: number, b0: number, re: Float64Array, im: Float64Array): boolean {
  for (let iteration = 0; iteration < 500; iteration++) {
    let largestChange = 0;
    for (let i = 0; i < 4; i++) {
      const [pRe, pIm] = quartic(b3, b2, b1, b0, re[i], im[i]);
      let dRe = 1;
      let dIm = 0;
      for (let j = 0; j < 4; j++) {
        if (j === i) continue;
        const xRe = re[i] - re[j];
        const xIm = im[i] - im[j];
        const t = dRe * xRe - dIm * xIm;
        dIm = dRe * xIm + dIm * xRe;
        dRe = t;
      }
      const norm = dRe * dRe + dIm * dIm;
      if (norm === 0) return false;
      const qRe = (pRe * dRe + pIm * dIm) / norm;
      const qIm = (pIm * dRe - pRe * dIm) / norm;
      re[i] -= qRe;
      im[i] -= qIm;
      largestChange = Math.max(largestChange, Math.hypot(qRe, qIm) / Math.max(1e-300, Math.hypot(re[i], im[i])));
    }
    if (largestChange < 1e-15) break;
    if (iteration === 499 && largestChange > 1e-10) return false;
  }
  // Newton polish on each root.
  for (let i = 0; i < 4; i++) {
    for (let polish = 0; polish < 2; polish++) {
      const [pRe, pIm] = quartic(b3, b2, b1, b0, re[i], im[i]);
      const [dRe, dIm] = quarticDerivative(b3, b2, b1, re[i], im[i]);
      const norm = dRe * dRe + dIm * dIm;
      if (norm === 0) break;
      re[i] -= (pRe * dRe + pIm * dIm) / norm;
      im[i] -= (pIm * dRe - pRe * dIm) / norm;
    }
  }
  for (let i = 0; i < 4; i++) if (!Number.isFinite(re[i]) || !Number.isFinite(im[i])) return false;
  return true;
}

/** Horner evaluation of the monic quartic at w = x + jy. */
function quartic(b3: number, b2: number, b1: number, b0: number, x: number, y: number): [number, number] {
  let re = 1;
  let im = 0;
  for (const coefficient of [b3, b2, b1, b0]) {
    const t = re * x - im * y + coefficient;
    im = re * y + im * x;
    re = t;
  }
  return [re, im];
}

/** Derivative 4w³ + 3b3w² + 2b2w + b1 at w = x + jy. */
function quarticDerivative(b3: number, b2: number, b1: number, x: number, y: number): [number, number] {
  let re = 4;
  let im = 0;
  for (const coefficient of [3 * b3, 2 * b2, b1]) {
    const t = re * x - im * y + coefficient;
    im = re * y + im * x;
    re = t;
  }
  return [re, im];
}

/**
 * Solves Σ_j c_j φ_j[c] = rhs[c] for complex c_j, φ given mode-major (j·4 + c). Returns [re[], im[]]
 * or null when singular.
 */
function solveComplex4(vecRe: Float64Array, vecIm: Float64Array, rhs: number[]): [Float64Array, Float64Array] | null {
  // Augmented matrix A[row=c][col=j], 4 × 5.
  const aRe = new Float64Array(20);
  const aIm = new Float64Array(20);
  for (let c = 0; c < 4; c++) {
    // Row scaling: voltages and currents differ by orders of magnitude.
    let rowScale = 0;
    for (let j = 0; j < 4; j++) rowScale = Math.max(rowScale, Math.hypot(vecRe[j * 4 + c], vecIm[j * 4 + c]));
    if (rowScale === 0) return null;
    for (let j = 0; j < 4; j++) {
      aRe[c * 5 + j] = vecRe[j * 4 + c] / rowScale;
      aIm[c * 5 + j] = vecIm[j * 4 + c] / rowScale;
    }
    aRe[c * 5 + 4] = rhs[c] / rowScale;
    aIm[c * 5 + 4] = 0;
  }
  for (let col = 0; col < 4; col++) {
    let pivot = col;
    let best = 0;
    for (let row = col; row < 4; row++) {
      const size = Math.hypot(aRe[row * 5 + col], aIm[row * 5 + col]);
      if (size > best) {
        best = size;
        pivot = row;
      }
    }
    if (best < 1e-14) return null;
    if (pivot !== col) {
      for (let k = 0; k < 5; k++) {
        let t = aRe[col * 5 + k];
        aRe[col * 5 + k] = aRe[pivot * 5 + k];
        aRe[pivot * 5 + k] = t;
        t = aIm[col * 5 + k];
        aIm[col * 5 + k] = aIm[pivot * 5 + k];
        aIm[pivot * 5 + k] = t;
      }
    }
    const pRe = aRe[col * 5 + col];
    const pIm = aIm[col * 5 + col];
    const pNorm = pRe * pRe + pIm * pIm;
    for (let row = col + 1; row < 4; row++) {
      // factor = A[row][col] / pivot
      const fRe = (aRe[row * 5 + col] * pRe + aIm[row * 5 + col] * pIm) / pNorm;
      const fIm = (aIm[row * 5 + col] * pRe - aRe[row * 5 + col] * pIm) / pNorm;
      for (let k = col; k < 5; k++) {
        aRe[row * 5 + k] -= fRe * aRe[col * 5 + k] - fIm * aIm[col * 5 + k];
        aIm[row * 5 + k] -= fRe * aIm[col * 5 + k] + fIm * aRe[col * 5 + k];
      }
    }
  }
  const xRe = new Float64Array(4);
  const xIm = new Float64Array(4);
  for (let row = 3; row >= 0; row--) {
    let sRe = aRe[row * 5 + 4];
    let sIm = aIm[row * 5 + 4];
    for (let k = row + 1; k < 4; k++) {
      sRe -= aRe[row * 5 + k] * xRe[k] - aIm[row * 5 + k] * xIm[k];
      sIm -= aRe[row * 5 + k] * xIm[k] + aIm[row * 5 + k] * xRe[k];
    }
    const pRe = aRe[row * 5 + row];
    const pIm = aIm[row * 5 + row];
    const pNorm = pRe * pRe + pIm * pIm;
    xRe[row] = (sRe * pRe + sIm * pIm) / pNorm;
    xIm[row] = (sIm * pRe - sRe * pIm) / pNorm;
  }
  return [xRe, xIm];
}
