/**
 * Panels of the axisymmetric boundary-element model: pieces of the meridian curves of the bodies
 * (half-plane r ≥ 0, z up, floor at z = 0), each carrying a uniform surface charge density. A panel
 * is an exact piece of its body's curve (a straight segment or a circular arc), so the geometry
 * has no polygon error; a thin ring (a primary turn, the strike rail) is one element carrying a line
 * charge on its centre line. Quadrature nodes of the 2- and 4-point Gauss–Legendre rules are
 * precomputed per panel for the assembly.
 *
 * Method: ring-charge boundary elements (charge simulation / moment method with piecewise-constant
 * density and midpoint collocation; R. F. Harrington, *Field Computation by Moment Methods*, 1968;
 * N. H. Malik, IEEE Trans. Electr. Insul. 24(1), 1989).
 */
import { GAUSS2_NODES, GAUSS2_WEIGHTS, GAUSS4_NODES, GAUSS4_WEIGHTS } from '../gauss-legendre.ts';

/** Panel kinds. */
export const PANEL_LINE = 0;
export const PANEL_ARC = 1;
export const PANEL_THIN_RING = 2;

/** The panels of one arrangement, structure-of-arrays, SI. */
export interface PanelLayout {
  count: number;
  /** PANEL_LINE, PANEL_ARC or PANEL_THIN_RING. */
  kind: Uint8Array;
  /**
   * Five numbers per panel. Line: r0, z0, r1, z1. Arc: centre r, centre z, radius, start angle,
   * end angle (rad, from the +r direction, counter-clockwise). Thin ring: r, z, wire radius.
   */
  geometry: Float64Array;
  /** Collocation point (panel midpoint), m. */
  midR: Float64Array;
  midZ: Float64Array;
  /** Arc length of the panel, m (2π·r for a thin ring). */
  length: Float64Array;
  /** Surface area 2π∫r ds, m² (2π·r for a thin ring: its unknown is a line charge). */
  area: Float64Array;
  /** Outward unit normal at the midpoint (0, 0 for a thin ring). */
  normalR: Float64Array;
  normalZ: Float64Array;
  /** Arc-length position of the midpoint along its body's curve, m. */
  position: Float64Array;
  /** 2-point nodes: r, z, weight × (ds/dt) × r′, two per panel. */
  gauss2R: Float64Array;
  gauss2Z: Float64Array;
  gauss2W: Float64Array;
  /** 4-point nodes, four per panel. */
  gauss4R: Float64Array;
  gauss4Z: Float64Array;
  gauss4W: Float64Array;
}

/** A piece of meridian curve before it becomes a panel. */
export type PanelShape =
  | { kind: 'line'; r0: number; z0: number; r1: number; z1: number; position: number }
  | { kind: 'arc'; centerR: number; centerZ: number; radius: number; angle0: number; angle1: number; position: number }
  | { kind: 'thin_ring'; r: number; z: number; wireRadius: number };

/** Point on panel j at parameter t ∈ [−1, 1]; writes r, z into `out`. */
export function panelPoint(layout: PanelLayout, j: number, t: number, out: Float64Array): void {
  const g = layout.geometry;
  const o = 5 * j;
  if (layout.kind[j] === PANEL_ARC) {
    const angle = 0.5 * (g[o + 3] + g[o + 4]) + 0.5 * t * (g[o + 4] - g[o + 3]);
    out[0] = g[o] + g[o + 2] * Math.cos(angle);
    out[1] = g[o + 1] + g[o + 2] * Math.sin(angle);
  } else if (layout.kind[j] === PANEL_LINE) {
    out[0] = 0.5 * (g[o] + g[o + 2]) + 0.5 * t * (g[o + 2] - g[o]);
    out[1] = 0.5 * (g[o + 1] + g[o + 3]) + 0.5 * t * (g[o + 3] - g[o + 1]);
  } else {
    out[0] = g[o];
    out[1] = g[o + 1];
  }
}

/** Builds the structure-of-arrays layout from panel shapes. */
export function buildPanelLayout(shapes: readonly PanelShape[]): PanelLayout {
  const layout = emptyLayout(shapes.length);
  const point = new Float64Array(2);
  for (let j = 0; j < shapes.length; j++) {
    const shape = shapes[j];
    if (shape.kind === 'thin_ring') addThinRing(layout, j, shape);
    else addCurvePanel(layout, j, shape, point);
  }
  return layout;
}

/** A layout of `count` panels, every array zero. */
function emptyLayout(count: number): PanelLayout {
  return {
    count,
    kind: new Uint8Array(count),
    geometry: new Float64Array(5 * count),
    midR: new Float64Array(count),
    midZ: new Float64Array(count),
    length: new Float64Array(count),
    area: new Float64Array(count),
    normalR: new Float64Array(count),
    normalZ: new Float64Array(count),
    position: new Float64Array(count),
    gauss2R: new Float64Array(2 * count),
    gauss2Z: new Float64Array(2 * count),
    gauss2W: new Float64Array(2 * count),
    gauss4R: new Float64Array(4 * count),
    gauss4Z: new Float64Array(4 * count),
    gauss4W: new Float64Array(4 * count),
  };
}

/** Element j as a thin ring: one node of weight r (line charge λ: dq = λ·r·dφ). */
function addThinRing(layout: PanelLayout, j: number, shape: Extract<PanelShape, { kind: 'thin_ring' }>): void {
  const o = 5 * j;
  layout.kind[j] = PANEL_THIN_RING;
  layout.geometry[o] = shape.r;
  layout.geometry[o + 1] = shape.z;
  layout.geometry[o + 2] = shape.wireRadius;
  layout.midR[j] = shape.r;
  layout.midZ[j] = shape.z;
  layout.length[j] = 2 * Math.PI * shape.r;
  layout.area[j] = 2 * Math.PI * shape.r;
  for (let q = 0; q < 2; q++) {
    layout.gauss2R[2 * j + q] = shape.r;
    layout.gauss2Z[2 * j + q] = shape.z;
    layout.gauss2W[2 * j + q] = 0.5 * shape.r;
  }
  for (let q = 0; q < 4; q++) {
    layout.gauss4R[4 * j + q] = shape.r;
    layout.gauss4Z[4 * j + q] = shape.z;
    layout.gauss4W[4 * j + q] = 0.25 * shape.r;
  }
}

/** Panel j as a piece of a line or an arc: geometry, normal, midpoint, area and Gauss nodes. */
function addCurvePanel(
  layout: PanelLayout,
  j: number,
  shape: Exclude<PanelShape, { kind: 'thin_ring' }>,
  point: Float64Array,
): void {
  const o = 5 * j;
  let halfLength: number;
  if (shape.kind === 'arc') {
    layout.kind[j] = PANEL_ARC;
    layout.geometry.set([shape.centerR, shape.centerZ, shape.radius, shape.angle0, shape.angle1], o);
    halfLength = 0.5 * shape.radius * Math.abs(shape.angle1 - shape.angle0);
    const mid = 0.5 * (shape.angle0 + shape.angle1);
    layout.normalR[j] = Math.cos(mid);
    layout.normalZ[j] = Math.sin(mid);
  } else {
    layout.kind[j] = PANEL_LINE;
    layout.geometry.set([shape.r0, shape.z0, shape.r1, shape.z1, 0], o);
    const dr = shape.r1 - shape.r0;
    const dz = shape.z1 - shape.z0;
    halfLength = 0.5 * Math.hypot(dr, dz);
    // Normal: the tangent (dr, dz) turned clockwise, (dz, −dr)/length; for the winding, drawn
    // from the base up, that is +r (outward).
    layout.normalR[j] = dz / (2 * halfLength);
    layout.normalZ[j] = -dr / (2 * halfLength);
  }
  layout.position[j] = shape.position;
  panelPoint(layout, j, 0, point);
  layout.midR[j] = point[0];
  layout.midZ[j] = point[1];
  layout.length[j] = 2 * halfLength;
  let area = 0;
  for (let q = 0; q < 4; q++) {
    panelPoint(layout, j, GAUSS4_NODES[q], point);
    layout.gauss4R[4 * j + q] = point[0];
    layout.gauss4Z[4 * j + q] = point[1];
    layout.gauss4W[4 * j + q] = GAUSS4_WEIGHTS[q] * halfLength * point[0];
    area += 2 * Math.PI * GAUSS4_WEIGHTS[q] * halfLength * point[0];
  }
  for (let q = 0; q < 2; q++) {
    panelPoint(layout, j, GAUSS2_NODES[q], point);
    layout.gauss2R[2 * j + q] = point[0];
    layout.gauss2Z[2 * j + q] = point[1];
    layout.gauss2W[2 * j + q] = GAUSS2_WEIGHTS[q] * halfLength * point[0];
  }
  layout.area[j] = area;
}
