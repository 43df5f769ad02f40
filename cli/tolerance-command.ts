/**
 * `coilfront tolerance RUN [--top 20] [--draws 256] [--from candidates|refined|evolved]` and
 * `coilfront tolerance design.yaml --tolerances FILE`: each candidate built `draws` times the way things are
 * really built (optimize/tolerance: the same scrambled Sobol draws for every candidate), evaluated in the
 * sweep's worker pool (run/tolerance-run.ts: journal, resume); per candidate the yield with its 95 % Wilson
 * interval and the 5 %, 50 % and 95 % quantiles of every objective and constrained metric
 * (cli/tolerance-outputs.ts).
 */
import { existsSync, mkdirSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { DesignSpace, type SpaceDefinition } from '../optimize/design-space.ts';
import { type BatchEvaluator, inProcessEvaluator } from '../optimize/evaluate-batch.ts';
import { ToleranceSetupError, toleranceSpace, type ToleranceSettings } from '../optimize/tolerance/index.ts';
import type { ConstraintDefinition, ObjectiveDefinition } from '../optimize/sweep-state.ts';
import { describeShard, resolveShard, type Shard } from '../run/shard.ts';
import { lockRunOrRefuse } from '../run/sweep-setup.ts';
import {
  hashOf,
  readShardResults,
  runToleranceStudy,
  shardDirectory,
  shardFolder,
  type StudyCandidate,
} from '../run/tolerance-run.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { commandError, fieldError, fileError, optionError } from './input-errors.ts';
import type { CliIo } from './io.ts';
import { loadDesignFile } from './load-design.ts';
import { readToleranceFile, type ToleranceFile } from './tolerance-file.ts';
import { runStudySetup } from './tolerance-candidates.ts';
import { SAFETY_LINE } from './safety.ts';
import { type StudySource, toleranceFiles, writeStudyOutputs } from './tolerance-outputs.ts';
import type { ToleranceSection } from './tolerance-spec.ts';

export { TOLERANCE_FILES } from './tolerance-outputs.ts';

export interface ToleranceCommandOptions {
  top?: number;
  draws?: number;
  tolerances?: string;
  workers?: number;
  out?: string;
  from?: string;
  /** `k/N`: study only the k-th of N contiguous blocks of the candidates, into its own shard directory. */
  shard?: string;
  /** Merge the shards' journals (these directories, or every shard directory of the study when `true`). */
  merge?: string[] | boolean;
}

/** What a study needs, from a run or a design file. */
export interface StudySetup {
  base: SpaceDefinition;
  section: ToleranceSection;
  constraints: ConstraintDefinition[];
  objectives: ObjectiveDefinition[];
  /** Metrics reported besides the objectives and constraints. */
  extraMetrics: string[];
  candidates: StudyCandidate[];
  identity: string;
  sourceFile: string;
  out: string;
  source: StudySource;
}

function designSetup(target: string, file: ToleranceFile | null, options: ToleranceCommandOptions): StudySetup {
  if (!file) throw optionError('--tolerances', `required for a design file (${target}): the file of spreads`);
  const loaded = loadDesignFile(target);
  const seed = file.tolerances.seed ?? 1;
  return {
    base: { tree: loaded.tree, dimensions: [], method: 'random', samples: 1, seed, gridLevels: null },
    section: file.tolerances,
    constraints: file.constraints,
    objectives: file.objectives,
    extraMetrics: file.metrics,
    candidates: [{ id: 'design', sampleIndex: null, values: [] }],
    identity: hashOf(loaded.tree),
    sourceFile: target,
    out: options.out ?? '.',
    source: 'candidates',
  };
}

function checkOptions(options: ToleranceCommandOptions): void {
  const top = options.top ?? 20;
  if (!Number.isInteger(top) || top < 1)
    throw optionError('--top', `expected a whole number of at least 1, got ${top}`);
  const draws = options.draws;
  if (draws !== undefined && (!Number.isInteger(draws) || draws < 1 || draws > 1_000_000))
    throw optionError('--draws', `expected a whole number from 1 to 1000000, got ${draws}`);
}

/** The tolerance space of a study; a field that cannot be toleranced is an input error naming it. */
function studySpace(setup: StudySetup, options: ToleranceCommandOptions) {
  try {
    return toleranceSpace(setup.base, setup.section.fields);
  } catch (error) {
    if (!(error instanceof ToleranceSetupError)) throw error;
    throw fieldError(options.tolerances ?? setup.sourceFile, {
      path: ['tolerances', ...error.path],
      message: error.message,
    });
  }
}

/** The shard directories `--merge` names, or every one the study's shards folder holds. */
function mergeDirectories(setup: StudySetup, merge: string[] | boolean): string[] {
  if (Array.isArray(merge) && merge.length > 0) return merge;
  const folder = shardFolder(setup.out, toleranceFiles(setup.source).journal);
  const found = existsSync(folder) ? readdirSync(folder).filter((name) => /^\d+-of-\d+$/.test(name)) : [];
  if (found.length === 0) throw optionError('--merge', `no shard directories given, and none in ${folder}`);
  return found.sort((a, b) => Number(a.split('-')[0]) - Number(b.split('-')[0])).map((name) => join(folder, name));
}

export async function toleranceCommand(target: string, options: ToleranceCommandOptions, io: CliIo): Promise<number> {
  checkOptions(options);
  if (!existsSync(target)) throw fileError(target, 'no such run directory or design file');
  const file = options.tolerances ? readToleranceFile(options.tolerances) : null;
  const setup = statSync(target).isDirectory()
    ? runStudySetup(target, file, options.top ?? 20, options.from)
    : designSetup(target, file, options);
  const { objectives, constraints } = setup;
  const metrics = [
    ...new Set([...objectives.map((o) => o.metric), ...constraints.map((c) => c.metric), ...setup.extraMetrics]),
  ];
  if (metrics.length === 0)
    throw fileError(options.tolerances ?? target, 'nothing to report: give constraints, objectives or metrics');
  const draws = options.draws ?? setup.section.draws ?? 256;
  const space = studySpace(setup, options);
  const required = objectives.map((o) => o.metric);
  const settings: ToleranceSettings = { draws, seed: setup.base.seed, constraints, required, metrics };
  const shard = options.merge ? null : resolveShard({ shardFlag: options.shard, env: process.env });
  if (options.merge && options.shard !== undefined)
    throw commandError(
      'tolerance',
      '--shard and --merge do not go together: merge the finished shards without --shard',
    );
  const files = toleranceFiles(setup.source);
  const study = { identity: setup.identity, space, settings, candidates: setup.candidates };
  const preloaded = options.merge
    ? readShardResults(study, mergeDirectories(setup, options.merge), files.journal)
    : undefined;
  const out = shard ? shardDirectory(setup.out, files.journal, shard) : setup.out;
  mkdirSync(out, { recursive: true });
  // One study (or sweep, refine, evolve) at a time in a directory: the journal has one writer.
  const lock = lockRunOrRefuse(out);
  try {
    const threads = options.workers ?? defaultWorkerCount();
    // A merge evaluates nothing: its results are the shards'.
    const evaluator: BatchEvaluator =
      threads === 0 || preloaded
        ? inProcessEvaluator(new DesignSpace(space.definition))
        : createWorkerPool(space.definition, { threads });
    settings.batchSize = Math.max(4, Math.min(64, Math.ceil(draws / Math.max(1, threads * 4))));
    if (shard) io.err(`tolerance: ${describeShard(shard)}\n`);
    const { results } = await runToleranceStudy({
      ...study,
      journalPath: join(out, files.journal),
      evaluator,
      notice: (line) => io.err(`${line}\n`),
      shard,
      preloaded,
    });
    if (shard) {
      io.out(shardDone(target, shard, results.length, setup.candidates.length, out));
      return 0;
    }
    const { sourceFile, candidates } = setup;
    const fields = setup.section.fields;
    writeStudyOutputs(
      { out, files, sourceFile, draws, seed: settings.seed, fields, constraints, metrics, candidates, results },
      io,
    );
    return 0;
  } finally {
    lock.release();
  }
}

/** The console lines of a finished shard: what it holds and how to merge. */
function shardDone(target: string, shard: Shard, studied: number, total: number, out: string): string {
  return (
    `tolerance shard ${shard.index}/${shard.count}: ${studied} of ${total} candidates studied into ${out}\n` +
    `when every shard has finished: npx coilfront tolerance ${target} --merge (with the same options)\n${SAFETY_LINE}\n`
  );
}
