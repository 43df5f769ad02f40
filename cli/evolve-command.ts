/**
 * `coilfront evolve RUN_DIR [--evaluations N] [--population P] [--seed S]`: carries a finished (or
 * stopped) sweep further with the evolutionary stage of optimize/evolve/, seeded by the sweep's kept
 * candidates, in the same worker pool. Writes evolved.csv (the improved, distinct designs, ids e1, e2, …,
 * the columns of candidates.csv), evolved.json (exact values for `show RUN e3`, and their metrics so a
 * later `refine` starts from them too), rewrites front.csv as the sweep's front merged with them, and
 * adds an `evolve` section (hypervolume before and after, evaluations) to summary.json.
 *
 * Durability: every finished generation is appended to evolve-journal.log and synced; a run stopped at
 * any instant (kill -9 included) continues from its last generation when the same command is given
 * again, and ends in the same files. The journal is removed once the outputs are written.
 * Ctrl-C or SIGTERM stops it after the generation in flight (cli/stage-signal.ts), and prints the
 * command that resumes it.
 */
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { type EvolveOutcome, evolveSweep } from '../optimize/evolve-run.ts';
import type { ShouldStop } from '../optimize/stage-stop.ts';
import { defaultWorkerCount } from '../workers/pool.ts';
import { openEvaluator } from '../run/evaluator.ts';
import { openEvolveJournal } from '../run/evolve-journal.ts';
import { lockRunOrRefuse } from '../run/sweep-setup.ts';
import { readRunRecord, RUN_FILES } from '../run/run-directory.ts';
import type { CliIo } from './io.ts';
import { readSweepState } from './stage-outputs.ts';
import { stageStop } from './stage-signal.ts';
import { writeEvolveOutputs } from './stage-writes.ts';
import { loadRunSpec } from './sweep-spec.ts';
import { candidateNumbering, outputEntries } from './sweep-outputs.ts';
import { fileError, optionError } from './input-errors.ts';
import { evolveConsole } from './views/stage-console.ts';

export interface EvolveCommandOptions {
  evaluations: number;
  population: number;
  seed?: number;
  workers?: number;
  /** Polled between generations (the sweep's stages pass their stop request); true stops with StageStopped. */
  shouldStop?: ShouldStop;
}

function checkOptions(options: EvolveCommandOptions): void {
  const whole = (option: string, value: number | undefined, least: number) => {
    if (value !== undefined && (!Number.isInteger(value) || value < least))
      throw optionError(option, `expected a whole number of at least ${least}, got ${value}`);
  };
  whole('--evaluations', options.evaluations, 1);
  whole('--population', options.population, 4);
  whole('--seed', options.seed, 0);
  if (options.seed !== undefined && options.seed > 0xffffffff)
    throw optionError('--seed', `expected a whole number below 2^32, got ${options.seed}`);
}

/** The command that carries a stopped evolve on: the same settings (the journal's identity). */
function resumeCommand(directory: string, options: EvolveCommandOptions): string {
  const seed = options.seed !== undefined ? ` --seed ${options.seed}` : '';
  return `npx coilfront evolve ${directory} --evaluations ${options.evaluations} --population ${options.population}${seed}`;
}

export async function evolveCommand(directory: string, options: EvolveCommandOptions, io: CliIo): Promise<number> {
  checkOptions(options);
  const record = readRunRecord(directory);
  const spec = loadRunSpec(directory);
  if (spec.objectives.length === 0)
    throw fileError(directory, `the sweep has no objectives; evolve needs at least one to improve on`);
  const state = readSweepState(directory, spec, record.keep);
  if (state.pool.size === 0) throw fileError(directory, `the sweep has no candidates to evolve from`);
  const seed = options.seed ?? spec.seed;
  const lock = lockRunOrRefuse(directory);
  const stop = stageStop(options.shouldStop, io);
  try {
    // The journal's first record names the stage it belongs to; one of other settings is started over.
    const identity = {
      kind: 'coilfront-evolve',
      spec_hash: spec.hash,
      sweep_evaluated: state.counts.evaluated,
      seed,
      evaluations: options.evaluations,
      population: options.population,
    };
    const journalPath = join(directory, RUN_FILES.evolveJournal);
    const { journal, replay } = openEvolveJournal(journalPath, identity, directory, io.err);
    const candidates = candidateNumbering(outputEntries(state, record.keep).ranked);
    const threads = options.workers ?? defaultWorkerCount();
    const space = new DesignSpace(spaceDefinitionOf(spec));
    const evaluator = openEvaluator(spec, threads);
    const started = performance.now();
    let lastProgress = started;
    let outcome: EvolveOutcome;
    try {
      const runOptions = {
        seed,
        evaluations: options.evaluations,
        population: options.population,
        batchSize: Math.max(8, record.batch_size),
        referencePoint: spec.referencePoint,
        shouldStop: stop.shouldStop,
      };
      outcome = await evolveSweep(space, state, spec.samples, evaluator, runOptions, {
        replay,
        append: (generation) => {
          journal.append(generation);
          journal.sync();
          // Progress on stderr: a refreshing line on a terminal, a plain line every ten seconds in a log.
          const now = performance.now();
          if (!io.isTty && now - lastProgress < 10_000) return;
          lastProgress = now;
          const text = `evolve: generation ${generation.generation}, ${generation.used}/${options.evaluations} evaluations`;
          io.err(io.isTty ? `\r${text}` : `${text}\n`);
        },
      });
    } catch (error) {
      const kept = `every finished generation is kept in ${journalPath}`;
      const code = stop.stopped(error, kept, resumeCommand(directory, options));
      if (code === null) throw error;
      return code;
    } finally {
      await evaluator.close();
      journal.close();
    }
    if (io.isTty) io.err('\n');

    const { improved, summaryPath } = await writeEvolveOutputs(directory, spec, record, outcome, {
      seed,
      population: options.population,
      evaluationBudget: options.evaluations,
      candidates,
      wallSeconds: (performance.now() - started) / 1000,
      threads,
    });
    rmSync(journalPath, { force: true });
    const refinedEarlier = existsSync(join(directory, RUN_FILES.refinedDesigns));
    io.out(evolveConsole(directory, spec, seed, outcome, improved, summaryPath, refinedEarlier).join('\n'));
    return 0;
  } finally {
    stop.dispose();
    lock.release();
  }
}
