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
import { ROD_CAP_PANELS, rodOnAxisPanels } from './breakout-rod.ts';
import type { PanelShape } from './panels.ts';

/** Toroid: tube circle of radius `minorRadius` around (majorRadius, centerZ), SI. */
export interface ToroidBody {
  shape: 'toroid';
  majorRadius: number;
  minorRadius: number;
  centerZ: number;
  /** A flat conducting disc filling the hole (radius R − r, in the mid-plane) at the toroid's potential. */
  centerDisc?: boolean;
  /** A breakout rod standing up on the axis from the centre disc (only with `centerDisc`). */
  axisRod?: AxisRod;
  /** Multiplies the attachments' panel counts (convergence checks; default 1). */
  attachmentResolution?: number;
}

/**
 * A round rod of radius `tipRadius` ending in a hemispherical cap, standing up on the axis from the
 * top of a topload (a sphere's north pole, a toroid's centre disc), at the topload's potential, SI.
 * `height` runs from the surface it stands on to the apex (cap included), as in breakout-rod.ts.
 */
export interface AxisRod {
  height: number;
  tipRadius: number;
}

/** Sphere of radius `radius` centred on the axis at `centerZ`, SI. */
export interface SphereBody {
  shape: 'sphere';
  radius: number;
  centerZ: number;
  /** A breakout rod standing up on the north pole. */
  axisRod?: AxisRod;
  /** Multiplies the rod's panel counts (convergence checks; default 1). */
  attachmentResolution?: number;
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

// ---- Attachments of a topload: a toroid's centre disc and a rod on the axis -------------------

/** Panels of a toroid's centre disc outside the rod's foot (uniform: no edge singularity, see below); its capacitance
 * and the field at its centre move < 0.04 % from 12 to 48 panels on the example gallery coil. */
const CENTER_DISC_PANELS = 12;
/** Panels of the disc under the rod's foot (its underside is exposed; the top is inside the rod). */
const CENTER_DISC_FOOT_PANELS = 3;
/** Growth of the disc's panels away from a rod's foot. */
const DISC_GROWTH = 1.3;
/** Growth of a sphere's panels away from a rod on its pole, and the largest as an angle (as breakout-rod.ts). */
const SPHERE_ROD_GROWTH = 1.2;
const SPHERE_ROD_LARGEST_PANEL = Math.PI / 24;

/** Radius of a toroid's centre disc: it fills the hole to the tube's inner equator, m. */
export function centerDiscRadius(body: ToroidBody): number {
  return body.majorRadius - body.minorRadius;
}

/**
 * A sphere's meridian from the south pole up to where a rod of radius a on its north pole meets it
 * (angle arccos(a/R)), the panels growing geometrically away from the rod (the first as long as a
 * cap panel) up to the smaller of π/24 and the sphere's uniform panel π/count.
 */
export function sphereUnderRodPanels(body: SphereBody, panelCount: number): PanelShape[] {
  const rod = body.axisRod;
  if (!rod) return spherePanels(body, panelCount);
  const scale = body.attachmentResolution ?? 1;
  const capPanels = Math.max(2, Math.round(ROD_CAP_PANELS * scale));
  const largest = Math.min(SPHERE_ROD_LARGEST_PANEL / scale, Math.PI / panelCount);
  const meet = Math.acos(rod.tipRadius / body.radius);
  const edges: number[] = [meet];
  let size = (0.5 * Math.PI * rod.tipRadius) / capPanels / body.radius;
  let angle = meet;
  while (angle - size > -Math.PI / 2 + 0.5 * size) {
    angle -= size;
    edges.push(angle);
    size = Math.min(size * (1 + (SPHERE_ROD_GROWTH - 1) / scale), largest);
  }
  edges.push(-Math.PI / 2);
  const shapes: PanelShape[] = [];
  for (let k = edges.length - 1; k > 0; k--) {
    const angle0 = edges[k];
    const angle1 = edges[k - 1];
    const position = body.radius * 0.5 * (angle0 + angle1);
    shapes.push({ kind: 'arc', centerR: 0, centerZ: body.centerZ, radius: body.radius, angle0, angle1, position });
  }
  return shapes;
}

/**
 * The panels of what is joined to a topload at its potential, after the body's own panels: a
 * toroid's centre disc (a thin sheet from the axis to the tube's inner equator, where the tube's
 * panels have an edge; an edge of it at the rod's radius when a rod stands on it), then a rod on the
 * axis (its apex panel last of all). The disc meets the tube and the rod at right angles, so its
 * charge density has no edge singularity there (the field vanishes in a 90° corner of air): uniform
 * panels. Empty for a body with neither (every arrangement without them is solved as before).
 */
export function attachmentPanels(body: ToploadBody): PanelShape[] {
  if (body.shape === 'disc') return [];
  const scale = body.attachmentResolution ?? 1;
  const rod = body.axisRod;
  const shapes: PanelShape[] = [];
  if (body.shape === 'toroid') {
    if (!body.centerDisc) return [];
    const outer = centerDiscRadius(body);
    const foot = rod ? rod.tipRadius : 0;
    const footPanels = rod ? Math.max(1, Math.round(CENTER_DISC_FOOT_PANELS * scale)) : 0;
    const discPanels = Math.max(2, Math.round(CENTER_DISC_PANELS * scale));
    const edges: number[] = [0];
    for (let k = 1; k <= footPanels; k++) edges.push((foot * k) / footPanels);
    if (rod) {
      // From the rod's foot outward the panels grow geometrically from half the tip radius up to
      // the uniform size (the rod draws the charge near its foot on a scale of its radius).
      const uniform = (outer - foot) / discPanels;
      let size = Math.min(uniform, 0.5 * foot);
      let r = foot;
      while (r + size < outer - 0.5 * size) {
        r += size;
        edges.push(r);
        size = Math.min(uniform, size * (1 + (DISC_GROWTH - 1) / scale));
      }
      edges.push(outer);
    } else for (let k = 1; k <= discPanels; k++) edges.push(foot + ((outer - foot) * k) / discPanels);
    for (let k = 0; k + 1 < edges.length; k++) {
      const r0 = edges[k];
      const r1 = edges[k + 1];
      shapes.push({ kind: 'line', r0, z0: body.centerZ, r1, z1: body.centerZ, position: 0.5 * (r0 + r1) });
    }
    if (rod) shapes.push(...rodOnAxisPanels(body.centerZ, rod.height - rod.tipRadius, rod.tipRadius, scale));
    return shapes;
  }
  if (!rod) return [];
  // On a sphere the rod's side meets the surface at height √(R² − a²) above the centre.
  const base = Math.sqrt(body.radius ** 2 - rod.tipRadius ** 2);
  const cylinder = body.radius + rod.height - base - rod.tipRadius;
  shapes.push(...rodOnAxisPanels(body.centerZ + base, cylinder, rod.tipRadius, scale));
  return shapes;
}
