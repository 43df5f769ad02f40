/**
 * The Maxwell capacitance matrix of a segmented winding, its topload and the grounded parts, from
 * the same boundary-element model as field-solve.ts: one assembly, one LU factorisation, one
 * right-hand side per conductor.
 *
 * The winding's sheet carries a piecewise-linear potential between S + 1 equally spaced ladder
 * nodes z_k = kℓ/S: node 0 at the base (grounded), node S the top. The "conductors" are the
 * interpolating hat functions φ_k of nodes 1 … S (φ_k(z_j) = δ_kj, linear between nodes) and the
 * topload (potential 1 on it, 0 elsewhere). The panels stay graded toward the ends (the charge
 * density is singular there) and are independent of the nodes: each hat is mapped onto the panels
 * by its mean over each panel, w_kj = (1/|P_j|) ∫_(P_j) φ_k dz (exact, the hat is piecewise linear).
 * For conductor l the collocation potentials are w_lj at the panel midpoints and the solve gives
 * the densities σ⁽ˡ⁾; the matrix is the Galerkin form
 *   C_kl = Σ_j w_kj σ⁽ˡ⁾_j A_j (winding nodes), C_Tl = charge on the topload,
 * so that for any node voltages V the stored energy is ½ Vᵀ C V, the same energy capacitance the
 * field solve forms (field-solve.ts) for the potential Σ V_k φ_k: with V_k = z_k/ℓ (the linear
 * profile, which the hats reproduce exactly) Vᵀ C V equals its total capacitance. Because the
 * nodes are uniform and shared with the segment inductance matrix (segment k between nodes k − 1
 * and k), the ladder is a consistent discretisation whose fundamental converges like 1/S²
 * (resonator.ts). The collocation form is symmetric only to discretisation accuracy; the returned
 * matrix is the symmetric part, and the largest relative asymmetry is reported (reciprocity,
 * [smythe1950] §3.07: C_kl = C_lk exactly).
 */
import { windingNodeFraction } from './bodies.ts';
import { assembleCollocationMatrix } from './assembly.ts';
import { luFactor, luSolveColumns } from './dense-lu.ts';
import {
  defaultPanelCounts,
  arrangementPanels,
  densityFields,
  type FieldArrangement,
  windingAloneCapacitance,
  matrixScratch,
  type SurfaceFields,
  type VoltageShape,
} from './field-solve.ts';
import { buildPanelLayout, type PanelLayout } from './panels.ts';

/** The Maxwell matrix of the winding's nodes and the topload, SI. */
export interface NodeCapacitanceMatrix {
  /** Winding nodes above the base (S, the ladder's segments). */
  nodes: number;
  /** Heights of the S + 1 nodes as fractions of the winding length, k/S, 0 (base) first. */
  fractions: Float64Array;
  /** Conductors: S winding nodes, then the topload when there is one. */
  size: number;
  /** Symmetric size × size matrix, F, row-major. */
  matrix: Float64Array;
  /** Largest |C_kl − C_lk| / √(C_kk C_ll) before symmetrisation. */
  asymmetry: number;
  /** Panels and, per conductor, the densities for unit potential on it (σ, C/m²; λ for rings). */
  layout: PanelLayout;
  densities: Float64Array[];
  /** Winding panels of the field solve (the first panels of the layout). */
  windingPanels: number;
  /** Index range of the topload's panels. */
  toploadPanels: { first: number; count: number };
  /** Unknowns of the boundary-element system. */
  unknowns: number;
  /**
   * Energy capacitance of the winding with the linear profile and the topload absent (the winding,
   * the grounded rings and the floor alone: the leading block of the same system), F.
   */
  selfCapacitance: number | null;
}

/** ∫ from −∞ to x of the unit hat max(0, 1 − |t|) dt. */
function hatIntegral(x: number): number {
  if (x <= -1) return 0;
  if (x <= 0) return 0.5 * (1 + x) ** 2;
  if (x <= 1) return 1 - 0.5 * (1 - x) ** 2;
  return 1;
}

/**
 * Mean of the hat of node k of S uniform nodes over the fraction interval [a, b] (see the header).
 */
export function hatPanelMean(k: number, segments: number, a: number, b: number): number {
  return (hatIntegral(b * segments - k) - hatIntegral(a * segments - k)) / ((b - a) * segments);
}

/**
 * Solves the arrangement once per conductor. The winding's profile, if any, is ignored.
 * @param arrangement bodies as for solveField (needs a winding)
 * @param windingPanelCount P, the number of winding panels of the field solve
 * @param segments S, the uniform segments of the finest ladder (default P/2: every hat then spans
 *   at least two of the graded panels, which the piecewise-constant collocation resolves)
 * @returns null when the system is singular or there is no winding
 */
export function nodeCapacitanceMatrix(
  arrangement: FieldArrangement,
  windingPanelCount: number,
  segments = Math.max(1, Math.floor(windingPanelCount / 2)),
): NodeCapacitanceMatrix | null {
  const winding = arrangement.winding;
  if (!winding || !(windingPanelCount >= 1) || !(segments >= 1) || !Number.isInteger(segments)) return null;
  const counts = defaultPanelCounts(arrangement);
  const { shapes, windingCount, leadingCount } = arrangementPanels(arrangement, {
    winding: windingPanelCount,
    topload: counts.topload,
  });
  const toploadCount = shapes.length - leadingCount;
  const layout = buildPanelLayout(shapes);
  const n = layout.count;
  const matrixA = assembleCollocationMatrix(layout, arrangement.floor, true, matrixScratch(n * n));
  const pivots = luFactor(matrixA, n, leadingCount);
  if (!pivots) return null;
  const selfCapacitance = windingAloneCapacitance(matrixA, n, pivots, layout, windingCount, leadingCount, {
    ...winding,
    profile: 'linear',
  });
  const p = segments;
  const size = p + (toploadCount > 0 ? 1 : 0);
  const weights = hatWeights(windingCount, p);
  const densities = conductorDensities(matrixA, n, pivots, weights, size, leadingCount);
  if (!densities) return null;
  const raw = projectedCharges(layout, densities, weights, size, leadingCount);
  const { matrix, asymmetry } = symmetrised(raw, size);
  const fractions = new Float64Array(p + 1);
  for (let k = 0; k <= p; k++) fractions[k] = k / p;
  return {
    nodes: p,
    fractions,
    size,
    matrix,
    asymmetry,
    layout,
    densities,
    windingPanels: windingCount,
    toploadPanels: { first: leadingCount, count: toploadCount },
    unknowns: n,
    selfCapacitance,
  };
}

/**
 * The densities for unit potential on each conductor: one solve of all the right-hand sides at once
 * (the hats' weights on the winding panels, then 1 on the topload's panels); null when one is not
 * finite.
 */
function conductorDensities(
  factors: Float64Array,
  n: number,
  pivots: Int32Array,
  weights: readonly { panel: number; weight: number }[][],
  size: number,
  leadingCount: number,
): Float64Array[] | null {
  const p = weights.length;
  const block = new Float64Array(n * size);
  for (let l = 0; l < p; l++) for (const { panel, weight } of weights[l]) block[l * n + panel] = weight;
  if (size > p) block.fill(1, p * n + leadingCount, (p + 1) * n);
  luSolveColumns(factors, n, pivots, block, size);
  for (let i = 0; i < block.length; i++) if (!Number.isFinite(block[i])) return null;
  const densities: Float64Array[] = [];
  for (let l = 0; l < size; l++) densities.push(block.subarray(l * n, (l + 1) * n));
  return densities;
}

/** The hat weights w_kj of nodes 1 … p on the winding panels j (each hat touches few panels). */
function hatWeights(windingCount: number, p: number): { panel: number; weight: number }[][] {
  const edges = new Float64Array(windingCount + 1);
  for (let j = 0; j <= windingCount; j++) edges[j] = windingNodeFraction(j / windingCount);
  const weights: { panel: number; weight: number }[][] = [];
  for (let k = 1; k <= p; k++) {
    const row: { panel: number; weight: number }[] = [];
    for (let j = 0; j < windingCount; j++) {
      if (edges[j + 1] <= (k - 1) / p || edges[j] >= (k + 1) / p) continue;
      const weight = hatPanelMean(k, p, edges[j], edges[j + 1]);
      if (weight > 0) row.push({ panel: j, weight });
    }
    weights.push(row);
  }
  return weights;
}

/**
 * raw[k][l] = ∫ φ_(k+1) σ_l dA for the hats k < p, and the topload's charge of σ_l in the last row
 * when there is a topload (size > p).
 */
function projectedCharges(
  layout: PanelLayout,
  densities: readonly Float64Array[],
  weights: readonly { panel: number; weight: number }[][],
  size: number,
  leadingCount: number,
): Float64Array {
  const p = weights.length;
  const n = layout.count;
  const raw = new Float64Array(size * size);
  for (let l = 0; l < size; l++) {
    const sigma = densities[l];
    for (let k = 0; k < p; k++) {
      // ∫ φ_(k+1) σ dA: σ constant on each panel, r constant on the sheet
      let value = 0;
      for (const { panel, weight } of weights[k]) value += weight * sigma[panel] * layout.area[panel];
      raw[k * size + l] = value;
    }
    if (size > p) {
      let charge = 0;
      for (let j = leadingCount; j < n; j++) charge += sigma[j] * layout.area[j];
      raw[p * size + l] = charge;
    }
  }
  return raw;
}

/** The symmetric part of `raw` and its largest relative asymmetry |raw_kl − raw_lk|/√(raw_kk raw_ll). */
function symmetrised(raw: Float64Array, size: number): { matrix: Float64Array; asymmetry: number } {
  const matrix = new Float64Array(size * size);
  let asymmetry = 0;
  for (let k = 0; k < size; k++) {
    for (let l = 0; l < size; l++) {
      matrix[k * size + l] = 0.5 * (raw[k * size + l] + raw[l * size + k]);
      const scale = Math.sqrt(raw[k * size + k] * raw[l * size + l]);
      asymmetry = Math.max(asymmetry, Math.abs(raw[k * size + l] - raw[l * size + k]) / scale);
    }
  }
  return { matrix, asymmetry };
}

/** Vᵀ C V for the linear profile V_k = z_k/ℓ with the topload at the top's potential, F. */
export function linearProfileCapacitance(matrix: NodeCapacitanceMatrix): number {
  const voltage = new Float64Array(matrix.size);
  for (let k = 0; k < matrix.nodes; k++) voltage[k] = matrix.fractions[k + 1];
  if (matrix.size > matrix.nodes) voltage[matrix.nodes] = 1;
  let energy = 0;
  for (let i = 0; i < matrix.size; i++) {
    for (let j = 0; j < matrix.size; j++) energy += voltage[i] * matrix.matrix[i * matrix.size + j] * voltage[j];
  }
  return energy;
}

/**
 * The surface fields of the winding at the node voltages of a top-normalised shape (the topload at
 * the top's voltage), by superposition of the densities solved per conductor: the field solve of
 * that profile without a second factorisation (electrostatics is linear).
 */
export function shapedSurfaceFields(
  arrangement: FieldArrangement,
  matrix: NodeCapacitanceMatrix,
  shape: VoltageShape,
): SurfaceFields {
  const density = new Float64Array(matrix.unknowns);
  const add = (sigma: Float64Array, voltage: number) => {
    for (let j = 0; j < density.length; j++) density[j] += voltage * sigma[j];
  };
  for (let k = 0; k < matrix.nodes; k++) add(matrix.densities[k], shape(matrix.fractions[k + 1]));
  if (matrix.size > matrix.nodes) add(matrix.densities[matrix.nodes], shape(1));
  return densityFields(arrangement, matrix.layout, density, matrix.windingPanels, matrix.toploadPanels.first);
}
