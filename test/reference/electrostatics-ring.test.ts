/**
 * The ring-charge kernel and the fast elliptic approximations of the field solve, against
 * published and independent values.
 */
import { describe, expect, test } from 'vitest';
import stdlibEllipk from '@stdlib/math/base/special/ellipk';
import stdlibEllipe from '@stdlib/math/base/special/ellipe';
import { ellipticEFromComplement, ellipticKFromComplement } from '../../core/electrostatics/elliptic-polynomial.ts';
import { ringChargeField, ringChargePotential, VACUUM_PERMITTIVITY } from '../../core/electrostatics/ring-kernel.ts';

const COULOMB = 1 / (4 * Math.PI * VACUUM_PERMITTIVITY);

describe('ellipticKFromComplement / ellipticEFromComplement (A&S 17.3.34, 17.3.36)', () => {
  // Source: @stdlib/math 0.4.1 ellipk/ellipe (parameter convention m = k²), an independent library;
  // A&S state |error| ≤ 2·10⁻⁸ for these approximations.
  test.each([0.001, 0.01, 0.1, 0.25, 0.5, 0.7, 0.9, 0.99, 0.999999])(
    'match @stdlib/math at m = %f within 2e-8',
    (m) => {
      expect(Math.abs(ellipticKFromComplement(1 - m) - stdlibEllipk(m))).toBeLessThan(2.5e-8);
      expect(Math.abs(ellipticEFromComplement(1 - m) - stdlibEllipe(m))).toBeLessThan(2.5e-8);
    },
  );
  test('reproduce the refs §1 [X] (mpmath) value K(0.999999) = 8.29405146361544', () => {
    expect(ellipticKFromComplement(1e-6)).toBeCloseTo(8.29405146361544, 7);
  });
  test('follow the logarithmic asymptote K ≈ ln(4/√m1) near the source ring (A&S 17.3.26)', () => {
    const m1 = 1e-14;
    expect(ellipticKFromComplement(m1)).toBeCloseTo(Math.log(4 / Math.sqrt(m1)), 6);
  });
});

describe('ringChargePotential (Smythe; refs §5.1)', () => {
  // Normalised potential 4πε0·a·V/q for a = 1: refs §5.1 [X] (mpmath).
  test.each([
    [0, 0, 1],
    [0, 1, Math.SQRT1_2],
    [0.5, 0, 1.07318200715],
    [2, 0, 0.536591003575],
    [1, 1, 0.642637681773],
    [0.5, 0.5, 0.908826925256],
  ])('at (r, z) = (%f, %f) is %f in units of q/(4πε0 a)', (r, z, expected) => {
    expect(ringChargePotential(1, 1, 0, r, z) / COULOMB).toBeCloseTo(expected, 10);
  });
  test('on the axis equals q/(4πε0 √(a² + z²)) (exact, Coulomb)', () => {
    for (const z of [0.1, 0.7, 3])
      expect(ringChargePotential(2e-9, 0.4, 0.2, 0, 0.2 + z)).toBeCloseTo((COULOMB * 2e-9) / Math.hypot(0.4, z), 6);
  });
});

describe('ringChargeField (refs §5.1)', () => {
  // q = 1 C, a = 1 m: refs §5.1 [X] (mpmath).
  test('matches the tabulated V, E_r, E_z at (0.5, 0.3) and (2, 1)', () => {
    const near = ringChargeField(1, 1, 0, 0.5, 0.3);
    expect(ringChargePotential(1, 1, 0, 0.5, 0.3) / 8.99082791e9).toBeCloseTo(1, 8);
    expect(near.radial / -1.543199027e9).toBeCloseTo(1, 8);
    expect(near.axial / 3.762152478e9).toBeCloseTo(1, 8);
    const far = ringChargeField(1, 1, 0, 2, 1);
    expect(ringChargePotential(1, 1, 0, 2, 1) / 4.08406453e9).toBeCloseTo(1, 8);
    expect(far.radial / 1.554090023e9).toBeCloseTo(1, 8);
    expect(far.axial / 1.066147781e9).toBeCloseTo(1, 8);
  });
  test.each([
    [0.5, 0.3],
    [2, 1],
    [1.2, 0.1],
    [0.9, -0.4],
  ])('equals −∇V by central differences at (%f, %f) (exact relation)', (r, z) => {
    const h = 1e-5;
    const er = -(ringChargePotential(1, 1, 0, r + h, z) - ringChargePotential(1, 1, 0, r - h, z)) / (2 * h);
    const ez = -(ringChargePotential(1, 1, 0, r, z + h) - ringChargePotential(1, 1, 0, r, z - h)) / (2 * h);
    const field = ringChargeField(1, 1, 0, r, z);
    expect(field.radial / er).toBeCloseTo(1, 7);
    expect(field.axial / ez).toBeCloseTo(1, 7);
  });
});
