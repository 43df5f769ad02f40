/**
 * The measurements `coilfront retune --measured key=value` takes, and their reading into SI values
 * (cli/units.ts); an InputError naming the option for anything wrong.
 */
import type { RetuneMeasurements } from '../core/retune.ts';
import { optionError } from '../run/input-error.ts';
import { suggest } from './suggest.ts';
import { readQuantity, type QuantityKind } from './units.ts';

/** The measurements `--measured` takes: the key, its kind of quantity and the field of RetuneMeasurements. */
export const MEASUREMENTS: Record<string, { kind: QuantityKind; field: keyof RetuneMeasurements; meaning: string }> = {
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
