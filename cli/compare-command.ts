/**
 * `coilfront compare RUN 1 3 7` (or `coilfront compare a.yaml b.yaml`): the chosen designs side by
 * side, a column each, every design parameter and every metric in its practical unit, the rows where
 * the designs differ marked; `--svg FILE` also draws them side by side at one scale.
 */
import { existsSync, statSync } from 'node:fs';
import type { Design } from '../core/design.ts';
import { designField } from '../core/design-field.ts';
import type { NormalTree } from '../optimize/design-tree.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { fieldError, optionError } from '../run/input-error.ts';
import { commandError } from './input-errors.ts';
import type { CliIo } from './io.ts';
import { loadDesignFile } from './load-design.ts';
import { runDesign, runSpace } from './run-design.ts';
import { type Compared, comparisonText, sideBySideSvg } from './views/comparison.ts';

export { DIFFERS } from './views/comparison.ts';

/** The designs named on the command line: ids of one run, or design files. */
function comparedDesigns(source: string, rest: string[]): Compared[] {
  const isRun = existsSync(source) && statSync(source).isDirectory();
  const found: { name: string; design: Design; tree: NormalTree; file: string }[] = [];
  if (isRun) {
    if (rest.length < 1)
      throw commandError('compare', `give the ranks to compare after the run (compare ${source} 1 3 7)`);
    const space = runSpace(source);
    for (const id of rest) {
      const design = runDesign(source, id, space);
      found.push({ name: id, design: design.design, tree: design.tree, file: source });
    }
  } else {
    for (const file of [source, ...rest]) {
      const loaded = loadDesignFile(file);
      found.push({ name: file, design: loaded.design, tree: loaded.tree, file });
    }
  }
  if (found.length < 2) throw commandError('compare', 'give at least two designs');
  return found.map((f) => {
    const field = designField(f.design);
    if (field.evaluation.problems.length > 0) {
      const problem = field.evaluation.problems[0];
      throw fieldError(f.file, { path: problem.field.split('.'), message: `${f.name}: ${problem.reason}` });
    }
    return { name: f.name, design: f.design, tree: f.tree, evaluation: field.evaluation, field };
  });
}

export function compareCommand(source: string, rest: string[], options: { svg?: string }, io: CliIo): number {
  if (options.svg !== undefined && !/\.svg$/i.test(options.svg))
    throw optionError('--svg', `expected a file name ending in .svg, got '${options.svg}'`);
  const compared = comparedDesigns(source, rest);
  if (options.svg !== undefined) writeFileAtomicSync(options.svg, sideBySideSvg(compared));
  io.out(comparisonText(compared));
  if (options.svg !== undefined) io.out(`drawings side by side: ${options.svg}\n`);
  return 0;
}
