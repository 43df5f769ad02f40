/**
 * candidates.xlsx for spreadsheets that mangle CSV decimals in their locale: the same columns as
 * candidates.csv, numbers stored as numbers (the unit in the header name), text as text, the header
 * row frozen, and the safety cautions on a second sheet. Written with exceljs.
 */
import { SAFETY_CAUTIONS } from '../safety.ts';
import type { RunTable } from './run-table.ts';

/** The workbook as bytes. */
export async function workbookOf(table: RunTable, title: string): Promise<Buffer> {
  // Loaded on demand: the package takes about 0.4 s to import, which every other command would pay.
  const { default: ExcelJS } = await import('exceljs');
  const workbook = new ExcelJS.Workbook();
  workbook.creator = 'coilfront';
  // A fixed date, so that the same run gives the same bytes.
  workbook.created = new Date(0);
  workbook.modified = new Date(0);
  const sheet = workbook.addWorksheet('candidates', { views: [{ state: 'frozen', ySplit: 1 }] });
  sheet.columns = table.header.map((name, c) => ({
    header: name,
    key: `c${c}`,
    width: Math.min(40, Math.max(10, name.length + 2)),
  }));
  sheet.getRow(1).font = { bold: true };
  for (const row of table.rows) sheet.addRow(row.map((cell) => (cell === null ? null : cell)));
  table.numeric.forEach((isNumber, c) => {
    if (isNumber) sheet.getColumn(c + 1).numFmt = 'General';
  });
  const cautions = workbook.addWorksheet('safety');
  cautions.getColumn(1).width = 110;
  cautions.addRow([title]).font = { bold: true };
  cautions.addRow([]);
  cautions.addRow(['SAFETY']).font = { bold: true };
  for (const line of SAFETY_CAUTIONS) cautions.addRow([line.trim()]);
  cautions.addRow([]);
  cautions.addRow(['Empty cells: a metric that does not apply, or an infinite crowding distance (a front end).']);
  cautions.addRow(['feasible: 1 = meets every constraint, 0 = does not.']);
  const bytes = await workbook.xlsx.writeBuffer();
  return Buffer.from(bytes);
}
