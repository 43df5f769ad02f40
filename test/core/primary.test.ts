/**
 * The primary: ring positions (the README's design-file convention), inductance as a function of the tap,
 * tuning, coupling, and the primary stage's problems and warnings.
 */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import type { PrimarySpec, Design } from '../../core/design.ts';
import { DEFAULT_ENVIRONMENT } from '../../core/design.ts';
import type { EvalContext } from '../../core/context.ts';
import { emptyMetrics } from '../../core/metrics.ts';
import { primaryPitch, primaryRings, ringWeights } from '../../core/primary/rings.ts';
import {
  primaryConductorLength,
  primaryInductanceAtTap,
  primaryInductanceTable,
} from '../../core/primary/inductance.ts';
import { tapForInductance, tuneTap } from '../../core/primary/tuning.ts';
import { lcResonantFrequency } from '../../core/capacitance/resonance.ts';
import { couplingCoefficient, ringMutualInductances, tappedMutualInductance } from '../../core/coupling.ts';
import { coaxialLoopMutualInductance } from '../../core/inductance/coaxial-loops.ts';
import { loopSelfInductance } from '../../core/inductance/loop.ts';
import { secondaryStage } from '../../core/stages/secondary-stage.ts';
import { primaryStage } from '../../core/stages/primary-stage.ts';

const SEED = 4242;

function flatSpiral(overrides: Partial<PrimarySpec> = {}): PrimarySpec {
  return {
    shape: 'flat_spiral',
    innerDiameter: 0.25,
    turns: 10,
    conductorDiameter: 6.35e-3,
    turnSpacing: 6e-3,
    elevation: 0,
    ...overrides,
  };
}

/** Σ w_i w_j M_ij written out directly (the definition). */
function directInductance(primary: PrimarySpec, tap: number): number {
  const rings = primaryRings(primary, 0);
  const weights = ringWeights(rings.length, tap);
  const radius = primary.conductorDiameter / 2;
  let total = 0;
  for (let i = 0; i < rings.length; i++) {
    for (let j = 0; j < rings.length; j++) {
      const term =
        i === j
          ? loopSelfInductance(rings[i].r, radius, 'surface')
          : coaxialLoopMutualInductance(rings[i].r, rings[j].r, rings[j].z - rings[i].z);
      total += weights[i] * weights[j] * term;
    }
  }
  return total;
}

describe('primaryRings and ringWeights (the README design-file convention)', () => {
  test('flat spiral: radius inner/2 + i·pitch, all at the secondary bottom + elevation', () => {
    const rings = primaryRings(flatSpiral({ elevation: 0.01 }), 0.5);
    expect(rings).toHaveLength(10);
    expect(primaryPitch(flatSpiral())).toBeCloseTo(12.35e-3, 15);
    rings.forEach((ring, i) => {
      expect(ring.r).toBeCloseTo(0.125 + i * 12.35e-3, 14);
      expect(ring.z).toBeCloseTo(0.51, 14);
    });
  });

  test('cone: radius inner/2 + i·p·cos θ at height i·p·sin θ; helix: inner/2 at height i·p', () => {
    const angle = Math.PI / 6;
    const cone = primaryRings(flatSpiral({ shape: 'cone', coneAngle: angle }), 0.3);
    expect(cone[4].r).toBeCloseTo(0.125 + 4 * 12.35e-3 * Math.cos(angle), 14);
    expect(cone[4].z).toBeCloseTo(0.3 + 4 * 12.35e-3 * Math.sin(angle), 14);
    const helix = primaryRings(flatSpiral({ shape: 'helix' }), 0.3);
    expect(helix[7].r).toBe(0.125);
    expect(helix[7].z).toBeCloseTo(0.3 + 7 * 12.35e-3, 14);
  });

  test('fractional turns give ceil(N) rings, the last weighted by the fraction', () => {
    const rings = primaryRings(flatSpiral({ turns: 7.25 }), 0);
    expect(rings).toHaveLength(8);
    expect(Array.from(ringWeights(8, 7.25))).toEqual([1, 1, 1, 1, 1, 1, 1, 0.25]);
    expect(Array.from(ringWeights(4, 2.5))).toEqual([1, 1, 0.5, 0]);
    expect(primaryRings(flatSpiral({ turns: 7 }), 0)).toHaveLength(7);
  });
});

describe('primaryInductanceAtTap', () => {
  test('equals the direct double sum Σ w_i w_j M_ij at whole and fractional taps', () => {
    for (const primary of [
      flatSpiral(),
      flatSpiral({ shape: 'helix' }),
      flatSpiral({ shape: 'cone', coneAngle: 0.5, turns: 8.6 }),
    ]) {
      const table = primaryInductanceTable(primaryRings(primary, 0), primary.conductorDiameter / 2);
      for (const tap of [1, 2.3, 5, 7.9, primary.turns]) {
        expect(Math.abs(primaryInductanceAtTap(table, tap) / directInductance(primary, tap) - 1)).toBeLessThan(1e-12);
      }
    }
  });

  test('L1(t) is increasing and continuous in t (random primaries)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<PrimarySpec['shape']>('flat_spiral', 'helix', 'cone'),
        fc.double({ min: 0.1, max: 0.8, noNaN: true }),
        fc.double({ min: 2, max: 25, noNaN: true }),
        fc.double({ min: 2e-3, max: 12e-3, noNaN: true }),
        fc.double({ min: 0, max: 15e-3, noNaN: true }),
        fc.double({ min: 0, max: 1.2, noNaN: true }),
        (shape, innerDiameter, turns, conductorDiameter, turnSpacing, coneAngle) => {
          const primary: PrimarySpec = {
            shape,
            innerDiameter,
            turns,
            conductorDiameter,
            turnSpacing,
            elevation: 0,
            coneAngle,
          };
          const table = primaryInductanceTable(primaryRings(primary, 0), conductorDiameter / 2);
          let previous = primaryInductanceAtTap(table, 0.5);
          for (let tap = 0.55; tap <= turns; tap += 0.05) {
            const value = primaryInductanceAtTap(table, tap);
            expect(value).toBeGreaterThan(previous);
            previous = value;
          }
          for (let whole = 1; whole < turns; whole++) {
            const below = primaryInductanceAtTap(table, whole - 1e-9);
            const above = primaryInductanceAtTap(table, whole + 1e-9);
            expect(Math.abs(above / below - 1)).toBeLessThan(1e-7);
          }
        },
      ),
      { seed: SEED, numRuns: 60 },
    );
  });

  test('conductor length of the tapped part: Σ w_i 2π r_i', () => {
    const rings = primaryRings(flatSpiral(), 0);
    expect(primaryConductorLength(rings, 1.5)).toBeCloseTo(2 * Math.PI * (0.125 + 0.5 * (0.125 + 12.35e-3)), 12);
  });
});

describe('tuning', () => {
  test('tapForInductance returns the tap whose inductance is the target, or the nearer end', () => {
    const primary = flatSpiral({ turns: 12.5 });
    const table = primaryInductanceTable(primaryRings(primary, 0), primary.conductorDiameter / 2);
    for (const tap of [1, 1.0001, 3.7, 6, 12.49]) {
      const result = tapForInductance(table, primaryInductanceAtTap(table, tap), 1, 12.5);
      expect(result.status).toBe('tuned');
      expect(result.tapTurns).toBeCloseTo(tap, 9);
    }
    expect(tapForInductance(table, 1e-9, 1, 12.5)).toMatchObject({ status: 'below_range', tapTurns: 1 });
    expect(tapForInductance(table, 1, 1, 12.5)).toMatchObject({ status: 'above_range', tapTurns: 12.5 });
  });

  test('tuneTap makes 1/(2π√(L1 C1)) equal 1/(2π√(L2 C2)) within 1e-6 (random cases in reach)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.2, max: 0.6, noNaN: true }),
        fc.double({ min: 5, max: 20, noNaN: true }),
        fc.double({ min: 0.05, max: 0.95, noNaN: true }), // where in the range the target lies
        fc.double({ min: 10e-12, max: 60e-12, noNaN: true }),
        (innerDiameter, turns, position, secondaryCapacitance) => {
          const primary = flatSpiral({ innerDiameter, turns });
          const table = primaryInductanceTable(primaryRings(primary, 0), primary.conductorDiameter / 2);
          const lowest = primaryInductanceAtTap(table, 1);
          const highest = primaryInductanceAtTap(table, turns);
          const tankCapacitance = 30e-9;
          const target = lowest + position * (highest - lowest);
          const secondaryInductance = (target * tankCapacitance) / secondaryCapacitance; // puts the target at `position`
          const result = tuneTap(table, secondaryInductance, secondaryCapacitance, tankCapacitance, turns);
          expect(result.status).toBe('tuned');
          const primaryFrequency = lcResonantFrequency(primaryInductanceAtTap(table, result.tapTurns), tankCapacitance);
          const secondaryFrequency = lcResonantFrequency(secondaryInductance, secondaryCapacitance);
          expect(Math.abs(primaryFrequency / secondaryFrequency - 1)).toBeLessThan(1e-6);
        },
      ),
      { seed: SEED, numRuns: 100 },
    );
  });

  test('lcResonantFrequency: 10 µH with 10 nF resonates at 503.29 kHz (Thomson formula)', () => {
    expect(Math.abs(lcResonantFrequency(10e-6, 10e-9) - 503292.12)).toBeLessThan(0.01);
  });
});

describe('coupling', () => {
  test('tappedMutualInductance weights the rings like the inductance', () => {
    const mutuals = new Float64Array([1, 2, 4, 8]);
    expect(tappedMutualInductance(mutuals, 2.5)).toBe(1 + 2 + 2);
    expect(tappedMutualInductance(mutuals, 4)).toBe(15);
    expect(couplingCoefficient(0.3, 1, 0.25)).toBeCloseTo(0.6, 15);
  });

  test('ringMutualInductances gives one positive value per ring, falling outward for a flat spiral', () => {
    const rings = primaryRings(flatSpiral(), 0.4);
    const mutuals = ringMutualInductances(rings, { radius: 0.08, bottomZ: 0.4, topZ: 1.0, turns: 1000 });
    expect(mutuals).toHaveLength(10);
    for (let i = 1; i < mutuals.length; i++) expect(mutuals[i]).toBeGreaterThan(0);
  });
});

function context(design: Partial<Design>): EvalContext {
  return {
    design: { environment: DEFAULT_ENVIRONMENT, ...design },
    metrics: emptyMetrics(),
    warnings: [],
    problems: [],
  };
}

const SECONDARY = {
  formDiameter: 0.16,
  wire: { bareDiameter: 0.4049e-3, insulation: 'grade2' as const },
  turns: 1100,
  baseHeight: 0.45,
  voltageProfile: 'linear' as const,
};

describe('primaryStage', () => {
  test('0 < k < 1 for random valid primaries and secondaries', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<PrimarySpec['shape']>('flat_spiral', 'helix', 'cone'),
        fc.double({ min: 0.08, max: 0.4, noNaN: true }), // form diameter
        fc.integer({ min: 300, max: 1600 }),
        fc.double({ min: 0.005, max: 0.15, noNaN: true }), // radial clearance of the primary
        fc.double({ min: 3, max: 20, noNaN: true }),
        fc.double({ min: 0, max: 1.3, noNaN: true }),
        fc.double({ min: -0.05, max: 0.2, noNaN: true }),
        (shape, formDiameter, turns, clearance, primaryTurns, coneAngle, elevation) => {
          const evaluation = context({
            secondary: { ...SECONDARY, formDiameter, turns },
            primary: {
              shape,
              innerDiameter: formDiameter + 2 * clearance + 2e-3 + 6.35e-3,
              turns: primaryTurns,
              conductorDiameter: 6.35e-3,
              turnSpacing: 5e-3,
              elevation,
              coneAngle,
            },
          });
          secondaryStage(evaluation);
          primaryStage(evaluation);
          expect(evaluation.problems).toEqual([]);
          const k = evaluation.metrics.coupling as number;
          expect(k).toBeGreaterThan(0);
          expect(k).toBeLessThan(1);
        },
      ),
      { seed: SEED, numRuns: 60 },
    );
  });

  test('without a tank: the whole primary, tap null, frequency null', () => {
    const evaluation = context({ secondary: SECONDARY, primary: flatSpiral() });
    secondaryStage(evaluation);
    primaryStage(evaluation);
    expect(evaluation.metrics.primary_tap_turns).toBeNull();
    expect(evaluation.metrics.primary_frequency).toBeNull();
    expect(evaluation.metrics.primary_inductance).toBe(evaluation.metrics.primary_full_inductance);
    expect(evaluation.metrics.primary_outer_diameter).toBeCloseTo(0.25 + 2 * 9 * 12.35e-3, 12);
    expect(evaluation.primary?.tapTurns).toBe(10);
  });

  test('with a tank but no electrostatic solution: whole primary, tap null, frequency of the whole primary', () => {
    const evaluation = context({ secondary: SECONDARY, primary: flatSpiral(), tank: { capacitance: 30e-9 } });
    secondaryStage(evaluation);
    primaryStage(evaluation);
    expect(evaluation.metrics.primary_tap_turns).toBeNull();
    expect(evaluation.metrics.primary_frequency).toBeCloseTo(
      lcResonantFrequency(evaluation.metrics.primary_full_inductance as number, 30e-9),
      6,
    );
  });

  test('with a tank and the total capacitance: tuned, primary frequency = secondary frequency', () => {
    const evaluation = context({ secondary: SECONDARY, primary: flatSpiral(), tank: { capacitance: 30e-9 } });
    secondaryStage(evaluation);
    evaluation.electrostatics = {
      totalCapacitance: 20e-12,
      toploadCapacitance: null,
      toploadFieldPerVolt: null,
      onsetField: null,
      breakoutVoltage: null,
    };
    primaryStage(evaluation);
    expect(evaluation.warnings).toEqual([]);
    const tap = evaluation.metrics.primary_tap_turns as number;
    expect(tap).toBeGreaterThan(1);
    expect(tap).toBeLessThan(10);
    const secondaryFrequency = lcResonantFrequency(evaluation.metrics.secondary_inductance as number, 20e-12);
    expect(Math.abs((evaluation.metrics.primary_frequency as number) / secondaryFrequency - 1)).toBeLessThan(1e-9);
    expect(evaluation.metrics.mutual_inductance).toBe(evaluation.primary?.mutual);
  });

  /** The primary stage on SECONDARY with a given total capacitance of 25 pF and the tank given. */
  const tunedAgainst = (primary: Partial<PrimarySpec>, tankCapacitance: number) => {
    const evaluation = context({
      secondary: SECONDARY,
      primary: flatSpiral(primary),
      tank: { capacitance: tankCapacitance },
    });
    secondaryStage(evaluation);
    evaluation.electrostatics = {
      totalCapacitance: 25e-12,
      toploadCapacitance: null,
      toploadFieldPerVolt: null,
      onsetField: null,
      breakoutVoltage: null,
    };
    primaryStage(evaluation);
    return evaluation;
  };
  const tuningOption = (requireTuning?: boolean) => (requireTuning === undefined ? {} : { requireTuning });
  const outOfReach = (requireTuning?: boolean) => tunedAgainst({ turns: 3, ...tuningOption(requireTuning) }, 5e-9);

  test('out of reach: infeasible by default, naming the needed and available inductance and the mistuning', () => {
    const evaluation = outOfReach();
    expect(evaluation.metrics.primary_tap_turns).toBe(3);
    expect(evaluation.metrics.primary_tap_margin).toBe(0);
    // Exact: tuning_error = f_tank / f_secondary − 1 with both from 1/(2π√(LC)) (Thomson's formula).
    const secondaryFrequency = 1 / (2 * Math.PI * Math.sqrt((evaluation.secondary?.inductance ?? 0) * 25e-12));
    const tankFrequency = 1 / (2 * Math.PI * Math.sqrt((evaluation.metrics.primary_inductance ?? 0) * 5e-9));
    expect(evaluation.metrics.tuning_error).toBeCloseTo(tankFrequency / secondaryFrequency - 1, 12);
    expect(evaluation.metrics.tuning_error ?? 0).toBeGreaterThan(0.03);
    expect(evaluation.problems).toHaveLength(1);
    expect(evaluation.problems[0]?.field).toBe('primary.turns');
    expect(evaluation.problems[0]?.reason).toMatch(
      /^primary cannot tune: needs [\d.]+ µH, has [\d.]+ µH–[\d.]+ µH; at the nearer end the tank [\d.]+ [kM]Hz against the secondary's [\d.]+ [kM]Hz \(\+[\d.]+ %, tolerance ±3 %\) \(set primary.require_tuning: false/,
    );
    expect(evaluation.warnings).toEqual([]);
  });

  test('out of reach with require_tuning false: the nearer end and a keyed warning instead', () => {
    const evaluation = outOfReach(false);
    expect(evaluation.problems).toEqual([]);
    expect(evaluation.warnings).toHaveLength(1);
    expect(evaluation.warnings[0]?.key).toBe('primary_untuned');
    expect(evaluation.warnings[0]?.message).toMatch(/^the primary cannot be tuned: needs [\d.]+ µH, has [\d.]+ µH–/);
  });

  test('a fixed tap far off tune is infeasible by default and a fixed_tap_mistuned warning when relaxed', () => {
    const build = (requireTuning?: boolean) => tunedAgainst({ tapTurns: 2, ...tuningOption(requireTuning) }, 30e-9);
    const strict = build();
    expect(Math.abs(strict.metrics.tuning_error ?? 0)).toBeGreaterThan(0.03);
    expect(strict.problems[0]?.field).toBe('primary.tap_turns');
    expect(strict.problems[0]?.reason).toMatch(/^primary cannot tune: at the fixed tap \(2 turns\) the tank /);
    const relaxed = build(false);
    expect(relaxed.problems).toEqual([]);
    expect(relaxed.warnings.map((w) => w.key)).toEqual(['fixed_tap_mistuned']);
  });

  test('a given tap is used and reported', () => {
    const evaluation = context({
      secondary: SECONDARY,
      primary: flatSpiral({ tapTurns: 6.5 }),
      tank: { capacitance: 30e-9 },
    });
    secondaryStage(evaluation);
    primaryStage(evaluation);
    expect(evaluation.metrics.primary_tap_turns).toBe(6.5);
    expect(evaluation.metrics.primary_inductance).toBeLessThan(evaluation.metrics.primary_full_inductance as number);
  });

  test('problems: a ring inside the winding, fewer than one turn, a tap beyond the primary', () => {
    const inside = context({ secondary: SECONDARY, primary: flatSpiral({ innerDiameter: 0.165 }) });
    secondaryStage(inside);
    primaryStage(inside);
    expect(inside.problems).toHaveLength(1);
    expect(inside.problems[0].field).toBe('primary.inner_diameter');
    expect(inside.problems[0].reason).toMatch(/mm/);
    expect(inside.metrics.primary_inductance).toBeNull();

    const few = context({ secondary: SECONDARY, primary: flatSpiral({ turns: 0.5 }) });
    secondaryStage(few);
    primaryStage(few);
    expect(few.problems[0].field).toBe('primary.turns');

    const tap = context({ secondary: SECONDARY, primary: flatSpiral({ tapTurns: 11 }) });
    secondaryStage(tap);
    primaryStage(tap);
    expect(tap.problems[0].field).toBe('primary.tap_turns');
  });

  test('a primary without a secondary: inductance only, no mutual or coupling', () => {
    const evaluation = context({ primary: flatSpiral() });
    primaryStage(evaluation);
    expect(evaluation.metrics.primary_inductance).toBeGreaterThan(0);
    expect(evaluation.metrics.mutual_inductance).toBeNull();
    expect(evaluation.metrics.coupling).toBeNull();
  });
});
