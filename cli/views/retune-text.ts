/**
 * The retune's report: the readable text (ending with the safety cautions) and the JSON, SI units.
 */
import { formatQuantity } from '../../core/outcome/warnings.ts';
import type { Retune, RetuneMeasurements, SecondaryFit, TapSetting } from '../../core/retune.ts';
import { MEASUREMENTS } from '../retune-measurements.ts';
import { safetyBlock } from '../safety.ts';

const hz = (value: number) => formatQuantity(value, 'Hz');
const farads = (value: number) => formatQuantity(value, 'F');
const henries = (value: number) => formatQuantity(value, 'H');
const turns = (value: number) => `${Number(value.toFixed(2))} turns`;
const percent = (value: number) => `${value >= -5e-5 ? '+' : '−'}${Math.abs(100 * value).toFixed(2)} %`;

function fittedWords(fit: SecondaryFit): string {
  const source =
    fit.capacitanceFrom === 'frequency_with_topload'
      ? 'from the resonance with the topload in place'
      : fit.capacitanceFrom === 'secondary_frequency'
        ? "from the winding's own resonance, the winding's error carried to the top unchanged"
        : fit.capacitanceFrom === 'self_capacitance'
          ? 'from the measured self-capacitance, its error carried to the top unchanged'
          : 'not fitted (no frequency or capacitance measured)';
  return `capacitance at the top ${fit.capacitanceShift >= 0 ? '+' : '−'}${farads(Math.abs(fit.capacitanceShift))} ${source}`;
}

function tapLine(what: string, setting: TapSetting, primaryTurns: number): string {
  const status =
    setting.tuning.status === 'tuned'
      ? ''
      : setting.tuning.status === 'below_range'
        ? ' — CANNOT TUNE: the tank needs less inductance than one turn gives (at the inner end)'
        : ` — CANNOT TUNE: the tank needs more inductance than all ${primaryTurns} turns give (at the outer end)`;
  return `${what}: ${turns(setting.tuning.tapTurns)} from the inner end, tank ${hz(setting.tankFrequency)} (${percent(setting.tuningError)} against the secondary)${status}`;
}

/** The readable retune report, ending with the safety cautions. */
export function formatRetune(file: string, measured: RetuneMeasurements, retune: Retune): string {
  const { fit, model } = retune;
  const given = Object.entries(MEASUREMENTS)
    .filter(([, spec]) => measured[spec.field] !== undefined)
    .map(
      ([key, spec]) =>
        `${key} ${formatQuantity(measured[spec.field] ?? 0, spec.kind === 'frequency' ? 'Hz' : spec.kind === 'inductance' ? 'H' : 'F')}`,
    );
  const move = retune.fittedTap.tuning.tapTurns - retune.modelTap.tuning.tapTurns;
  const lines = [
    `Retune of ${file} from measurements`,
    `  measured: ${given.join(', ')}`,
    `  fitted: ${fittedWords(fit)}; inductance ${fit.inductanceRatio === 1 ? 'as modelled' : `× ${fit.inductanceRatio.toFixed(4)} (measured against modelled)`}`,
    `  capacitance at the top: model ${farads(model.effectiveCapacitance)} → fitted ${farads(fit.capacitance)}; effective inductance ${henries(fit.inductance)}`,
    `  secondary with its topload: model ${hz(model.frequency)} → fitted ${hz(fit.frequency)}`,
  ];
  if (model.bare && measured.secondaryFrequency !== undefined) {
    lines.push(
      `  winding alone (no topload): model ${hz(model.bare.frequency)}, measured ${hz(measured.secondaryFrequency)}; its capacitance model ${farads(model.bare.effectiveCapacitance)}`,
    );
  }
  if (retune.bareCrossCheck) {
    lines.push(
      `  cross-check: the winding-alone measurement by itself would put the secondary at ${hz(retune.bareCrossCheck.frequency)}`,
    );
  }
  lines.push(
    '',
    `  ${tapLine("model's tap", retune.modelTap, retune.primaryTurns)}`,
    `  ${tapLine('set the tap to', retune.fittedTap, retune.primaryTurns)}`,
    `  move: ${move >= 0 ? '+' : '−'}${turns(Math.abs(move))} from the model's tap (${Math.abs(move) < 0.005 ? 'stay' : move > 0 ? 'outward: more turns' : 'inward: fewer turns'})${retune.currentTap !== null ? `; the file's tap_turns is ${turns(retune.currentTap)}` : ''}`,
    `  margins: ${turns(retune.fittedTap.tapMargin)} to the nearer end of the primary; the tank reaches ${hz(retune.tankRange.lowest)} to ${hz(retune.tankRange.highest)} over its taps`,
  );
  if (retune.couplingAtFittedTap !== null) {
    lines.push(`  coupling at the new tap: ${retune.couplingAtFittedTap.toFixed(3)} (the modelled geometry)`);
  }
  if (retune.loadedTap && retune.loadedFrequency !== null) {
    lines.push(
      `  ${tapLine('with streamer loading', retune.loadedTap, retune.primaryTurns)} (secondary ${hz(retune.loadedFrequency)}, common practice 1 pF per foot of streamer)`,
    );
  }
  lines.push(
    '',
    '  The fit trusts the modelled inductance (or the measured one) and corrects the capacitance at the top;',
    '  set the tap, then confirm by ear or with a scope at low power before a full run.',
    '',
    safetyBlock(),
  );
  return `${lines.join('\n')}\n`;
}

/** The retune as JSON, SI units. */
export function retuneJson(measured: RetuneMeasurements, retune: Retune): Record<string, unknown> {
  const tap = (setting: TapSetting | null) =>
    setting === null
      ? null
      : {
          tap_turns: setting.tuning.tapTurns,
          status: setting.tuning.status,
          required_inductance: setting.tuning.requiredInductance,
          tank_frequency: setting.tankFrequency,
          tuning_error: setting.tuningError,
          tap_margin: setting.tapMargin,
        };
  return {
    measured,
    model: retune.model,
    fit: retune.fit,
    bare_cross_check: retune.bareCrossCheck,
    model_tap: tap(retune.modelTap),
    fitted_tap: tap(retune.fittedTap),
    loaded_tap: tap(retune.loadedTap),
    loaded_frequency: retune.loadedFrequency,
    tank_range: retune.tankRange,
    current_tap: retune.currentTap,
    coupling_at_fitted_tap: retune.couplingAtFittedTap,
  };
}
