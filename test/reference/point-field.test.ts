/**
 * The field at arbitrary points from a solved charge distribution (core/electrostatics/point-field.ts)
 * against exact fields: a ring charge (refs §5.1 [smythe1950], ring-kernel.ts), an isolated sphere
 * (E = V a / d², exact, [jackson1999] ch. 1) and a sphere over a grounded plane by its image charges
 * (Kelvin's images of a point charge in a sphere and a plane, [smythe1950], refs §5.3; summed here).
 */
import { describe, expect, test } from 'vitest';
import { solveField } from '../../core/electrostatics/field-solve.ts';
import { buildPanelLayout } from '../../core/electrostatics/panels.ts';
import { fieldAtPoint } from '../../core/electrostatics/point-field.ts';
import { ringChargeField, ringChargePotential, VACUUM_PERMITTIVITY } from '../../core/electrostatics/ring-kernel.ts';

const COULOMB = 1 / (4 * Math.PI * VACUUM_PERMITTIVITY);

describe('a thin ring of line charge (exact ring field, ring-kernel.ts)', () => {
  const layout = buildPanelLayout([{ kind: 'thin_ring', r: 0.3, z: 0.5, wireRadius: 0.003 }]);
  const lambda = 1e-9;
  const charge = lambda * 2 * Math.PI * 0.3;
  test.each([
    [0, 0.9],
    [0.2, 0.6],
    [0.45, 0.2],
    [1.5, 2],
  ])('at r = %s m, z = %s m equals the ring formula, with and without the floor image', (r, z) => {
    const free = fieldAtPoint(layout, [lambda], false, r, z);
    const exact = ringChargeField(charge, 0.3, 0.5, r, z);
    expect(free.axial).toBeCloseTo(exact.axial, 6);
    expect(free.radial).toBeCloseTo(exact.radial, 6);
    expect(free.potential / ringChargePotential(charge, 0.3, 0.5, r, z)).toBeCloseTo(1, 12);
    const floor = fieldAtPoint(layout, [lambda], true, r, z);
    const image = ringChargeField(-charge, 0.3, -0.5, r, z);
    expect(floor.axial).toBeCloseTo(exact.axial + image.axial, 6);
    expect(floor.radial).toBeCloseTo(exact.radial + image.radial, 6);
  });
});

describe('an isolated sphere at 1 V (exact: φ = a/d, E = a/d² radially)', () => {
  const a = 0.25;
  const solution = solveField({ topload: { shape: 'sphere', radius: a, centerZ: 1 }, floor: false });
  if (!solution) throw new Error('no solution');
  test.each([
    [0, 1.5],
    [0.3, 1.2],
    [0.2, 0.8],
    [1.2, 1],
    [0, 1.2525], // 1 % of the radius off the pole
    [0.2525, 1], // and off the equator
  ])('at r = %s m, z = %s m within 0.3 %', (r, z) => {
    const d = Math.hypot(r, z - 1);
    const field = fieldAtPoint(solution.layout, solution.density, false, r, z);
    expect(Math.abs(field.potential / (a / d) - 1)).toBeLessThan(3e-3);
    expect(Math.abs(Math.hypot(field.radial, field.axial) / (a / (d * d)) - 1)).toBeLessThan(3e-3);
    // direction: radial from the centre
    expect(
      Math.abs(field.radial * (z - 1) - field.axial * r) / (Math.hypot(field.radial, field.axial) * d),
    ).toBeLessThan(1e-3);
  });
});

/** The image charges of a sphere (radius a, centre h, potential 1) over a grounded plane: [charge, z]. */
function sphereOverPlaneImages(a: number, h: number): Array<[number, number]> {
  const charges: Array<[number, number]> = [[a / COULOMB, h]];
  let q = charges[0][0];
  let z = h;
  for (let n = 0; n < 200; n++) {
    // the plane image −q at −z seen by the sphere: image q·a/d at h − a²/d, d = h + z
    const d = h + z;
    q = (q * a) / d;
    z = h - (a * a) / d;
    charges.push([q, z]);
    if (Math.abs(q) < 1e-16 * charges[0][0]) break;
  }
  return charges;
}

describe('a sphere over a grounded plane at 1 V (exact image charges, refs §5.3)', () => {
  const a = 0.2;
  const h = 0.5;
  const solution = solveField({ topload: { shape: 'sphere', radius: a, centerZ: h }, floor: true });
  if (!solution) throw new Error('no solution');
  const images = sphereOverPlaneImages(a, h);
  const exact = (r: number, z: number) => {
    let er = 0;
    let ez = 0;
    let phi = 0;
    for (const [q, zq] of images) {
      for (const [charge, at] of [
        [q, zq],
        [-q, -zq],
      ]) {
        const d = Math.hypot(r, z - at);
        phi += (COULOMB * charge) / d;
        er += (COULOMB * charge * r) / d ** 3;
        ez += (COULOMB * charge * (z - at)) / d ** 3;
      }
    }
    return { phi, er, ez };
  };
  test.each([
    [0, 0.15], // between the sphere and the floor, on the axis (a central column)
    [0.01, 0.05],
    [0.15, 0.2],
    [0.4, 0.5],
    [0, 0.9],
  ])('at r = %s m, z = %s m the field is within 0.5 % of the images', (r, z) => {
    const field = fieldAtPoint(solution.layout, solution.density, true, r, z);
    const want = exact(r, z);
    const magnitude = Math.hypot(want.er, want.ez);
    expect(Math.abs(Math.hypot(field.radial, field.axial) / magnitude - 1)).toBeLessThan(5e-3);
    expect(Math.abs(field.potential - want.phi)).toBeLessThan(2e-3);
  });
  test('the potential is 1 on the sphere (off the collocation points) and 0 on the floor', () => {
    expect(fieldAtPoint(solution.layout, solution.density, true, 0.05, 0).potential).toBeCloseTo(0, 9);
    const angle = 0.37;
    const onSurface = fieldAtPoint(
      solution.layout,
      solution.density,
      true,
      1.001 * a * Math.cos(angle),
      h + 1.001 * a * Math.sin(angle),
    );
    expect(onSurface.potential).toBeCloseTo(1, 2);
  });
});
