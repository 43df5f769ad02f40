/**
 * A toroid's centre disc and a breakout rod standing on the axis as bodies of the design's own
 * field solve (core/electrostatics/bodies.ts `attachmentPanels`, core/stages/axis-point.ts), checked
 * against exact solutions and the project's rod-on-sphere model:
 * - the disc's panels alone, isolated: the exact capacitance of a thin disc, 8ε0a (refs §5.3,
 *   [jackson1999]);
 * - a hemisphere (l = a) on the disc's centre: the exact apex factor 3 of a hemisphere on a plane
 *   ([jackson1999], refs §20), the disc being flat where a small tip stands;
 * - a sphere with a rod on its pole over the floor in the same solve: the rod-on-sphere model
 *   (solved rod-on-sphere β × the sphere's pole field, breakout-point.ts) within 0.2 %;
 * - the tip field's convergence as the attachments' panels double;
 * - designs without a disc: no attachment panels (their solves are today's, `npm run fixtures`).
 */
import { describe, expect, test } from 'vitest';
import { attachmentPanels, type ToroidBody } from '../../core/electrostatics/bodies.ts';
import { apexField, rodOnSphereEnhancement } from '../../core/electrostatics/breakout-rod.ts';
import { assembleCollocationMatrix } from '../../core/electrostatics/assembly.ts';
import { luFactor, luSolve } from '../../core/electrostatics/dense-lu.ts';
import { type FieldArrangement, solveField } from '../../core/electrostatics/field-solve.ts';
import { buildPanelLayout } from '../../core/electrostatics/panels.ts';
import { fieldAtPoint } from '../../core/electrostatics/point-field.ts';
import { VACUUM_PERMITTIVITY } from '../../core/electrostatics/ring-kernel.ts';
import { toploadFieldAtAngle } from '../../core/electrostatics/supports.ts';
import type { Design } from '../../core/design.ts';
import { evaluateDesign } from '../../core/evaluate.ts';
import { must } from '../../core/must.ts';
import { loadDesignFile } from '../../cli/load-design.ts';

const relative = (value: number, expected: number) => Math.abs(value / expected - 1);

/** The disc's own panels (the lines in the mid-plane) of a toroid's attachments, solved isolated. */
function isolatedDiscCapacitance(resolution: number): number {
  const body: ToroidBody = {
    shape: 'toroid',
    majorRadius: 1.5,
    minorRadius: 0.5,
    centerZ: 0,
    centerDisc: true,
    attachmentResolution: resolution,
  };
  const layout = buildPanelLayout(attachmentPanels(body));
  const n = layout.count;
  const matrix = assembleCollocationMatrix(layout, false, true);
  const pivots = must(luFactor(matrix, n));
  const density = new Float64Array(n).fill(1);
  luSolve(matrix, n, pivots, density);
  let charge = 0;
  for (let j = 0; j < n; j++) charge += density[j] * layout.area[j];
  return charge;
}

describe('the centre disc', () => {
  const exact = 8 * VACUUM_PERMITTIVITY; // radius R − r = 1 m
  const errors = [2, 4, 8, 16].map((resolution) => isolatedDiscCapacitance(resolution) / exact - 1);
  test('alone and isolated, its panels converge to the exact 8ε0a of a thin disc [jackson1999]', () => {
    // Uniform panels meet the free rim's 1/√ singularity (absent where the disc joins the tube):
    // first-order convergence from below, 0.73 % at 24 panels, 0.09 % at 192.
    expect(errors[0]).toBeLessThan(0);
    expect(Math.abs(errors[0])).toBeLessThan(0.008);
    expect(Math.abs(errors[3])).toBeLessThan(0.001);
    for (let k = 1; k < errors.length; k++) expect(errors[k] / errors[k - 1]).toBeCloseTo(0.5, 1);
    // Richardson's extrapolation of the first-order error: within 0.01 %.
    expect(Math.abs(2 * errors[3] - errors[2])).toBeLessThan(1e-4);
  });
  test('a toroid without it has no attachment panels (its solve is unchanged)', () => {
    expect(attachmentPanels({ shape: 'toroid', majorRadius: 0.2, minorRadius: 0.06, centerZ: 1 })).toEqual([]);
    expect(attachmentPanels({ shape: 'sphere', radius: 0.2, centerZ: 1 })).toEqual([]);
  });
  test('raises the capacitance of a toroid over the floor a little and lowers none of it', () => {
    const toroid: ToroidBody = { shape: 'toroid', majorRadius: 0.23, minorRadius: 0.075, centerZ: 1.2 };
    const bare = must(solveField({ topload: toroid, floor: true }));
    const disc = must(solveField({ topload: { ...toroid, centerDisc: true }, floor: true }));
    const added = must(disc.toploadCapacitance) / must(bare.toploadCapacitance) - 1;
    expect(added).toBeGreaterThan(0);
    expect(added).toBeLessThan(0.01);
    expect(disc.toploadPanels.count).toBe(bare.toploadPanels.count);
  });
});

const toroid: ToroidBody = { shape: 'toroid', majorRadius: 0.23, minorRadius: 0.075, centerZ: 1.2, centerDisc: true };

function tipPerVolt(arrangement: FieldArrangement): number {
  const solution = must(solveField(arrangement));
  return apexField(solution.layout, solution.density, solution.layout.count - 1);
}

describe('a rod standing on the centre disc, solved with the toroid over the floor', () => {
  const disc = must(solveField({ topload: toroid, floor: true }));
  const base = fieldAtPoint(disc.layout, disc.density, true, 0, toroid.centerZ + 1e-5).axial;
  test('the field just above the disc centre does not depend on how close it is read', () => {
    const nearer = fieldAtPoint(disc.layout, disc.density, true, 0, toroid.centerZ + 1e-4).axial;
    expect(relative(nearer, base)).toBeLessThan(1e-4);
  });
  test('a bare hemisphere (l = a) gives the exact factor 3 of a hemisphere on a plane [jackson1999] within 0.5 %', () => {
    const tip = tipPerVolt({ topload: { ...toroid, axisRod: { height: 0.002, tipRadius: 0.002 } }, floor: true });
    expect(relative(tip / base, 3)).toBeLessThan(5e-3);
    const finer = tipPerVolt({
      topload: { ...toroid, axisRod: { height: 0.002, tipRadius: 0.002 }, attachmentResolution: 2 },
      floor: true,
    });
    expect(relative(finer / base, 3)).toBeLessThan(1e-3);
  });
  test.each([
    [0.02, 0.002],
    [0.1, 0.002],
    [0.3, 0.003],
  ])('the tip field of a %s m rod (tip %s m) moves < 0.2 %% as its panels double and double again', (l, a) => {
    const at = (attachmentResolution: number) =>
      tipPerVolt({ topload: { ...toroid, axisRod: { height: l, tipRadius: a }, attachmentResolution }, floor: true });
    const [one, two, four] = [at(1), at(2), at(4)];
    expect(relative(one, four)).toBeLessThan(2e-3);
    expect(relative(two, four)).toBeLessThan(2e-3);
    expect(one / base).toBeGreaterThan(3);
  });
});

describe('a rod on a sphere in the same solve', () => {
  test.each([
    [0.01, 0.002],
    [0.04, 0.002],
    [0.02, 0.005],
  ])(
    'a %s m rod (tip %s m) on a 0.3 m sphere over the floor agrees with the rod-on-sphere model within 0.2 %%',
    (l, a) => {
      const sphere = { shape: 'sphere' as const, radius: 0.15, centerZ: 1 };
      const bare = must(solveField({ topload: sphere, floor: true }));
      const { first, count } = bare.toploadPanels;
      const pole = must(toploadFieldAtAngle(sphere, bare.layout, bare.density, first, count, Math.PI / 2));
      const model = pole * rodOnSphereEnhancement(l, a, sphere.radius);
      const solved = tipPerVolt({ topload: { ...sphere, axisRod: { height: l, tipRadius: a } }, floor: true });
      expect(relative(solved, model)).toBeLessThan(2e-3);
    },
  );
});

describe('a breakout point on the centre disc in an evaluation', () => {
  const gallery = (): Design => {
    const design = loadDesignFile('examples/gallery-coil-breakout-point.yaml').design;
    design.topload = { ...must(design.topload), centerDisc: true } as Design['topload'];
    return design;
  };
  const evaluation = evaluateDesign(gallery());
  const m = evaluation.metrics;
  test('fire_at_fraction sizes the rod on the axis to fire at that share of the bare breakout voltage', () => {
    expect(evaluation.problems).toEqual([]);
    expect((m.breakout_point_voltage as number) / (m.breakout_voltage as number)).toBeCloseTo(0.6, 4);
    // Recessed in the hole, the disc's centre sees far less field than the crown: a longer rod.
    expect(m.breakout_point_base_field_per_volt as number).toBeLessThan(0.5 * (m.topload_field_per_volt as number));
    expect(evaluation.warnings.map((w) => w.key)).not.toContain('breakout_point_beyond_model');
  });
  test('a given length fires where onset over the solved tip field says', () => {
    const design = gallery();
    design.breakoutPoint = { position: 'top', tipRadius: 0.002, length: m.breakout_point_length as number };
    const again = evaluateDesign(design).metrics;
    expect(relative(again.breakout_point_voltage as number, m.breakout_point_voltage as number)).toBeLessThan(1e-4);
  });
  test('a tip too wide for the disc is a design problem naming the field', () => {
    const design = gallery();
    design.breakoutPoint = { position: 'top', tipRadius: 0.08, length: 0.2 };
    const { problems } = evaluateDesign(design);
    expect(problems[0]?.field).toBe('breakout_point.tip_radius');
    expect(problems[0]?.reason).toContain('centre disc');
  });
  test('a target no rod on the disc reaches is a design problem naming the sizing field', () => {
    // The bare hemisphere there fires near 1.3 MV; a 2 m rod far below 10 kV.
    for (const voltage of [5e6, 1e3]) {
      const design = gallery();
      design.breakoutPoint = { position: 'top', tipRadius: 0.002, fireAtVoltage: voltage };
      const { problems } = evaluateDesign(design);
      expect(problems[0]?.field).toBe('breakout_point.fire_at_voltage');
      expect(problems[0]?.reason).toContain(voltage > 1e5 ? 'as late as' : 'as early as');
    }
  });
  test('a support rod through the centre disc is a design problem naming the field', () => {
    const design = gallery();
    design.breakoutPoint = undefined;
    const top = 0.4 + 1100 * 0.0005 + 0.3;
    design.support = {
      kind: 'rods',
      count: 3,
      diameter: 0.02,
      fromRadius: 0.05,
      fromHeight: 0.5,
      toRadius: 0.05,
      toHeight: top,
    };
    const { problems } = evaluateDesign(design);
    expect(problems[0]?.field).toBe('supports.to_height');
    expect(problems[0]?.reason).toContain('centre disc');
  });
  test('a rim point on a toroid with a disc keeps the curvature model', () => {
    const design = gallery();
    design.breakoutPoint = { position: 'rim', tipRadius: 0.002, length: 0.01 };
    const plain = loadDesignFile('examples/gallery-coil-breakout-point.yaml').design;
    plain.breakoutPoint = design.breakoutPoint;
    const withDisc = evaluateDesign(design).metrics;
    const without = evaluateDesign(plain).metrics;
    expect(relative(withDisc.breakout_point_enhancement as number, without.breakout_point_enhancement as number)).toBe(
      0,
    );
  });
});
