/**
 * Meridian curves of the bodies of an arrangement, cut into graded panels.
 *
 * Grading puts panels where the surface charge varies fastest: on a toroid around its outer
 * equator (where the peak field sits), on the winding toward both open ends, much more toward the
 * top (an open sheet's charge density rises like 1/√distance toward its edge), on a disc toward
 * the rim. Every mapping is a smooth monotone function of a uniform parameter, so doubling the
 * panel count halves every panel and the convergence rule (doubling changes capacitance by
 * < 0.2 %) can be checked directly.
 */
import type { PanelShape } from './panels.ts';

/** Toroid: tube circle of radius `minorRadius` around (majorRadius, centerZ), SI. */
export interface ToroidBody {
  shape: 'toroid';
  majorRadius: number;
  minorRadius: number;
  centerZ: number;
}

/** Sphere of radius `radius` centred on the axis at `centerZ`, SI. */
export interface SphereBody {
  shape: 'sphere';
  radius: number;
  centerZ: number;
}

/** Thin flat disc (zero thickness) of radius `radius` at height `centerZ`, SI (reference checks). */
export interface DiscBody {
  shape: 'disc';
  radius: number;
  centerZ: number;
}

/** A topload body of the field solve (the disc serves the reference checks). */
export type ToploadBody = ToroidBody | SphereBody | DiscBody;

/** The secondary winding as a cylindrical sheet at the wire's centre radius, SI. */
export interface WindingBody {
  radius: number;
  bottomZ: number;
  topZ: number;
}

/** A grounded thin ring (primary turn, strike rail), SI. */
export interface GroundedRing {
  /** Centre-line radius, m. */
  r: number;
  /** Height above the floor, m. */
  z: number;
  /** Conductor radius, m. */
  wireRadius: number;
}

/** Strength of the toroid's grading toward the outer equator (0 uniform, < 1). */
const TOROID_GRADING = 0.3;
/** Share of the winding's panel mapping that clusters toward the ends (Chebyshev-like). */
const WINDING_END_CLUSTERING = 0.85;
/** Exponent that biases the winding's panels toward the top. */
const WINDING_TOP_BIAS = 1.6;

/**
 * Panels around a toroid's tube circle, an odd count so that one panel is centred on the outer
 * equator (angle 0). Angle θ = π·(u − (α/π) sin πu), u uniform on [−1, 1]: panels are (1 − α)/(1 + α)
 * times shorter at the outer equator than at the inner one.
 * @param inward true to grade toward the inner equator instead (α → −α), where the peak sits when
 *   the tube hugs the top of the winding
 */
export function toroidPanels(body: ToroidBody, panelCount: number, inward = false): PanelShape[] {
  const count = panelCount % 2 === 1 ? panelCount : panelCount + 1;
  const grading = inward ? -TOROID_GRADING : TOROID_GRADING;
  const angles: number[] = [];
  for (let k = 0; k <= count; k++) {
    const u = -1 + (2 * k) / count;
    angles.push(Math.PI * (u - (grading / Math.PI) * Math.sin(Math.PI * u)));
  }
  const shapes: PanelShape[] = [];
  for (let k = 0; k < count; k++) {
    const mid = 0.5 * (angles[k] + angles[k + 1]);
    shapes.push({
      kind: 'arc',
      centerR: body.majorRadius,
      centerZ: body.centerZ,
      radius: body.minorRadius,
      angle0: angles[k],
      angle1: angles[k + 1],
      position: body.minorRadius * mid,
    });
  }
  return shapes;
}

/** Panels on a sphere's meridian from the south pole to the north pole, uniform in angle. */
export function spherePanels(body: SphereBody, panelCount: number): PanelShape[] {
  const shapes: PanelShape[] = [];
  for (let k = 0; k < panelCount; k++) {
    const angle0 = -Math.PI / 2 + (Math.PI * k) / panelCount;
    const angle1 = -Math.PI / 2 + (Math.PI * (k + 1)) / panelCount;
    shapes.push({
      kind: 'arc',
      centerR: 0,
      centerZ: body.centerZ,
      radius: body.radius,
      angle0,
      angle1,
      position: body.radius * 0.5 * (angle0 + angle1),
    });
  }
  return shapes;
}

/** Panels on a thin disc from the axis to the rim, r = a·sin(πu/2) (clustered at the rim). */
export function discPanels(body: DiscBody, panelCount: number): PanelShape[] {
  const shapes: PanelShape[] = [];
  for (let k = 0; k < panelCount; k++) {
    const r0 = body.radius * Math.sin((Math.PI * k) / (2 * panelCount));
    const r1 = body.radius * Math.sin((Math.PI * (k + 1)) / (2 * panelCount));
    shapes.push({ kind: 'line', r0, z0: body.centerZ, r1, z1: body.centerZ, position: 0.5 * (r0 + r1) });
  }
  return shapes;
}

/**
 * Fraction of the winding length below node u ∈ [0, 1]: a blend of uniform spacing and the
 * Chebyshev map (1 − cos πv)/2, with v = 1 − (1 − u)^b biasing the clustering toward the top.
 */
export function windingNodeFraction(u: number): number {
  const v = 1 - (1 - u) ** WINDING_TOP_BIAS;
  return (1 - WINDING_END_CLUSTERING) * v + WINDING_END_CLUSTERING * 0.5 * (1 - Math.cos(Math.PI * v));
}

/** Panels on the winding's cylindrical sheet from the base up. */
export function windingPanels(body: WindingBody, panelCount: number): PanelShape[] {
  const length = body.topZ - body.bottomZ;
  const shapes: PanelShape[] = [];
  for (let k = 0; k < panelCount; k++) {
    const z0 = body.bottomZ + length * windingNodeFraction(k / panelCount);
    const z1 = body.bottomZ + length * windingNodeFraction((k + 1) / panelCount);
    shapes.push({ kind: 'line', r0: body.radius, z0, r1: body.radius, z1, position: 0.5 * (z0 + z1) - body.bottomZ });
  }
  return shapes;
}

/** One element per grounded ring. */
export function groundedRingPanels(rings: readonly GroundedRing[]): PanelShape[] {
  return rings.map((ring) => ({ kind: 'thin_ring', r: ring.r, z: ring.z, wireRadius: ring.wireRadius }));
}
