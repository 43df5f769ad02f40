/**
 * Outward normal field on the winding's sheet from a solved charge distribution.
 *
 * On a charged sheet the normal field jumps by σ/ε0; the direct (principal) value of the field of
 * all charges at a point of the sheet is the mean of the two sides, so the outside field is
 * E_out = σ/(2ε0) + E_direct (Gauss's law; e.g. Jackson 3rd ed. §1.6). The winding is a vertical
 * line in the meridian plane with normal +r, so only the radial ring field is needed (ring-kernel.ts):
 *   E_r = q/(4πε0) · (1/(π r)) [K − ((a² − r² + Δz²)/d₋²) E] / d₊,
 * which on the sheet itself (a = r) reduces to (K − E)/(π r d₊): a logarithmic singularity only,
 * integrated on the own panel with the substitution t = ±u² and 8-point Gauss–Legendre. Other
 * panels follow the distance rules of assembly.ts (midpoint, 2-point, 4-point, bisection).
 */
import { ellipticKLogPart, ellipticKSmoothPart } from './elliptic-polynomial.ts';
import { GAUSS4_NODES, GAUSS4_WEIGHTS, GAUSS8_NODES, GAUSS8_WEIGHTS } from '../gauss-legendre.ts';
import { DISTANT_RATIO, FAR_RATIO, NEAR_RATIO } from './assembly.ts';
import { PANEL_THIN_RING, panelPoint, type PanelLayout } from './panels.ts';
import { VACUUM_PERMITTIVITY } from './ring-kernel.ts';

const MAX_DEPTH = 14;
const point = new Float64Array(2);

/** 2[K − ((r′² − r² + Δz²)/d₋²)E]/(r d₊): the radial ring field (ring-kernel.ts) times 2π·4πε0/q, 1/m²; with r′ ds′ σ/(4πε0) it is the field of the charge σ·2πr′ds′. */
function radialKernel(r: number, z: number, sourceR: number, sourceZ: number): number {
  const dz = z - sourceZ;
  const plus2 = (r + sourceR) ** 2 + dz * dz;
  const minus2 = (r - sourceR) ** 2 + dz * dz;
  const m1 = minus2 / plus2;
  // K and E from one logarithm (A&S 17.3.34 and 17.3.36, as in elliptic-polynomial.ts).
  const logInverse = -Math.log(m1);
  const k = ellipticKSmoothPart(m1) + ellipticKLogPart(m1) * logInverse;
  const e =
    1 +
    m1 * (0.44325141463 + m1 * (0.0626060122 + m1 * (0.04757383546 + m1 * 0.01736506451))) +
    m1 * (0.2499836831 + m1 * (0.09200180037 + m1 * (0.04069697526 + m1 * 0.00526449639))) * logInverse;
  return ((2 / r) * (k - ((sourceR * sourceR - r * r + dz * dz) / minus2) * e)) / Math.sqrt(plus2);
}

/** ∫ r′·radialKernel ds′ over the parameter interval [ta, tb] of panel j, adaptive by distance. */
function integrateRadial(
  layout: PanelLayout,
  j: number,
  ta: number,
  tb: number,
  r: number,
  z: number,
  depth: number,
): number {
  const halfSpan = 0.5 * (tb - ta);
  const centre = 0.5 * (ta + tb);
  const pieceLength = layout.length[j] * halfSpan;
  panelPoint(layout, j, centre, point);
  const distance2 = (r - point[0]) ** 2 + (z - point[1]) ** 2;
  if (depth === 0 && distance2 >= DISTANT_RATIO * DISTANT_RATIO * pieceLength * pieceLength) {
    return (layout.area[j] / (2 * Math.PI)) * radialKernel(r, z, layout.midR[j], layout.midZ[j]);
  }
  if (depth === 0 && distance2 >= FAR_RATIO * FAR_RATIO * pieceLength * pieceLength) {
    const o = 2 * j;
    return (
      layout.gauss2W[o] * radialKernel(r, z, layout.gauss2R[o], layout.gauss2Z[o]) +
      layout.gauss2W[o + 1] * radialKernel(r, z, layout.gauss2R[o + 1], layout.gauss2Z[o + 1])
    );
  }
  if (distance2 >= NEAR_RATIO * NEAR_RATIO * pieceLength * pieceLength || depth >= MAX_DEPTH) {
    let sum = 0;
    const jacobian = 0.5 * layout.length[j] * halfSpan;
    for (let q = 0; q < 4; q++) {
      panelPoint(layout, j, centre + halfSpan * GAUSS4_NODES[q], point);
      sum += GAUSS4_WEIGHTS[q] * jacobian * point[0] * radialKernel(r, z, point[0], point[1]);
    }
    return sum;
  }
  return (
    integrateRadial(layout, j, ta, centre, r, z, depth + 1) + integrateRadial(layout, j, centre, tb, r, z, depth + 1)
  );
}

/** Own-panel radial field integral on a vertical line panel, t = ±u² removes the log. */
function selfRadial(layout: PanelLayout, j: number): number {
  const r0 = layout.midR[j];
  const z0 = layout.midZ[j];
  const half = 0.5 * layout.length[j];
  let sum = 0;
  for (let side = -1; side <= 1; side += 2) {
    for (let q = 0; q < 8; q++) {
      const u = 0.5 * (1 + GAUSS8_NODES[q]);
      const t = side * u * u;
      panelPoint(layout, j, t, point);
      // dt = 2u du, du weight ½·w.
      sum += 0.5 * GAUSS8_WEIGHTS[q] * 2 * u * half * point[0] * radialKernel(r0, z0, point[0], point[1]);
    }
  }
  return sum;
}

/**
 * Outward (+r) field just outside the winding sheet at the collocation point of winding panel i,
 * V/m, from the densities `density` of every element (σ, C/m²; λ, C/m for thin rings).
 * @param floor whether the floor's images are part of the solution
 */
export function windingOutsideField(layout: PanelLayout, i: number, density: Float64Array, floor: boolean): number {
  const r = layout.midR[i];
  const z = layout.midZ[i];
  let direct = 0;
  for (let j = 0; j < layout.count; j++) {
    let value: number;
    if (layout.kind[j] === PANEL_THIN_RING) {
      value = layout.midR[j] * radialKernel(r, z, layout.midR[j], layout.midZ[j]);
      if (floor) value -= layout.midR[j] * radialKernel(r, z, layout.midR[j], -layout.midZ[j]);
    } else {
      value = i === j ? selfRadial(layout, j) : integrateRadial(layout, j, -1, 1, r, z, 0);
      // Image panel (−σ at z′ → −z′) seen from (r, z): the same kernel with the image source.
      if (floor) value -= integrateRadialImage(layout, j, r, z);
    }
    direct += density[j] * value;
  }
  return density[i] / (2 * VACUUM_PERMITTIVITY) + direct / (4 * Math.PI * VACUUM_PERMITTIVITY);
}

function integrateRadialImage(layout: PanelLayout, j: number, r: number, z: number): number {
  // E_r is even in Δz, so the image source at −z′ seen from z equals the real source seen from −z.
  return integrateRadial(layout, j, -1, 1, r, -z, 0);
}
