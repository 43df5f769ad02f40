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
 */
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { type BatchEvaluator, inProcessEvaluator } from '../optimize/evaluate-batch.ts';
import { type EvolveOutcome, evolveSweep, type GenerationRecord } from '../optimize/evolve-run.ts';
import type { RankedEntry } from '../optimize/pareto/candidate-pool.ts';
import type { PackedRow } from '../optimize/packed-row.ts';
import type { ShouldStop } from '../optimize/stage-stop.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { journalRecords, openJournal } from '../run/durable/journal.ts';
import { lockRunOrRefuse } from '../run/sweep-setup.ts';
import { optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { readRunRecord, RUN_FILES, runDigits } from '../run/run-directory.ts';
import { SAFETY_CAUTIONS } from './safety.ts';
import {
  designLines,
  hypervolumeLines,
  improvedDesigns,
  readSweepState,
  writeMergedFront,
  writeStageDesigns,
  writeSummarySection,
} from './stage-outputs.ts';
import { loadRunSpec } from './sweep-spec.ts';
import type { SweepSpec } from './sweep-spec.ts';
import { candidateNumbering, outputEntries, sortedFront } from './sweep-outputs.ts';
import { fileError } from './input-errors.ts';

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
    const { journal, replay } = openEvolveJournal(journalPath, identity, directory, io);
    const candidates = candidateNumbering(outputEntries(state, record.keep).ranked);
    const threads = options.workers ?? defaultWorkerCount();
    const space = new DesignSpace(spaceDefinitionOf(spec));
    const evaluator: BatchEvaluator =
      threads === 0 ? inProcessEvaluator(space) : createWorkerPool(spaceDefinitionOf(spec), { threads });
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
        ...(options.shouldStop ? { shouldStop: options.shouldStop } : {}),
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
    } finally {
      await evaluator.close();
      journal.close();
    }
    if (io.isTty) io.err('\n');

    const { improved, summaryPath } = await writeEvolveOutputs(directory, spec, record, outcome, {
      seed,
      options,
      candidates,
      wallSeconds: (performance.now() - started) / 1000,
      threads,
    });
    rmSync(journalPath, { force: true });
    const refinedEarlier = existsSync(join(directory, RUN_FILES.refinedDesigns));
    io.out(evolveConsole(directory, spec, seed, outcome, improved, summaryPath, refinedEarlier).join('\n'));
    return 0;
  } finally {
    lock.release();
  }
}

/**
 * The evolve journal: kept when its first record names this stage's settings, else started over;
 * opened without keeping its records, and its generations replayed by streaming (flat memory).
 */
function openEvolveJournal(
  journalPath: string,
  identity: object,
  directory: string,
  io: CliIo,
): { journal: ReturnType<typeof openJournal>; replay: Iterable<GenerationRecord> } {
  if (existsSync(journalPath)) {
    // Only the first record is read here; the generations are streamed into the stage below.
    const records = journalRecords(journalPath);
    const first = records.next();
    records.return(undefined as never);
    if (!first.done && JSON.stringify(first.value) !== JSON.stringify(identity)) {
      io.err(`${journalPath}: from an evolve with other settings or an earlier sweep; starting over\n`);
      rmSync(journalPath, { force: true });
    }
  }
  // Opened without keeping its records (a torn tail is cut off): memory stays flat in its length.
  const journal = openJournal(journalPath, { keepRecords: false });
  const replayCount = Math.max(0, journal.recordCount - 1);
  if (replayCount > 0) io.err(`resuming evolve in ${directory}: ${replayCount} generations from the journal\n`);
  if (journal.recordCount === 0) {
    journal.append(identity);
    journal.sync();
  }
  const replay: Iterable<GenerationRecord> = {
    *[Symbol.iterator]() {
      if (replayCount === 0) return;
      let index = 0;
      for (const record of journalRecords(journalPath)) {
        // The identity first, then at most the generations counted when the journal was opened.
        if (index > 0 && index <= replayCount) yield record as GenerationRecord;
        if (++index > replayCount) return;
      }
    },
  };
  return { journal, replay };
}

/** evolved.csv and .json, the merged front and the summary's evolve section. */
async function writeEvolveOutputs(
  directory: string,
  spec: SweepSpec,
  record: ReturnType<typeof readRunRecord>,
  outcome: EvolveOutcome,
  run: {
    seed: number;
    options: EvolveCommandOptions;
    candidates: ReturnType<typeof candidateNumbering>;
    wallSeconds: number;
    threads: number;
  },
) {
  const { seed, options, candidates } = run;
  const front = sortedFront(outcome.merged);
  const improved = improvedDesigns(front, spec.samples);
  const kept = new Set(improved);
  const near = front.filter((entry) => entry.item.index >= spec.samples && !kept.has(entry));
  const digits = runDigits(record);
  const files = { csv: RUN_FILES.evolved, json: RUN_FILES.evolvedDesigns, digits };
  writeStageDesigns(directory, spec, improved, 'e', files, near);
  const ids = new Map(improved.map((entry, i) => [entry.item.index, `e${i + 1}`]));
  await writeMergedFront(directory, spec, front, { candidates, ids, stageOf: () => 'evolved', digits }, improved);
  const summaryPath = writeSummarySection(directory, 'evolve', {
    seed,
    population: options.population,
    generations: outcome.generations,
    evaluations: outcome.evaluations,
    evaluation_budget: options.evaluations,
    improved_designs: improved.length,
    evolved_feasible: outcome.evolved.feasibleSize,
    front_size: front.length,
    hypervolume_before: outcome.hypervolumeBefore,
    hypervolume_after: outcome.hypervolumeAfter,
    reference_point: outcome.referencePoint,
    timing: { wall_seconds: run.wallSeconds, workers: run.threads },
  });
  return { improved, summaryPath };
}

/** What evolve prints: the improved designs with units, the hypervolume explained, the files. */
function evolveConsole(
  directory: string,
  spec: SweepSpec,
  seed: number,
  outcome: EvolveOutcome,
  improved: readonly RankedEntry<PackedRow>[],
  summaryPath: string,
  refinedEarlier: boolean,
): string[] {
  const lines = [
    `evolved ${outcome.generations} generations with ${outcome.evaluations} evaluations (seed ${seed}), starting from the sweep's kept candidates`,
  ];
  if (outcome.evolved.feasibleSize === 0) {
    lines.push(
      'no evolved design met every constraint: the front is unchanged (see the sweep for what rejects designs)',
    );
  } else if (improved.length === 0) {
    lines.push('no evolved design extends the front: the sweep front already dominates every one');
  } else {
    lines.push(`${improved.length} evolved designs extend the front (in ${RUN_FILES.evolved}, shown by their id):`);
    lines.push(...designLines(spec, improved, 'e', RUN_FILES.evolved));
  }
  lines.push(...hypervolumeLines(spec, outcome.hypervolumeBefore, outcome.hypervolumeAfter, outcome.referencePoint));
  lines.push(
    `files: ${join(directory, RUN_FILES.evolved)} (improved designs), ${join(directory, RUN_FILES.front)} (updated), ${summaryPath} (evolve section)`,
  );
  if (improved.length > 0) lines.push(`an evolved design: npx coilfront show ${directory} e1`);
  if (refinedEarlier)
    lines.push(
      `refined.csv predates this evolve and front.csv no longer lists it: npx coilfront refine ${directory} polishes the evolved front`,
    );
  else lines.push(`to polish the evolved front: npx coilfront refine ${directory}`);
  lines.push('', 'SAFETY', ...SAFETY_CAUTIONS, '');
  return lines;
}
