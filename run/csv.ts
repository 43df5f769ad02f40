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
 *
 * Text cells are ASCII: a spreadsheet that opens a CSV by double click guesses its character set
 * (LibreOffice Calc's headless import and Excel's default both read it as a Western 8-bit set, not
 * UTF-8, with or without a byte-order mark), so `toroid 400×100 mm` would arrive as `400Ã—100`.
 * The symbols our labels, reasons and warnings use are written in ASCII (× as x, µ as u, ± as +/-,
 * en and em dashes as -, ° as deg, ≤ ≥ ≈ as <= >= ~, Ω as ohm), accented letters lose their accents,
 * and only a character with no ASCII form (one a user wrote in a label) is left as it is.
 */
import { stringify } from 'csv-stringify/sync';

export type Cell = string | number | boolean | null;

/** Significant digits of CSV numbers unless a run asks for more (`--digits`). */
export const DEFAULT_DIGITS = 7;

/** The largest digit count a double carries meaningfully (17 round-trips every double). */
export const MAX_DIGITS = 17;

const ASCII_FORMS: Readonly<Record<string, string>> = {
  '×': 'x',
  µ: 'u',
  μ: 'u',
  '±': '+/-',
  '–': '-',
  '—': '-',
  '−': '-',
  '°': 'deg',
  '≤': '<=',
  '≥': '>=',
  '≈': '~',
  Ω: 'ohm',
  '·': '*',
  '…': '...',
  '‘': "'",
  '’': "'",
  '“': '"',
  '”': '"',
  '²': '2',
  '³': '3',
  π: 'pi',
  ß: 'ss',
  '\u00a0': ' ',
  '\u202f': ' ',
};

/** Text in ASCII where it has an ASCII form (see the module comment); ASCII text is returned as it is. */
export function asciiText(text: string): string {
  if (/^[\t\n\r\x20-\x7e]*$/.test(text)) return text;
  let out = '';
  for (const char of text) {
    const form = ASCII_FORMS[char];
    out += form ?? char.normalize('NFKD').replace(/[\u0300-\u036f]/g, '');
  }
  return out;
}

/** A text cell in ASCII where it can be, and safe from formula injection. */
export function guardText(text: string): string {
  const ascii = asciiText(text);
  return /^[=+\-@\t\r]/.test(ascii) ? `'${ascii}` : ascii;
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
  return [...csvChunks(header, rows, digits)].join('');
}

/** CSV text of rows only (for streaming appends). */
export function csvRows(rows: readonly (readonly Cell[])[], digits: number = DEFAULT_DIGITS): string {
  if (rows.length === 0) return '';
  return stringify(
    rows.map((row) => row.map((cell) => cellText(cell, digits))),
    { record_delimiter: '\n' },
  );
}

/** Rows per chunk of {@link csvChunks}: small enough that each chunk's cells die young. */
const ROWS_PER_CHUNK = 64;

/**
 * The same text as {@link toCsv}, as a sequence of chunks (the header, then at most ROWS_PER_CHUNK rows
 * each), the rows read from `rows` only as each chunk is made: a large table never exists as one
 * string or one array of cells (for {@link writeChunksAtomicSync}).
 */
export function* csvChunks(
  header: readonly string[],
  rows: Iterable<readonly Cell[]>,
  digits: number = DEFAULT_DIGITS,
): Generator<string> {
  yield stringify([header.map((h) => guardText(h))], { record_delimiter: '\n' });
  let chunk: (readonly Cell[])[] = [];
  for (const row of rows) {
    chunk.push(row);
    if (chunk.length === ROWS_PER_CHUNK) {
      yield csvRows(chunk, digits);
      chunk = [];
    }
  }
  if (chunk.length > 0) yield csvRows(chunk, digits);
}
