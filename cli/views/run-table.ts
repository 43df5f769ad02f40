/**
 * A run's CSV read back as a typed table: each column numeric (every non-empty cell a number) or
 * text, numbers as numbers and empty cells as null. The spreadsheet, the plots, the drawings and the
 * report all start here, so they read the same columns the user sees.
 */
import { existsSync, readFileSync } from 'node:fs';
import { parse as parseCsv } from 'csv-parse/sync';
import { fileError, optionError } from '../input-errors.ts';

export type TableCell = number | string | null;

export interface RunTable {
  header: string[];
  /** Per column: true where every non-empty cell is a number. */
  numeric: boolean[];
  rows: TableCell[][];
}

const NUMBER = /^-?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/** Parses CSV text into a typed table. */
export function parseRunTable(text: string): RunTable {
  const records = parseCsv(text, { skip_empty_lines: true, relax_column_count: false }) as string[][];
  const [header = [], ...body] = records;
  const numeric = header.map((_, c) => body.every((row) => row[c] === '' || NUMBER.test(row[c] ?? '')));
  const rows = body.map((row) =>
    header.map((_, c): TableCell => {
      const text = row[c] ?? '';
      if (text === '') return null;
      return numeric[c] ? Number(text) : text;
    }),
  );
  return { header, numeric, rows };
}

/** Reads a run's CSV file (candidates.csv, front.csv, …) as a typed table. */
export function readRunTable(path: string): RunTable {
  if (!existsSync(path)) throw fileError(path, 'no such file');
  return parseRunTable(readFileSync(path, 'utf8'));
}

/** A column's index, or an input error naming the columns there are (with the closest first). */
export function columnIndex(table: RunTable, name: string, option: string): number {
  const index = table.header.indexOf(name);
  if (index >= 0) return index;
  throw optionError(option, `no column '${name}' in the run (${columnHint(table.header, name)})`);
}

/** Unit suffixes of the CSV column names (display-units.ts), left out when matching words. */
const UNIT_WORDS = new Set([
  'kv',
  'pf',
  'nf',
  'mm',
  'cm',
  'khz',
  'hz',
  'uh',
  'mh',
  'us',
  'ohm',
  'mohm',
  'per',
  'deg',
  'kg',
]);

/**
 * The columns to suggest for a name that is not one: those containing it, else those sharing the
 * most weight of its words (split at `_` and `.`, units and one-letter words left out), at most five; else
 * where the full list is.
 */
function columnHint(header: readonly string[], name: string): string {
  const near = header.filter((h) => h.startsWith(name) || h.includes(name));
  if (near.length > 0) return `did you mean ${near.slice(0, 3).join(', ')}?`;
  const words = (text: string): string[] =>
    text
      .toLowerCase()
      .split(/[_.]/)
      .filter((w) => w.length > 1 && !UNIT_WORDS.has(w));
  // A later word weighs more (the quantity comes last: topload_voltage is a voltage first).
  const wanted = new Map(words(name).map((w, k) => [w, k + 1]));
  const scored = header
    .map((h) => ({ h, shared: words(h).reduce((sum, w) => sum + (wanted.get(w) ?? 0), 0) }))
    .filter((entry) => entry.shared > 0)
    .sort((a, b) => b.shared - a.shared);
  if (scored.length > 0)
    return `did you mean ${scored
      .slice(0, 5)
      .map((entry) => entry.h)
      .join(', ')}?`;
  return `its ${header.length} columns are the header line of the CSV file`;
}
