/**
 * `coilfront draw design.yaml [--out design.svg]` and `coilfront draw RUN RANK`: the design drawn to
 * scale with its solved field (cli/views/design-drawing.ts).
 */
import { existsSync, statSync } from 'node:fs';
import { basename, extname, join } from 'node:path';
import type { Design } from '../core/design.ts';
import { designField } from '../core/design-field.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { fieldError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { loadDesignFile } from './load-design.ts';
import { runDesign } from './run-design.ts';
import { designDrawingSvg } from './views/design-drawing.ts';
import { svgToPng } from './views/vega-render.ts';
import { commandError, optionError } from './input-errors.ts';

/** The drawing of one design; a design that cannot be built is an input error naming the field. */
export function drawingOf(design: Design, title: string, source: string, fieldColumns?: number): string {
  const field = designField(design);
  if (field.evaluation.problems.length > 0) {
    const problem = field.evaluation.problems[0];
    throw fieldError(source, { path: problem.field.split('.'), message: problem.reason });
  }
  return designDrawingSvg(design, field, { title, fieldColumns });
}

/** A design file, or a run directory and an id in it. */
export function resolveDrawable(
  source: string,
  id: string | undefined,
): { design: Design; title: string; defaultOut: string } {
  const isRun = existsSync(source) && statSync(source).isDirectory();
  if (isRun) {
    if (id === undefined)
      throw commandError('draw', `${source} is a run directory: give a rank too (draw ${source} 1)`);
    const found = runDesign(source, id);
    return { design: found.design, title: found.label, defaultOut: join(source, `drawing-${found.id}.svg`) };
  }
  if (id !== undefined) throw commandError('draw', `${source} is not a run directory, so '${id}' means nothing here`);
  const loaded = loadDesignFile(source);
  const stem = basename(source, extname(source));
  return {
    design: loaded.design,
    title: source,
    defaultOut: `${source.slice(0, source.length - basename(source).length)}${stem}.svg`,
  };
}

export async function drawCommand(
  source: string,
  id: string | undefined,
  options: { out?: string },
  io: CliIo,
): Promise<number> {
  if (options.out !== undefined && !/\.(svg|png)$/i.test(options.out))
    throw optionError('--out', `expected a file name ending in .svg or .png, got '${options.out}'`);
  const drawable = resolveDrawable(source, id);
  const svg = drawingOf(drawable.design, drawable.title, source);
  const out = options.out ?? drawable.defaultOut;
  writeFileAtomicSync(out, /\.png$/i.test(out) ? await svgToPng(svg) : svg);
  io.out(`${out}\n`);
  return 0;
}
