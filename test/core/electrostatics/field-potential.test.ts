import { describe, expect, test } from 'vitest';
import { potentialAt, potentialGrid } from '../../../core/electrostatics/field-potential.ts';
import { solveField } from '../../../core/electrostatics/field-solve.ts';
import { buildPanelLayout } from '../../../core/electrostatics/panels.ts';
import { VACUUM_PERMITTIVITY } from '../../../core/electrostatics/ring-kernel.ts';

describe('potentialAt (superposed ring-charge potentials of a solved density, refs §5.1, §5.4)', () => {
  test("a uniformly charged ring's on-axis potential is q/(4πε0√(a² + z²)) (exact, Jackson ch. 1)", () => {
    const a = 0.4;
    const lambda = 2e-9; // C/m along the ring
    const layout = buildPanelLayout([{ kind: 'thin_ring', r: a, z: 1, wireRadius: 0.005 }]);
    const q = 2 * Math.PI * a * lambda;
    for (const z of [1, 1.3, 2.5, -0.7]) {
      const exact = q / (4 * Math.PI * VACUUM_PERMITTIVITY * Math.hypot(a, z - 1));
      expect(potentialAt(layout, [lambda], false, 0, z) / exact).toBeCloseTo(1, 10);
    }
  });

  test('its floor image makes the floor 0 V and subtracts the potential of the image ring above it (method of images, Jackson ch. 2)', () => {
    const a = 0.4;
    const layout = buildPanelLayout([{ kind: 'thin_ring', r: a, z: 1, wireRadius: 0.005 }]);
    expect(potentialAt(layout, [1e-9], true, 0.2, 0)).toBe(0);
    const q = 2 * Math.PI * a * 1e-9;
    const k = 1 / (4 * Math.PI * VACUUM_PERMITTIVITY);
    const z = 2;
    const exact = k * q * (1 / Math.hypot(a, z - 1) - 1 / Math.hypot(a, z + 1));
    expect(potentialAt(layout, [1e-9], true, 0, z) / exact).toBeCloseTo(1, 10);
  });

  // An isolated conducting sphere at 1 V: φ = a/d outside and 1 inside (exact, Jackson ch. 1).
  const sphere = solveField({ topload: { shape: 'sphere', radius: 0.3, centerZ: 2 }, floor: false });
  test('the solved isolated sphere at 1 V gives a/d outside it within 0.2 %', () => {
    if (!sphere) throw new Error('no solution');
    for (const [r, z] of [
      [0.5, 2],
      [0, 3],
      [1.2, 1.1],
      [0, 5],
    ]) {
      const d = Math.hypot(r, z - 2);
      expect(Math.abs(potentialAt(sphere.layout, sphere.density, false, r, z) / (0.3 / d) - 1)).toBeLessThan(0.002);
    }
  });

  test('and 1 V inside it, at its centre and off the axis, within 0.2 %', () => {
    if (!sphere) throw new Error('no solution');
    expect(potentialAt(sphere.layout, sphere.density, false, 0, 2)).toBeCloseTo(1, 2);
    expect(Math.abs(potentialAt(sphere.layout, sphere.density, false, 0.15, 2.1) - 1)).toBeLessThan(0.002);
  });

  test("reproduces the prescribed potentials at the solve's own collocation points of a winding over the floor", () => {
    const solution = solveField({
      topload: { shape: 'toroid', majorRadius: 0.25, minorRadius: 0.06, centerZ: 1.5 },
      winding: { radius: 0.08, bottomZ: 0.5, topZ: 1.4, profile: 'linear' },
      groundedRings: [{ r: 0.2, z: 0.5, wireRadius: 0.003 }],
      floor: true,
    });
    if (!solution) throw new Error('no solution');
    const { layout, density } = solution;
    // A winding panel's midpoint (linear profile), the grounded ring's surface, a topload panel.
    const w = 10;
    const expected = (layout.midZ[w] - 0.5) / 0.9;
    expect(potentialAt(layout, density, true, layout.midR[w] + 1e-9, layout.midZ[w])).toBeCloseTo(expected, 3);
    const t = layout.count - 3;
    expect(potentialAt(layout, density, true, layout.midR[t], layout.midZ[t])).toBeCloseTo(1, 3);
  });
});

describe('potentialGrid', () => {
  test('lays the values out row by row from the lower left, both ends included', () => {
    const layout = buildPanelLayout([{ kind: 'thin_ring', r: 0.4, z: 1, wireRadius: 0.005 }]);
    const grid = potentialGrid(layout, [1e-9], true, { rMin: 0, rMax: 1, zMin: 0, zMax: 2, columns: 3, rows: 5 });
    expect(grid.values.length).toBe(15);
    expect(grid.values[0]).toBe(0);
    expect(grid.values[3 * 2 + 1]).toBe(potentialAt(layout, [1e-9], true, 0.5, 1));
    expect(grid.values[14]).toBe(potentialAt(layout, [1e-9], true, 1, 2));
  });
});
