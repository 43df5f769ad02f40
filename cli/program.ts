/**
 * The commander program. `runCli(argv, io)` runs one command and resolves to its exit code, so the
 * whole CLI runs inside vitest; cli/main.ts is the process entry. Errors of input are one line and
 * exit code 2; anything else is a bug and says so.
 */
import { Command, CommanderError, InvalidArgumentError } from 'commander';
import { InputError } from './input-error.ts';
import type { CliIo } from './io.ts';
import { evaluateCommand } from './evaluate-command.ts';
import { sweepCommand, type SweepOptions } from './sweep-command.ts';

export async function runCli(argv: string[], io: CliIo): Promise<number> {
  let exitCode = 0;
  const program = new Command();
  program
    .name('coilfront')
    .description('design-space optimizer and parameter sweeper for air-core resonant transformers')
    .exitOverride()
    .configureOutput({ writeOut: (text) => io.out(text), writeErr: (text) => io.err(text) })
    .showHelpAfterError(false);

  program
    .command('evaluate')
    .description('evaluate one design file and print a report (or --json)')
    .argument('<file>', 'design file, YAML or JSON')
    .option('--json', 'print the JSON contract (SI units) instead of the report')
    .action((file: string, options: { json?: boolean }) => {
      exitCode = evaluateCommand(file, options, io);
    });

  const integer = (option: string) => (text: string) => {
    if (!/^\s*\d+\s*$/.test(text)) throw new InvalidArgumentError(`expected a whole number, got '${text}'`);
    return Number(text);
  };

  program
    .command('sweep')
    .description('sample a design space overnight: ranked candidates.csv, front.csv, summary.json')
    .argument('[spec]', 'sweep file, YAML or JSON (optional with --resume)')
    .option('--out <dir>', 'directory for the results (must be empty unless --overwrite)')
    .option('--resume <dir>', 'continue an interrupted run in this directory')
    .option('--workers <n>', 'worker threads (default: available parallelism; 0 evaluates in the main thread)', integer('--workers'))
    .option('--keep <k>', 'candidates to keep and rank exactly', integer('--keep'), 1000)
    .option('--all', 'also write all.csv with every evaluated design')
    .option('--shard <k/N>', 'evaluate slice k of N of the sample indices')
    .option('--shard-count <n>', 'number of shards when the scheduler gives only an index', integer('--shard-count'))
    .option('--time-limit <duration>', 'stop cleanly after this long (90m, 8h, 1d)')
    .option('--checkpoint-every <duration>', 'how often the journal is flushed to disk', '5s')
    .option('--batch-size <n>', 'designs per worker task (default: measured)', integer('--batch-size'))
    .option('--force', 'allow sample counts beyond the documented limit')
    .option('--overwrite', 'write into a non-empty output directory')
    .option('--quiet', 'no progress on stderr')
    .action(async (spec: string | undefined, options: SweepOptions) => {
      exitCode = await sweepCommand(spec, options, io);
    });

  try {
    await program.parseAsync(argv, { from: 'user' });
    return exitCode;
  } catch (error) {
    if (error instanceof InputError) {
      io.err(`coilfront: ${error.message}\n`);
      return error.exitCode;
    }
    if (error instanceof CommanderError) {
      if (error.code === 'commander.helpDisplayed' || error.code === 'commander.version' || error.exitCode === 0) return 0;
      return 2;
    }
    const message = error instanceof Error ? error.message : String(error);
    io.err(`coilfront: internal error: ${message}\n  (this is a bug; please report it with the input file)\n`);
    if (process.env.COILFRONT_DEBUG && error instanceof Error) io.err(`${error.stack}\n`);
    return 70;
  }
}
