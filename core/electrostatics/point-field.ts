/**
 * Potential and electric field at an arbitrary point of the meridian half-plane from a solved
 * boundary-element charge distribution (panels.ts): the same ring-charge Green's function as the
 * solve (ring-kernel.ts, refs §5.1 [smythe1950]), integrated over each panel, with the floor's
 * image charges (−σ at z′ → −z′) when the solve had the floor.
 *
 * A panel carrying density σ is a stack of rings of charge dq = σ·2πr′ds′; a thin ring (primary
 * turn, strike rail) is one ring of charge λ·2πr. Quadrature per panel piece: 4-point
 * Gauss–Legendre when the field point is at least 4 piece lengths from the piece's centre,
 * otherwise the piece is bisected (to depth 18, a 2⁻¹⁸ fraction of the panel), so points close to
 * a surface keep their accuracy. On a charged surface itself the field is discontinuous
 * (Gauss's law); points are meant to lie off the panels.
 */
import { ellipticKEComplement } from '../elliptic.ts';
import { GAUSS4_NODES, GAUSS4_WEIGHTS } from '../gauss-legendre.ts';
import { PANEL_THIN_RING, panelPoint, type PanelLayout } from './panels.ts';
import { VACUUM_PERMITTIVITY } from './ring-kernel.ts';

/** Potential (V) and field components (V/m) at a point. */
export interface PointField {
  potential: number;
  radial: number;
  axial: number;
}

const COULOMB_FACTOR = 1 / (4 * Math.PI * VACUUM_PERMITTIVITY);
const PIECE_RATIO = 4;
const MAX_DEPTH = 18;
const scratch = new Float64Array(2);

/**
 * Adds to `out` the potential and field at (r, z) of a unit-charge ring of radius a at height
 * zs, times `charge` (ring-kernel.ts formulas; Coulomb factor applied by the caller).
 */
function addRing(out: PointField, charge: number, a: number, zs: number, r: number, z: number): void {
  const dz = z - zs;
  const plus2 = (r + a) ** 2 + dz * dz;
  const minus2 = (r - a) ** 2 + dz * dz;
  if (!(minus2 > 0)) return;
  const plus = Math.sqrt(plus2);
  const { k, e } = ellipticKEComplement(minus2 / plus2);
  out.potential += (charge * (2 / Math.PI) * k) / plus;
  out.axial += (charge * (2 / Math.PI) * dz * e) / (minus2 * plus);
  if (r > 0) out.radial += (charge * (1 / (Math.PI * r)) * (k - ((a * a - r * r + dz * dz) / minus2) * e)) / plus;
}

/** Adds the rings of panel j's parameter interval [ta, tb], density σ, source heights mirrored if asked. */
function addPiece(
  out: PointField,
  layout: PanelLayout,
  j: number,
  sigma: number,
  ta: number,
  tb: number,
  r: number,
  z: number,
  mirror: boolean,
  depth: number,
): void {
  const halfSpan = 0.5 * (tb - ta);
  const centre = 0.5 * (ta + tb);
  const pieceLength = layout.length[j] * halfSpan;
  panelPoint(layout, j, centre, scratch);
  const sourceZ = mirror ? -scratch[1] : scratch[1];
  const distance2 = (r - scratch[0]) ** 2 + (z - sourceZ) ** 2;
  if (distance2 >= PIECE_RATIO * PIECE_RATIO * pieceLength * pieceLength || depth >= MAX_DEPTH) {
    const jacobian = 0.5 * layout.length[j] * halfSpan;
    for (let q = 0; q < 4; q++) {
      panelPoint(layout, j, centre + halfSpan * GAUSS4_NODES[q], scratch);
      const charge = sigma * 2 * Math.PI * scratch[0] * GAUSS4_WEIGHTS[q] * jacobian;
      addRing(out, mirror ? -charge : charge, scratch[0], mirror ? -scratch[1] : scratch[1], r, z);
    }
    return;
  }
  addPiece(out, layout, j, sigma, ta, centre, r, z, mirror, depth + 1);
  addPiece(out, layout, j, sigma, centre, tb, r, z, mirror, depth + 1);
}

/**
 * Potential and field at (r, z) of the densities `density` on `layout` (σ, C/m² per panel; λ, C/m
 * for thin rings), with the floor's images when `floor` is true. SI; r ≥ 0.
 */
export function fieldAtPoint(
  layout: PanelLayout,
  density: ArrayLike<number>,
  floor: boolean,
  r: number,
  z: number,
): PointField {
  const out: PointField = { potential: 0, radial: 0, axial: 0 };
  for (let j = 0; j < layout.count; j++) {
    const sigma = density[j];
    if (sigma === 0) continue;
    if (layout.kind[j] === PANEL_THIN_RING) {
      const charge = sigma * 2 * Math.PI * layout.midR[j];
      addRing(out, charge, layout.midR[j], layout.midZ[j], r, z);
      if (floor) addRing(out, -charge, layout.midR[j], -layout.midZ[j], r, z);
      continue;
    }
    addPiece(out, layout, j, sigma, -1, 1, r, z, false, 0);
    if (floor) addPiece(out, layout, j, sigma, -1, 1, r, z, true, 0);
  }
  out.potential *= COULOMB_FACTOR;
  out.radial *= COULOMB_FACTOR;
  out.axial *= COULOMB_FACTOR;
  return out;
}
