/**
 * The commander program. `runCli(argv, io)` runs one command and resolves to its exit code, so the
 * whole CLI runs inside vitest; cli/main.ts is the process entry. Errors of input are one line and
 * exit code 2; anything else is a bug and says so.
 */
import { registerViewCommands } from './view-commands.ts';
import { MAX_DIGITS } from '../run/csv.ts';
import { readFileSync } from 'node:fs';
import { Command, CommanderError, InvalidArgumentError, Option } from 'commander';
import { InputError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { evaluateCommand } from './evaluate-command.ts';
import { sweepCommand, type SweepOptions } from './sweep-command.ts';
import { batchEvaluate } from './batch-evaluate.ts';
import { checkCommand } from './check-command.ts';
import { designFileSchema, sweepSchema } from './json-schema.ts';
import { showCommand } from './show-command.ts';
import { mergeCommand } from './merge-command.ts';
import { demoCommand } from './demo-command.ts';
import { refineCommand, type RefineCommandOptions } from './refine-command.ts';
import { evolveCommand, type EvolveCommandOptions } from './evolve-command.ts';
import { STAGE_DEFAULTS } from './sweep-stages.ts';
import { sensitivityCommand, type SensitivityOptions } from './sensitivity-command.ts';
import { sheetCommand, type SheetCommandOptions } from './sheet-command.ts';
import { stockCommand } from './stock-command.ts';
import { retuneCommand } from './retune-command.ts';
import { toleranceCommand, type ToleranceCommandOptions } from './tolerance-command.ts';
import { commandError } from './input-errors.ts';

/** The journal's sync interval: --sync-every, or its older spelling --checkpoint-every (hidden). */
interface SyncEveryFlags {
  syncEvery?: string;
  checkpointEvery?: string;
}

/** The version in package.json (one directory above cli/ and dist/cli/). */
function packageVersion(): string {
  for (const candidate of ['../package.json', '../../package.json']) {
    try {
      const data = JSON.parse(readFileSync(new URL(candidate, import.meta.url), 'utf8')) as {
        name?: string;
        version?: string;
      };
      if (data.name === 'coilfront' && data.version) return data.version;
    } catch {
      // try the next place
    }
  }
  return 'unknown';
}

/** Commander parser of whole-number options: a usage error (exit 2) for anything else. */
function integer(option: string) {
  return (text: string): number => {
    if (!/^\s*\d+\s*$/.test(text)) throw new InvalidArgumentError(`${option}: expected a whole number, got '${text}'`);
    return Number(text);
  };
}

/** Commander parser of --digits: a whole number from 1 to MAX_DIGITS. */
function digitsOption(text: string): number {
  const value = integer('--digits')(text);
  if (value < 1 || value > MAX_DIGITS)
    throw new InvalidArgumentError(`--digits: expected 1 to ${MAX_DIGITS} significant digits, got ${value}`);
  return value;
}

export async function runCli(argv: string[], io: CliIo): Promise<number> {
  let exitCode = 0;
  const program = new Command();
  program
    .name('coilfront')
    .description('design-space optimizer and parameter sweeper for air-core resonant transformers')
    .version(packageVersion(), '-V, --version', 'print the version')
    .exitOverride()
    .configureOutput({ writeOut: (text) => io.out(text), writeErr: (text) => io.err(text) })
    .showHelpAfterError(false);

  const setExit = (code: number) => {
    exitCode = code;
  };
  registerDesignCommands(program, io, setExit);
  registerStudyCommands(program, io, setExit);
  registerRunCommands(program, io, setExit);
  registerBuildCommands(program, io, setExit);

  try {
    await program.parseAsync(argv, { from: 'user' });
    return exitCode;
  } catch (error) {
    if (error instanceof InputError) {
      io.err(`coilfront: ${error.message}\n`);
      return error.exitCode;
    }
    if (error instanceof CommanderError) {
      if (error.code === 'commander.helpDisplayed' || error.code === 'commander.version' || error.exitCode === 0)
        return 0;
      return 2;
    }
    const message = error instanceof Error ? error.message : String(error);
    io.err(`coilfront: internal error: ${message}\n  (this is a bug; please report it with the input file)\n`);
    if (process.env.COILFRONT_DEBUG && error instanceof Error) io.err(`${error.stack}\n`);
    return 70;
  }
}

/** Commands on one design file and on a run's candidates: evaluate, check, schema, the views, show. */
function registerDesignCommands(program: Command, io: CliIo, setExit: (code: number) => void): void {
  program
    .command('evaluate')
    .description('evaluate one design file and print a report (or --json)')
    .argument('[file]', 'design file, YAML or JSON')
    .option('--json', 'print the JSON contract (SI units) instead of the report')
    .option('--batch <jsonl>', "evaluate one JSON design per line ('-' for stdin), one JSON result per line out")
    .option('--workers <n>', 'worker threads for --batch (default: available parallelism)', integer('--workers'))
    .action(async (file: string | undefined, options: { json?: boolean; batch?: string; workers?: number }) => {
      if (options.batch !== undefined) {
        if (file !== undefined) throw commandError('evaluate', 'give a design file or --batch, not both');
        setExit(
          await batchEvaluate(options.batch, io, options.workers !== undefined ? { workers: options.workers } : {}),
        );
        return;
      }
      if (file === undefined) throw commandError('evaluate', 'give a design file (or --batch FILE.jsonl)');
      setExit(evaluateCommand(file, options, io));
    });

  program
    .command('check')
    .description('validate a sweep file, show its dimensions and estimate its run time')
    .argument('<spec>', 'sweep file, YAML or JSON')
    .option('--workers <n>', 'workers to estimate for', integer('--workers'))
    .option('--force', 'allow sample counts beyond the documented limit')
    .action((spec: string, options: { workers?: number; force?: boolean }) => {
      setExit(checkCommand(spec, options, io));
    });

  program
    .command('schema')
    .description('print the JSON Schema of sweep files (or --design: of design files)')
    .option('--design', 'the schema of design files')
    .action((options: { design?: boolean }) => {
      io.out(`${JSON.stringify(options.design ? designFileSchema() : sweepSchema(), null, 2)}\n`);
    });
  registerViewCommands(program, io, setExit);

  program
    .command('show')
    .description('print the design file of a ranked candidate of a run')
    .argument('<run>', 'run directory')
    .argument(
      '[rank]',
      'rank in candidates.csv (the same rank front.csv shows), a refined id r1, r2, … or an evolved id e1, e2, …',
    )
    .option('--refined <rank>', 'a design of refined.csv instead (the same as rN)')
    .option('--sample <index>', 'the design of a sample index (the sample_index column)')
    .action((run: string, rank: string | undefined, options: { refined?: string; sample?: string }) => {
      setExit(showCommand(run, rank, options, io));
    });
}

/** Studies of a finished sweep or of a sweep file: refine, sensitivity, tolerance, evolve. */
function registerStudyCommands(program: Command, io: CliIo, setExit: (code: number) => void): void {
  program
    .command('refine')
    .description("polish a sweep's best candidates and its Pareto front with Nelder-Mead")
    .argument('<run>', 'run directory of a sweep')
    .option('--starts <n>', 'number of starts', integer('--starts'), 8)
    .option('--evaluations <n>', 'total evaluation budget, shared by the starts', integer('--evaluations'), 2000)
    .option('--workers <n>', 'worker threads (default: available parallelism)', integer('--workers'))
    .action(async (run: string, options: RefineCommandOptions) => {
      setExit(await refineCommand(run, options, io));
    });

  program
    .command('sensitivity')
    .description('first-order and total Sobol indices of the fields of a sweep file on its metrics')
    .argument('<file>', 'sweep file, YAML or JSON')
    .option('--samples <n>', 'base samples N (N·(fields + 2) evaluations)', integer('--samples'), 512)
    .option('--workers <n>', 'worker threads (default: available parallelism)', integer('--workers'))
    .option('--out <dir>', 'directory for sensitivity.csv and sensitivity.json', '.')
    .option('--shard <k/N>', 'evaluate only the k-th of N blocks of the rows, into OUT/sensitivity-shards/k-of-N')
    .option('--merge [dirs...]', 'merge finished shards (default: every directory under OUT/sensitivity-shards)')
    .action(async (file: string, options: SensitivityOptions) => {
      setExit(await sensitivityCommand(file, options, io));
    });

  program
    .command('tolerance')
    .description('yield and metric quantiles of candidates built with tolerances (same draws for every candidate)')
    .argument('<target>', 'run directory of a sweep, or a design file (with --tolerances)')
    .option('--top <n>', 'first ranks of the list (--from) to study', integer('--top'), 20)
    .option('--draws <n>', "builds per candidate (default: the tolerances' draws, or 256)", integer('--draws'))
    .option('--tolerances <file>', 'file with a tolerances: section (and constraints, objectives, metrics)')
    .option('--workers <n>', 'worker threads (default: available parallelism)', integer('--workers'))
    .option('--out <dir>', 'directory for tolerance.csv and tolerance.json of a design file', '.')
    .option('--from <list>', 'designs of the run to study: candidates, refined (r1 …) or evolved (e1 …)', 'candidates')
    .option('--shard <k/N>', 'study only the k-th of N blocks of the candidates, into tolerance-shards/k-of-N')
    .option('--merge [dirs...]', "merge finished shards (default: every directory under the study's shards folder)")
    .action(async (target: string, options: ToleranceCommandOptions) => {
      setExit(await toleranceCommand(target, options, io));
    });

  program
    .command('evolve')
    .description("carry a sweep's kept candidates further with a multi-objective genetic algorithm")
    .argument('<run>', 'run directory of a sweep')
    .option('--evaluations <n>', 'new evaluations to spend', integer('--evaluations'), 2000)
    .option(
      '--population <n>',
      'designs per generation (at least 4)',
      integer('--population'),
      STAGE_DEFAULTS.evolve.population,
    )
    .option('--seed <n>', "seed of the stage's random draws (default: the sweep's)", integer('--seed'))
    .option('--workers <n>', 'worker threads (default: available parallelism)', integer('--workers'))
    .action(async (run: string, options: EvolveCommandOptions) => {
      setExit(await evolveCommand(run, options, io));
    });
}

/** The overnight run and its companions: merge, demo, sweep. */
function registerRunCommands(program: Command, io: CliIo, setExit: (code: number) => void): void {
  program
    .command('merge')
    .description('merge the shard directories of one sweep into the outputs of a single run')
    .argument('<shards...>', 'shard run directories')
    .option('--out <dir>', 'directory for the merged results')
    .option('--overwrite', 'write into a non-empty output directory')
    .action(async (shards: string[], options: { out?: string; overwrite?: boolean }) => {
      setExit(await mergeCommand(shards, options, io));
    });

  program
    .command('demo')
    .description('sweep the example science-centre scenario into runs/demo and print the best five')
    .option('--workers <n>', 'worker threads', integer('--workers'))
    .action(async (options: { workers?: number }) => {
      setExit(await demoCommand(options, io));
    });

  program
    .command('sweep')
    .description('sample a design space overnight: ranked candidates.csv, front.csv, summary.json')
    .argument('[spec]', 'sweep file, YAML or JSON (optional with --resume)')
    .option('--out <dir>', 'directory for the results (must be empty unless --overwrite)')
    .option('--resume <dir>', 'continue an interrupted run in this directory')
    .option(
      '--workers <n>',
      'worker threads (default: available parallelism; 0 evaluates in the main thread)',
      integer('--workers'),
    )
    .option(
      '--keep <k>',
      "candidates to keep and rank exactly (default: 1000, or the resumed run's)",
      integer('--keep'),
    )
    .option('--all', 'also write all.csv with every evaluated design')
    .option('--digits <n>', 'significant digits of CSV numbers (default 7, at most 17)', digitsOption)
    .option('--shard <k/N>', 'evaluate slice k of N of the sample indices')
    .option('--shard-count <n>', 'number of shards when the scheduler gives only an index', integer('--shard-count'))
    .option('--time-limit <duration>', 'stop cleanly after this long (90m, 8h, 1d)')
    .option('--sync-every <duration>', 'how often the journal is forced to disk (default 5s)')
    .addOption(new Option('--checkpoint-every <duration>').hideHelp())
    .option('--batch-size <n>', 'designs per worker task (default: measured)', integer('--batch-size'))
    .option('--force', 'allow sample counts beyond the documented limit')
    .option('--overwrite', 'write into a non-empty output directory')
    .option('--quiet', 'no progress on stderr')
    .action(async (spec: string | undefined, given: Omit<SweepOptions, 'syncEvery'> & SyncEveryFlags) => {
      const { syncEvery, checkpointEvery, ...options } = given;
      setExit(await sweepCommand(spec, { ...options, syncEvery: syncEvery ?? checkpointEvery ?? '5s' }, io));
    });
}

/** From a candidate to a machine on the bench: sheet, stock, retune. */
function registerBuildCommands(program: Command, io: CliIo, setExit: (code: number) => void): void {
  program
    .command('sheet')
    .description('the build sheet of a design file or of a ranked candidate of a run (Markdown, and a parts CSV)')
    .argument('<design-or-run>', 'design file (YAML or JSON) or run directory')
    .argument('[rank]', 'with a run: rank in candidates.csv, a refined id r1, … or an evolved id e1, …')
    .option('--out <file>', 'write the Markdown here (and the parts list beside it, NAME.parts.csv)')
    .option('--parts <file>', 'write the parts list (CSV) here')
    .option('--refined <rank>', 'a design of refined.csv (the same as rN)')
    .option('--sample <index>', 'the design of a sample index (the sample_index column)')
    .option('--reel-mass <mass>', 'copper on one reel of magnet wire (default 1 kg)')
    .action((target: string, rank: string | undefined, options: SheetCommandOptions) => {
      setExit(sheetCommand(target, rank, options, io));
    });

  program
    .command('stock')
    .description('list the stock catalogues (pipe, tube, magnet wire), or the sizes of one')
    .argument('[name]', 'catalogue name')
    .action((name: string | undefined) => {
      setExit(stockCommand(name, io));
    });

  program
    .command('retune')
    .description('fit the model to measurements on the built coil and give the tap to set')
    .argument('<file>', 'design file, YAML or JSON')
    .option(
      '--measured <key=value>',
      'a measurement (repeatable): secondary_frequency, frequency_with_topload, secondary_inductance, self_capacitance',
      (value: string, previous: string[] = []) => [...previous, value],
    )
    .option('--json', 'print the retune as JSON (SI units)')
    .action((file: string, options: { measured?: string[]; json?: boolean }) => {
      setExit(retuneCommand(file, options, io));
    });
}
