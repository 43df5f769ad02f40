/**
 * The commander program. `runCli(argv, io)` runs one command and resolves to its exit code, so the
 * whole CLI runs inside vitest; cli/main.ts is the process entry. Errors of input are one line and
 * exit code 2; anything else is a bug and says so.
 */
import { Command, CommanderError } from 'commander';
import { InputError } from './input-error.ts';
import type { CliIo } from './io.ts';
import { evaluateCommand } from './evaluate-command.ts';

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
