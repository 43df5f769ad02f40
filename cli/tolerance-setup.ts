/**
 * What a tolerance study is given, before anything runs: the options and their checks, the study of
 * a single design file, the tolerance space (a field that cannot be toleranced is an input error
 * naming it) and the shard directories `--merge` reads. The study of a run's candidates is built in
 * cli/tolerance-candidates.ts.
 */
import type { SpaceDefinition } from '../optimize/design-space.ts';
import { ToleranceSetupError, toleranceSpace } from '../optimize/tolerance/index.ts';
import type { ConstraintDefinition, ObjectiveDefinition } from '../optimize/sweep-state.ts';
import { hashOf, shardFolder, type StudyCandidate } from '../run/tolerance-run.ts';
import { fieldError, optionError } from './input-errors.ts';
import { shardDirectoriesToMerge } from './shard-directories.ts';
import { loadDesignFile } from './load-design.ts';
import type { ToleranceFile } from './tolerance-file.ts';
import { type StudySource, toleranceFiles } from './tolerance-outputs.ts';
import type { ToleranceSection } from './tolerance-spec.ts';

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

export function designSetup(target: string, file: ToleranceFile | null, options: ToleranceCommandOptions): StudySetup {
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

export function checkOptions(options: ToleranceCommandOptions): void {
  const top = options.top ?? 20;
  if (!Number.isInteger(top) || top < 1)
    throw optionError('--top', `expected a whole number of at least 1, got ${top}`);
  const draws = options.draws;
  if (draws !== undefined && (!Number.isInteger(draws) || draws < 1 || draws > 1_000_000))
    throw optionError('--draws', `expected a whole number from 1 to 1000000, got ${draws}`);
}

/** The tolerance space of a study; a field that cannot be toleranced is an input error naming it. */
export function studySpace(setup: StudySetup, options: ToleranceCommandOptions) {
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
export function mergeDirectories(setup: StudySetup, merge: string[] | boolean): string[] {
  return shardDirectoriesToMerge(shardFolder(setup.out, toleranceFiles(setup.source).journal), merge);
}
