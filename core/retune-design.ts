/**
 * Retuning a design from measurements (core/retune.ts): evaluates the design (and, for a
 * measurement of the winding alone, the winding without its topload), fits the secondary and finds
 * the taps. Pure: a function of the SI design and the measurements.
 */
import type { Design } from './design.ts';
import { evaluateDesign } from './evaluate.ts';
import { streamerCapacitance } from './capacitance/streamer.ts';
import { lcResonantFrequency } from './capacitance/resonance.ts';
import { primaryInductanceAtTap, primaryInductanceTable } from './primary/inductance.ts';
import { primaryRings } from './primary/rings.ts';
import {
  fitSecondary,
  type Retune,
  type RetuneMeasurements,
  type RetuneModel,
  type RetuneProblem,
  tapFor,
} from './retune.ts';

/**
 * Retunes a design from measurements on the built coil.
 * @param design the SI design, with a secondary, a primary and a tank
 * @param measured what was measured (at least one)
 * @returns the retune, or the problem that prevents it (a section missing, an infeasible design, a
 *   measurement that does not fit)
 */
export function retuneDesign(design: Design, measured: RetuneMeasurements): Retune | RetuneProblem {
  const { secondary, primary, tank } = design;
  if (!secondary) return { field: 'secondary', reason: 'retuning needs a secondary' };
  if (!primary) return { field: 'primary', reason: 'retuning needs a primary to tap' };
  if (!tank) return { field: 'tank', reason: 'retuning needs the tank capacitor' };
  // The model's own tuning: the tap chosen by the evaluation, whatever tap the file fixes.
  const free: Design = { ...design, primary: { ...primary, tapTurns: undefined, requireTuning: false } };
  const evaluation = evaluateDesign(free);
  if (evaluation.problems.length > 0) return evaluation.problems[0];
  const m = evaluation.metrics;
  const inductance = m.effective_inductance;
  const capacitance = m.total_capacitance;
  const frequency = m.resonant_frequency;
  const lowFrequency = m.secondary_inductance;
  if (inductance === null || capacitance === null || frequency === null || lowFrequency === null) {
    return { field: 'secondary', reason: 'the model gives no resonance for this secondary' };
  }
  let bare: RetuneModel['bare'] = null;
  if (measured.secondaryFrequency !== undefined) {
    // The winding alone, standing where it stands (primary and strike rail in place, no topload).
    const alone = evaluateDesign({ ...free, topload: undefined, tank: undefined, driver: undefined });
    const c = alone.metrics.total_capacitance;
    const f = alone.metrics.resonant_frequency;
    if (alone.problems.length === 0 && c !== null && f !== null) bare = { effectiveCapacitance: c, frequency: f };
  }
  const streamerLength = design.environment.streamerLength ?? 0;
  const model: RetuneModel = {
    effectiveInductance: inductance,
    effectiveCapacitance: capacitance,
    frequency,
    lowFrequencyInductance: lowFrequency,
    selfCapacitance: m.secondary_self_capacitance,
    bare,
    streamerCapacitance: streamerLength > 0 ? streamerCapacitance(streamerLength) : 0,
  };
  const fitted = fitSecondary(model, measured);
  if (!('fit' in fitted)) return fitted;
  const fit = fitted.fit;
  let bareCrossCheck = null;
  if (measured.frequencyWithTopload !== undefined && (measured.secondaryFrequency ?? measured.selfCapacitance)) {
    const alone = fitSecondary(model, { ...measured, frequencyWithTopload: undefined });
    if ('fit' in alone) bareCrossCheck = alone.fit;
  }
  const table = primaryInductanceTable(primaryRings(primary, secondary.baseHeight), primary.conductorDiameter / 2);
  const c1 = tank.capacitance;
  const modelTap = tapFor(table, primary.turns, c1, inductance, capacitance);
  const fittedTap = tapFor(table, primary.turns, c1, fit.inductance, fit.capacitance);
  const loaded = model.streamerCapacitance > 0;
  // The coupling at the new tap: the design evaluated with the primary tapped there.
  const tapped = evaluateDesign({
    ...design,
    primary: { ...primary, tapTurns: fittedTap.tuning.tapTurns, requireTuning: false },
  });
  return {
    model,
    fit,
    bareCrossCheck,
    modelTap,
    fittedTap,
    loadedTap: loaded
      ? tapFor(table, primary.turns, c1, fit.inductance, fit.capacitance + model.streamerCapacitance)
      : null,
    loadedFrequency: loaded ? lcResonantFrequency(fit.inductance, fit.capacitance + model.streamerCapacitance) : null,
    tankRange: {
      highest: lcResonantFrequency(primaryInductanceAtTap(table, Math.min(1, primary.turns)), c1),
      lowest: lcResonantFrequency(primaryInductanceAtTap(table, primary.turns), c1),
    },
    primaryTurns: primary.turns,
    currentTap: primary.tapTurns ?? null,
    couplingAtFittedTap: tapped.problems.length === 0 ? tapped.metrics.coupling : null,
  };
}
