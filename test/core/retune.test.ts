/**
 * Retuning from measurements (core/retune.ts): the fit against the exact inversion of Thomson's
 * formula f = 1/(2π √(L C)) (refs §4), and the tap against the closed-form tuning condition
 * L1 = L2 C2 / C1 (core/primary/tuning.ts). The coil is the invented exhibit example; every check is
 * a self-consistency of the model with an exact relation, not a measured coil.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { loadDesignFile } from '../../cli/load-design.ts';
import type { Design } from '../../core/design.ts';
import { evaluateDesign, type Evaluation } from '../../core/evaluate.ts';
import { primaryInductanceAtTap, primaryInductanceTable } from '../../core/primary/inductance.ts';
import { primaryRings } from '../../core/primary/rings.ts';
import { fitSecondary, type Retune, type RetuneModel } from '../../core/retune.ts';
import { retuneDesign } from '../../core/retune-design.ts';

const TWO_PI = 2 * Math.PI;

/** A lumped secondary of 40 mH and 20 pF (Thomson: 177.94 kHz), winding alone 12 pF. */
function syntheticModel(): RetuneModel {
  const inductance = 40e-3;
  const capacitance = 20e-12;
  return {
    effectiveInductance: inductance,
    effectiveCapacitance: capacitance,
    frequency: 1 / (TWO_PI * Math.sqrt(inductance * capacitance)),
    lowFrequencyInductance: 38e-3,
    selfCapacitance: 9e-12,
    bare: { effectiveCapacitance: 12e-12, frequency: 1 / (TWO_PI * Math.sqrt(inductance * 12e-12)) },
    streamerCapacitance: 0,
  };
}

function fitOf(result: ReturnType<typeof fitSecondary>) {
  if (!('fit' in result)) throw new Error(result.reason);
  return result.fit;
}

describe('fitSecondary(model, measured)', () => {
  it('a measurement equal to the prediction fits nothing: ΔC = 0 and ρ = 1 exactly', () => {
    const model = syntheticModel();
    for (const measured of [
      { frequencyWithTopload: model.frequency },
      { secondaryFrequency: model.bare?.frequency },
      { selfCapacitance: 9e-12 },
      { secondaryInductance: 38e-3 },
    ]) {
      const fit = fitOf(fitSecondary(model, measured));
      expect(fit.capacitanceShift).toBe(0);
      expect(fit.inductanceRatio).toBe(1);
      expect(fit.frequency).toBe(model.frequency);
    }
  });

  it('the frequency with the topload fixes C by Thomson inverted: C = 1/((2π f)² L)', () => {
    const model = syntheticModel();
    const fit = fitOf(fitSecondary(model, { frequencyWithTopload: 160e3 }));
    // exact: C = 1/((2π·160 kHz)²·40 mH) = 24.7366 pF
    expect(fit.capacitance).toBeCloseTo(1 / ((TWO_PI * 160e3) ** 2 * 40e-3), 24);
    expect(fit.capacitance * 1e12).toBeCloseTo(24.7366, 3);
    expect(fit.frequency).toBe(160e3);
    expect(fit.capacitanceFrom).toBe('frequency_with_topload');
  });

  it('a measured inductance scales L_eff, and the frequency then fixes C for that inductance', () => {
    const model = syntheticModel();
    const fit = fitOf(fitSecondary(model, { secondaryInductance: 39.9e-3, frequencyWithTopload: 170e3 }));
    expect(fit.inductanceRatio).toBeCloseTo(39.9 / 38, 14);
    expect(fit.inductance).toBeCloseTo(40e-3 * (39.9 / 38), 16);
    expect(fit.capacitance).toBeCloseTo(1 / ((TWO_PI * 170e3) ** 2 * fit.inductance), 24);
    // the inductance alone moves the frequency by 1/√ρ
    const alone = fitOf(fitSecondary(model, { secondaryInductance: 39.9e-3 }));
    expect(alone.frequency).toBeCloseTo(model.frequency / Math.sqrt(39.9 / 38), 6);
  });

  it("the winding's own resonance gives its capacitance error, carried to the top unchanged", () => {
    const model = syntheticModel();
    // the winding alone measured at 90 % of its modelled frequency: C_bare/0.81 − C_bare more
    const measured = 0.9 * (model.bare?.frequency ?? 0);
    const fit = fitOf(fitSecondary(model, { secondaryFrequency: measured }));
    expect(fit.capacitanceShift).toBeCloseTo(12e-12 / 0.81 - 12e-12, 24);
    expect(fit.capacitance).toBeCloseTo(20e-12 + 12e-12 / 0.81 - 12e-12, 24);
    expect(fitOf(fitSecondary(model, { selfCapacitance: 10.5e-12 })).capacitanceShift).toBeCloseTo(1.5e-12, 24);
  });

  it('a fit that would need a non-positive capacitance is refused with its field', () => {
    // a winding alone modelled above the total (artificial): a much higher bare resonance takes away more than C
    const model = { ...syntheticModel(), bare: { effectiveCapacitance: 25e-12, frequency: 200e3 } };
    expect(fitSecondary(model, { secondaryFrequency: 1e6 })).toMatchObject({ field: 'secondary_frequency' });
    expect(fitSecondary(syntheticModel(), { secondaryInductance: -1 })).toMatchObject({
      field: 'secondary_inductance',
    });
  });
});

describe('retuneDesign(design, measured) on the exhibit example', () => {
  let design: Design;
  let evaluation: Evaluation;
  let frequency: number;
  beforeAll(() => {
    design = loadDesignFile('examples/exhibit-two-metre-coil.yaml').design;
    evaluation = evaluateDesign(design);
    frequency = evaluation.metrics.resonant_frequency ?? Number.NaN;
  });

  function retune(measured: Parameters<typeof retuneDesign>[1]): Retune {
    const result = retuneDesign(design, measured);
    if (!('fit' in result)) throw new Error(result.reason);
    return result;
  }

  /** The primary's L1(t) of the design (core/primary/inductance.ts), H. */
  function inductanceAt(tap: number): number {
    const primary = design.primary;
    if (!primary || !design.secondary) throw new Error('primary');
    const table = primaryInductanceTable(
      primaryRings(primary, design.secondary.baseHeight),
      primary.conductorDiameter / 2,
    );
    return primaryInductanceAtTap(table, tap);
  }

  it("a measurement equal to the model's prediction gives the model's own tap, exactly", () => {
    const own = evaluation.metrics.primary_tap_turns;
    const result = retune({ frequencyWithTopload: frequency });
    expect(result.modelTap.tuning.tapTurns).toBe(own);
    expect(result.fittedTap.tuning.tapTurns).toBe(own);
    expect(result.fit.capacitanceShift).toBe(0);
    expect(result.fittedTap.tapMargin).toBe(evaluation.metrics.primary_tap_margin);
  });

  it("the winding alone measured at its modelled frequency also leaves the model's tap exactly", () => {
    const bare = evaluateDesign({ ...design, topload: undefined, tank: undefined, driver: undefined });
    const result = retune({ secondaryFrequency: bare.metrics.resonant_frequency ?? 0 });
    expect(result.fittedTap.tuning.tapTurns).toBe(evaluation.metrics.primary_tap_turns);
  });

  it('a secondary 3 % low moves the tap outward by the closed form L1 ∝ 1/f²; 3 % high, inward', () => {
    const model = retune({ frequencyWithTopload: frequency }).fittedTap;
    const low = retune({ frequencyWithTopload: 0.97 * frequency }).fittedTap;
    const high = retune({ frequencyWithTopload: 1.03 * frequency }).fittedTap;
    expect(low.tuning.status).toBe('tuned');
    expect(high.tuning.status).toBe('tuned');
    expect(low.tuning.tapTurns).toBeGreaterThan(model.tuning.tapTurns);
    expect(high.tuning.tapTurns).toBeLessThan(model.tuning.tapTurns);
    // closed-form tuning: the required L1 scales as (f_model / f_measured)², and L1(tap) hits it
    expect(low.tuning.requiredInductance / model.tuning.requiredInductance).toBeCloseTo(1 / 0.97 ** 2, 12);
    expect(high.tuning.requiredInductance / model.tuning.requiredInductance).toBeCloseTo(1 / 1.03 ** 2, 12);
    for (const setting of [low, high]) {
      expect(inductanceAt(setting.tuning.tapTurns) / setting.tuning.requiredInductance).toBeCloseTo(1, 12);
      expect(Math.abs(setting.tuningError)).toBeLessThan(1e-12);
    }
    // the tank at the new tap rings at the measured frequency
    expect(low.tankFrequency / (0.97 * frequency)).toBeCloseTo(1, 12);
  });

  it('a design without a tank cannot be retuned: the problem names the section', () => {
    expect(retuneDesign({ ...design, tank: undefined }, { frequencyWithTopload: frequency })).toEqual({
      field: 'tank',
      reason: 'retuning needs the tank capacitor',
    });
  });
});
