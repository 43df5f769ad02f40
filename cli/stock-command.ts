/**
 * `coilfront stock` lists the stock catalogues; `coilfront stock NAME` lists the sizes of one, with
 * its source and how sure its values are (cli/stock/catalogues.ts).
 */
import { fieldError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { SAFETY_LINE } from './safety.ts';
import { STOCK_CATALOGUES, stockNames, type StockCatalogue } from './stock/catalogues.ts';
import { suggest } from './suggest.ts';

/** Columns padded to their widest cell; a column of numbers (and '-') right-aligned, text left. */
function table(header: string[], rows: string[][]): string[] {
  const widths = header.map((title, c) => Math.max(title.length, ...rows.map((row) => row[c].length)));
  const numeric = header.map((_, c) => c > 0 && rows.every((row) => /^(-|[\d.]+)$/.test(row[c])));
  const line = (cells: string[]) =>
    cells
      .map((cell, c) => (numeric[c] ? cell.padStart(widths[c]) : cell.padEnd(widths[c])))
      .join('  ')
      .trimEnd();
  return [line(header), ...rows.map(line)];
}

function overview(): string[] {
  const rows = [...STOCK_CATALOGUES.values()].map((c) => [c.name, c.kind, String(c.sizes.length), c.title]);
  return [
    'stock catalogues (in a sweep file: field: { stock: NAME, from: …, to: … }, bounds inclusive and optional):',
    ...table(['name', 'fits', 'sizes', 'what'], rows).map((line) => `  ${line}`),
    'npx coilfront stock NAME lists the sizes, with the source of each catalogue.',
  ];
}

function listing(catalogue: StockCatalogue): string[] {
  const rows = catalogue.sizes.map((size) => [
    size.label,
    ...size.cells.map((cell) => (cell === null ? '-' : String(cell))),
  ]);
  return [
    `${catalogue.name}: ${catalogue.title}`,
    `source: ${catalogue.source}`,
    `note: ${catalogue.note}`,
    `fits: ${catalogue.kind === 'wire' ? 'wire fields (secondary.wire)' : 'length fields (a form, conductor or tube diameter)'}`,
    ...table(['size', ...catalogue.columns], rows).map((line) => `  ${line}`),
  ];
}

export function stockCommand(name: string | undefined, io: CliIo): number {
  let lines: string[];
  if (name === undefined) lines = overview();
  else {
    const catalogue = STOCK_CATALOGUES.get(name);
    if (catalogue === undefined) {
      const guess = suggest(name, stockNames());
      throw fieldError('stock', {
        path: [],
        message: `unknown catalogue '${name}'${guess ? ` (did you mean '${guess}'?)` : ''}; expected one of ${stockNames().join(', ')}`,
      });
    }
    lines = listing(catalogue);
  }
  io.out(`${[...lines, '', SAFETY_LINE].join('\n')}\n`);
  return 0;
}
