/**
 * The command line's factory of InputErrors: every message the commands raise is built here, on the
 * shapes of run/input-error.ts (`FILE: field.path: reason`, `--option: reason`, `subject: reason`), so
 * that the formats are one. test/architecture/input-errors.test.ts keeps `new InputError(` out of
 * every other module.
 */
import { fieldError, type InputError, optionError, subjectError } from '../run/input-error.ts';

export { fieldError, optionError };

/** A problem with a command's arguments as a whole: `evaluate: give a design file (or --batch FILE.jsonl)`. */
export function commandError(command: string, reason: string): InputError {
  return subjectError(command, reason);
}

/** A problem with a whole file or run directory: `runs/a: the sweep has no candidates to refine`. */
export function fileError(file: string, reason: string): InputError {
  return subjectError(file, reason);
}
