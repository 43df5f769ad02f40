/**
 * Errors of input, built in one place so that every message has one format:
 * `FILE: field.path: reason` on one line, exit code 2, never a stack trace.
 */

/** One problem found in an input file, with the path of the field in the file's own names. */
export interface InputIssue {
  path: ReadonlyArray<string | number>;
  message: string;
}

/** Formats a field path the way a user writes it: `secondary.turns`, `design.primary.turns`, `objectives[1]`. */
export function formatPath(path: ReadonlyArray<string | number>): string {
  let text = '';
  for (const part of path) {
    if (typeof part === 'number') text += `[${part}]`;
    else text += text === '' ? part : `.${part}`;
  }
  return text;
}

/**
 * `text` with line breaks and other control characters written as escapes (`\n`, `\u001b`), so that a
 * message quoting a user's key or value stays on one line.
 */
export function escapeControlCharacters(text: string): string {
  // biome-ignore lint/suspicious/noControlCharactersInRegex: matching control characters is the point here
  return text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/g, (character) => {
    if (character === '\n') return '\\n';
    if (character === '\r') return '\\r';
    if (character === '\t') return '\\t';
    return `\\u${character.charCodeAt(0).toString(16).padStart(4, '0')}`;
  });
}

/** A problem with the user's input; the CLI prints `message` alone and exits with code 2. */
export class InputError extends Error {
  /** The exit code the command line ends with: 2. */
  readonly exitCode = 2;
  constructor(message: string) {
    super(escapeControlCharacters(message));
    this.name = 'InputError';
  }
}

/** An InputError for a field of a file: `file: path: reason`. */
export function fieldError(file: string, issue: InputIssue): InputError {
  const where = formatPath(issue.path);
  return new InputError(where === '' ? `${file}: ${issue.message}` : `${file}: ${where}: ${issue.message}`);
}

/** An InputError for a command-line option: `--option: reason`. */
export function optionError(option: string, reason: string): InputError {
  return new InputError(`${option}: ${reason}`);
}

/**
 * An InputError about a whole file, run directory or command (no field path): `subject: reason`, e.g.
 * `runs/a: not a coilfront run directory (no spec.yaml)` or `merge: give the shard directories`.
 */
export function subjectError(subject: string, reason: string): InputError {
  return new InputError(`${subject}: ${reason}`);
}

/**
 * An InputError about the environment a run was started in (the scheduler's variables, which have no
 * file or option to name first): the reason names the variables itself, e.g.
 * `SLURM_ARRAY_TASK_STEP: expected a step of 1 or more, got 0`.
 */
export function environmentError(reason: string): InputError {
  return new InputError(reason);
}

/** An InputError carrying a message already written in the `path: reason` shape (a DiskError's). */
export function inputErrorOf(error: { message: string }): InputError {
  return new InputError(error.message);
}
