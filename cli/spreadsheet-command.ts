/**
 * `coilfront spreadsheet RUN [--out FILE]`: candidates.xlsx beside the run's CSVs (or where --out
 * says), from candidates.csv (or --file front.csv / infeasible.csv / refined.csv).
 */
import { basename, join } from 'node:path';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import type { CliIo } from './io.ts';
import { readRunRecord } from '../run/run-directory.ts';
import { SAFETY_LINE } from './safety.ts';
import { readRunTable } from './views/run-table.ts';
import { workbookOf } from './views/spreadsheet.ts';

export interface SpreadsheetOptions {
  out?: string;
  file?: string;
}

export async function spreadsheetCommand(directory: string, options: SpreadsheetOptions, io: CliIo): Promise<number> {
  readRunRecord(directory);
  const file = options.file ?? 'candidates.csv';
  const table = readRunTable(join(directory, file));
  const out = options.out ?? join(directory, `${basename(file, '.csv')}.xlsx`);
  const bytes = await workbookOf(table, `${file} of ${directory}: ${table.rows.length} designs`);
  writeFileAtomicSync(out, bytes);
  io.out(`wrote ${out} (${table.rows.length} rows, ${table.header.length} columns)\n${SAFETY_LINE}\n`);
  return 0;
}
