/**
 * CSV for spreadsheets, by csv-stringify: RFC 4180 quoting, '.' as decimal point, no thousands
 * separators, numbers in their shortest exact form, booleans as 1/0, NaN and infinities (a boundary
 * design's crowding distance) as empty cells, and text cells that a spreadsheet would read as a
 * formula (starting with = + - @, or a tab or carriage return) guarded with a leading apostrophe.
 */
import { stringify } from 'csv-stringify/sync';

export type Cell = string | number | boolean | null;

/** A text cell safe from formula injection. */
export function guardText(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

function cellText(cell: Cell): string {
  if (cell === null) return '';
  if (typeof cell === 'number') {
    // No text in numeric columns: NaN and ±Infinity (a boundary design's crowding distance) are
    // empty cells, which every spreadsheet reads as blank rather than as a word.
    if (!Number.isFinite(cell)) return '';
    return String(cell);
  }
  if (typeof cell === 'boolean') return cell ? '1' : '0';
  return guardText(cell);
}

/** CSV text of a header and rows (with a trailing newline). */
export function toCsv(header: readonly string[], rows: readonly (readonly Cell[])[]): string {
  return stringify([header.map((h) => guardText(h)), ...rows.map((row) => row.map(cellText))], {
    record_delimiter: '\n',
  });
}

/** CSV text of rows only (for streaming appends). */
export function csvRows(rows: readonly (readonly Cell[])[]): string {
  if (rows.length === 0) return '';
  return stringify(
    rows.map((row) => row.map(cellText)),
    { record_delimiter: '\n' },
  );
}
