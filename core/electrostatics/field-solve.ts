/**
 * One electrostatic field solve of an axisymmetric arrangement: topload, secondary winding with
 * its voltage distribution, grounded rings (primary turns, strike rail) and the floor as an image
 * plane; ring-charge boundary elements (panels.ts, assembly.ts), dense LU (dense-lu.ts).
 *
 * Definitions (potentials per volt at the top of the winding, V = 1):
 * - winding: a cylindrical sheet at the wire's centre radius from the base to the top whose
 *   potential is φ(z): linear, (z − base)/length, or a quarter-wave sine, sin(π/2·(z − base)/length);
 *   the coil form's dielectric is ignored (the sheet sits in air);
 * - topload at 1, grounded rings and the floor at 0;
 * - total capacitance (energy based): C_total = 2W/V² with W = ½ Σ q_i V_i over all real charges,
 *   i.e. C_total = Σ_j ∫_j σ φ dA (the images carry no energy of their own: the floor is at 0);
 * - topload capacitance: the charge on the topload per volt (in situ, with the winding and the
 *   grounds present);
 * - secondary self-capacitance: the same energy capacitance for the winding alone (no topload, the
 *   same grounds and floor);
 * - surface field on the topload (a conductor): E = σ/ε0, peak refined by a parabola through the
 *   largest collocation value and its neighbours;
 * - winding top field: the outside normal field of the sheet, mean over its top 5 % of length
 *   (a sheet's edge density is singular, so its pointwise peak depends on the mesh; the band mean
 *   converges). It is the field of the equivalent sheet, not of a wire's surface.
 *
 * Panel counts (accuracy-targeted, checked in the tests against a fine reference solve over
 * seeded random arrangements): `defaultPanelCounts` gives the topload the fewest panels that keep
 * its peak field and the capacitances within 0.3 % of a solve with four times the panels. The rule
 * is an error model fitted to a scan of 200 random arrangements (for each, the smallest topload
 * count whose peak field, topload and total capacitance all stay within 0.15 %, half the budget):
 * a smooth toroid far from everything needs 11–15 panels, and the count needed grows about
 * linearly with tube radius / effective clearance (a crowded underside draws a narrow peak),
 * at most 58 panels per unit of that ratio in the scan; a sphere 7–11 and at most 25 per unit.
 * The capacitances are far less sensitive (within 0.07 % at these counts). `resolution` multiplies
 * the counts.
 */
import {
  attachmentPanels,
  discPanels,
  sphereUnderRodPanels,
  groundedRingPanels,
  spherePanels,
  toroidPanels,
  windingPanels,
  type GroundedRing,
  type ToploadBody,
  type WindingBody,
} from './bodies.ts';
import { assembleCollocationMatrix } from './assembly.ts';
import { luFactor, luSolve } from './dense-lu.ts';
import { buildPanelLayout, type PanelLayout, type PanelShape } from './panels.ts';
import { VACUUM_PERMITTIVITY } from './ring-kernel.ts';
import { windingOutsideField } from './surface-field.ts';
import { must } from '../must.ts';

/** A top-normalised voltage along the winding as a function of the fraction of its length (0 at the base). */
export type VoltageShape = (fraction: number) => number;

/**
 * Voltage distribution along the winding: linear, a quarter sine, or a computed shape (the
 * distributed resonator's fundamental, core/resonator/design-resonator.ts).
 */
export type WindingProfile = 'linear' | 'quarter_wave' | VoltageShape;

/** The shape of a profile. */
export function profileShape(profile: WindingProfile): VoltageShape {
  if (typeof profile === 'function') return profile;
  return profile === 'quarter_wave' ? (x) => Math.sin((Math.PI / 2) * x) : (x) => x;
}

/** What the field solve sees, SI, heights above the floor. */
export interface FieldArrangement {
  topload?: ToploadBody;
  winding?: WindingBody & { profile: WindingProfile };
  groundedRings?: readonly GroundedRing[];
  /** Include the grounded floor z = 0 (image plane). */
  floor: boolean;
}

/** Panel counts per body (grounded rings are one element each). */
export interface PanelCounts {
  topload: number;
  winding: number;
}

/** How finely to cut the bodies into panels. */
export interface FieldSolveOptions {
  /** Multiplies the default panel counts (2 doubles every count). Default 1. */
  resolution?: number;
  /** Explicit counts, overriding the defaults. */
  panelCounts?: Partial<PanelCounts>;
}

/** Result of `solveField`, per volt at the top of the winding (or on the topload alone), SI. */
export interface FieldSolution {
  panelCounts: PanelCounts;
  /** Unknowns of the full system. */
  unknowns: number;
  /** Energy-based capacitance 2W/V², F. */
  totalCapacitance: number;
  /** Topload charge per volt, F (null without a topload). */
  toploadCapacitance: number | null;
  /** Energy capacitance of the winding alone (no topload), F (null without a winding). */
  selfCapacitance: number | null;
  /** Peak topload surface field per volt, 1/m. */
  toploadPeakFieldPerVolt: number | null;
  /** Where the peak sits, rad: angle around the tube (toroid) or elevation angle (sphere), 0 at
   * the outer equator, positive upward; null for a disc. */
  toploadPeakAngle: number | null;
  /** Topload surface field per volt at its lowest point (angle −π/2), 1/m. */
  toploadUndersideFieldPerVolt: number | null;
  /** Mean outside field of the winding sheet per volt over its top 5 %, 1/m. */
  windingTopFieldPerVolt: number | null;
  /** Panels and solved densities (σ, C/m² per volt; λ, C/m per volt for thin rings). */
  layout: PanelLayout;
  density: Float64Array;
  /** Index range of the topload's panels in the layout. */
  toploadPanels: { first: number; count: number };
}

/** Base panel counts: toroid 15, sphere 12, disc 40, winding 24 (see the accuracy tests). */
export const BASE_PANEL_COUNTS = { toroid: 15, sphere: 12, disc: 40, winding: 24 } as const;

/**
 * Most panels a topload gets from the clearance rule: toroid 55, sphere 72. Beyond about 57 toroid
 * panels a doubling no longer shrinks the capacitance change (it stays near 3·10⁻⁵, the floor of
 * the entries' distance-tiered quadrature, measured on a toroid 5 cm above the floor), so more
 * panels buy peak-field accuracy only in the rare arrangements where the tube hugs the winding.
 */
const MAX_PANEL_COUNTS = { toroid: 55, sphere: 72 } as const;

/**
 * Panels per unit of (curvature radius / effective clearance) on a toroid's tube circle and on a
 * sphere's meridian: a grounded ring, the floor or the low part of the winding close to the
 * topload draws a narrow field peak that the base count would not resolve. Fitted to the scan of
 * the header (58 and 25 the largest there, rounded up for a margin).
 */
const TOROID_PANELS_PER_GAP_RATIO = 60;
const SPHERE_PANELS_PER_GAP_RATIO = 26;

/** Winding points sampled for the clearance rule. */
const CLEARANCE_SAMPLES = 16;

/**
 * Effective clearance between the topload's surface and the nearest object at another potential,
 * m: the floor and the grounded rings by distance, the winding by distance / √(1 − φ) (its parts
 * near the top are nearly at the topload's potential and draw less field; the square root is a
 * compromise found by the convergence scan, between no weighting and the parallel-plate 1/(1 − φ)).
 */
function effectiveClearance(arrangement: FieldArrangement): { clearance: number; inner: boolean } {
  const topload = arrangement.topload;
  if (!topload || topload.shape === 'disc') return { clearance: Number.POSITIVE_INFINITY, inner: false };
  const centreR = topload.shape === 'toroid' ? topload.majorRadius : 0;
  const radius = topload.shape === 'toroid' ? topload.minorRadius : topload.radius;
  const surfaceDistance = (r: number, z: number) => Math.hypot(r - centreR, z - topload.centerZ) - radius;
  let clearance = arrangement.floor ? topload.centerZ - radius : Number.POSITIVE_INFINITY;
  // Whether the object that sets the clearance lies on the inner side of the tube's centre.
  let inner = false;
  const consider = (distance: number, r: number) => {
    if (distance < clearance) {
      clearance = distance;
      inner = r < centreR;
    }
  };
  for (const ring of arrangement.groundedRings ?? [])
    consider(surfaceDistance(ring.r, ring.z) - ring.wireRadius, ring.r);
  const winding = arrangement.winding;
  if (winding) {
    for (let k = 0; k < CLEARANCE_SAMPLES; k++) {
      const z = winding.bottomZ + ((winding.topZ - winding.bottomZ) * k) / CLEARANCE_SAMPLES;
      const difference = 1 - windingPotential(winding, z);
      if (difference > 0) consider(surfaceDistance(winding.radius, z) / Math.sqrt(difference), winding.radius);
    }
  }
  return { clearance, inner };
}

/**
 * Whether a toroid's panels are graded toward its inner equator: when the object that sets its
 * clearance lies inside the tube's centre radius and is close enough to raise the count above the
 * base (it then draws the peak to the tube's inner side; found on the tubes that hug the top of the
 * winding, whose peak error fell from 1.3 % to 0.01 % at 55 panels).
 */
export function toroidGradedInward(arrangement: FieldArrangement): boolean {
  const topload = arrangement.topload;
  if (topload?.shape !== 'toroid') return false;
  const { clearance, inner } = effectiveClearance(arrangement);
  return (
    inner && clearance > 0 && TOROID_PANELS_PER_GAP_RATIO * topload.minorRadius > BASE_PANEL_COUNTS.toroid * clearance
  );
}

/**
 * Panel counts of an arrangement. The topload gets its base count, raised when an object at another
 * potential comes close (to at most 55 or 72): count ≥ 60·r/gap on a toroid (r the tube radius),
 * ≥ 26·a/gap on a sphere, gap the effective clearance (floor and grounded rings by
 * distance, the winding by distance/√(1 − φ)). The winding always gets the base count.
 * `resolution` multiplies all.
 */
export function defaultPanelCounts(arrangement: FieldArrangement, resolution = 1): PanelCounts {
  const topload = arrangement.topload;
  let toploadCount = 0;
  if (topload) {
    const { clearance } = effectiveClearance(arrangement);
    if (topload.shape === 'toroid') {
      const wanted = clearance > 0 ? Math.ceil((TOROID_PANELS_PER_GAP_RATIO * topload.minorRadius) / clearance) : 0;
      toploadCount = Math.min(MAX_PANEL_COUNTS.toroid, Math.max(BASE_PANEL_COUNTS.toroid, wanted));
    } else if (topload.shape === 'sphere') {
      const wanted = clearance > 0 ? Math.ceil((SPHERE_PANELS_PER_GAP_RATIO * topload.radius) / clearance) : 0;
      toploadCount = Math.min(MAX_PANEL_COUNTS.sphere, Math.max(BASE_PANEL_COUNTS.sphere, wanted));
    } else {
      toploadCount = BASE_PANEL_COUNTS.disc;
    }
  }
  const scaleCount = (count: number) => Math.max(1, Math.round(count * resolution));
  return {
    topload: topload ? scaleCount(toploadCount) : 0,
    winding: arrangement.winding ? scaleCount(BASE_PANEL_COUNTS.winding) : 0,
  };
}

/** The share of the winding length at the top over which the top field is averaged. */
export const WINDING_TOP_BAND = 0.05;

function windingPotential(winding: NonNullable<FieldArrangement['winding']>, z: number): number {
  const x = (z - winding.bottomZ) / (winding.topZ - winding.bottomZ);
  if (typeof winding.profile === 'function') return winding.profile(x);
  return winding.profile === 'quarter_wave' ? Math.sin((Math.PI / 2) * x) : x;
}

/** ∫ φ dA over panel j (4-point Gauss nodes). */
function potentialWeightedArea(layout: PanelLayout, j: number, potential: (z: number) => number): number {
  let sum = 0;
  for (let q = 0; q < 4; q++) sum += 2 * Math.PI * layout.gauss4W[4 * j + q] * potential(layout.gauss4Z[4 * j + q]);
  return sum;
}

/** Parabola vertex through three points, clamped to the bracket; returns [x, y]. */
function parabolaPeak(x0: number, y0: number, x1: number, y1: number, x2: number, y2: number): [number, number] {
  const denominator = (x0 - x1) * (x0 - x2) * (x1 - x2);
  if (denominator === 0) return [x1, y1];
  const a = (x2 * (y1 - y0) + x1 * (y0 - y2) + x0 * (y2 - y1)) / denominator;
  const b = (x2 * x2 * (y0 - y1) + x1 * x1 * (y2 - y0) + x0 * x0 * (y1 - y2)) / denominator;
  if (!(a < 0)) return [x1, y1];
  const xv = Math.min(Math.max(-b / (2 * a), Math.min(x0, x2)), Math.max(x0, x2));
  const c = y1 - a * x1 * x1 - b * x1;
  return [xv, Math.max(y1, a * xv * xv + b * xv + c)];
}

function midAngle(layout: PanelLayout, j: number): number {
  const o = 5 * j;
  return 0.5 * (layout.geometry[o + 3] + layout.geometry[o + 4]);
}

/** Peak field, its angle and the underside field over the topload's panels. */
function toploadFields(
  topload: ToploadBody,
  layout: PanelLayout,
  density: Float64Array,
  first: number,
  count: number,
): { peak: number; angle: number | null; underside: number } {
  const field = (k: number) => Math.abs(density[first + k]) / VACUUM_PERMITTIVITY;
  let best = 0;
  for (let k = 1; k < count; k++) if (field(k) > field(best)) best = k;
  if (topload.shape === 'disc') return { peak: field(best), angle: null, underside: field(0) };
  const angle = (k: number) => midAngle(layout, first + k);
  let x0: number, y0: number, x2: number, y2: number;
  if (topload.shape === 'toroid') {
    const before = (best - 1 + count) % count;
    const after = (best + 1) % count;
    x0 = angle(before) - (before > best ? 2 * Math.PI : 0);
    x2 = angle(after) + (after < best ? 2 * Math.PI : 0);
    y0 = field(before);
    y2 = field(after);
  } else if (best === 0) {
    // South pole: the field is even about the pole (mirror the first panel).
    x0 = -Math.PI - angle(0);
    y0 = field(0);
    x2 = angle(1);
    y2 = field(1);
  } else if (best === count - 1) {
    x0 = angle(best - 1);
    y0 = field(best - 1);
    x2 = Math.PI - angle(best);
    y2 = field(best);
  } else {
    x0 = angle(best - 1);
    y0 = field(best - 1);
    x2 = angle(best + 1);
    y2 = field(best + 1);
  }
  const [peakAngle, peak] = parabolaPeak(x0, y0, angle(best), field(best), x2, y2);
  // Underside (angle −π/2): linear interpolation between the collocation points around it.
  let underside = field(0);
  if (topload.shape === 'toroid') {
    for (let k = 0; k < count - 1; k++) {
      const a0 = angle(k);
      const a1 = angle(k + 1);
      if (a0 <= -Math.PI / 2 && a1 >= -Math.PI / 2) {
        const w = (-Math.PI / 2 - a0) / (a1 - a0);
        underside = (1 - w) * field(k) + w * field(k + 1);
        break;
      }
    }
  } else {
    // Sphere: even about the south pole; linear extrapolation of the first two panels to the pole.
    const a0 = angle(0) + Math.PI / 2;
    const a1 = angle(1) + Math.PI / 2;
    const y0f = field(0);
    const y1f = field(1);
    // Even function: fit y = c0 + c2·a² through the two points.
    const c2 = (y1f - y0f) / (a1 * a1 - a0 * a0);
    underside = y0f - c2 * a0 * a0;
  }
  return { peak, angle: peakAngle, underside };
}

let matrixBuffer = new Float64Array(0);
/**
 * Scratch memory for the collocation matrix, reused from one solve to the next (a solve is
 * synchronous and nothing it returns refers to it), so that a sweep does not allocate and zero a
 * fresh n² array per design. Shared with the node capacitance matrix (capacitance-matrix.ts), which
 * never runs inside a field solve nor a field solve inside it.
 */
export function matrixScratch(size: number): Float64Array {
  if (matrixBuffer.length < size) matrixBuffer = new Float64Array(Math.max(size, 2 * matrixBuffer.length));
  return matrixBuffer;
}

/** Solves the arrangement for V = 1 at the top; null when the system is singular. */
export function solveField(arrangement: FieldArrangement, options: FieldSolveOptions = {}): FieldSolution | null {
  const defaults = defaultPanelCounts(arrangement, options.resolution ?? 1);
  const counts: PanelCounts = {
    topload: arrangement.topload ? (options.panelCounts?.topload ?? defaults.topload) : 0,
    winding: arrangement.winding ? (options.panelCounts?.winding ?? defaults.winding) : 0,
  };
  const winding = arrangement.winding;
  const { shapes, windingCount, leadingCount } = arrangementPanels(arrangement, counts);
  const toploadCount = shapes.length - leadingCount;
  counts.topload = toploadCount;
  const layout = buildPanelLayout(shapes);
  const n = layout.count;
  if (n === 0) return null;

  const potential = new Float64Array(n);
  for (let j = 0; j < windingCount; j++) potential[j] = windingPotential(must(winding), layout.midZ[j]);
  for (let j = leadingCount; j < n; j++) potential[j] = 1;

  const matrix = assembleCollocationMatrix(layout, arrangement.floor, true, matrixScratch(n * n));
  // One factorisation whose leading block (winding and rings) is the winding-alone system's.
  const pivots = luFactor(matrix, n, leadingCount);
  if (!pivots) return null;
  let selfCapacitance: number | null = null;
  if (winding && toploadCount > 0)
    selfCapacitance = windingAloneCapacitance(matrix, n, pivots, layout, windingCount, leadingCount, winding);
  const density = potential.slice();
  luSolve(matrix, n, pivots, density);
  if (!density.every(Number.isFinite)) return null;

  let totalCapacitance = 0;
  if (winding) totalCapacitance += windingEnergyCapacitance(layout, density, windingCount, winding);
  const surface = densityFields(arrangement, layout, density, windingCount, leadingCount);
  if (surface.toploadCapacitance !== null) totalCapacitance += surface.toploadCapacitance;
  if (winding && toploadCount === 0) selfCapacitance = totalCapacitance;
  const { toploadCapacitance, windingTopFieldPerVolt } = surface;

  return {
    panelCounts: counts,
    unknowns: n,
    totalCapacitance,
    toploadCapacitance,
    selfCapacitance,
    toploadPeakFieldPerVolt: surface.toploadPeakFieldPerVolt,
    toploadPeakAngle: surface.toploadPeakAngle,
    toploadUndersideFieldPerVolt: surface.toploadUndersideFieldPerVolt,
    windingTopFieldPerVolt,
    layout,
    density,
    toploadPanels: { first: leadingCount, count: ownToploadCount(arrangement, toploadCount) },
  };
}

/** The topload body's own panels among its `toploadCount` (the attachments' panels follow them). */
export function ownToploadCount(arrangement: FieldArrangement, toploadCount: number): number {
  const topload = arrangement.topload;
  return topload && toploadCount > 0 ? toploadCount - attachmentPanels(topload).length : toploadCount;
}

/**
 * The panels of an arrangement in the solve's order: the winding, the grounded rings, the topload
 * last, so that the winding-alone system is the leading block of the matrix.
 */
export function arrangementPanels(
  arrangement: FieldArrangement,
  counts: PanelCounts,
): { shapes: PanelShape[]; windingCount: number; leadingCount: number } {
  const shapes: PanelShape[] = [];
  if (arrangement.winding) shapes.push(...windingPanels(arrangement.winding, counts.winding));
  const windingCount = shapes.length;
  shapes.push(...groundedRingPanels(arrangement.groundedRings ?? []));
  const leadingCount = shapes.length;
  const topload = arrangement.topload;
  if (topload?.shape === 'toroid')
    shapes.push(...toroidPanels(topload, counts.topload, toroidGradedInward(arrangement)));
  else if (topload?.shape === 'sphere')
    shapes.push(
      ...(topload.axisRod ? sphereUnderRodPanels(topload, counts.topload) : spherePanels(topload, counts.topload)),
    );
  else if (topload?.shape === 'disc') shapes.push(...discPanels(topload, counts.topload));
  // What is joined to the topload (a toroid's centre disc, a rod on the axis) follows its own panels.
  if (topload) shapes.push(...attachmentPanels(topload));
  return { shapes, windingCount, leadingCount };
}

/**
 * The energy capacitance of the winding alone (the topload absent): the leading block (winding and
 * rings) of a collocation matrix factored by `luFactor(matrix, n, leadingCount)`, whose first
 * `leadingCount` steps are the factorisation of that block alone (dense-lu.ts), solved for the
 * winding's potentials at its panel midpoints.
 */
export function windingAloneCapacitance(
  factors: Float64Array,
  n: number,
  pivots: Int32Array,
  layout: PanelLayout,
  windingCount: number,
  leadingCount: number,
  winding: NonNullable<FieldArrangement['winding']>,
): number {
  const alone = new Float64Array(leadingCount);
  for (let j = 0; j < windingCount; j++) alone[j] = windingPotential(winding, layout.midZ[j]);
  luSolve(factors, n, pivots, alone, leadingCount);
  return windingEnergyCapacitance(layout, alone, windingCount, winding);
}

/** What a solved surface density gives: the topload's charge and fields, the winding's top field (per volt). */
export interface SurfaceFields {
  toploadCapacitance: number | null;
  toploadPeakFieldPerVolt: number | null;
  toploadPeakAngle: number | null;
  toploadUndersideFieldPerVolt: number | null;
  windingTopFieldPerVolt: number | null;
  /** The panels and the density these fields come from (σ, C/m² per volt; λ for thin rings). */
  layout: PanelLayout;
  density: Float64Array;
  /** Index range of the topload's panels in the layout. */
  toploadPanels: { first: number; count: number };
}

/**
 * The topload's charge and surface fields and the winding's top field of a density solved on a
 * layout whose panels are the winding's (the first `windingCount`), the grounded rings, then the
 * topload's (from `leadingCount` on): the field solve's own density, or one formed by superposition
 * (capacitance-matrix.ts).
 */
export function densityFields(
  arrangement: FieldArrangement,
  layout: PanelLayout,
  density: Float64Array,
  windingCount: number,
  leadingCount: number,
): SurfaceFields {
  const n = layout.count;
  const toploadCount = n - leadingCount;
  const topload = arrangement.topload;
  const winding = arrangement.winding;
  let toploadCapacitance: number | null = null;
  if (toploadCount > 0) {
    let charge = 0;
    for (let j = leadingCount; j < n; j++) charge += density[j] * layout.area[j];
    toploadCapacitance = charge;
  }
  let fields: { peak: number; angle: number | null; underside: number } | null = null;
  const ownCount = ownToploadCount(arrangement, toploadCount);
  if (topload && toploadCount > 0) fields = toploadFields(topload, layout, density, leadingCount, ownCount);

  let windingTopFieldPerVolt: number | null = null;
  if (winding && windingCount > 0) {
    // Mean over the band [top − 5 % of length, top]: each panel weighted by its overlap with it.
    const bandStart = winding.topZ - WINDING_TOP_BAND * (winding.topZ - winding.bottomZ);
    let weighted = 0;
    let overlap = 0;
    for (let i = windingCount - 1; i >= 0; i--) {
      const o = 5 * i;
      const low = Math.min(layout.geometry[o + 1], layout.geometry[o + 3]);
      const high = Math.max(layout.geometry[o + 1], layout.geometry[o + 3]);
      const inside = high - Math.max(low, bandStart);
      if (!(inside > 0)) break;
      weighted += windingOutsideField(layout, i, density, arrangement.floor) * inside;
      overlap += inside;
    }
    windingTopFieldPerVolt = Math.abs(weighted / overlap);
  }
  return {
    toploadCapacitance,
    toploadPeakFieldPerVolt: fields ? fields.peak : null,
    toploadPeakAngle: fields ? fields.angle : null,
    toploadUndersideFieldPerVolt: fields ? fields.underside : null,
    windingTopFieldPerVolt,
    layout,
    density,
    toploadPanels: { first: leadingCount, count: ownCount },
  };
}

/** Σ σ_j ∫ φ dA over the winding's panels: the winding's share of 2W at 1 V on top, F. */
export function windingEnergyCapacitance(
  layout: PanelLayout,
  density: Float64Array,
  windingCount: number,
  winding: NonNullable<FieldArrangement['winding']>,
): number {
  let sum = 0;
  const potential = (z: number) => windingPotential(winding, z);
  for (let j = 0; j < windingCount; j++) sum += density[j] * potentialWeightedArea(layout, j, potential);
  return sum;
}
