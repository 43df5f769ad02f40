/**
 * `coilfront report RUN [--out report.html]`: the morning report of a run as one self-contained HTML
 * file (cli/views/report-page.ts): the cautions in full, the counts and what rejected designs, the
 * interactive front with each front design's drawing, a sortable table of the top candidates, the
 * drawings of the top three, and the sensitivities of summary.json.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { drawingOf } from './draw-command.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { optionError } from '../run/input-error.ts';
import { fileError } from './input-errors.ts';
import type { CliIo } from './io.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { runDesign, runSpace } from './run-design.ts';
import { type ReportSummary, reportData, reportRows } from './views/report-data.ts';
import { reportHtml } from './views/report-page.ts';
import { readRunTable } from './views/run-table.ts';

export interface ReportOptions {
  out?: string;
  /** Most front designs drawn (each drawing is one more field solve), default 40. */
  drawings?: string;
}

const DEFAULT_DRAWINGS = 40;
/** A coarser field grid than `draw`'s for the report's many drawings (smaller file, quicker). */
const REPORT_FIELD_COLUMNS = 45;

export async function reportCommand(directory: string, options: ReportOptions, io: CliIo): Promise<number> {
  if (!existsSync(join(directory, RUN_FILES.summary)))
    throw fileError(directory, `not a finished run (no ${RUN_FILES.summary})`);
  let drawingLimit = DEFAULT_DRAWINGS;
  if (options.drawings !== undefined) {
    if (!/^\d+$/.test(options.drawings))
      throw optionError('--drawings', `expected a whole number, got '${options.drawings}'`);
    drawingLimit = Number(options.drawings);
  }
  if (options.out !== undefined && !/\.html?$/i.test(options.out))
    throw optionError('--out', `expected a file name ending in .html, got '${options.out}'`);
  const summary = JSON.parse(readFileSync(join(directory, RUN_FILES.summary), 'utf8')) as ReportSummary;
  const candidates = readRunTable(join(directory, RUN_FILES.candidates));
  const front = readRunTable(join(directory, RUN_FILES.front));
  const space = runSpace(directory);
  const rows = reportRows(front, candidates);
  const drawings: Record<string, string> = {};
  const notes: string[] = [];
  const draw = (id: string) => {
    if (id in drawings) return;
    const found = runDesign(directory, id, space);
    drawings[id] = drawingOf(found.design, found.label, directory, REPORT_FIELD_COLUMNS).replace(
      /^<svg /,
      `<svg data-rank="${id}" `,
    );
  };
  const frontIds = rows.frontRows.map((r) => String(r.rank));
  for (const id of frontIds.slice(0, drawingLimit)) draw(id);
  if (frontIds.length > drawingLimit) {
    notes.push(
      `${frontIds.length - drawingLimit} of the ${frontIds.length} front designs are not drawn here (--drawings ${drawingLimit}); npx coilfront draw ${directory} RANK draws any.`,
    );
  }
  const topThree = rows.candidateRows.slice(0, 3).map((r) => String(r.rank));
  for (const id of topThree) draw(id);
  const data = reportData(directory, summary, candidates, rows, { drawings, topThree, notes });
  const out = options.out ?? join(directory, 'report.html');
  writeFileAtomicSync(out, reportHtml(data));
  io.out(`${out}\n`);
  return 0;
}
