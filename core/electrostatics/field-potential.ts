/**
 * The potential anywhere in the meridian half-plane from a solved surface density: the
 * superposition of the ring-charge potentials of every panel (refs §5.1, Smythe's ring potential
 * V = (q/4πε0)(2/π) K(m)/d₊, the kernel of assembly.ts; checks in refs §5.4) and, with the floor, of their images
 * (charge −σ at z → −z), so that the floor z = 0 is at 0 V exactly. Per volt at the top of the
 * winding when the density is the field solve's.
 *
 * This is the same sum that forms a row of the collocation matrix, evaluated at a free point: at a
 * collocation point it reproduces the prescribed potential (checked in the tests). Points on a
 * panel itself are integrable (the kernel's singularity is logarithmic) and handled by the
 * adaptive bisection of `panelIntegral`.
 */
import { panelIntegral } from './assembly.ts';
import type { PanelLayout } from './panels.ts';
import { VACUUM_PERMITTIVITY } from './ring-kernel.ts';

const SCALE = 1 / (Math.PI * VACUUM_PERMITTIVITY);

/**
 * Potential at (r, z), V per unit of the density's scale (V per volt at the top for a field solve).
 * @param layout the panels the density was solved on
 * @param density σ per panel, C/m² (λ, C/m, for a thin ring)
 * @param floor true when the solve had the grounded floor z = 0 (image charges)
 * @param r radius of the field point, m (≥ 0)
 * @param z height of the field point, m
 */
export function potentialAt(
  layout: PanelLayout,
  density: ArrayLike<number>,
  floor: boolean,
  r: number,
  z: number,
): number {
  let sum = 0;
  for (let j = 0; j < layout.count; j++) {
    const sigma = density[j];
    if (sigma === 0) continue;
    let value = panelIntegral(layout, j, r, z);
    if (floor) value -= panelIntegral(layout, j, r, -z);
    sum += sigma * value;
  }
  return SCALE * sum;
}

/** A rectangular grid of potentials, row-major from (rMin, zMin), `columns` across and `rows` up. */
export interface PotentialGrid {
  columns: number;
  rows: number;
  rMin: number;
  rMax: number;
  zMin: number;
  zMax: number;
  /** values[row·columns + column] at r = rMin + column·Δr, z = zMin + row·Δz. */
  values: Float64Array;
}

/**
 * The potential on a grid of the meridian half-plane (r from rMin ≥ 0 to rMax, z from zMin to zMax,
 * both ends included), for contouring.
 */
export function potentialGrid(
  layout: PanelLayout,
  density: ArrayLike<number>,
  floor: boolean,
  extent: { rMin: number; rMax: number; zMin: number; zMax: number; columns: number; rows: number },
): PotentialGrid {
  const { rMin, rMax, zMin, zMax, columns, rows } = extent;
  const values = new Float64Array(columns * rows);
  const dr = columns > 1 ? (rMax - rMin) / (columns - 1) : 0;
  const dz = rows > 1 ? (zMax - zMin) / (rows - 1) : 0;
  for (let i = 0; i < rows; i++) {
    const z = zMin + i * dz;
    for (let k = 0; k < columns; k++) values[i * columns + k] = potentialAt(layout, density, floor, rMin + k * dr, z);
  }
  return { columns, rows, rMin, rMax, zMin, zMax, values };
}
