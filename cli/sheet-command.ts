/**
 * `coilfront sheet design.yaml` and `coilfront sheet RUN RANK`: the build sheet of a design file or
 * of a ranked candidate of a run (cli/build-sheet.ts), as Markdown to stdout or to --out, with its
 * parts list as CSV beside it (`NAME.parts.csv` next to `NAME.md`, or --parts).
 */
import { existsSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { evaluateDesign } from '../core/evaluate.ts';
import { buildDesign } from '../optimize/build-design.ts';
import { buildSheet, partsCsv, sheetMarkdown } from './build-sheet.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { fieldError, optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { loadDesignFile } from './load-design.ts';
import { runDesignTree } from './show-command.ts';
import { readQuantity } from './units.ts';
import { commandError } from './input-errors.ts';

export interface SheetCommandOptions {
  out?: string;
  parts?: string;
  refined?: string;
  sample?: string;
  reelMass?: string;
}

/** Where the parts CSV goes: --parts, or beside --out (sheet.md → sheet.parts.csv). */
export function partsPathFor(out: string): string {
  return `${out.replace(/\.(md|markdown|txt)$/i, '')}.parts.csv`;
}

export function sheetCommand(
  target: string,
  rank: string | undefined,
  options: SheetCommandOptions,
  io: CliIo,
): number {
  let reelMass: number | undefined;
  if (options.reelMass !== undefined) {
    const read = readQuantity(options.reelMass, 'mass');
    if (!read.ok) throw optionError('--reel-mass', read.reason);
    if (!(read.value > 0)) throw optionError('--reel-mass', `expected a positive mass, got '${options.reelMass}'`);
    reelMass = read.value;
  }
  const isRun = existsSync(target) && statSync(target).isDirectory();
  let design: ReturnType<typeof loadDesignFile>['design'];
  let title: string;
  if (isRun) {
    const found = runDesignTree(target, rank, options);
    const built = buildDesign(found.tree);
    if (built.issues.length > 0 || !built.design)
      throw fieldError(target, built.issues[0] ?? { path: [], message: 'no design' });
    design = built.design;
    title = found.title;
  } else {
    if (rank !== undefined) throw commandError('sheet', `${target} is a design file; a rank goes with a run directory`);
    design = loadDesignFile(target).design;
    title = target;
  }
  const evaluation = evaluateDesign(design);
  if (evaluation.problems.length > 0) {
    const problem = evaluation.problems[0];
    throw fieldError(target, { path: problem.field.split('.'), message: `cannot be built: ${problem.reason}` });
  }
  const sheet = buildSheet(design, evaluation, title, reelMass !== undefined ? { reelMass } : {});
  const markdown = sheetMarkdown(sheet);
  const csv = partsCsv(sheet);
  const partsPath = options.parts ?? (options.out !== undefined ? partsPathFor(options.out) : undefined);
  // Nothing half-written: both places are checked before either file is written.
  for (const [option, path] of [
    ['--out', options.out],
    ['--parts', partsPath],
  ] as const) {
    if (path === undefined) continue;
    const directory = dirname(resolve(path));
    if (!existsSync(directory) || !statSync(directory).isDirectory())
      throw optionError(option, `cannot write ${path}: no such directory ${directory}`);
    if (existsSync(path) && statSync(path).isDirectory()) throw optionError(option, `${path} is a directory`);
  }
  if (options.out !== undefined) {
    writeFileAtomicSync(options.out, markdown);
    io.err(`wrote ${options.out}\n`);
  } else {
    io.out(markdown);
  }
  if (partsPath !== undefined) {
    writeFileAtomicSync(partsPath, csv);
    io.err(`wrote ${partsPath}\n`);
  }
  return 0;
}
