/**
 * CSV for spreadsheets, by csv-stringify: RFC 4180 quoting, '.' as decimal point, no thousands
 * separators, and text cells that a spreadsheet would read as a formula (starting with = + - @, or a
 * tab or carriage return) guarded with a leading apostrophe.
 *
 * Numeric columns never hold text, so a spreadsheet reads every one of them as numbers:
 * - numbers are written to `digits` significant digits (7 by default), whole numbers exactly;
 * - a value that is not a finite number (an infinite crowding distance, a metric that does not
 *   apply, NaN) is an empty cell;
 * - booleans are 1 (true) and 0 (false).
 */
import { stringify } from 'csv-stringify/sync';

export type Cell = string | number | boolean | null;

/** Significant digits of CSV numbers unless a run asks for more (`--digits`). */
export const DEFAULT_DIGITS = 7;

/** The largest digit count a double carries meaningfully (17 round-trips every double). */
export const MAX_DIGITS = 17;

/** A text cell safe from formula injection. */
export function guardText(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

/** A finite number to `digits` significant digits, in the shortest form that reads back the same. */
export function formatCsvNumber(value: number, digits: number = DEFAULT_DIGITS): string {
  if (!Number.isFinite(value)) return '';
  if (Number.isSafeInteger(value)) return String(value);
  return String(Number(value.toPrecision(digits)));
}

function cellText(cell: Cell, digits: number): string {
  if (cell === null) return '';
  if (typeof cell === 'number') return formatCsvNumber(cell, digits);
  if (typeof cell === 'boolean') return cell ? '1' : '0';
  return guardText(cell);
}

/** CSV text of a header and rows (with a trailing newline). */
export function toCsv(
  header: readonly string[],
  rows: readonly (readonly Cell[])[],
  digits: number = DEFAULT_DIGITS,
): string {
  return stringify([header.map((h) => guardText(h)), ...rows.map((row) => row.map((cell) => cellText(cell, digits)))], {
    record_delimiter: '\n',
  });
}

/** CSV text of rows only (for streaming appends). */
export function csvRows(rows: readonly (readonly Cell[])[], digits: number = DEFAULT_DIGITS): string {
  if (rows.length === 0) return '';
  return stringify(
    rows.map((row) => row.map((cell) => cellText(cell, digits))),
    { record_delimiter: '\n' },
  );
}
