/**
 * Reading a YAML or JSON input file into a plain value. JSON is read by the YAML parser too (YAML 1.2
 * is a superset), so one path serves both and every syntax error comes back the same way:
 * one line with the file, the line and column, and the parser's reason.
 */
import { readFileSync } from 'node:fs';
import { parseDocument } from 'yaml';
import { fileError } from './input-errors.ts';

const MAX_INPUT_BYTES = 16 * 1024 * 1024;

/** The text of an input file, or an InputError saying why it cannot be read. */
export function readInputText(file: string): string {
  let buffer: Buffer;
  try {
    buffer = readFileSync(file);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const reason =
      code === 'ENOENT'
        ? 'no such file'
        : code === 'EISDIR'
          ? 'is a directory, not a file'
          : code === 'EACCES'
            ? 'permission denied'
            : `cannot be read (${code ?? 'unknown error'})`;
    throw fileError(file, `${reason}`);
  }
  if (buffer.length > MAX_INPUT_BYTES) throw fileError(file, `larger than 16 MiB; not a design or sweep file`);
  return buffer.toString('utf8');
}

/** Parses YAML or JSON text; syntax errors become one-line InputErrors. */
export function parseInputText(text: string, file: string): unknown {
  const document = parseDocument(text, { uniqueKeys: true, prettyErrors: false });
  const error = document.errors[0];
  if (error) {
    const position = error.linePos?.[0];
    const where = position ? `line ${position.line}, column ${position.col}: ` : '';
    const reason = error.message.split('\n')[0].replace(/ at line \d+, column \d+:?$/, '');
    throw fileError(file, `${where}cannot parse: ${reason}`);
  }
  let value: unknown;
  try {
    value = document.toJS({ maxAliasCount: 100 });
  } catch (caught) {
    throw fileError(file, `cannot parse: ${(caught as Error).message.split('\n')[0]}`);
  }
  if (value === null || value === undefined) throw fileError(file, `the file is empty`);
  return value;
}

/** Reads and parses an input file. */
export function readInputFile(file: string): unknown {
  return parseInputText(readInputText(file), file);
}
