/**
 * The commands that show a finished run: spreadsheet, plot, draw, compare, report. Registered here
 * so that program.ts stays a list of one line per group.
 */
import type { Command } from 'commander';
import type { CliIo } from './io.ts';
import { type PlotCommandOptions, plotCommand } from './plot-command.ts';
import { spreadsheetCommand, type SpreadsheetOptions } from './spreadsheet-command.ts';
import { drawCommand } from './draw-command.ts';
import { type ReportOptions, reportCommand } from './report-command.ts';
import { compareCommand } from './compare-command.ts';

export function registerViewCommands(program: Command, io: CliIo, setExit: (code: number) => void): void {
  program
    .command('spreadsheet')
    .description('write candidates.xlsx (typed columns, frozen header, cautions on a second sheet)')
    .argument('<run>', 'run directory')
    .option('--file <csv>', 'which CSV of the run (default candidates.csv)')
    .option('--out <file>', 'where to write (default: beside the CSV)')
    .action(async (run: string, options: SpreadsheetOptions) => {
      setExit(await spreadsheetCommand(run, options, io));
    });

  program
    .command('plot')
    .description('any two columns of a run against each other (SVG, or PNG by the --out name)')
    .argument('<run>', 'run directory')
    .requiredOption('--x <column>', 'column for the horizontal axis (a CSV header name)')
    .requiredOption('--y <column>', 'column for the vertical axis')
    .option('--color <column>', 'colour the marks by this column')
    .option('--front-only', 'only the non-dominated designs')
    .option('--near-misses', 'also the closest infeasible designs, muted')
    .option('--log-x', 'logarithmic horizontal axis')
    .option('--log-y', 'logarithmic vertical axis')
    .option('--out <file>', 'plot.svg or plot.png (default: plot-X-Y.svg in the run)')
    .action(async (run: string, options: PlotCommandOptions) => {
      setExit(await plotCommand(run, options, io));
    });

  program
    .command('draw')
    .description('a design drawn to scale with its equipotentials (a design file, or a run and a rank)')
    .argument('<source>', 'design file, or run directory')
    .argument('[rank]', 'with a run: rank in candidates.csv, or r1 (refined), e1 (evolved)')
    .option(
      '--out <file>',
      'drawing.svg or drawing.png (default: beside the design file, or drawing-RANK.svg in the run)',
    )
    .action(async (source: string, rank: string | undefined, options: { out?: string }) => {
      setExit(await drawCommand(source, rank, options, io));
    });

  program
    .command('report')
    .description('one self-contained HTML file of a run: cautions, counts, interactive front, drawings, sensitivities')
    .argument('<run>', 'run directory')
    .option('--out <file>', 'where to write (default: report.html in the run)')
    .option('--drawings <n>', 'most front designs drawn (default 40)')
    .action(async (run: string, options: ReportOptions) => {
      setExit(await reportCommand(run, options, io));
    });

  program
    .command('compare')
    .description('designs side by side: every parameter and metric with units, differences marked')
    .argument('<source>', 'run directory (then ranks), or the first design file')
    .argument('[more...]', 'ranks in the run (1, r2, e3), or more design files')
    .option('--svg <file>', 'also draw them side by side at one scale')
    .action((source: string, more: string[], options: { svg?: string }) => {
      setExit(compareCommand(source, more, options, io));
    });
}
