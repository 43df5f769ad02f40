/**
 * The secondary and primary stages end to end against worked examples and independent formulas:
 * the worked secondary of refs §2.4, a helix primary against Nagaoka + Rosa (HF form), a flat
 * spiral against Wheeler's spiral formula, and the stage conventions.
 */
import { describe, expect, test } from 'vitest';
import type { Design, PrimarySpec, SecondarySpec } from '../../core/design.ts';
import { DEFAULT_ENVIRONMENT } from '../../core/design.ts';
import type { EvalContext } from '../../core/context.ts';
import { emptyMetrics } from '../../core/metrics.ts';
import { secondaryStage } from '../../core/stages/secondary-stage.ts';
import { primaryStage } from '../../core/stages/primary-stage.ts';
import { roundWireSolenoidInductance } from '../../core/inductance/rosa.ts';
import { insulatedDiameter } from '../../core/wire/insulation.ts';
import { awgDiameter } from '../../core/wire/awg.ts';
import { coaxialLoopMutualInductance } from '../../core/inductance/coaxial-loops.ts';
import { loopSelfInductance } from '../../core/inductance/loop.ts';
import { ringToTurnsMutualInductance } from '../../core/inductance/sheet-mutual.ts';
import { primaryRings, ringWeights } from '../../core/primary/rings.ts';
import { must } from '../../core/must.ts';

function context(design: Partial<Design>): EvalContext {
  return {
    design: { environment: DEFAULT_ENVIRONMENT, ...design },
    metrics: emptyMetrics(),
    warnings: [],
    problems: [],
  };
}

function relativeError(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}

/** refs §2.4 worked example: centre-line D = 0.20 m, l = 0.80 m, N = 1000, d = 0.70 mm. */
const WORKED: SecondarySpec = {
  formDiameter: 0.2 - 0.8e-3, // so that the wire's centre line has D = 0.20 m
  wire: { bareDiameter: 0.7e-3, insulation: 'grade2', overallDiameter: 0.8e-3 },
  turns: 1000,
  baseHeight: 0.3,
  voltageProfile: 'linear',
};

describe('secondaryStage on the worked example of refs §2.4 [X]', () => {
  test('L = 44.3991 mH, wire length 628.32 m, R_dc(20 °C) = 28.149 Ω, close-wound pitch 0.8 mm', () => {
    const evaluation = context({ secondary: WORKED });
    secondaryStage(evaluation);
    const { metrics } = evaluation;
    expect(evaluation.problems).toEqual([]);
    expect(metrics.winding_length).toBeCloseTo(0.8, 12);
    expect(Math.abs((metrics.secondary_inductance as number) * 1e3 - 44.3991)).toBeLessThan(5e-5);
    expect(Math.abs((metrics.wire_length as number) - 628.32)).toBeLessThan(5e-3);
    expect(Math.abs((metrics.secondary_dc_resistance as number) - 28.149)).toBeLessThan(5e-4);
    // the exact loop sum agrees with Nagaoka + Rosa to about 1e-5 here (§2.4 validation rows)
    expect(
      relativeError(metrics.secondary_inductance_filament as number, metrics.secondary_inductance as number),
    ).toBeLessThan(1e-4);
    expect(metrics.winding_aspect_ratio).toBeCloseTo(0.8 / WORKED.formDiameter, 12);
    expect(metrics.wire_mass).toBeCloseTo(8890 * Math.PI * 0.35e-3 ** 2 * (metrics.wire_length as number), 9);
    expect(evaluation.secondary).toMatchObject({ radius: 0.1, pitch: 0.8e-3, bottomZ: 0.3 });
    expect(evaluation.secondary?.topZ).toBeCloseTo(1.1, 12);
  });

  test('DC resistance follows the environment temperature (IEC 60028, α = 0.00393 /K)', () => {
    const evaluation = context({ secondary: WORKED });
    (evaluation.design as Design).environment = { ...DEFAULT_ENVIRONMENT, temperature: 373.15 };
    secondaryStage(evaluation);
    expect(Math.abs((evaluation.metrics.secondary_dc_resistance as number) - 28.149 * (1 + 0.00393 * 80))).toBeLessThan(
      1e-3,
    );
  });
});

describe('secondaryStage conventions', () => {
  const base: SecondarySpec = {
    formDiameter: 0.16,
    wire: { bareDiameter: awgDiameter(26), insulation: 'grade2' },
    baseHeight: 0.45,
    voltageProfile: 'linear',
  };

  test('close-wound by default: pitch = the grade’s insulated diameter; radius = (form + insulated)/2', () => {
    const evaluation = context({ secondary: { ...base, turns: 1100 } });
    secondaryStage(evaluation);
    const overall = insulatedDiameter(awgDiameter(26), 'grade2');
    expect(evaluation.secondary?.pitch).toBe(overall);
    expect(evaluation.secondary?.radius).toBeCloseTo((0.16 + overall) / 2, 15);
    expect(evaluation.metrics.winding_length).toBeCloseTo(1100 * overall, 15);
  });

  test('winding_length alone gives fractional turns = length / pitch', () => {
    const evaluation = context({ secondary: { ...base, windingLength: 0.5, pitch: 0.6e-3 } });
    secondaryStage(evaluation);
    expect(evaluation.metrics.secondary_turns).toBeCloseTo(0.5 / 0.6e-3, 10);
    expect(Number.isInteger(evaluation.metrics.secondary_turns)).toBe(false);
  });

  test('turns and winding_length together set the pitch; too short a winding is a problem', () => {
    const fits = context({ secondary: { ...base, turns: 800, windingLength: 0.6 } });
    secondaryStage(fits);
    expect(fits.secondary?.pitch).toBeCloseTo(0.6 / 800, 15);
    const tooShort = context({ secondary: { ...base, turns: 1500, windingLength: 0.6 } });
    secondaryStage(tooShort);
    expect(tooShort.problems[0].field).toBe('secondary.winding_length');
    expect(tooShort.metrics.secondary_inductance).toBeNull();
  });

  test('a pitch below the insulated diameter is a problem on secondary.pitch', () => {
    const evaluation = context({ secondary: { ...base, turns: 1000, pitch: 0.3e-3 } });
    secondaryStage(evaluation);
    expect(evaluation.problems).toHaveLength(1);
    expect(evaluation.problems[0].field).toBe('secondary.pitch');
    expect(evaluation.problems[0].reason).toMatch(/0\.3 mm/);
  });

  test('a wire outside the enamel table is extrapolated with a warning', () => {
    const evaluation = context({
      secondary: { ...base, wire: { bareDiameter: awgDiameter(32), insulation: 'grade1' }, turns: 1000 },
    });
    secondaryStage(evaluation);
    expect(evaluation.problems).toEqual([]);
    expect(evaluation.warnings[0]?.message).toMatch(/outside the enamel build table/);
  });
});

describe('primaryStage against independent formulas', () => {
  const secondary: SecondarySpec = {
    formDiameter: 0.16,
    wire: { bareDiameter: 0.5e-3, insulation: 'grade2' },
    turns: 1000,
    baseHeight: 0.45,
    voltageProfile: 'linear',
  };
  const tube = 6.35e-3;

  test('helix primary: the ring sum equals Nagaoka + Rosa with the surface-current k_s (refs §2.4: HF pair)', () => {
    // A helix of rings is a single-layer solenoid of round conductor; Rosa's HF corrections
    // (3/2 − ln(2p/d) with k_m) describe it to about 1e-3 for ten turns.
    for (const [innerDiameter, turns, spacing] of [
      [0.25, 10, 6e-3],
      [0.3, 15, 3e-3],
      [0.4, 12, 12e-3],
    ]) {
      const primary: PrimarySpec = {
        shape: 'helix',
        innerDiameter,
        turns,
        conductorDiameter: tube,
        turnSpacing: spacing,
        elevation: 0,
      };
      const evaluation = context({ secondary, primary });
      secondaryStage(evaluation);
      primaryStage(evaluation);
      const rosa = roundWireSolenoidInductance(
        { radius: innerDiameter / 2, turns, pitch: tube + spacing, bareDiameter: tube },
        'surface',
      );
      expect(relativeError(evaluation.metrics.primary_full_inductance as number, rosa)).toBeLessThan(1e-3);
    }
  });

  test('flat spiral: within 5 % of Wheeler’s spiral formula a²N²/(8a + 11c) for c > 0.2a (refs §3.3 [P2])', () => {
    // a = mean radius, c = radial width N·p of the winding (current-sheet width), inches → µH
    for (const [innerDiameter, turns, diameter, spacing] of [
      [0.25, 10, tube, 6e-3],
      [0.3, 15, tube, 3e-3],
      [0.2, 8, 3e-3, 1e-3],
      [0.4, 12, 9.5e-3, 12e-3],
    ]) {
      const primary: PrimarySpec = {
        shape: 'flat_spiral',
        innerDiameter,
        turns,
        conductorDiameter: diameter,
        turnSpacing: spacing,
        elevation: 0,
      };
      const evaluation = context({ secondary, primary });
      secondaryStage(evaluation);
      primaryStage(evaluation);
      const pitch = diameter + spacing;
      const meanRadius = (innerDiameter / 2 + ((turns - 1) * pitch) / 2) / 0.0254;
      const width = (turns * pitch) / 0.0254;
      expect(width).toBeGreaterThan(0.2 * meanRadius);
      const wheeler = (1e-6 * meanRadius ** 2 * turns ** 2) / (8 * meanRadius + 11 * width);
      expect(relativeError(evaluation.metrics.primary_full_inductance as number, wheeler)).toBeLessThan(0.05);
    }
  });

  // common practice: steepening a cone primary toward a helix raises the coupling
  test('a 45° cone couples more than the flat spiral (0°) and less than the helix (90°)', () => {
    const results = [0, Math.PI / 4, Math.PI / 2].map((coneAngle) => {
      const primary: PrimarySpec = {
        shape: 'cone',
        innerDiameter: 0.25,
        turns: 10,
        conductorDiameter: tube,
        turnSpacing: 6e-3,
        elevation: 0,
        coneAngle,
      };
      const evaluation = context({ secondary, primary });
      secondaryStage(evaluation);
      primaryStage(evaluation);
      return evaluation.metrics;
    });
    expect(results[1].coupling as number).toBeGreaterThan(results[0].coupling as number);
    expect(results[1].coupling as number).toBeLessThan(results[2].coupling as number);
  });
});

describe('primaryStage wiring against a direct computation (ring × turn sums, no fast paths)', () => {
  const cases: Array<[string, SecondarySpec, PrimarySpec]> = [
    [
      'flat spiral, AWG 24 grade 2',
      {
        formDiameter: 0.16,
        wire: { bareDiameter: awgDiameter(24), insulation: 'grade2' },
        turns: 900,
        baseHeight: 0.4,
        voltageProfile: 'linear',
      },
      {
        shape: 'flat_spiral',
        innerDiameter: 0.22,
        turns: 9.5,
        conductorDiameter: 6.35e-3,
        turnSpacing: 5e-3,
        elevation: 0.01,
        tapTurns: 7.3,
      },
    ],
    [
      'helix, 0.5 mm metric grade 1',
      {
        formDiameter: 0.11,
        wire: { bareDiameter: 0.5e-3, insulation: 'grade1' },
        windingLength: 0.45,
        baseHeight: 0.3,
        voltageProfile: 'linear',
      },
      {
        shape: 'helix',
        innerDiameter: 0.2,
        turns: 6,
        conductorDiameter: 4e-3,
        turnSpacing: 8e-3,
        elevation: -0.02,
        tapTurns: 5,
      },
    ],
    [
      'cone 30°, AWG 28 with a given pitch',
      {
        formDiameter: 0.09,
        wire: { bareDiameter: awgDiameter(28), insulation: 'grade3' },
        turns: 1300,
        pitch: 0.45e-3,
        baseHeight: 0.2,
        voltageProfile: 'linear',
      },
      {
        shape: 'cone',
        innerDiameter: 0.15,
        turns: 12,
        conductorDiameter: 5e-3,
        turnSpacing: 4e-3,
        elevation: 0,
        coneAngle: Math.PI / 6,
        tapTurns: 10.25,
      },
    ],
  ];
  test.each(cases)('%s: L1, M and k agree with the direct sums to 1e-4', (_name, secondary, primary) => {
    const evaluation = context({ secondary, primary });
    secondaryStage(evaluation);
    primaryStage(evaluation);
    expect(evaluation.problems).toEqual([]);
    const geometry = must(evaluation.secondary);
    const rings = primaryRings(primary, geometry.bottomZ);
    const weights = ringWeights(rings.length, must(primary.tapTurns));
    let l1 = 0;
    let mutual = 0;
    const winding = { radius: geometry.radius, bottomZ: geometry.bottomZ, topZ: geometry.topZ, turns: geometry.turns };
    for (let i = 0; i < rings.length; i++) {
      for (let j = 0; j < rings.length; j++) {
        const term =
          i === j
            ? loopSelfInductance(rings[i].r, primary.conductorDiameter / 2, 'surface')
            : coaxialLoopMutualInductance(rings[i].r, rings[j].r, rings[j].z - rings[i].z);
        l1 += weights[i] * weights[j] * term;
      }
      mutual += weights[i] * ringToTurnsMutualInductance(rings[i].r, rings[i].z, winding);
    }
    const k = mutual / Math.sqrt(l1 * (evaluation.metrics.secondary_inductance as number));
    expect(relativeError(evaluation.metrics.primary_inductance as number, l1)).toBeLessThan(1e-12);
    expect(relativeError(evaluation.metrics.mutual_inductance as number, mutual)).toBeLessThan(1e-4);
    expect(relativeError(evaluation.metrics.coupling as number, k)).toBeLessThan(1e-4);
  });
});
