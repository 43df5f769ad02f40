/**
 * Exact solution of a small lossy network of coupled loops by its normal modes (two or three loops).
 *
 * Loop charges Q (the time integrals of the loop currents I = dQ/dt) obey
 *   L Q'' + R Q' + S Q = 0,
 * L the (symmetric, positive definite) loop inductance matrix, R the loop resistances (diagonal),
 * S the elastance matrix (inverse capacitances, as a capacitor shared by two loops enters it),
 * Kirchhoff's voltage law for loop currents (any circuit-theory text, e.g. [terman1943]). With the
 * state y = [Q, I] the system is dy/dt = A y, so y(t) = Σ_j c_j φ_j e^{s_j t}: the s_j are the 2n
 * roots of det(s² L + s R + S) = 0, the φ_j = [x_j, s_j x_j] with x_j a null vector of
 * s_j² L + s_j R + S, and the c_j solve Σ c_j φ_j = y(0). Standard linear-systems theory, the same
 * method as coupled-modes.ts for two loops: the roots by the Durand–Kerner iteration (E. Durand
 * 1960; I. O. Kerner, Numer. Math. 8, 1966) with Newton polish, started from the lossless modes of
 * the symmetric-definite problem S x = ω² L x [golubvanloan2013]; the complex system by Gaussian
 * elimination with partial pivoting.
 */
import { generalizedSymmetricEigen } from '../resonator/dense-eigen.ts';

/** A network of n coupled loops (n = 2 or 3), SI: matrices row-major n × n. */
export interface LoopNetwork {
  readonly size: number;
  /** L, H (symmetric positive definite). */
  readonly inductance: Float64Array;
  /** R of each loop, Ω (≥ 0). */
  readonly resistance: Float64Array;
  /** S, 1/F (symmetric positive definite). */
  readonly elastance: Float64Array;
}

/** The modal solution: y_c(t) = Re Σ_j amp[j·2n + c] e^{s_j t}, y = [Q (C), I (A)]. */
export interface LoopModes {
  readonly network: LoopNetwork;
  readonly rateRe: Float64Array;
  readonly rateIm: Float64Array;
  readonly ampRe: Float64Array;
  readonly ampIm: Float64Array;
}

/**
 * Lossless normal-mode angular frequencies of the network, ascending, rad/s: ω² the eigenvalues of
 * S x = ω² L x (null when L is not positive definite).
 */
export function losslessLoopFrequencies(network: LoopNetwork): Float64Array | null {
  const eigen = generalizedSymmetricEigen(network.elastance, network.inductance, network.size);
  if (!eigen) return null;
  const out = new Float64Array(network.size);
  for (let j = 0; j < network.size; j++) {
    if (!(eigen.values[j] > 0)) return null;
    out[j] = Math.sqrt(eigen.values[j]);
  }
  return out;
}

/** Stored energy ½ Iᵀ L I + ½ Qᵀ S Q, J, of a state [Q, I]. */
export function loopEnergy(network: LoopNetwork, state: ArrayLike<number>): number {
  const n = network.size;
  let energy = 0;
  for (let a = 0; a < n; a++) {
    for (let b = 0; b < n; b++) {
      energy += 0.5 * network.inductance[a * n + b] * state[n + a] * state[n + b];
      energy += 0.5 * network.elastance[a * n + b] * state[a] * state[b];
    }
  }
  return energy;
}

/**
 * Normal modes of the network from the state y0 = [Q, I], or null when it cannot be decomposed
 * (L or S not positive definite, a repeated eigenvalue, an ill-conditioned mode set).
 * Cost: some tens of microseconds.
 */
export function loopModes(network: LoopNetwork, initial: ArrayLike<number>): LoopModes | null {
  const n = network.size;
  if (n < 2 || n > 3) return null;
  const lossless = losslessLoopFrequencies(network);
  if (!lossless) return null;
  const degree = 2 * n;
  const roots = characteristicRoots(network, lossless);
  if (roots === null) return null;
  const [re, im] = roots;
  // Modal vectors φ_j = [x, s x], x the null vector of Z(s) = s² L + s R + S.
  const vecRe = new Float64Array(degree * degree);
  const vecIm = new Float64Array(degree * degree);
  const zRe = new Float64Array(n * n);
  const zIm = new Float64Array(n * n);
  for (let j = 0; j < degree; j++) {
    const sRe = re[j];
    const sIm = im[j];
    const s2Re = sRe * sRe - sIm * sIm;
    const s2Im = 2 * sRe * sIm;
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) {
        const l = network.inductance[a * n + b];
        const r = a === b ? network.resistance[a] : 0;
        zRe[a * n + b] = s2Re * l + sRe * r + network.elastance[a * n + b];
        zIm[a * n + b] = s2Im * l + sIm * r;
      }
    }
    const [xRe, xIm] = nullVector(zRe, zIm, n);
    for (let a = 0; a < n; a++) {
      vecRe[j * degree + a] = xRe[a];
      vecIm[j * degree + a] = xIm[a];
      vecRe[j * degree + n + a] = sRe * xRe[a] - sIm * xIm[a];
      vecIm[j * degree + n + a] = sRe * xIm[a] + sIm * xRe[a];
    }
  }
  const rhs = Array.from({ length: degree }, (_, c) => initial[c]);
  const coefficients = solveComplex(vecRe, vecIm, rhs, degree);
  if (coefficients === null) return null;
  const ampRe = new Float64Array(degree * degree);
  const ampIm = new Float64Array(degree * degree);
  for (let j = 0; j < degree; j++) {
    const cRe = coefficients[0][j];
    const cIm = coefficients[1][j];
    for (let c = 0; c < degree; c++) {
      ampRe[j * degree + c] = cRe * vecRe[j * degree + c] - cIm * vecIm[j * degree + c];
      ampIm[j * degree + c] = cRe * vecIm[j * degree + c] + cIm * vecRe[j * degree + c];
    }
  }
  if (!reconstructionHolds(network, initial, ampRe, ampIm)) return null;
  return { network, rateRe: re, rateIm: im, ampRe, ampIm };
}

/**
 * The 2n roots s_j of det(s² L + s R + S) = 0 (real and imaginary parts), by the Durand–Kerner
 * iteration started from the lossless modes; null when it fails.
 */
function characteristicRoots(network: LoopNetwork, lossless: Float64Array): [Float64Array, Float64Array] | null {
  const n = network.size;
  const degree = 2 * n;
  // det(s² L + s R + S) by the Leibniz formula on polynomials in s (coefficients, lowest first).
  const entry = (a: number, b: number): number[] => [
    network.elastance[a * n + b],
    a === b ? network.resistance[a] : 0,
    network.inductance[a * n + b],
  ];
  const polynomial = new Array<number>(degree + 1).fill(0);
  for (const [permutation, sign] of permutations(n)) {
    let product = [1];
    for (let a = 0; a < n; a++) product = multiplyPolynomials(product, entry(a, permutation[a]));
    for (let k = 0; k < product.length; k++) polynomial[k] += sign * product[k];
  }
  const leading = polynomial[degree];
  const constant = polynomial[0];
  if (!(leading > 0) || !(constant > 0)) return null;
  // Scale s = σ·w so that the monic polynomial in w has coefficients of order 1.
  const scale = (constant / leading) ** (1 / degree);
  const monic = polynomial.map((value, k) => value / leading / scale ** (degree - k));
  const re = new Float64Array(degree);
  const im = new Float64Array(degree);
  let decay = 0;
  for (let a = 0; a < n; a++) decay += network.resistance[a] / network.inductance[a * n + a];
  decay /= 2 * n * scale;
  for (let j = 0; j < degree; j++) {
    const omega = lossless[j >> 1] * (1 + 1e-4 * (j >> 1)) * (j % 2 === 0 ? 1 : -1);
    re[j] = -decay * (1 + 0.01 * j) - 1e-4 * j;
    im[j] = omega / scale + 1e-5 * (j - degree / 2 + 0.5);
  }
  if (!durandKerner(monic, re, im)) return null;
  for (let j = 0; j < degree; j++) {
    re[j] *= scale;
    im[j] *= scale;
  }
  return [re, im];
}

/**
 * Whether the modal amplitudes rebuild y(0) on the scale of the state's charges and currents (an
 * ill-conditioned, near-repeated mode set does not).
 */
function reconstructionHolds(
  network: LoopNetwork,
  initial: ArrayLike<number>,
  ampRe: Float64Array,
  ampIm: Float64Array,
): boolean {
  const n = network.size;
  const degree = 2 * n;
  // The reconstruction of y(0) on the scale of the state's charges and currents: an
  // ill-conditioned (near-repeated) mode set is refused.
  let chargeScale = 0;
  let currentScale = 0;
  for (let c = 0; c < n; c++) {
    chargeScale = Math.max(chargeScale, Math.abs(initial[c]));
    currentScale = Math.max(currentScale, Math.abs(initial[n + c]));
  }
  const energyScale = Math.sqrt(Math.max(1e-300, 2 * loopEnergy(network, initial)));
  for (let c = 0; c < degree; c++) {
    let sum = 0;
    let magnitude = 0;
    for (let j = 0; j < degree; j++) {
      sum += ampRe[j * degree + c];
      magnitude += Math.hypot(ampRe[j * degree + c], ampIm[j * degree + c]);
    }
    // natural scale of component c: √(2W/S_cc) for a charge, √(2W/L_cc) for a current
    const natural =
      c < n
        ? energyScale / Math.sqrt(network.elastance[c * n + c])
        : energyScale / Math.sqrt(network.inductance[(c - n) * n + (c - n)]);
    const reference = Math.max(natural, c < n ? chargeScale : currentScale);
    if (Math.abs(sum - initial[c]) > 1e-9 * reference || magnitude > 1e6 * reference) return false;
  }
  return true;
}

/** The state [Q, I] of the modal solution at time t, written into `out`. */
export function loopStateAt(modes: LoopModes, time: number, out: Float64Array): Float64Array {
  const degree = modes.rateRe.length;
  out.fill(0);
  for (let j = 0; j < degree; j++) {
    const magnitude = Math.exp(modes.rateRe[j] * time);
    const eRe = magnitude * Math.cos(modes.rateIm[j] * time);
    const eIm = magnitude * Math.sin(modes.rateIm[j] * time);
    for (let c = 0; c < degree; c++) out[c] += modes.ampRe[j * degree + c] * eRe - modes.ampIm[j * degree + c] * eIm;
  }
  return out;
}

/**
 * Marches the modal solution on an even time grid t0 + m·h, one complex multiplication per mode
 * and step (as ModalMarch in coupled-modes.ts).
 */
export class LoopMarch {
  readonly state: Float64Array;
  private readonly phaseRe: Float64Array;
  private readonly phaseIm: Float64Array;
  private readonly stepRe: Float64Array;
  private readonly stepIm: Float64Array;
  time: number;

  constructor(
    private readonly modes: LoopModes,
    startTime: number,
    readonly step: number,
  ) {
    const degree = modes.rateRe.length;
    this.state = new Float64Array(degree);
    this.phaseRe = new Float64Array(degree);
    this.phaseIm = new Float64Array(degree);
    this.stepRe = new Float64Array(degree);
    this.stepIm = new Float64Array(degree);
    this.time = startTime;
    for (let j = 0; j < degree; j++) {
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
    for (let j = 0; j < this.phaseRe.length; j++) {
      const re = this.phaseRe[j] * this.stepRe[j] - this.phaseIm[j] * this.stepIm[j];
      this.phaseIm[j] = this.phaseRe[j] * this.stepIm[j] + this.phaseIm[j] * this.stepRe[j];
      this.phaseRe[j] = re;
    }
    this.time += this.step;
    this.evaluate();
  }

  private evaluate(): void {
    const degree = this.phaseRe.length;
    const { ampRe, ampIm } = this.modes;
    this.state.fill(0);
    for (let j = 0; j < degree; j++) {
      const eRe = this.phaseRe[j];
      const eIm = this.phaseIm[j];
      for (let c = 0; c < degree; c++) this.state[c] += ampRe[j * degree + c] * eRe - ampIm[j * degree + c] * eIm;
    }
  }
}

/** Permutations of 0..n−1 with their signs (n ≤ 3). */
function permutations(n: number): Array<[number[], number]> {
  if (n === 2) {
    return [
      [[0, 1], 1],
      [[1, 0], -1],
    ];
  }
  return [
    [[0, 1, 2], 1],
    [[1, 2, 0], 1],
    [[2, 0, 1], 1],
    [[0, 2, 1], -1],
    [[2, 1, 0], -1],
    [[1, 0, 2], -1],
  ];
}

function multiplyPolynomials(a: readonly number[], b: readonly number[]): number[] {
  const out = new Array<number>(a.length + b.length - 1).fill(0);
  for (let i = 0; i < a.length; i++) for (let j = 0; j < b.length; j++) out[i + j] += a[i] * b[j];
  return out;
}

/**
 * A null vector of the complex n × n matrix z (n = 2 or 3, rank n − 1): for n = 2 the best row
 * (a, b) gives (b, −a); for n = 3 the largest cross product of two rows (the cofactors).
 */
function nullVector(zRe: Float64Array, zIm: Float64Array, n: number): [Float64Array, Float64Array] {
  const outRe = new Float64Array(n);
  const outIm = new Float64Array(n);
  if (n === 2) {
    const row = Math.hypot(zRe[0], zIm[0], zRe[1], zIm[1]) >= Math.hypot(zRe[2], zIm[2], zRe[3], zIm[3]) ? 0 : 1;
    outRe[0] = zRe[row * 2 + 1];
    outIm[0] = zIm[row * 2 + 1];
    outRe[1] = -zRe[row * 2];
    outIm[1] = -zIm[row * 2];
    return [outRe, outIm];
  }
  let best = -1;
  for (const [p, q] of [
    [0, 1],
    [0, 2],
    [1, 2],
  ]) {
    const cRe = new Float64Array(3);
    const cIm = new Float64Array(3);
    for (let c = 0; c < 3; c++) {
      const u = (c + 1) % 3;
      const v = (c + 2) % 3;
      // p_u q_v − p_v q_u
      cRe[c] =
        zRe[p * 3 + u] * zRe[q * 3 + v] -
        zIm[p * 3 + u] * zIm[q * 3 + v] -
        (zRe[p * 3 + v] * zRe[q * 3 + u] - zIm[p * 3 + v] * zIm[q * 3 + u]);
      cIm[c] =
        zRe[p * 3 + u] * zIm[q * 3 + v] +
        zIm[p * 3 + u] * zRe[q * 3 + v] -
        (zRe[p * 3 + v] * zIm[q * 3 + u] + zIm[p * 3 + v] * zRe[q * 3 + u]);
    }
    const size = Math.hypot(cRe[0], cIm[0], cRe[1], cIm[1], cRe[2], cIm[2]);
    if (size > best) {
      best = size;
      outRe.set(cRe);
      outIm.set(cIm);
    }
  }
  return [outRe, outIm];
}

/** Durand–Kerner iteration for the monic polynomial (coefficients lowest first) in place. */
function durandKerner(monic: readonly number[], re: Float64Array, im: Float64Array): boolean {
  const degree = re.length;
  for (let iteration = 0; iteration < 1000; iteration++) {
    let largestChange = 0;
    for (let i = 0; i < degree; i++) {
      const [pRe, pIm] = evaluatePolynomial(monic, re[i], im[i]);
      let dRe = 1;
      let dIm = 0;
      for (let j = 0; j < degree; j++) {
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
    if (iteration === 999 && largestChange > 1e-10) return false;
  }
  const derivative = monic.slice(1).map((value, k) => value * (k + 1));
  for (let i = 0; i < degree; i++) {
    for (let polish = 0; polish < 2; polish++) {
      const [pRe, pIm] = evaluatePolynomial(monic, re[i], im[i]);
      const [dRe, dIm] = evaluatePolynomial(derivative, re[i], im[i]);
      const norm = dRe * dRe + dIm * dIm;
      if (norm === 0) break;
      re[i] -= (pRe * dRe + pIm * dIm) / norm;
      im[i] -= (pIm * dRe - pRe * dIm) / norm;
    }
  }
  for (let i = 0; i < degree; i++) if (!Number.isFinite(re[i]) || !Number.isFinite(im[i])) return false;
  return true;
}

/** Horner evaluation of a real polynomial (lowest first) at x + jy. */
function evaluatePolynomial(coefficients: readonly number[], x: number, y: number): [number, number] {
  let re = 0;
  let im = 0;
  for (let k = coefficients.length - 1; k >= 0; k--) {
    const t = re * x - im * y + coefficients[k];
    im = re * y + im * x;
    re = t;
  }
  return [re, im];
}

/**
 * Solves Σ_j c_j φ_j[c] = rhs[c] for complex c_j, φ mode-major (j·d + c), d × d. Returns [re, im]
 * or null when singular.
 */
function solveComplex(
  vecRe: Float64Array,
  vecIm: Float64Array,
  rhs: readonly number[],
  d: number,
): [Float64Array, Float64Array] | null {
  const w = d + 1;
  const aRe = new Float64Array(d * w);
  const aIm = new Float64Array(d * w);
  for (let c = 0; c < d; c++) {
    let rowScale = 0;
    for (let j = 0; j < d; j++) rowScale = Math.max(rowScale, Math.hypot(vecRe[j * d + c], vecIm[j * d + c]));
    if (rowScale === 0) return null;
    for (let j = 0; j < d; j++) {
      aRe[c * w + j] = vecRe[j * d + c] / rowScale;
      aIm[c * w + j] = vecIm[j * d + c] / rowScale;
    }
    aRe[c * w + d] = rhs[c] / rowScale;
  }
  for (let col = 0; col < d; col++) {
    let pivot = col;
    let best = 0;
    for (let row = col; row < d; row++) {
      const size = Math.hypot(aRe[row * w + col], aIm[row * w + col]);
      if (size > best) {
        best = size;
        pivot = row;
      }
    }
    if (best < 1e-14) return null;
    if (pivot !== col) {
      for (let k = 0; k < w; k++) {
        let t = aRe[col * w + k];
        aRe[col * w + k] = aRe[pivot * w + k];
        aRe[pivot * w + k] = t;
        t = aIm[col * w + k];
        aIm[col * w + k] = aIm[pivot * w + k];
        aIm[pivot * w + k] = t;
      }
    }
    const pRe = aRe[col * w + col];
    const pIm = aIm[col * w + col];
    const pNorm = pRe * pRe + pIm * pIm;
    for (let row = col + 1; row < d; row++) {
      const fRe = (aRe[row * w + col] * pRe + aIm[row * w + col] * pIm) / pNorm;
      const fIm = (aIm[row * w + col] * pRe - aRe[row * w + col] * pIm) / pNorm;
      for (let k = col; k < w; k++) {
        aRe[row * w + k] -= fRe * aRe[col * w + k] - fIm * aIm[col * w + k];
        aIm[row * w + k] -= fRe * aIm[col * w + k] + fIm * aRe[col * w + k];
      }
    }
  }
  const xRe = new Float64Array(d);
  const xIm = new Float64Array(d);
  for (let row = d - 1; row >= 0; row--) {
    let sRe = aRe[row * w + d];
    let sIm = aIm[row * w + d];
    for (let k = row + 1; k < d; k++) {
      sRe -= aRe[row * w + k] * xRe[k] - aIm[row * w + k] * xIm[k];
      sIm -= aRe[row * w + k] * xIm[k] + aIm[row * w + k] * xRe[k];
    }
    const pRe = aRe[row * w + row];
    const pIm = aIm[row * w + row];
    const pNorm = pRe * pRe + pIm * pIm;
    xRe[row] = (sRe * pRe + sIm * pIm) / pNorm;
    xIm[row] = (sIm * pRe - sRe * pIm) / pNorm;
  }
  return [xRe, xIm];
}
