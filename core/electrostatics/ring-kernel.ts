/**
 * The field of a charged ring: the Green's function of the axisymmetric boundary-element solve.
 *
 * A ring of radius a at height z′ carrying total charge q, seen from the field point (r, z) in the
 * meridian half-plane: with Δz = z − z′, d₊² = (r + a)² + Δz², d₋² = (r − a)² + Δz² and the
 * elliptic parameter m = 4ar/d₊² (complement m1 = 1 − m = d₋²/d₊², formed without subtraction),
 *   V   = q/(4πε0) · (2/π) · K(m)/d₊
 *   E_z = q/(4πε0) · (2/π) · Δz · E(m) / (d₋² d₊)
 *   E_r = q/(4πε0) · (1/(π r)) · [K(m) − ((a² − r² + Δz²)/d₋²) E(m)] / d₊
 * Source: W. R. Smythe, *Static and Dynamic Electricity* (ring charge); J. D. Jackson, *Classical
 * Electrodynamics* 3rd ed. ch. 3; the field components are −∇V (checked numerically in the tests).
 * Elliptic integrals in the parameter convention (core/elliptic.ts), from m1 directly.
 */
import { ellipticKEComplement } from '../elliptic.ts';

/** Vacuum permittivity, F/m (CODATA 2018). */
export const VACUUM_PERMITTIVITY = 8.8541878128e-12;

const COULOMB_FACTOR = 1 / (4 * Math.PI * VACUUM_PERMITTIVITY);

/**
 * Potential of a ring charge, V.
 * @param charge total charge of the ring q, C
 * @param ringRadius a, m (> 0)
 * @param ringZ height of the ring z′, m
 * @param r field point radius, m (≥ 0)
 * @param z field point height, m
 * Valid everywhere except on the ring itself (Infinity there).
 */
export function ringChargePotential(charge: number, ringRadius: number, ringZ: number, r: number, z: number): number {
  const dz = z - ringZ;
  const plus2 = (r + ringRadius) ** 2 + dz * dz;
  const minus2 = (r - ringRadius) ** 2 + dz * dz;
  if (minus2 === 0) return Number.POSITIVE_INFINITY * Math.sign(charge);
  const { k } = ellipticKEComplement(minus2 / plus2);
  return (COULOMB_FACTOR * charge * (2 / Math.PI) * k) / Math.sqrt(plus2);
}

/** Electric field (radial and axial components) of a ring charge, V/m. */
export interface RingField {
  /** Radial component E_r, V/m. */
  radial: number;
  /** Axial component E_z, V/m. */
  axial: number;
}

/**
 * Electric field of a ring charge at (r, z), V/m; arguments as for `ringChargePotential`.
 * On the axis (r = 0) the radial component is 0 by symmetry.
 */
export function ringChargeField(charge: number, ringRadius: number, ringZ: number, r: number, z: number): RingField {
  const dz = z - ringZ;
  const plus2 = (r + ringRadius) ** 2 + dz * dz;
  const minus2 = (r - ringRadius) ** 2 + dz * dz;
  if (minus2 === 0) return { radial: Number.NaN, axial: Number.NaN };
  const plus = Math.sqrt(plus2);
  const { k, e } = ellipticKEComplement(minus2 / plus2);
  const axial = (COULOMB_FACTOR * charge * (2 / Math.PI) * dz * e) / (minus2 * plus);
  if (r === 0) return { radial: 0, axial };
  const radial =
    (COULOMB_FACTOR * charge * (1 / (Math.PI * r)) * (k - ((ringRadius * ringRadius - r * r + dz * dz) / minus2) * e)) /
    plus;
  return { radial, axial };
}
