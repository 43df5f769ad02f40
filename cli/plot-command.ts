/**
 * `coilfront plot RUN --x COL --y COL [--color COL] [--front-only] [--near-misses] [--log-x] [--log-y]
 * [--out plot.svg|plot.png]`: any two columns of a run against each other.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import type { CliIo } from './io.ts';
import { readRunRecord, RUN_FILES } from '../run/run-directory.ts';
import { SAFETY_LINE } from './safety.ts';
import { type ColumnPlotOptions, columnPlotSpec } from './views/column-plot.ts';
import { readRunTable } from './views/run-table.ts';
import { svgToPng, vegaLiteSvg } from './views/vega-render.ts';
import { optionError } from './input-errors.ts';

export interface PlotCommandOptions extends ColumnPlotOptions {
  out?: string;
}

export async function plotCommand(directory: string, options: PlotCommandOptions, io: CliIo): Promise<number> {
  readRunRecord(directory);
  const out = options.out ?? join(directory, `plot-${options.x}-${options.y}.svg`);
  if (!/\.(svg|png)$/i.test(out)) throw optionError('--out', `expected a file ending in .svg or .png, got '${out}'`);
  const infeasiblePath = join(directory, RUN_FILES.infeasible);
  const spec = columnPlotSpec(
    {
      candidates: readRunTable(join(directory, RUN_FILES.candidates)),
      front: readRunTable(join(directory, RUN_FILES.front)),
      infeasible: existsSync(infeasiblePath) ? readRunTable(infeasiblePath) : null,
    },
    options,
  );
  const svg = await vegaLiteSvg(spec);
  writeFileAtomicSync(out, /\.png$/i.test(out) ? await svgToPng(svg) : svg);
  io.out(`wrote ${out}\n${SAFETY_LINE}\n`);
  return 0;
}
