/**
 * The electrostatics stage: metrics, the topload-alone case, impossible geometry, and the
 * monotonic facts a builder relies on (as properties).
 */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import type { EvalContext, SecondaryGeometry } from '../../../core/context.ts';
import type { Design, ToploadSpec } from '../../../core/design.ts';
import { emptyMetrics } from '../../../core/metrics.ts';
import { electrostaticsStage } from '../../../core/stages/electrostatics-stage.ts';
import { peekCylinderOnsetField } from '../../../core/breakdown/peek.ts';
import { relativeAirDensity } from '../../../core/breakdown/air-density.ts';
import { STREAMER_CAPACITANCE_PER_METRE, streamerCapacitance } from '../../../core/capacitance/streamer.ts';
import { must } from '../../../core/must.ts';

/** An invented demo secondary: 160 mm form, 800 mm winding from 450 mm above the floor, 30 mH. */
const SECONDARY: SecondaryGeometry = {
  turns: 1000,
  pitch: 0.0008,
  windingLength: 0.8,
  radius: 0.0804,
  bareDiameter: 0.0007,
  overallDiameter: 0.00076,
  bottomZ: 0.45,
  topZ: 1.25,
  inductance: 0.03,
  dcResistance: 20,
  wireLength: 505,
};

function design(topload: ToploadSpec | undefined, extra: Partial<Design> = {}): Design {
  return {
    secondary: {
      formDiameter: 0.16,
      wire: { bareDiameter: 0.0007, insulation: 'grade2' },
      turns: 1000,
      baseHeight: 0.45,
      voltageProfile: 'linear',
    },
    topload,
    environment: { altitude: 0, temperature: 293.15 },
    ...extra,
  };
}

function run(d: Design, secondary: SecondaryGeometry | null = SECONDARY): EvalContext {
  const context: EvalContext = { design: d, metrics: emptyMetrics(), warnings: [], problems: [] };
  if (secondary) context.secondary = secondary;
  electrostaticsStage(context);
  return context;
}

const TOROID: ToploadSpec = { shape: 'toroid', outerDiameter: 0.61, tubeDiameter: 0.15, heightAboveWinding: 0.04 };

describe('electrostaticsStage with a secondary, a toroid and a primary', () => {
  const d = design(TOROID, {
    primary: {
      shape: 'flat_spiral',
      innerDiameter: 0.23,
      turns: 10,
      conductorDiameter: 0.00635,
      turnSpacing: 0.006,
      elevation: 0,
    },
    strikeRail: { diameter: 0.7, conductorDiameter: 0.02, elevation: 0.05 },
  });
  const context = run(d);
  const m = context.metrics;
  test('sets every electrostatics metric', () => {
    expect(context.problems).toEqual([]);
    for (const key of [
      'secondary_self_capacitance',
      'secondary_self_capacitance_medhurst',
      'topload_capacitance',
      'total_capacitance',
      'resonant_frequency',
      'topload_field_per_volt',
      'topload_underside_field_per_volt',
      'winding_top_field_per_volt',
      'topload_onset_field',
      'air_density_factor',
      'breakout_voltage',
      'topload_peak_field_angle',
    ]) {
      expect(m[key], key).toBeTypeOf('number');
      expect(Number.isFinite(m[key]), key).toBe(true);
    }
    expect(m.loaded_resonant_frequency).toBeNull(); // no streamer length given
  });
  test('resonant_frequency = 1/(2π√(L·C_total)) (Thomson)', () => {
    expect(m.resonant_frequency).toBeCloseTo(1 / (2 * Math.PI * Math.sqrt(0.03 * must(m.total_capacitance))), 6);
  });
  test('breakout_voltage = Peek onset field (tube radius, δ) / topload_field_per_volt', () => {
    const onset = peekCylinderOnsetField(0.075, relativeAirDensity(0, 293.15), 1);
    expect(m.topload_onset_field).toBe(onset);
    expect(m.breakout_voltage).toBe(onset / must(m.topload_field_per_volt));
    expect(m.air_density_factor).toBeCloseTo(298.15 / 293.15, 12);
  });
  test('leaves the total capacitance for the primary tuning', () => {
    expect(context.electrostatics?.totalCapacitance).toBe(m.total_capacitance);
    expect(context.electrostatics?.breakoutVoltage).toBe(m.breakout_voltage);
  });
  test('a streamer length adds 1 pF per foot at the top (common practice) for the loaded frequency', () => {
    const loaded = run({ ...d, environment: { ...d.environment, streamerLength: 1.2 } }).metrics;
    expect(streamerCapacitance(1.2)).toBeCloseTo(1.2 * STREAMER_CAPACITANCE_PER_METRE, 20);
    expect(STREAMER_CAPACITANCE_PER_METRE * 0.3048).toBeCloseTo(1e-12, 20);
    expect(loaded.loaded_resonant_frequency).toBeCloseTo(
      1 / (2 * Math.PI * Math.sqrt(0.03 * (must(loaded.total_capacitance) + streamerCapacitance(1.2)))),
      6,
    );
    expect(must(loaded.loaded_resonant_frequency)).toBeLessThan(must(loaded.resonant_frequency));
  });
  test('a lower surface factor lowers the breakout voltage in proportion', () => {
    const rough = run({ ...d, environment: { ...d.environment, surfaceFactor: 0.9 } }).metrics;
    expect(must(rough.breakout_voltage) / must(m.breakout_voltage)).toBeCloseTo(0.9, 12);
  });
});

describe('electrostaticsStage without a topload', () => {
  test('topload metrics are null and total = self-capacitance', () => {
    const m = run(design(undefined)).metrics;
    expect(m.topload_capacitance).toBeNull();
    expect(m.topload_field_per_volt).toBeNull();
    expect(m.breakout_voltage).toBeNull();
    expect(m.total_capacitance).toBe(m.secondary_self_capacitance);
    expect(m.resonant_frequency).toBeTypeOf('number');
  });
});

describe('electrostaticsStage with a topload alone', () => {
  test('R = 0.3 m, r = 0.1 m at 1.5 m: 38.302 pF and ≈ 648 kV breakout (refs §5.3, §6.1 [X])', () => {
    const d: Design = {
      topload: { shape: 'toroid', outerDiameter: 0.8, tubeDiameter: 0.2, centerHeight: 1.5 },
      environment: { altitude: 0, temperature: 298.15 },
    };
    const m = run(d, null).metrics;
    expect(must(m.topload_capacitance) / 38.302e-12).toBeCloseTo(1, 3);
    expect(m.total_capacitance).toBe(m.topload_capacitance);
    // 3.286 MV/m × 0.1 m / 0.5071 (the field factor of refs §5.3 at h = 1.5 m).
    expect(must(m.breakout_voltage) / ((peekCylinderOnsetField(0.1, 1, 1) * 0.1) / 0.5071)).toBeCloseTo(1, 2);
    expect(m.resonant_frequency).toBeNull();
    expect(m.secondary_self_capacitance).toBeNull();
  });
  test('a sphere alone uses the sphere form of Peek’s law', () => {
    const m = run(
      {
        topload: { shape: 'sphere', diameter: 0.3, centerHeight: 1 },
        environment: { altitude: 0, temperature: 298.15 },
      },
      null,
    ).metrics;
    expect(must(m.topload_onset_field) / 1e5).toBeCloseTo(27.2 * (1 + 0.54 / Math.sqrt(15)), 9);
  });
});

describe('electrostaticsStage rejects impossible geometry with the reason', () => {
  test.each<[string, Design, SecondaryGeometry | null, string]>([
    [
      'a tube not smaller than the outer diameter',
      design({ ...TOROID, tubeDiameter: 0.61 } as ToploadSpec),
      SECONDARY,
      'topload.tube_diameter',
    ],
    [
      'a toroid that cuts into the winding',
      design({ shape: 'toroid', outerDiameter: 0.4, tubeDiameter: 0.2, heightAboveWinding: 0.02 }),
      SECONDARY,
      'topload.height_above_winding',
    ],
    [
      'a toroid through the floor',
      {
        topload: { shape: 'toroid', outerDiameter: 0.6, tubeDiameter: 0.2, centerHeight: 0.05 },
        environment: { altitude: 0, temperature: 293 },
      },
      null,
      'topload.center_height',
    ],
    [
      'a sphere that swallows the top of the winding',
      design({ shape: 'sphere', diameter: 0.4, heightAboveWinding: 0.1 }),
      SECONDARY,
      'topload.height_above_winding',
    ],
    [
      'a toroid on a secondary without its height',
      design({ shape: 'toroid', outerDiameter: 0.6, tubeDiameter: 0.15 }),
      SECONDARY,
      'topload.height_above_winding',
    ],
    [
      'a primary ring lying on the floor',
      design(TOROID, {
        primary: {
          shape: 'flat_spiral',
          innerDiameter: 0.23,
          turns: 5,
          conductorDiameter: 0.00635,
          turnSpacing: 0.006,
          elevation: -0.45,
        },
      }),
      SECONDARY,
      'primary.elevation',
    ],
    [
      'an altitude above the troposphere',
      design(TOROID, { environment: { altitude: 12000, temperature: 220 } }),
      SECONDARY,
      'environment.altitude',
    ],
  ])('%s', (_, d, secondary, field) => {
    const context = run(d, secondary);
    expect(context.problems.length).toBe(1);
    expect(context.problems[0].field).toBe(field);
    expect(context.problems[0].reason).not.toMatch(/NaN|undefined/);
    expect(context.electrostatics).toBeUndefined();
    expect(context.metrics.total_capacitance).toBeNull();
  });
  test('the intersection reason gives the sizes in mm', () => {
    const context = run(design({ shape: 'toroid', outerDiameter: 0.5, tubeDiameter: 0.2, heightAboveWinding: 0.02 }));
    expect(context.problems[0].reason).toMatch(
      /inner edge \(radius 50 mm\) reaches below the top of the winding \(radius 80\.4 mm\) by 80 mm/,
    );
  });
});

describe('monotonic facts (properties)', () => {
  const alone = (toroid: { outer: number; tube: number; height: number }) =>
    run(
      {
        topload: {
          shape: 'toroid',
          outerDiameter: toroid.outer,
          tubeDiameter: toroid.tube,
          centerHeight: toroid.height,
        },
        environment: { altitude: 0, temperature: 293.15 },
      },
      null,
    ).metrics;
  test('a larger tube diameter at the same outer diameter raises the breakout voltage', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.3, max: 1.5, noNaN: true }),
        fc.double({ min: 0.1, max: 0.4, noNaN: true }),
        fc.double({ min: 1.05, max: 1.5, noNaN: true }),
        (outer, tubeShare, growth) => {
          const tube = outer * tubeShare;
          const height = 0.6 * outer + 0.3;
          const small = alone({ outer, tube, height });
          const large = alone({ outer, tube: Math.min(tube * growth, 0.6 * outer), height });
          expect(must(large.breakout_voltage)).toBeGreaterThan(must(small.breakout_voltage));
        },
      ),
      { numRuns: 15, seed: 42, endOnFailure: true },
    );
  });
  test('on a winding, a larger toroid raises the topload capacitance and lowers the resonant frequency', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.35, max: 0.9, noNaN: true }),
        fc.double({ min: 1.05, max: 1.6, noNaN: true }),
        (outer, growth) => {
          const small = run(
            design({ shape: 'toroid', outerDiameter: outer, tubeDiameter: 0.12, heightAboveWinding: 0.05 }),
          ).metrics;
          const large = run(
            design({ shape: 'toroid', outerDiameter: outer * growth, tubeDiameter: 0.12, heightAboveWinding: 0.05 }),
          ).metrics;
          expect(must(large.topload_capacitance)).toBeGreaterThan(must(small.topload_capacitance));
          expect(must(large.resonant_frequency)).toBeLessThan(must(small.resonant_frequency));
        },
      ),
      { numRuns: 12, seed: 7, endOnFailure: true },
    );
  });
  test('raising a topload above the floor lowers its capacitance toward the isolated value', () => {
    // Isolated torus R = 0.3 m, r = 0.1 m (R/r = 3): 1.030591456 × 4πε0R (refs §5.3 series).
    const isolated = 1.030591456 * 111.265005545e-12 * 0.3;
    fc.assert(
      fc.property(
        fc.double({ min: 0.2, max: 3, noNaN: true }),
        fc.double({ min: 1.1, max: 3, noNaN: true }),
        (height, factor) => {
          const low = alone({ outer: 0.8, tube: 0.2, height });
          const high = alone({ outer: 0.8, tube: 0.2, height: height * factor });
          expect(must(high.topload_capacitance)).toBeLessThan(must(low.topload_capacitance));
          expect(must(high.topload_capacitance)).toBeGreaterThan(isolated);
        },
      ),
      { numRuns: 15, seed: 3, endOnFailure: true },
    );
    expect(must(alone({ outer: 0.8, tube: 0.2, height: 60 }).topload_capacitance) / isolated - 1).toBeLessThan(0.01);
  });
});
