/**
 * The Maxwell capacitance matrix of a segmented winding, its topload and the grounded parts, from
 * the same boundary-element model as field-solve.ts: one assembly, one LU factorisation, one
 * right-hand side per conductor.
 *
 * The winding's sheet carries a piecewise-linear potential between nodes at its panel edges: node 0
 * at the base (grounded), nodes 1 … P above it, node P the top. The "conductors" are the hat
 * functions φ_k of nodes 1 … P and the topload (potential 1 on it, 0 elsewhere). For conductor l
 * the collocation potentials are φ_l at the panel midpoints (½ on the two panels beside node l) and
 * the solve gives the densities σ⁽ˡ⁾; the matrix is the Galerkin form
 *   C_kl = ∫ φ_k σ⁽ˡ⁾ dA (winding nodes), C_Tl = charge on the topload,
 * so that for any node voltages V the stored energy is ½ Vᵀ C V, the same energy capacitance the
 * field solve forms (field-solve.ts) for a profile given at the nodes: with V_k = z_k/ℓ
 * (the linear profile) Vᵀ C V equals its total capacitance. The collocation form is symmetric only
 * to discretisation accuracy; the returned matrix is the symmetric part, and the largest relative
 * asymmetry is reported (reciprocity, [smythe1950] §3.07: C_kl = C_lk exactly).
 */
import { windingNodeFraction } from './bodies.ts';
import { assembleCollocationMatrix } from './assembly.ts';
import { luFactor, luSolve } from './dense-lu.ts';
import {
  defaultPanelCounts,
  arrangementPanels,
  densityFields,
  type FieldArrangement,
  windingAloneCapacitance,
  type SurfaceFields,
  type VoltageShape,
} from './field-solve.ts';
import { buildPanelLayout, type PanelLayout } from './panels.ts';

/** The Maxwell matrix of the winding's nodes and the topload, SI. */
export interface NodeCapacitanceMatrix {
  /** Winding nodes above the base (P = winding panel count). */
  nodes: number;
  /** Heights of the P + 1 nodes as fractions of the winding length, 0 (base) first. */
  fractions: Float64Array;
  /** Conductors: P winding nodes, then the topload when there is one. */
  size: number;
  /** Symmetric size × size matrix, F, row-major. */
  matrix: Float64Array;
  /** Largest |C_kl − C_lk| / √(C_kk C_ll) before symmetrisation. */
  asymmetry: number;
  /** Panels and, per conductor, the densities for unit potential on it (σ, C/m²; λ for rings). */
  layout: PanelLayout;
  densities: Float64Array[];
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

/**
 * Solves the arrangement once per conductor. The winding's profile, if any, is ignored.
 * @param arrangement bodies as for solveField (needs a winding)
 * @param windingPanelCount P, the number of winding panels = segments of the finest ladder
 * @returns null when the system is singular or there is no winding
 */
export function nodeCapacitanceMatrix(
  arrangement: FieldArrangement,
  windingPanelCount: number,
): NodeCapacitanceMatrix | null {
  const winding = arrangement.winding;
  if (!winding || !(windingPanelCount >= 1)) return null;
  const counts = defaultPanelCounts(arrangement);
  const { shapes, windingCount, leadingCount } = arrangementPanels(arrangement, {
    winding: windingPanelCount,
    topload: counts.topload,
  });
  const toploadCount = shapes.length - leadingCount;
  const layout = buildPanelLayout(shapes);
  const n = layout.count;
  const matrixA = assembleCollocationMatrix(layout, arrangement.floor, true);
  const selfCapacitance = windingAloneCapacitance(matrixA, n, layout, windingCount, leadingCount, {
    ...winding,
    profile: 'linear',
  });
  const pivots = luFactor(matrixA, n);
  if (!pivots) return null;
  const p = windingCount;
  const size = p + (toploadCount > 0 ? 1 : 0);
  const densities: Float64Array[] = [];
  for (let l = 0; l < size; l++) {
    const rhs = new Float64Array(n);
    if (l < p) {
      // hat of node l + 1: panels l and l + 1 (the top node has only panel p − 1 below it)
      rhs[l] = 0.5;
      if (l + 1 < p) rhs[l + 1] = 0.5;
    } else for (let j = leadingCount; j < n; j++) rhs[j] = 1;
    luSolve(matrixA, n, pivots, rhs);
    if (!rhs.every(Number.isFinite)) return null;
    densities.push(rhs);
  }
  const raw = new Float64Array(size * size);
  for (let l = 0; l < size; l++) {
    const sigma = densities[l];
    for (let k = 0; k < p; k++) {
      // ∫ φ_(k+1) σ dA over panels k and k + 1: half of each panel's area (φ linear, r constant)
      let value = 0.5 * sigma[k] * layout.area[k];
      if (k + 1 < p) value += 0.5 * sigma[k + 1] * layout.area[k + 1];
      raw[k * size + l] = value;
    }
    if (toploadCount > 0) {
      let charge = 0;
      for (let j = leadingCount; j < n; j++) charge += sigma[j] * layout.area[j];
      raw[p * size + l] = charge;
    }
  }
  const matrix = new Float64Array(size * size);
  let asymmetry = 0;
  for (let k = 0; k < size; k++) {
    for (let l = 0; l < size; l++) {
      matrix[k * size + l] = 0.5 * (raw[k * size + l] + raw[l * size + k]);
      const scale = Math.sqrt(raw[k * size + k] * raw[l * size + l]);
      asymmetry = Math.max(asymmetry, Math.abs(raw[k * size + l] - raw[l * size + k]) / scale);
    }
  }
  const fractions = new Float64Array(p + 1);
  for (let k = 0; k <= p; k++) fractions[k] = windingNodeFraction(k / p);
  return {
    nodes: p,
    fractions,
    size,
    matrix,
    asymmetry,
    layout,
    densities,
    toploadPanels: { first: leadingCount, count: toploadCount },
    unknowns: n,
    selfCapacitance,
  };
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
  return densityFields(arrangement, matrix.layout, density, matrix.nodes, matrix.toploadPanels.first);
}
