/**
 * Field enhancement at the tip of a breakout point: a round rod of radius a ending in a
 * hemispherical cap, standing on a conducting surface in a field E0 that is uniform on the scale of
 * the rod. The tip field is β·E0.
 *
 * β is solved here with the project's own axisymmetric boundary-element model (panels.ts,
 * assembly.ts): the rod on a grounded plane (the floor images make it a capsule of length 2l) with
 * the applied potential E0·z cancelled on its surface, the tip field σ/ε0 at the apex. Checks
 * (test/reference/breakout-point.test.ts): the exact hemisphere-on-plane factor 3 (l = a;
 * [jackson1999] sphere in a uniform field), the closed form of a prolate half-spheroid on a plane
 * (`halfSpheroidEnhancement`, [landau1984] §4 conducting ellipsoid: β = 1/n, n the depolarising
 * factor), and the published fit of the hemisphere-on-post factor [forbes2003]
 * β ≈ 1.2·(l/a + 2.15)^0.90 inside its stated range (`HEMISPHERE_POST_FIT_RANGE`).
 * l is the rod's whole height from the surface to the apex (cap included).
 */
import { assembleCollocationMatrix } from './assembly.ts';
import { luFactor, luSolve } from './dense-lu.ts';
import { buildPanelLayout, type PanelLayout, type PanelShape } from './panels.ts';
import { VACUUM_PERMITTIVITY } from './ring-kernel.ts';

/** Panels on the hemispherical cap (uniform in angle). */
export const ROD_CAP_PANELS = 14;
/** The cylinder's panels grow geometrically from the cap downward, first one a/ROD_CAP_PANELS·… long. */
const CYLINDER_GROWTH = 1.15;

/**
 * Range of l/a in which the published hemisphere-on-post fit holds to about 3 % [forbes2003]
 * (the range from memory: about 30 to 2000).
 */
export const HEMISPHERE_POST_FIT_RANGE: readonly [number, number] = [30, 2000];

/** Largest l/a the boundary-element solve of the rod accepts (its panel count grows like ln(l/a)). */
export const MAX_ROD_ASPECT = 1000;

/** Published fit of the apex enhancement of a hemisphere on a post [forbes2003]: 1.2 (l/a + 2.15)^0.90. */
export function hemispherePostFit(aspect: number): number {
  return 1.2 * (aspect + 2.15) ** 0.9;
}

/**
 * Exact apex enhancement of a conducting prolate half-spheroid (height l along the field, base
 * semi-axis b < l) on a grounded plane in a uniform field: by the mirror image, that of a whole
 * uncharged spheroid, β = 1/n with the depolarising factor n = ((1 − e²)/e³)(artanh e − e),
 * e = √(1 − b²/l²) [landau1984]. Its apex radius is b²/l. The sphere (e → 0) gives 3.
 */
export function halfSpheroidEnhancement(height: number, baseRadius: number): number {
  if (!(height > 0) || !(baseRadius > 0) || !(baseRadius <= height)) return Number.NaN;
  const e = Math.sqrt(1 - (baseRadius / height) ** 2);
  if (e < 1e-4) return 3 / (1 - (3 / 5) * e * e); // series of 1/n about the sphere
  const n = ((1 - e * e) / (e * e * e)) * (Math.atanh(e) - e);
  return 1 / n;
}

/** The meridian panels of a rod of height l and tip radius a on the plane z = 0. */
export function rodPanels(height: number, tipRadius: number): PanelShape[] {
  return rodOnAxisPanels(0, height - tipRadius, tipRadius, 1);
}

/**
 * The meridian panels of a rod on the axis whose foot is at height `footZ` on a surface it meets at
 * the rod's radius: the cylinder from `footZ` up (edges from the cap down, sizes s0·q^k with the
 * first as long as a cap panel, the last piece stretched to reach the foot), then the cap, ending at
 * the apex (the last panel of the list). `cylinder` is the length of the straight part (0 for a bare
 * hemisphere on a plane); `scale` > 1 refines (more cap panels, slower growth).
 */
export function rodOnAxisPanels(footZ: number, cylinder: number, tipRadius: number, scale: number): PanelShape[] {
  const capPanels = Math.max(2, Math.round(ROD_CAP_PANELS * scale));
  const growth = 1 + (CYLINDER_GROWTH - 1) / scale;
  const shapes: PanelShape[] = [];
  // A straight part shorter than a millionth of the tip radius (rounding of l = a) is none.
  const straight = cylinder > 1e-6 * tipRadius ? cylinder : 0;
  if (straight > 0) {
    const edges: number[] = [straight];
    let size = (0.5 * Math.PI * tipRadius) / capPanels;
    let z = straight;
    while (z - size > 0.5 * size) {
      z -= size;
      edges.push(z);
      size *= growth;
    }
    edges.push(0);
    for (let k = edges.length - 1; k > 0; k--) {
      const z0 = footZ + edges[k];
      const z1 = footZ + edges[k - 1];
      shapes.push({ kind: 'line', r0: tipRadius, z0, r1: tipRadius, z1, position: 0.5 * (edges[k] + edges[k - 1]) });
    }
  }
  const centreZ = footZ + straight;
  for (let k = 0; k < capPanels; k++) {
    const angle0 = (0.5 * Math.PI * k) / capPanels;
    const angle1 = (0.5 * Math.PI * (k + 1)) / capPanels;
    shapes.push({
      kind: 'arc',
      centerR: 0,
      centerZ: centreZ,
      radius: tipRadius,
      angle0,
      angle1,
      position: straight + tipRadius * 0.5 * (angle0 + angle1),
    });
  }
  return shapes;
}

/**
 * Apex field enhancement β of a hemisphere-capped rod of height l (surface to apex) and tip
 * radius a on a plane in a uniform field, by the boundary-element solve described above.
 * NaN when l < a, a ≤ 0 or l/a > 4·MAX_ROD_ASPECT.
 */
export function rodEnhancementSolved(height: number, tipRadius: number): number {
  if (!(tipRadius > 0) || !(height >= tipRadius) || !(height / tipRadius <= 4 * MAX_ROD_ASPECT)) return Number.NaN;
  return uniformFieldApexEnhancement(rodPanels(height, tipRadius));
}

/**
 * Apex enhancement of a grounded axisymmetric body standing on the plane z = 0 in a unit uniform
 * field, its meridian given as panels from the plane to the axis (the last panel ends at the apex).
 */
export function uniformFieldApexEnhancement(shapes: readonly PanelShape[]): number {
  const layout = buildPanelLayout(shapes);
  const n = layout.count;
  const matrix = assembleCollocationMatrix(layout, true, true);
  const pivots = luFactor(matrix, n);
  if (!pivots) return Number.NaN;
  // The body is grounded with the plane; the applied potential E0·z (E0 = 1) is cancelled on it.
  const density = new Float64Array(n);
  for (let j = 0; j < n; j++) density[j] = -layout.midZ[j];
  luSolve(matrix, n, pivots, density);
  // Apex: σ is even in the distance s from the axis; fit c0 + c2·s² through the last two panels.
  const field = (j: number) => -density[j] / VACUUM_PERMITTIVITY;
  const last = n - 1;
  const s0 = layout.midR[last];
  const s1 = layout.midR[last - 1];
  const c2 = (field(last - 1) - field(last)) / (s1 * s1 - s0 * s0);
  return field(last) - c2 * s0 * s0;
}

/** Table nodes of ln(β) over ln(l/a), built on first use. */
let table: { x: Float64Array; y: Float64Array; slope: Float64Array } | null = null;
const TABLE_NODES = 49;

function enhancementTable(): NonNullable<typeof table> {
  if (table) return table;
  const x = new Float64Array(TABLE_NODES);
  const y = new Float64Array(TABLE_NODES);
  const top = Math.log(MAX_ROD_ASPECT);
  for (let k = 0; k < TABLE_NODES; k++) {
    x[k] = (top * k) / (TABLE_NODES - 1);
    y[k] = Math.log(rodEnhancementSolved(Math.exp(x[k]), 1));
  }
  // Hermite slopes by centred differences (one-sided at the ends).
  const slope = new Float64Array(TABLE_NODES);
  for (let k = 0; k < TABLE_NODES; k++) {
    const a = Math.max(0, k - 1);
    const b = Math.min(TABLE_NODES - 1, k + 1);
    slope[k] = (y[b] - y[a]) / (x[b] - x[a]);
  }
  table = { x, y, slope };
  return table;
}

/**
 * Apex field enhancement β of a hemisphere-capped rod of height l (surface to apex) and tip radius
 * a on a plane in a uniform field: the boundary-element solve above, tabulated once at 49 values of
 * l/a from 1 to MAX_ROD_ASPECT (log-spaced) and interpolated by cubic Hermite in ln β over ln(l/a)
 * (within 0.05 % of a direct solve, checked in the tests). NaN when l < a, a ≤ 0 or l/a beyond
 * MAX_ROD_ASPECT.
 */
export function rodEnhancement(height: number, tipRadius: number): number {
  if (!(tipRadius > 0) || !(height >= tipRadius) || !(height / tipRadius <= MAX_ROD_ASPECT)) return Number.NaN;
  const { x, y, slope } = enhancementTable();
  const u = Math.log(height / tipRadius);
  const step = x[1] - x[0];
  const k = Math.min(TABLE_NODES - 2, Math.max(0, Math.floor(u / step)));
  const t = (u - x[k]) / step;
  const h00 = (1 + 2 * t) * (1 - t) ** 2;
  const h10 = t * (1 - t) ** 2;
  const h01 = t * t * (3 - 2 * t);
  const h11 = t * t * (t - 1);
  return Math.exp(h00 * y[k] + h10 * step * slope[k] + h01 * y[k + 1] + h11 * step * slope[k + 1]);
}

/** Growth of the sphere's panels away from the rod (the first is as long as a cap panel). */
const SPHERE_GROWTH = 1.2;
/** Largest sphere panel, as an angle (rad). */
const SPHERE_LARGEST_PANEL = Math.PI / 24;

/**
 * The panels of a sphere of radius R centred at z = 0 with a rod of height l (from the pole to the
 * apex) and tip radius a standing on its north pole: the sphere's meridian from the south pole to
 * where it meets the rod's side (panels growing geometrically away from the rod, at most π/24),
 * then the rod (rodPanels, raised onto the sphere).
 */
export function sphereWithRodPanels(height: number, tipRadius: number, sphereRadius: number): PanelShape[] {
  const meet = Math.acos(tipRadius / sphereRadius);
  const edges: number[] = [meet];
  let size = (0.5 * Math.PI * tipRadius) / ROD_CAP_PANELS / sphereRadius;
  let angle = meet;
  while (angle - size > -Math.PI / 2 + 0.5 * size) {
    angle -= size;
    edges.push(angle);
    size = Math.min(size * SPHERE_GROWTH, SPHERE_LARGEST_PANEL);
  }
  edges.push(-Math.PI / 2);
  const shapes: PanelShape[] = [];
  for (let k = edges.length - 1; k > 0; k--) {
    const angle0 = edges[k];
    const angle1 = edges[k - 1];
    const position = sphereRadius * 0.5 * (angle0 + angle1);
    shapes.push({ kind: 'arc', centerR: 0, centerZ: 0, radius: sphereRadius, angle0, angle1, position });
  }
  const base = Math.sqrt(sphereRadius ** 2 - tipRadius ** 2);
  for (const shape of rodPanels(sphereRadius + height - base, tipRadius)) {
    if (shape.kind === 'line') shapes.push({ ...shape, z0: shape.z0 + base, z1: shape.z1 + base });
    else if (shape.kind === 'arc') shapes.push({ ...shape, centerZ: shape.centerZ + base });
  }
  return shapes;
}

/**
 * Apex enhancement of a rod standing on the pole of an isolated sphere at 1 V: the tip field over
 * the bare sphere's surface field 1/R (exact, [jackson1999]), by the boundary-element solve of the
 * sphere and the rod together (all on the axis, so the solve is exact to discretisation). It falls
 * below the plane value `rodEnhancement` as the rod grows against R (the field of a curved surface
 * decays over the rod's height). NaN when l < a, a ≥ R/2 or l/a > 4·MAX_ROD_ASPECT.
 */
export function rodOnSphereEnhancement(height: number, tipRadius: number, sphereRadius: number): number {
  if (!(tipRadius > 0) || !(height >= tipRadius) || !(height / tipRadius <= 4 * MAX_ROD_ASPECT)) return Number.NaN;
  if (!(tipRadius < 0.5 * sphereRadius)) return Number.NaN;
  const layout = buildPanelLayout(sphereWithRodPanels(height, tipRadius, sphereRadius));
  const n = layout.count;
  const matrix = assembleCollocationMatrix(layout, false, true);
  const pivots = luFactor(matrix, n);
  if (!pivots) return Number.NaN;
  const density = new Float64Array(n).fill(1);
  luSolve(matrix, n, pivots, density);
  const field = (j: number) => density[j] / VACUUM_PERMITTIVITY;
  const last = n - 1;
  const s0 = layout.midR[last];
  const s1 = layout.midR[last - 1];
  const c2 = (field(last - 1) - field(last)) / (s1 * s1 - s0 * s0);
  return (field(last) - c2 * s0 * s0) * sphereRadius;
}

/**
 * The apex field of a solved rod whose cap ends with panel `last` (the apex panel, its neighbour
 * before it), V/m per unit density scale: σ is even in the distance s from the axis, so
 * c0 + c2·s² is fitted through the two panels nearest the apex (as in the solves above) and c0
 * returned, σ/ε0 with the sign of the density.
 */
export function apexField(layout: PanelLayout, density: ArrayLike<number>, last: number): number {
  const field = (j: number) => density[j] / VACUUM_PERMITTIVITY;
  const s0 = layout.midR[last];
  const s1 = layout.midR[last - 1];
  const c2 = (field(last - 1) - field(last)) / (s1 * s1 - s0 * s0);
  return field(last) - c2 * s0 * s0;
}
