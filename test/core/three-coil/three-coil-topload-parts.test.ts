/**
 * The breakout point and the supports of a three-coil system: they stand on the resonator's
 * topload and are solved with the resonator's winding. The resonator's field solve is the field
 * solve of a two-coil design made of the resonator's winding and the topload alone, so every
 * breakout-point and support figure must equal that design's exactly (an identity of the two
 * paths through the same solver, not a physics source); the point's cap on the top voltage, the
 * margins and the warnings follow the two-coil rules of outcome-stage.ts (checked for two coils in
 * test/core/stages/topload-parts.test.ts). The example is an invented demo scenario.
 */
import { describe, expect, test } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadDesignFile } from '../../../cli/load-design.ts';
import type { BreakoutPointSpec, Design, SupportSpec } from '../../../core/design.ts';
import { evaluateDesign } from '../../../core/evaluate.ts';
import { SUPPORT_FIELD_LIMIT } from '../../../core/electrostatics/supports.ts';

const here = (path: string): string => fileURLToPath(new URL(`../../../${path}`, import.meta.url));

const POINT: BreakoutPointSpec = { position: 'top', tipRadius: 0.002, fireAtFraction: 0.6 };
const COLUMN: SupportSpec = { kind: 'column', from: 'winding_top', diameter: 0.06 };

/** The three-coil exhibit with a breakout point and a support added (others given; null: none). */
function exhibit(point: BreakoutPointSpec | null = POINT, support: SupportSpec | null = COLUMN): Design {
  const { design } = loadDesignFile(here('examples/three-coil-exhibit.yaml'));
  const out: Design = { ...design };
  delete out.breakoutPoint;
  delete out.support;
  if (point) out.breakoutPoint = point;
  if (support) out.support = support;
  return out;
}

/** The two-coil design whose field solve is the resonator's: its winding under the same topload, nothing else. */
function resonatorAsTwoCoil(design: Design): Design {
  const resonator = design.resonator;
  if (!resonator) throw new Error('a resonator expected');
  const two: Design = { secondary: resonator.winding, environment: design.environment };
  if (design.topload) two.topload = design.topload;
  if (design.breakoutPoint) two.breakoutPoint = design.breakoutPoint;
  if (design.support) two.support = design.support;
  return two;
}

const SOLVED_KEYS = [
  'topload_capacitance',
  'topload_field_per_volt',
  'breakout_voltage',
  'breakout_point_length',
  'breakout_point_enhancement',
  'breakout_point_base_field_per_volt',
  'breakout_point_onset_field',
  'breakout_point_voltage',
  'support_peak_field_per_volt',
  'support_peak_field_position',
  'topload_low_field_angle',
  'topload_low_field_per_volt',
] as const;

describe('the resonator field solve is the two-coil solve of its winding and topload (identity)', () => {
  test.each([
    ['a point on the crown sized by fire_at_fraction, a column from the winding top', POINT, COLUMN, false],
    [
      'a point on a centre disc (solved on the axis) of given length, a column from the floor',
      { position: 'top', tipRadius: 0.003, length: 0.05 } as BreakoutPointSpec,
      { kind: 'column', from: 'floor', diameter: 0.05 } as SupportSpec,
      true,
    ],
    [
      'a point on the rim sized by fire_at_voltage, three rods from the floor to the tube',
      { position: 'rim', tipRadius: 0.002, fireAtVoltage: 4e5 } as BreakoutPointSpec,
      {
        kind: 'rods',
        count: 3,
        diameter: 0.02,
        fromRadius: 0.5,
        fromHeight: 0,
        toRadius: 0.34,
        toHeight: 1.0,
      } as SupportSpec,
      false,
    ],
  ])('%s: every point and support figure equals the two-coil one', (_what, point, support, disc) => {
    const three = exhibit(point, support);
    if (disc && three.topload?.shape === 'toroid') three.topload = { ...three.topload, centerDisc: true };
    const a = evaluateDesign(three);
    const b = evaluateDesign(resonatorAsTwoCoil(three));
    expect(a.problems).toEqual([]);
    expect(b.problems).toEqual([]);
    for (const key of SOLVED_KEYS) {
      expect(b.metrics[key], key).not.toBeNull();
      expect(a.metrics[key], key).toBe(b.metrics[key]);
    }
  });
});

describe('the breakout point caps the resonator top voltage (the two-coil rule of outcome-stage.ts)', () => {
  const without = evaluateDesign(exhibit(null, null));
  const withPoint = evaluateDesign(exhibit());
  const m = withPoint.metrics;
  test('fire_at_fraction 0.6 sizes the rod on the resonator topload to 0.6 of its bare breakout voltage', () => {
    expect(withPoint.problems).toEqual([]);
    expect((m.breakout_point_voltage as number) / (m.breakout_voltage as number)).toBeCloseTo(0.6, 6);
  });
  test('the dynamics are unchanged; the peak is the lower of theirs and the firing voltage, at the resonator top too', () => {
    expect(m.peak_voltage_without_point).toBe(without.metrics.peak_voltage);
    expect(m.three_coil_transfer_fraction).toBe(without.metrics.three_coil_transfer_fraction);
    const capped = Math.min(m.peak_voltage_without_point as number, m.breakout_point_voltage as number);
    expect(m.peak_voltage).toBe(capped);
    expect(m.resonator_peak_voltage).toBe(capped);
    expect(capped).toBeLessThan(m.peak_voltage_without_point as number);
  });
  test('the margin is the topload above the point, fields at the capped peak, and the warnings say so', () => {
    expect(m.breakout_margin).toBe((m.breakout_voltage as number) / (m.peak_voltage as number));
    expect(m.topload_peak_field).toBe((m.topload_field_per_volt as number) * (m.peak_voltage as number));
    expect(m.support_peak_field).toBe((m.support_peak_field_per_volt as number) * (m.peak_voltage as number));
    expect(m.support_field_margin).toBe(SUPPORT_FIELD_LIMIT / (m.support_peak_field as number));
    const keys = withPoint.warnings.map((w) => w.key);
    expect(without.warnings.map((w) => w.key)).toContain('topload_never_breaks_out');
    expect(keys).not.toContain('topload_never_breaks_out');
  });
  test('a point the resonator never reaches and one that fires above the topload warn as for two coils', () => {
    const result = evaluateDesign(exhibit({ position: 'top', tipRadius: 0.001, length: 0.001 }, null));
    const keys = result.warnings.map((w) => w.key);
    expect(keys).toContain('breakout_point_above_topload');
    expect(keys).toContain('breakout_point_never_fires');
    expect(result.metrics.peak_voltage).toBe(result.metrics.peak_voltage_without_point);
  });
});

describe('bad geometry on the resonator is a design problem naming the field', () => {
  test.each([
    // the resonator's form is 250 mm across (the driver's 400 mm would take this column)
    [{ kind: 'column', from: 'winding_top', diameter: 0.3 }, undefined, 'supports.diameter'],
    [
      { kind: 'rods', count: 3, diameter: 0.02, fromRadius: 0.1, fromHeight: -0.05, toRadius: 0.2, toHeight: 1 },
      undefined,
      'supports.from_height',
    ],
    // crosses the resonator's winding (radius about 125 mm, 0.3 m to 1.02 m), above the driver's
    [
      { kind: 'rods', count: 3, diameter: 0.02, fromRadius: 0, fromHeight: 0.6, toRadius: 0.3, toHeight: 0.7 },
      undefined,
      'supports.to_radius',
    ],
    [undefined, { position: 'top', tipRadius: 0.005, length: 0.002 }, 'breakout_point.length'],
    [undefined, { position: 'rim', tipRadius: 0.005, fireAtVoltage: 2e6 }, 'breakout_point.fire_at_voltage'],
  ] as const)('%j with point %j names %s', (support, point, field) => {
    const design = exhibit(point ? { ...point } : null, support ? { ...support } : null);
    expect(evaluateDesign(design).problems.map((p) => p.field)).toEqual([field]);
  });
});

describe("a solid-state burst reports when the resonator's top reaches the topload's breakout (as a two-coil burst)", () => {
  test.each([
    [12, false],
    [30, true],
  ])(
    '%i cycles at 400 V: breakout_during_burst is %s, exactly when the peak reaches breakout_voltage',
    (cycles, warned) => {
      const { metrics, warnings } = evaluateDesign({
        ...exhibit(null, null),
        driver: { kind: 'solid_state', bridge: 'full', busVoltage: 400, cycles, repetitionRate: 100 },
      });
      const reached = (metrics.peak_voltage as number) >= (metrics.breakout_voltage as number);
      expect(reached).toBe(warned);
      expect(warnings.map((w) => w.key).includes('breakout_during_burst')).toBe(warned);
    },
  );
});
