/**
 * The commands that show a finished run: spreadsheet, plot, draw, compare, report. Registered here
 * so that program.ts stays a list of one line per group.
 */
import type { Command } from 'commander';
import type { CliIo } from './io.ts';
import { spreadsheetCommand, type SpreadsheetOptions } from './spreadsheet-command.ts';

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
}
