/**
 * The breakout point and the supports in the evaluation: unchanged metrics without them (a snapshot
 * of this project's own outputs taken before they existed), the point's cap on the top voltage and
 * its margins, sizing by fire_at, and bad geometry as a design problem naming the field.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import type { Design } from '../../../core/design.ts';
import { evaluateDesign } from '../../../core/evaluate.ts';
import { METRIC_KEYS } from '../../../core/metrics.ts';
import { loadDesignFile } from '../../../cli/load-design.ts';

const before = JSON.parse(readFileSync('test/fixtures/metrics-before-topload-parts.json', 'utf8')) as Record<
  string,
  { metrics: Record<string, number | null>; warnings: string[] }
>;
const NEW_KEYS = METRIC_KEYS.slice(METRIC_KEYS.indexOf('breakout_point_length'));

describe('designs with neither a breakout point nor supports', () => {
  test.each(['tabletop-teaching-coil', 'topload-alone'])(
    'examples/%s.yaml gives the metrics it gave before',
    (name) => {
      const evaluation = evaluateDesign(loadDesignFile(`examples/${name}.yaml`).design);
      for (const [key, value] of Object.entries(before[name].metrics)) expect(evaluation.metrics[key]).toBe(value);
      for (const key of NEW_KEYS) expect(evaluation.metrics[key]).toBeNull();
      expect(evaluation.warnings.map((w) => w.key)).toEqual(before[name].warnings);
    },
  );
});

const gallery = (): Design => loadDesignFile('examples/gallery-coil-breakout-point.yaml').design;

describe('a breakout point', () => {
  const evaluation = evaluateDesign(gallery());
  const m = evaluation.metrics;
  test('fire_at_fraction sizes the rod so that it fires at that share of the bare breakout voltage', () => {
    expect(evaluation.problems).toEqual([]);
    expect((m.breakout_point_voltage as number) / (m.breakout_voltage as number)).toBeCloseTo(0.6, 6);
    expect(m.breakout_point_length as number).toBeGreaterThan(0.002);
  });
  test('caps the top voltage at its firing voltage; the margin is the topload above the point', () => {
    expect(m.peak_voltage_without_point as number).toBeGreaterThan(m.breakout_point_voltage as number);
    expect(m.peak_voltage).toBe(m.breakout_point_voltage);
    expect(m.breakout_margin as number).toBeCloseTo(
      (m.breakout_voltage as number) / (m.breakout_point_voltage as number),
      9,
    );
    expect(m.topload_peak_field as number).toBeCloseTo(
      (m.topload_field_per_volt as number) * (m.peak_voltage as number),
      3,
    );
  });
  test('a given length reproduces the sized firing voltage (the same model both ways)', () => {
    const design = gallery();
    design.breakoutPoint = { position: 'top', tipRadius: 0.002, length: m.breakout_point_length as number };
    const again = evaluateDesign(design).metrics;
    expect(again.breakout_point_voltage as number).toBeCloseTo(m.breakout_point_voltage as number, 0);
  });
  test('a point that fires above the topload warns, and so does one that the coil never reaches', () => {
    const design = gallery();
    // a 1 mm bump: Peek's onset at 1 mm is high enough that even β = 3 on the crown fires late
    design.breakoutPoint = { position: 'top', tipRadius: 0.001, length: 0.001 };
    const keys = evaluateDesign(design).warnings.map((w) => w.key);
    expect(keys).toContain('breakout_point_above_topload');
    expect(keys).toContain('breakout_point_never_fires');
  });
  test('a point that never fires changes no other metric the design had without it', () => {
    const without = gallery();
    delete without.breakoutPoint;
    const withPoint = gallery();
    withPoint.breakoutPoint = { position: 'top', tipRadius: 0.001, length: 0.001 };
    const a = evaluateDesign(without).metrics;
    const b = evaluateDesign(withPoint).metrics;
    expect(b.breakout_point_voltage as number).toBeGreaterThan(b.peak_voltage as number);
    // (its warnings differ: it says that it never fires instead of the topload never breaking out)
    // the rod stands on the tube's crown: the highest conductor rises by its length (geometry)
    const raised = ['overall_height', 'headroom_needed'];
    for (const key of raised) expect(b[key] as number).toBeCloseTo((a[key] as number) + 0.001, 12);
    for (const key of METRIC_KEYS)
      if (!NEW_KEYS.includes(key) && !raised.includes(key) && key !== 'warning_count') expect(b[key]).toBe(a[key]);
  });
  test('a point that fires far below the peak warns that it clips the swing', () => {
    const design = gallery();
    design.breakoutPoint = { position: 'rim', tipRadius: 0.001, length: 0.1 };
    const result = evaluateDesign(design);
    expect(result.warnings.map((w) => w.key)).toContain('breakout_point_fires_low');
    expect(result.warnings.map((w) => w.key)).toContain('breakout_point_beyond_model');
  });
  test('a firing voltage no rod reaches is a design problem naming the field', () => {
    const design = gallery();
    design.breakoutPoint = { position: 'rim', tipRadius: 0.005, fireAtVoltage: 2e6 };
    const problems = evaluateDesign(design).problems;
    expect(problems[0].field).toBe('breakout_point.fire_at_voltage');
  });
  test('a rod shorter than its tip radius is a design problem naming the length', () => {
    const design = gallery();
    design.breakoutPoint = { position: 'top', tipRadius: 0.005, length: 0.002 };
    expect(evaluateDesign(design).problems[0].field).toBe('breakout_point.length');
  });
});

describe('supports', () => {
  test('a column from the winding top reports its largest field, its margin and the quiet band', () => {
    const m = evaluateDesign(gallery()).metrics;
    expect(m.support_peak_field_per_volt as number).toBeGreaterThan(0);
    expect(m.support_peak_field as number).toBeCloseTo(
      (m.support_peak_field_per_volt as number) * (m.peak_voltage as number),
      3,
    );
    expect(m.support_field_margin as number).toBeCloseTo(1e6 / (m.support_peak_field as number), 9);
    expect(m.topload_low_field_per_volt as number).toBeLessThan(m.topload_field_per_volt as number);
    // the quiet side of a toroid faces the axis (|angle| near π)
    expect(Math.abs(m.topload_low_field_angle as number)).toBeGreaterThan(Math.PI / 2);
  });
  test('supports alone change no metric a design had before', () => {
    const plain = gallery();
    delete plain.breakoutPoint;
    const without = { ...plain };
    delete without.support;
    const a = evaluateDesign(plain).metrics;
    const b = evaluateDesign(without).metrics;
    for (const key of METRIC_KEYS) if (!NEW_KEYS.includes(key)) expect(a[key]).toBe(b[key]);
  });
  test.each([
    [{ kind: 'column', from: 'floor', diameter: 0.2 }, 'supports.diameter'],
    [
      { kind: 'rods', count: 3, diameter: 0.02, fromRadius: 0.1, fromHeight: -0.05, toRadius: 0.2, toHeight: 1 },
      'supports.from_height',
    ],
    [
      { kind: 'rods', count: 3, diameter: 0.02, fromRadius: 0, fromHeight: 0.6, toRadius: 0.3, toHeight: 0.7 },
      'supports.to_radius',
    ],
    // straight through the tube at the toroid's mid-plane (set below)
    [
      { kind: 'rods', count: 3, diameter: 0.02, fromRadius: 0.5, fromHeight: 0, toRadius: 0, toHeight: 0 },
      'supports.to_height',
    ],
  ] as const)('bad geometry %j is a design problem naming %s', (support, field) => {
    const design = gallery();
    design.support = { ...support };
    if (design.support.kind === 'rods' && design.support.toHeight === 0) {
      const midPlane = (evaluateDesign(gallery()).metrics.overall_height as number) - 0.06;
      design.support.fromHeight = midPlane;
      design.support.toHeight = midPlane;
    }
    const problems = evaluateDesign(design).problems;
    expect(problems.map((p) => p.field)).toEqual([field]);
  });
});

describe('the field along a support against exact image charges', () => {
  /** A sphere at 1 V over a grounded plane: Kelvin's image charges [charge / 4πε0, height]. */
  function images(a: number, h: number): Array<[number, number]> {
    const charges: Array<[number, number]> = [[a, h]];
    let q = a;
    let z = h;
    for (let n = 0; n < 200 && Math.abs(q) > 1e-16 * a; n++) {
      const d = h + z;
      q = (q * a) / d;
      z = h - (a * a) / d;
      charges.push([q, z]);
    }
    return charges;
  }
  test('a column from the floor under a sphere: its largest field per volt is the exact one within 0.2 %', () => {
    const radius = 0.25;
    const centre = 0.9;
    const diameter = 0.04;
    const design: Design = {
      topload: { shape: 'sphere', diameter: 2 * radius, centerHeight: centre },
      support: { kind: 'column', from: 'floor', diameter },
      environment: { altitude: 0, temperature: 293.15 },
    };
    const m = evaluateDesign(design).metrics;
    // the same 40 sample points, the exact field there (r = column radius)
    const rho = diameter / 2;
    const top = centre - Math.sqrt(radius ** 2 - rho ** 2);
    let best = 0;
    let where = 0;
    for (let k = 0; k < 40; k++) {
      const t = (k + 0.5) / 40;
      const z = t * top;
      let er = 0;
      let ez = 0;
      for (const [q, zq] of images(radius, centre)) {
        for (const [charge, at] of [
          [q, zq],
          [-q, -zq],
        ]) {
          const d = Math.hypot(rho, z - at);
          er += (charge * rho) / d ** 3;
          ez += (charge * (z - at)) / d ** 3;
        }
      }
      const magnitude = Math.hypot(er, ez);
      if (magnitude > best) {
        best = magnitude;
        where = t;
      }
    }
    expect(Math.abs((m.support_peak_field_per_volt as number) / best - 1)).toBeLessThan(0.002);
    expect(m.support_peak_field_position).toBe(where);
    // a sphere alone has no peak voltage: no field at the peak, no margin
    expect(m.support_peak_field).toBeNull();
  });
});
