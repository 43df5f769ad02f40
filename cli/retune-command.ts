/**
 * `coilfront retune DESIGN --measured key=value ...`: fits the model's uncertain part (the
 * capacitance at the top; the inductance when measured) to measurements on the built coil and gives
 * the tap to set, the tank frequency there and the margins left (core/retune.ts).
 */
import { retuneDesign } from '../core/retune-design.ts';
import { fieldError, optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { loadDesignFile } from './load-design.ts';
import { MEASUREMENTS, readMeasurements } from './retune-measurements.ts';
import { formatRetune, retuneJson } from './views/retune-text.ts';

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
