/**
 * `coilfront retune DESIGN --measured key=value ...`: fits the model's uncertain part (the
 * capacitance at the top; the inductance when measured) to measurements on the built coil and gives
 * the tap to set, the tank frequency there and the margins left (core/retune.ts).
 */
import { retuneDesign } from '../core/retune-design.ts';
import type { Retune, RetuneMeasurements, SecondaryFit, TapSetting } from '../core/retune.ts';
import { formatQuantity } from '../core/outcome/warnings.ts';
import { fieldError, optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { loadDesignFile } from './load-design.ts';
import { safetyBlock } from './safety.ts';
import { suggest } from './suggest.ts';
import { readQuantity, type QuantityKind } from './units.ts';

/** The measurements `--measured` takes: the key, its kind of quantity and the field of RetuneMeasurements. */
const MEASUREMENTS: Record<string, { kind: QuantityKind; field: keyof RetuneMeasurements; meaning: string }> = {
  secondary_frequency: {
    kind: 'frequency',
    field: 'secondaryFrequency',
    meaning: 'resonance of the winding alone, before the topload is fitted',
  },
  frequency_with_topload: {
    kind: 'frequency',
    field: 'frequencyWithTopload',
    meaning: 'resonance of the secondary with its topload in place',
  },
  secondary_inductance: { kind: 'inductance', field: 'secondaryInductance', meaning: 'low-frequency inductance' },
  self_capacitance: { kind: 'capacitance', field: 'selfCapacitance', meaning: 'self-capacitance of the winding' },
};

/** Reads the `--measured key=value` options into SI measurements; an InputError for anything wrong. */
export function readMeasurements(options: readonly string[]): RetuneMeasurements {
  const keys = Object.keys(MEASUREMENTS);
  if (options.length === 0) {
    throw optionError('--measured', `give at least one measurement, key=value, with key one of ${keys.join(', ')}`);
  }
  const measured: RetuneMeasurements = {};
  for (const option of options) {
    const equals = option.indexOf('=');
    if (equals < 0)
      throw optionError('--measured', `expected key=value (e.g. secondary_frequency=212kHz), got '${option}'`);
    const key = option.slice(0, equals).trim();
    const text = option.slice(equals + 1).trim();
    const spec = MEASUREMENTS[key];
    if (!spec) {
      const guess = suggest(key, keys);
      throw optionError(
        '--measured',
        `unknown measurement '${key}'${guess ? ` (did you mean '${guess}'?)` : `; expected one of ${keys.join(', ')}`}`,
      );
    }
    if (measured[spec.field] !== undefined) throw optionError(`--measured ${key}`, 'given twice');
    const value = readQuantity(/^[-+]?[\d.]+(e[-+]?\d+)?$/i.test(text) ? Number(text) : text, spec.kind);
    if (!value.ok) throw optionError(`--measured ${key}`, value.reason);
    if (!(value.value > 0)) throw optionError(`--measured ${key}`, `expected a positive value, got '${text}'`);
    measured[spec.field] = value.value;
  }
  if (measured.secondaryFrequency !== undefined && measured.selfCapacitance !== undefined) {
    throw optionError(
      '--measured',
      'secondary_frequency and self_capacitance both fit the winding alone; give one of them',
    );
  }
  return measured;
}

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

export function retuneCommand(file: string, options: { measured?: string[]; json?: boolean }, io: CliIo): number {
  const measured = readMeasurements(options.measured ?? []);
  const loaded = loadDesignFile(file);
  const retune = retuneDesign(loaded.design, measured);
  if (!('fit' in retune)) {
    const field = retune.field;
    if (field in MEASUREMENTS) throw optionError(`--measured ${field}`, retune.reason);
    throw fieldError(file, { path: field.split('.'), message: retune.reason });
  }
  io.out(
    options.json ? `${JSON.stringify(retuneJson(measured, retune), null, 2)}\n` : formatRetune(file, measured, retune),
  );
  return 0;
}
