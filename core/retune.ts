/**
 * Retuning a built coil from measurements: the model's uncertain part is fitted to what was
 * measured, and the tap that tunes the tank to the fitted secondary follows in closed form.
 *
 * What is trusted and what is fitted:
 * - The secondary is the lumped pair the tank sees at the top, L_eff and C_eff (core/stages: the
 *   distributed model's effective values, or the winding's inductance and the field solve's total
 *   capacitance), with f2 = 1/(2π √(L_eff C_eff)) ([thomson1853], refs §11.4); what is fitted is ours (refs §13).
 * - A measured low-frequency inductance L_meas scales L_eff by ρ = L_meas / L_model (the winding's
 *   inductance is the better-known part; the ratio carries a measured error of it into L_eff).
 * - The capacitance is the uncertain part (the winding's and topload's surroundings: floor, walls,
 *   primary, the form's dielectric). It is fitted as an additive shift ΔC at the top:
 *   - from the frequency with the topload in place, f_top: C_fit = C_eff (f_model / f_top)² / ρ
 *     (exact inversion of Thomson's formula for the lumped pair);
 *   - from the winding's own resonance before the topload is fitted, f_bare: the same inversion on
 *     the model of the winding alone gives its capacitance error ΔC = C_bare (f_bare,model / f_bare)² / ρ
 *     − C_bare, carried unchanged to the top with the topload (an approximation of ours: the winding's
 *     surroundings error is assumed not to change when the topload is added);
 *   - from a measured self-capacitance C_self: ΔC = C_self − C_self,model, carried the same way.
 * - The tap: L1 = ρ L_eff (C_eff + ΔC) / C1 (the tuning condition of core/primary/tuning.ts), solved
 *   for the tap in closed form; with ρ = 1 and ΔC = 0 this is the model's own tap exactly.
 * Pure: SI numbers in, SI numbers out; the caller evaluates the design (core/evaluate.ts).
 */
import { lcResonantFrequency } from './capacitance/resonance.ts';
import { primaryInductanceAtTap, type PrimaryInductanceTable } from './primary/inductance.ts';
import { tapForInductance, type TuningResult } from './primary/tuning.ts';

/** What was measured on the built coil, SI (any subset; at least one). */
export interface RetuneMeasurements {
  /** Resonance of the winding alone, before the topload is fitted, Hz. */
  secondaryFrequency?: number;
  /** Resonance of the secondary with its topload in place, Hz. */
  frequencyWithTopload?: number;
  /** Low-frequency inductance of the winding, H. */
  secondaryInductance?: number;
  /** Self-capacitance of the winding, F. */
  selfCapacitance?: number;
}

/** The model's values the fit starts from (from the evaluations of the design and of its winding alone). */
export interface RetuneModel {
  /** L_eff at the top of the winding with the topload, H. */
  effectiveInductance: number;
  /** C_eff at the top with the topload, F. */
  effectiveCapacitance: number;
  /** The model's resonant frequency with the topload, Hz (the reported `resonant_frequency`). */
  frequency: number;
  /** The winding's low-frequency inductance, H (`secondary_inductance`). */
  lowFrequencyInductance: number;
  /** The winding's modelled self-capacitance, F (`secondary_self_capacitance`), or null. */
  selfCapacitance: number | null;
  /** The winding alone (no topload): its effective capacitance and resonant frequency, or null. */
  bare: { effectiveCapacitance: number; frequency: number } | null;
  /** Capacitance added at the top by streamers (common practice, refs §9), F; 0 for none. */
  streamerCapacitance: number;
}

/** The fitted secondary. */
export interface SecondaryFit {
  /** ρ = L_meas / L_model (1 when the inductance was not measured). */
  inductanceRatio: number;
  /** ΔC added to the capacitance at the top, F. */
  capacitanceShift: number;
  /** ρ L_eff, H. */
  inductance: number;
  /** C_eff + ΔC, F. */
  capacitance: number;
  /** The fitted secondary's resonance with the topload, Hz. */
  frequency: number;
  /** Which measurement fixed the capacitance: 'frequency_with_topload', 'secondary_frequency', 'self_capacitance' or null. */
  capacitanceFrom: 'frequency_with_topload' | 'secondary_frequency' | 'self_capacitance' | null;
}

/**
 * Fits the model's secondary to the measurements (see the file comment for what is fitted).
 * @returns the fit, or a reason when the measurements cannot be fitted (non-positive values, a
 *   bare-winding measurement without a model of the winding alone, a fitted capacitance ≤ 0)
 */
export function fitSecondary(
  model: RetuneModel,
  measured: RetuneMeasurements,
): { fit: SecondaryFit } | { field: string; reason: string } {
  const ratio =
    measured.secondaryInductance !== undefined ? measured.secondaryInductance / model.lowFrequencyInductance : 1;
  if (!(ratio > 0 && Number.isFinite(ratio))) {
    return { field: 'secondary_inductance', reason: 'the measured and modelled inductances must be positive' };
  }
  let shift = 0;
  let capacitanceFrom: SecondaryFit['capacitanceFrom'] = null;
  if (measured.frequencyWithTopload !== undefined) {
    // Thomson inverted: C_fit = C_eff (f_model / f_top)² / ρ; ΔC = C_fit − C_eff
    const fitted = (model.effectiveCapacitance * (model.frequency / measured.frequencyWithTopload) ** 2) / ratio;
    shift = fitted - model.effectiveCapacitance;
    capacitanceFrom = 'frequency_with_topload';
  } else if (measured.secondaryFrequency !== undefined) {
    if (model.bare === null) {
      return { field: 'secondary_frequency', reason: 'the model of the winding alone has no resonance to fit' };
    }
    const fitted =
      (model.bare.effectiveCapacitance * (model.bare.frequency / measured.secondaryFrequency) ** 2) / ratio;
    shift = fitted - model.bare.effectiveCapacitance;
    capacitanceFrom = 'secondary_frequency';
  } else if (measured.selfCapacitance !== undefined) {
    if (model.selfCapacitance === null) {
      return { field: 'self_capacitance', reason: 'the model gives no self-capacitance for this winding' };
    }
    shift = measured.selfCapacitance - model.selfCapacitance;
    capacitanceFrom = 'self_capacitance';
  }
  const inductance = ratio * model.effectiveInductance;
  const capacitance = model.effectiveCapacitance + shift;
  if (!(capacitance > 0)) {
    return {
      field: capacitanceFrom ?? 'measured',
      reason: `the fitted capacitance at the top would not be positive (${capacitance} F): the measurement does not fit this design`,
    };
  }
  const frequency =
    ratio === 1 && shift === 0
      ? model.frequency
      : capacitanceFrom === 'frequency_with_topload' && measured.frequencyWithTopload !== undefined
        ? measured.frequencyWithTopload
        : lcResonantFrequency(inductance, capacitance);
  return {
    fit: { inductanceRatio: ratio, capacitanceShift: shift, inductance, capacitance, frequency, capacitanceFrom },
  };
}

/** A tap and the tank it gives. */
export interface TapSetting {
  tuning: TuningResult;
  /** The tank's frequency at the tap, Hz. */
  tankFrequency: number;
  /** tank / target − 1. */
  tuningError: number;
  /** Turns between the tap and the nearer end of its range [min(1, turns), turns]. */
  tapMargin: number;
}

/**
 * The tap that tunes a tank of capacitance C1 to a secondary of inductance L and capacitance C
 * (L1 = L C / C1, core/primary/tuning.ts), with the tank frequency and the margins it leaves.
 */
export function tapFor(
  table: PrimaryInductanceTable,
  primaryTurns: number,
  tankCapacitance: number,
  secondaryInductance: number,
  secondaryCapacitance: number,
): TapSetting {
  const lowest = Math.min(1, primaryTurns);
  const required = (secondaryInductance * secondaryCapacitance) / tankCapacitance;
  const tuning = tapForInductance(table, required, lowest, primaryTurns);
  const tankFrequency = lcResonantFrequency(primaryInductanceAtTap(table, tuning.tapTurns), tankCapacitance);
  const target = lcResonantFrequency(secondaryInductance, secondaryCapacitance);
  return {
    tuning,
    tankFrequency,
    tuningError: tankFrequency / target - 1,
    tapMargin: Math.max(0, Math.min(tuning.tapTurns - lowest, primaryTurns - tuning.tapTurns)),
  };
}

/** The whole retune of a design: the fit, the model's tap and the new one, with and without streamers. */
export interface Retune {
  model: RetuneModel;
  fit: SecondaryFit;
  /** The fit the winding-alone measurement gives by itself, when the topload frequency fixed the fit too. */
  bareCrossCheck: SecondaryFit | null;
  /** The tap the model itself chooses (the evaluation's `primary_tap_turns` without a fixed tap). */
  modelTap: TapSetting;
  /** The tap for the fitted secondary. */
  fittedTap: TapSetting;
  /** The tap for the fitted secondary with streamer loading at the top (null without a streamer length). */
  loadedTap: TapSetting | null;
  /** The fitted secondary's frequency with streamer loading, Hz (null without a streamer length). */
  loadedFrequency: number | null;
  /** The tank's frequencies at the lowest and the highest tap, Hz. */
  tankRange: { highest: number; lowest: number };
  /** The primary's turns (the highest tap). */
  primaryTurns: number;
  /** The tap the design file fixes (`tap_turns`), or null. */
  currentTap: number | null;
  /** The coupling coefficient with the primary tapped at the fitted tap (the model's geometry), or null. */
  couplingAtFittedTap: number | null;
}

/** Why a design cannot be retuned: the field and the reason (an input problem for the CLI). */
export interface RetuneProblem {
  field: string;
  reason: string;
}
