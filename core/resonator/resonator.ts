/**
 * The winding as a distributed resonator: a quasi-static ladder of n axial segments.
 *
 * Unknowns: the voltages v_1 … v_n of the nodes between segments (node 0, the base, grounded; node n
 * the top, where the topload and any streamer load sit) and the segment currents i_1 … i_n
 * (segment k runs from node k − 1 to node k). With the segment inductance matrix L (mutuals
 * included) and the Maxwell capacitance matrix C of the nodes (charges q = C v):
 *   L di/dt = −Dᵀ v  (the drop across each segment),   C dv/dt = D i  (charge conservation),
 * D the n × n incidence matrix (D_kk = 1, D_k,k+1 = −1: current in from below, out above). So
 *   ω² C v = K v,  K = D L⁻¹ Dᵀ,
 * a symmetric-definite generalised eigenproblem (solved in standard form, see solveResonator). It is the lumped-element
 * (Kirchhoff) discretisation of the multiconductor-line model of a coil with the full mutual
 * inductance and capacitance of every part to every other [paul2008] ch. 4–5; a uniform line gives
 * the quarter-wave ladder, a dominant top capacitance gives Thomson's 1/(2π√(L C)).
 *
 * Equivalent lumped values at the top (for the fundamental, top voltage V): the capacitance that
 * stores the same energy, C_eff = vᵀ C v / V², and L_eff = 1/(ω² C_eff), which gives the same
 * frequency; with the mode's peak current amplitudes i = L⁻¹ Dᵀ v / ω the magnetic energy ½ iᵀ L i
 * equals ½ C_eff V² (energy balance, checked in the tests). The effective current is
 * I_eff = √(iᵀ L i / L_eff) and the effective mutual to another circuit whose mutuals to the
 * segments are m_k is M_eff = |m · i| / I_eff (same flux linkage for the same energy).
 */
import {
  applyReflections,
  backSubstituteTransposed,
  choleskyFactor,
  tridiagonalEigenvalues,
  tridiagonalEigenvector,
  tridiagonalize,
} from './dense-eigen.ts';

/** The ladder's inputs, SI, row-major matrices. */
export interface LadderMatrices {
  /** n × n segment inductance matrix, H (segment 1 at the base). */
  inductance: Float64Array;
  /** n × n Maxwell capacitance matrix of nodes 1 … n, F (the topload already folded into node n). */
  capacitance: Float64Array;
  /** n + 1 node heights as fractions of the winding length (0 first, 1 last). */
  fractions: ArrayLike<number>;
  /** Winding length, m (for gradients). */
  length: number;
}

/** One mode of the ladder. */
export interface ResonatorMode {
  /** Frequency, Hz. */
  frequency: number;
  /** Node voltages 0 … n, normalised to 1 at the top (the base is 0). */
  voltage: Float64Array;
  /** Segment current amplitudes per volt at the top, A/V (segment 1 at the base). */
  current: Float64Array;
}

/** What solveResonator returns. */
export interface ResonatorSolution {
  /** The lowest modes with their profiles, by ascending frequency (PROFILED_MODES of them, at most n). */
  modes: ResonatorMode[];
  /** The frequencies of all n modes, ascending, Hz. */
  frequencies: Float64Array;
  /** The fundamental (modes[0]). */
  fundamental: ResonatorMode;
  /** First overtone frequency / fundamental; null for n = 1. */
  overtoneRatio: number | null;
  /** C_eff = vᵀ C v / V_top², F (fundamental). */
  effectiveCapacitance: number;
  /** L_eff = 1/(ω² C_eff), H. */
  effectiveInductance: number;
  /** I_eff per volt at the top, A/V: √(iᵀ L i / L_eff). */
  effectiveCurrent: number;
  /** Peak electric energy ½ vᵀ C v and peak magnetic energy ½ iᵀ L i per V² at the top, J/V². */
  electricEnergy: number;
  magneticEnergy: number;
  /** Peak |dv/dz| of the fundamental per volt at the top, 1/m, and the fraction of the length where it sits. */
  peakGradientPerVolt: number;
  peakGradientFraction: number;
  /** Segments n. */
  segments: number;
}

function multiply(matrix: Float64Array, n: number, x: ArrayLike<number>): Float64Array {
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let j = 0; j < n; j++) sum += matrix[i * n + j] * x[j];
    y[i] = sum;
  }
  return y;
}

function quadratic(matrix: Float64Array, n: number, x: ArrayLike<number>): number {
  const y = multiply(matrix, n, x);
  let sum = 0;
  for (let i = 0; i < n; i++) sum += x[i] * y[i];
  return sum;
}

/** How many modes carry their profiles: the fundamental and the first overtone. */
export const PROFILED_MODES = 2;

/**
 * P = K⁻¹ = D⁻ᵀ L D⁻¹: (D⁻¹)_ij = 1 for j ≥ i, so P_ij = Σ_(k≤i) Σ_(l≤j) L_kl, the mutual
 * inductance of the paths from the base to nodes i and j; O(n²) by running sums.
 */
function pathInductance(inductance: Float64Array, n: number): Float64Array {
  const p = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    let row = 0;
    for (let j = 0; j < n; j++) {
      row += inductance[i * n + j];
      p[i * n + j] = row + (i > 0 ? p[(i - 1) * n + j] : 0);
    }
  }
  return p;
}

/**
 * A = Gᵀ P G for a lower-triangular G: X = P G, then A = Gᵀ X, upper half mirrored. Both products
 * run along rows (x_i += p_ik g_k and a_i += g_ki x_k for ascending k), the same sums in the same
 * order as the dot products of rows with columns, with the inner loops on contiguous entries.
 */
function congruence(p: Float64Array, g: Float64Array, n: number): Float64Array {
  const x = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    const row = i * n;
    for (let k = 0; k < n; k++) {
      const pik = p[row + k];
      const gRow = k * n;
      for (let j = 0; j <= k; j++) x[row + j] += pik * g[gRow + j];
    }
  }
  const a = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    const kRow = k * n;
    for (let i = 0; i <= k; i++) {
      const gki = g[kRow + i];
      const row = i * n;
      for (let j = i; j < n; j++) a[row + j] += gki * x[kRow + j];
    }
  }
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) a[j * n + i] = a[i * n + j];
  return a;
}

/**
 * Solves the ladder. Null when a matrix is not positive definite (an impossible input).
 *
 * With P = K⁻¹ (pathInductance) the problem K v = ω² C v is P C v = v / ω²; with C = G Gᵀ and
 * y = Gᵀ v it is the standard symmetric problem Gᵀ P G y = y / ω², whose largest eigenvalues are
 * the lowest modes. Its eigenvalues come from the tridiagonal form (dense-eigen.ts), the profiles of
 * the fundamental and the first overtone by inverse iteration, v = G⁻ᵀ Q z. The segment currents
 * follow from charge conservation, D i = ω C v: i_k = ω Σ_(j≥k) (C v)_j, the current that charges
 * every node above the segment (the same as L⁻¹ Dᵀ v / ω, without inverting L).
 */
export function solveResonator(ladder: LadderMatrices): ResonatorSolution | null {
  const n = ladder.fractions.length - 1;
  if (!(n >= 1) || ladder.inductance.length < n * n || ladder.capacitance.length < n * n) return null;
  const g = choleskyFactor(ladder.capacitance, n);
  if (!g) return null;
  const p = pathInductance(ladder.inductance, n);
  const a = congruence(p, g, n);
  const tridiagonal = tridiagonalize(a, n);
  const values = tridiagonalEigenvalues(tridiagonal.diagonal, tridiagonal.offDiagonal);
  if (!values) return null;
  const largest = values[n - 1];
  // Every 1/ω² positive (P and C definite), and none lost in the rounding of the largest.
  if (!(largest > 0) || !(values[0] > 1e-13 * largest)) return null;
  const frequencies = new Float64Array(n);
  for (let m = 0; m < n; m++) frequencies[m] = 1 / (2 * Math.PI * Math.sqrt(values[n - 1 - m]));
  const modes: ResonatorMode[] = [];
  for (let m = 0; m < Math.min(n, PROFILED_MODES); m++) {
    const mu = values[n - 1 - m];
    const raw = tridiagonalEigenvector(tridiagonal.diagonal, tridiagonal.offDiagonal, mu);
    applyReflections(tridiagonal, raw);
    backSubstituteTransposed(g, n, raw); // v = G⁻ᵀ y
    const top = raw[n - 1];
    const scale = top !== 0 ? 1 / top : 1;
    const voltage = new Float64Array(n + 1);
    for (let k = 0; k < n; k++) voltage[k + 1] = raw[k] * scale;
    const omega = 1 / Math.sqrt(mu);
    const charge = multiply(ladder.capacitance, n, voltage.subarray(1));
    const current = new Float64Array(n);
    let above = 0;
    for (let k = n - 1; k >= 0; k--) {
      above += charge[k];
      current[k] = omega * above;
    }
    modes.push({ frequency: frequencies[m], voltage, current });
  }
  const fundamental = modes[0];
  const v = fundamental.voltage.subarray(1);
  const electric = 0.5 * quadratic(ladder.capacitance, n, v);
  const magnetic = 0.5 * quadratic(ladder.inductance, n, fundamental.current);
  const omega = 2 * Math.PI * fundamental.frequency;
  const effectiveCapacitance = 2 * electric;
  const effectiveInductance = 1 / (omega * omega * effectiveCapacitance);
  let peakGradientPerVolt = 0;
  let peakGradientFraction = 0;
  for (let k = 0; k < n; k++) {
    const span = (ladder.fractions[k + 1] - ladder.fractions[k]) * ladder.length;
    const gradient = Math.abs(fundamental.voltage[k + 1] - fundamental.voltage[k]) / span;
    if (gradient > peakGradientPerVolt) {
      peakGradientPerVolt = gradient;
      peakGradientFraction = 0.5 * (ladder.fractions[k] + ladder.fractions[k + 1]);
    }
  }
  return {
    modes,
    frequencies,
    fundamental,
    overtoneRatio: n > 1 ? frequencies[1] / fundamental.frequency : null,
    effectiveCapacitance,
    effectiveInductance,
    effectiveCurrent: Math.sqrt((2 * magnetic) / effectiveInductance),
    electricEnergy: electric,
    magneticEnergy: magnetic,
    peakGradientPerVolt,
    peakGradientFraction,
    segments: n,
  };
}

/**
 * Effective mutual inductance of the fundamental to a circuit with mutuals m_k to the segments, H:
 * |Σ m_k i_k| / I_eff (see the header).
 */
export function effectiveMutualInductance(solution: ResonatorSolution, segmentMutuals: ArrayLike<number>): number {
  let linkage = 0;
  for (let k = 0; k < solution.segments; k++) linkage += segmentMutuals[k] * solution.fundamental.current[k];
  return Math.abs(linkage) / solution.effectiveCurrent;
}

/** The top-normalised voltage of a mode at a fraction of the winding length (linear between nodes). */
export function voltageAt(mode: ResonatorMode, fractions: ArrayLike<number>, fraction: number): number {
  const n = fractions.length - 1;
  if (fraction <= 0) return 0;
  if (fraction >= 1) return mode.voltage[n];
  let k = 0;
  while (k < n - 1 && fractions[k + 1] < fraction) k++;
  const w = (fraction - fractions[k]) / (fractions[k + 1] - fractions[k]);
  return (1 - w) * mode.voltage[k] + w * mode.voltage[k + 1];
}

/**
 * Folds a topload conductor (the last row and column of a (n + 1)-conductor Maxwell matrix) into
 * node n: the topload is tied to the top of the winding, v_T = v_n. Adds `extraTop` (F, a lumped
 * capacitance to ground at the top: streamer loading) to the top node.
 */
export function foldTopload(matrix: Float64Array, size: number, nodes: number, extraTop = 0): Float64Array {
  const n = nodes;
  const folded = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) folded[i * n + j] = matrix[i * size + j];
  if (size > n) {
    const t = n;
    for (let i = 0; i < n; i++) {
      folded[i * n + (n - 1)] += matrix[i * size + t];
      folded[(n - 1) * n + i] += matrix[t * size + i];
    }
    folded[(n - 1) * n + (n - 1)] += matrix[t * size + t];
  }
  folded[(n - 1) * n + (n - 1)] += extraTop;
  return folded;
}

/**
 * The capacitance matrix of a coarser ladder whose nodes are every `stride`-th fine node: the
 * coarse hats are combinations of the fine ones (piecewise-linear interpolation in height), so
 * C_coarse = R C Rᵀ exactly (Galerkin restriction). Returns the matrix and the coarse fractions.
 * Cost: R is banded (2·stride − 1 weights a row), so O(n · fine · stride); stride 1 is a copy.
 */
export function coarsenCapacitance(
  matrix: Float64Array,
  fineFractions: ArrayLike<number>,
  stride: number,
): { matrix: Float64Array; fractions: Float64Array } | null {
  const fine = fineFractions.length - 1;
  if (!(stride >= 1) || fine % stride !== 0) return null;
  const n = fine / stride;
  const fractions = new Float64Array(n + 1);
  for (let c = 0; c <= n; c++) fractions[c] = fineFractions[c * stride];
  if (stride === 1) return { matrix: Float64Array.from(matrix.subarray(0, fine * fine)), fractions };
  // R (n × fine): coarse hat c (1-based) spans fine nodes (c − 1)·stride + 1 … (c + 1)·stride − 1;
  // row c − 1 keeps its 2·stride − 1 weights from fine node (c − 1)·stride + 1 (0-based: (c − 1)·stride).
  const band = 2 * stride - 1;
  const r = new Float64Array(n * band);
  for (let c = 1; c <= n; c++) {
    for (let f = (c - 1) * stride + 1; f <= Math.min(fine, (c + 1) * stride - 1); f++) {
      const z = fineFractions[f];
      const centre = fractions[c];
      const value =
        f <= c * stride
          ? (z - fractions[c - 1]) / (centre - fractions[c - 1])
          : (fractions[c + 1] - z) / (fractions[c + 1] - centre);
      r[(c - 1) * band + (f - 1 - (c - 1) * stride)] = value;
    }
  }
  const weight = (c: number, f: number) => {
    const offset = f - c * stride; // c, f 0-based
    return offset >= 0 && offset < band ? r[c * band + offset] : 0;
  };
  const temp = new Float64Array(n * fine); // R C, summed over the band in ascending f
  for (let i = 0; i < n; i++)
    for (let f = i * stride; f < Math.min(fine, i * stride + band); f++) {
      const w = weight(i, f);
      if (w === 0) continue;
      for (let j = 0; j < fine; j++) temp[i * fine + j] += w * matrix[f * fine + j];
    }
  const coarse = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      let sum = 0;
      for (let f = j * stride; f < Math.min(fine, j * stride + band); f++) sum += temp[i * fine + f] * weight(j, f);
      coarse[i * n + j] = sum;
    }
  return { matrix: coarse, fractions };
}
