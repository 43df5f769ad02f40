/**
 * coilfront as a typed library: `import { evaluateDesign, readDesign, sweep, refine } from 'coilfront'`.
 *
 * The same machinery as the command line, without its files: design and sweep files (text or parsed
 * objects, quantities with units) are read and checked by the CLI's own readers, designs are evaluated
 * by the physics core in SI units, and a sweep or a refinement runs in worker threads (or in this
 * thread) and returns its ranked candidates and its Pareto front in memory.
 *
 * A sweep here keeps no run directory: a library call lives as long as its caller, so there is nothing
 * to resume after a crash, and writing a journal would only cost disk time. Because the sweep's state
 * depends on the set of evaluated designs and never on their order, the ranking equals that of
 * `coilfront sweep` on the same file (candidates.csv), whatever the number of workers.
 *
 * Nothing in the repository imports this module; it sits above the command line's readers, the run
 * layer, the worker pool, the optimizer and the core.
 *
 * SAFETY: the figures are estimates from models; they do not make a design safe (see {@link SAFETY_TEXT}).
 *
 * @packageDocumentation
 */
import type { Design as CoreDesign } from '../core/design.ts';
import { evaluateDesign as evaluateInCore } from '../core/evaluate.ts';
import { METRIC_KEYS } from '../core/metrics.ts';
import { warningKeysOf } from '../core/outcome/warnings.ts';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import type { Dimension } from '../optimize/design-tree.ts';
import {
  type BatchEvaluator,
  type BatchResult,
  type BatchTask,
  inProcessEvaluator,
} from '../optimize/evaluate-batch.ts';
import type { CandidatePool, PoolEntry, RankedEntry } from '../optimize/pareto/candidate-pool.ts';
import type { PackedRow } from '../optimize/packed-row.ts';
import { refineSweep } from '../optimize/refine-run.ts';
import { type ObjectiveDefinition as Objective, SweepState, type SweepCounts } from '../optimize/sweep-state.ts';
import { fieldError, InputError, optionError } from '../run/input-error.ts';
import { DEFAULT_KEEP, measureBatchSize } from '../run/sweep-setup.ts';
import { scheduleBatches } from '../run/batch-scheduler.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { designFromValue } from '../cli/load-design.ts';
import { parseInputText } from '../cli/read-file.ts';
import { outputEntries, sortedFront } from '../cli/sweep-outputs.ts';
import { SAFETY_CAUTIONS, SAFETY_LINE } from '../cli/safety.ts';
import { type SweepSpec, sweepFromValue } from '../cli/sweep-spec.ts';

export { InputError };

/**
 * One resonant transformer in SI base units (m, F, H, V, Hz, W, K, rad, Ω): what the physics core
 * evaluates. Read one from a design file's text or object with {@link readDesign}; its fields are the
 * design file's, in camelCase (`secondary.formDiameter`, `tank.capacitance`, …), documented in the
 * README's Design files section.
 */
export type Design = CoreDesign;

/** The fundamental along the winding, at every tenth of its length from the base. */
export interface WindingProfile {
  /** Height along the winding as a fraction of its length, 0 to 1 in steps of 0.1. */
  fraction: number[];
  /** The voltage there, normalised to 1 at the top. */
  voltage: number[];
  /** The current there, normalised to its largest value. */
  current: number[];
}

/** One objective of a sweep: the sweep state's own definition (optimize/sweep-state.ts). */
export type { Objective };

/** The keys of the metric contract in their stable order (README, Metrics); every result carries them all. */
export const METRIC_NAMES: readonly string[] = METRIC_KEYS;

/** The safety cautions that close every human-readable report of coilfront, one line of text each. */
export const SAFETY_TEXT: readonly string[] = SAFETY_CAUTIONS;

/** The cautions in one line, for short outputs: print it beside any figure you show. */
export const SAFETY_NOTE: string = SAFETY_LINE;

/** A metric value of the contract by its key (README, Metrics), SI units, `null` where it does not apply. */
export type MetricValues = Record<string, number | null>;

/** One warning for the builder: a stable key and its message. */
export interface WarningEntry {
  /** The stable key (README, Warnings), e.g. `primary_untuned`. */
  key: string;
  /** The sentence a report prints. */
  message: string;
}

/** The evaluation of one buildable design. */
export interface DesignEvaluation {
  /** Every metric of the contract, SI units, `null` where it does not apply to this design. */
  metrics: MetricValues;
  /** The warnings for the builder, in the order the stages raised them. */
  warnings: WarningEntry[];
  /** The fundamental at every tenth of the winding (as `evaluate --json` prints it), or `null`. */
  profile: WindingProfile | null;
}

/** Where an input came from, for the first word of an error message (`design.yaml: secondary.turns: …`). */
export interface ReadOptions {
  /** The name errors start with; `design` for designs and `sweep` for sweep files unless given. */
  name?: string;
}

/**
 * Reads a design: YAML or JSON text, or the object it parses to. Quantities may be numbers in SI base
 * units or strings with units (`'160 mm'`, `'AWG 26'`, `'30 nF'`), exactly as in a design file.
 *
 * @param input The design's text, or its parsed object (the sections `secondary`, `topload`, …).
 * @param options The name error messages start with.
 * @returns The design in SI units, ready for {@link evaluateDesign}.
 * @throws {@link InputError} with one line naming the field and the reason, for bad input or a design
 *   that cannot be built as written.
 */
export function readDesign(input: string | object, options: ReadOptions = {}): Design {
  const name = options.name ?? 'design';
  const value = typeof input === 'string' ? parseInputText(input, name) : input;
  return designFromValue(value, name).design;
}

/**
 * Evaluates one design through every stage of the physics core (SI in, SI out).
 *
 * @param design A design in SI units, from {@link readDesign} or built by hand.
 * @returns Its metrics, warnings and winding profile.
 * @throws {@link InputError} naming the field and the reason when the design is physically impossible
 *   (a primary inside the form, a toroid through the winding); the command line refuses it the same way.
 */
export function evaluateDesign(design: Design): DesignEvaluation {
  const evaluation = evaluateInCore(design);
  const problem = evaluation.problems[0];
  if (problem) throw fieldError('design', { path: problem.field.split('.'), message: problem.reason });
  return {
    metrics: { ...evaluation.metrics },
    warnings: evaluation.warnings.map((warning) => ({ key: warning.key, message: warning.message })),
    profile: evaluation.profile,
  };
}

/** One candidate of a sweep or a refinement, as a row of candidates.csv holds it but in SI units. */
export interface Candidate {
  /**
   * 1-based position in its list (the `rank` column of candidates.csv, or the order of infeasible.csv);
   * on the front, its rank among the candidates, or `null` when it is not among them.
   */
  rank: number | null;
  /** The sample index of the design (a refined design: an index after the samples). */
  sampleIndex: number;
  /** 1 on the Pareto front, 2 on the next front, …; `null` for an infeasible candidate. */
  paretoRank: number | null;
  /** Crowding distance within its front (Infinity at the ends); `null` for an infeasible candidate. */
  crowding: number | null;
  /** Meets every constraint and has every objective. */
  feasible: boolean;
  /** Total constraint violation: 0 when feasible. */
  violation: number;
  /** Why it is infeasible, or `null`. */
  reason: string | null;
  /**
   * The varied parameters by path (`secondary.turns`): SI numbers for ranges, the choice as written
   * (`'AWG 24'`, `'200 mm'`) for sets.
   */
  parameters: Record<string, number | string>;
  /** Every metric of the contract, SI units, `null` where it does not apply. */
  metrics: MetricValues;
  /** The keys of its warnings. */
  warnings: string[];
  /** The design itself in SI units, for {@link evaluateDesign}; `null` when it cannot be built. */
  design: Design | null;
}

/** How many designs a sweep evaluated, by outcome: the sweep state's counts (optimize/sweep-state.ts). */
export type { SweepCounts };

/** Options of {@link sweep}. */
export interface SweepOptions {
  /** Worker threads; 0 evaluates in this thread. Default: the machine's available parallelism. */
  workers?: number;
  /** Candidates kept and ranked exactly (as `--keep`); default 1000. */
  keep?: number;
  /** Designs per task; default: measured to run about 50 ms, as the command line does. */
  batchSize?: number;
  /**
   * Stops the sweep: the batches in flight finish and the result holds the designs evaluated so far,
   * with `complete: false` (as `coilfront sweep` does on Ctrl-C).
   */
  signal?: AbortSignal;
  /** The name error messages start with; `sweep` unless given. */
  name?: string;
  /** Accept more than 20 million samples (as `--force`); refused unless set. */
  force?: boolean;
}

/** What {@link sweep} returns. */
export interface SweepResult {
  /** The best feasible designs, at most `keep`, by Pareto rank and then crowding (candidates.csv). */
  candidates: Candidate[];
  /** The infeasible designs closest to feasible, at most `keep`, by violation (infeasible.csv). */
  nearMisses: Candidate[];
  /** The non-dominated feasible designs, by the first objective, then the others (front.csv). */
  front: Candidate[];
  /** Counts by outcome. */
  counts: SweepCounts;
  /** Every sample of the range was evaluated (false after an abort). */
  complete: boolean;
  /** The sweep's sample count, as its file sets it (or the product of grid levels). */
  samples: number;
  /** The objectives, in the file's order. */
  objectives: Objective[];
}

/** What a refinement needs of its sweep, kept beside each result without showing in its type. */
interface SweepInternals {
  spec: SweepSpec;
  space: DesignSpace;
  state: SweepState;
}
const internals = new WeakMap<SweepResult, SweepInternals>();

/** The evaluator of `workers` threads (0: this thread). */
function evaluatorOf(spec: SweepSpec, space: DesignSpace, workers: number): BatchEvaluator {
  return workers === 0 ? inProcessEvaluator(space) : createWorkerPool(spaceDefinitionOf(spec), { threads: workers });
}

function checkWholeNumber(option: string, value: number | undefined, min: number): void {
  if (value !== undefined && (!Number.isInteger(value) || value < min))
    throw optionError(option, `expected a whole number of at least ${min}, got ${value}`);
}

/** The label of the choice of a set dimension at `value` (its index), or the SI number of a range. */
function parameterValue(dimension: Dimension, value: number): number | string {
  if (dimension.kind === 'range') return value;
  return dimension.labels[Math.round(value)] ?? value;
}

/** A pool entry as a candidate of the API. */
function candidateOf(
  space: DesignSpace,
  entry: PoolEntry<PackedRow>,
  rank: number | null,
  ranked: RankedEntry<PackedRow> | null,
): Candidate {
  const dimensions = space.definition.dimensions;
  const row = entry.payload;
  const values = row.packed.subarray(0, row.dimensions);
  const parameters: Record<string, number | string> = {};
  dimensions.forEach((dimension, d) => {
    parameters[dimension.path.join('.')] = parameterValue(dimension, values[d]);
  });
  const metrics: MetricValues = {};
  METRIC_KEYS.forEach((key, m) => {
    const value = row.packed[row.dimensions + m];
    metrics[key] = Number.isFinite(value) ? value : null;
  });
  const feasible = entry.item.violation === 0;
  return {
    rank,
    sampleIndex: entry.item.index,
    paretoRank: feasible ? (ranked ? ranked.paretoRank : entry.dominatedBy === 0 ? 1 : null) : null,
    crowding: feasible && ranked ? ranked.crowding : null,
    feasible,
    violation: entry.item.violation,
    reason: row.reason,
    parameters,
    metrics,
    warnings: warningKeysOf(row.warningMask),
    design: space.designOf(values).design,
  };
}

/** Ranked entries as candidates of the API, ranks from 1. */
function rankedCandidates(space: DesignSpace, entries: RankedEntry<PackedRow>[]): Candidate[] {
  return entries.map((entry, k) => candidateOf(space, entry, k + 1, entry));
}

/** The front in front.csv's order, each candidate with its rank in `ranked` (null when not listed there). */
function frontCandidates(space: DesignSpace, pool: CandidatePool<PackedRow>, ranked: Candidate[]): Candidate[] {
  const byIndex = new Map(ranked.map((candidate) => [candidate.sampleIndex, candidate]));
  return sortedFront(pool).map((entry) => byIndex.get(entry.item.index) ?? candidateOf(space, entry, null, null));
}

/**
 * Runs a sweep in memory: every sample of the sweep file's design space is evaluated, ranked on its
 * objectives and constraints, and the kept candidates and the Pareto front are returned. No file is
 * written. Deterministic: the same file gives the same candidates with any number of workers.
 *
 * @param spec A sweep file's text (YAML or JSON), or its parsed object (`design`, `constraints`,
 *   `objectives`, `sweep`), quantities with units as in a sweep file.
 * @param options Workers, candidates kept, batch size, an AbortSignal.
 * @returns The ranked candidates, the front and the counts.
 * @throws {@link InputError} with one line naming the field and the reason, for a bad sweep file or option.
 */
export async function sweep(spec: string | object, options: SweepOptions = {}): Promise<SweepResult> {
  const name = options.name ?? 'sweep';
  checkWholeNumber('workers', options.workers, 0);
  checkWholeNumber('keep', options.keep, 1);
  checkWholeNumber('batchSize', options.batchSize, 1);
  const parsed = sweepFromValue(typeof spec === 'string' ? parseInputText(spec, name) : spec, name, {
    force: options.force ?? false,
  });
  const space = new DesignSpace(spaceDefinitionOf(parsed));
  const state = new SweepState(parsed.objectives, parsed.constraints, options.keep ?? DEFAULT_KEEP, parsed.seed);
  const total = parsed.samples;
  const batchSize = options.batchSize ?? measureBatchSize(space, [0, total]).batchSize;
  const workers = options.workers ?? defaultWorkerCount();
  const batchCount = Math.ceil(total / batchSize);
  const signal = options.signal;

  // Batches in flight, a bounded number at a time (the run layer's scheduler); the state takes each as it finishes.
  const evaluator = evaluatorOf(parsed, space, workers);
  let finished = 0;
  let failure: { error: unknown } | null;
  try {
    failure = await scheduleBatches({
      evaluator,
      batchCount,
      threads: workers,
      taskOf: (batch: number): BatchTask => {
        const start = batch * batchSize;
        return { kind: 'indices', start, count: Math.min(batchSize, total - start) };
      },
      stopRequested: () => signal?.aborted === true,
      take: (_batch: number, result: BatchResult) => {
        state.offerBatch(result, space.dimensionCount);
        finished++;
      },
    });
  } finally {
    await evaluator.close();
  }
  if (failure !== null) throw failure.error;

  const keep = state.keep;
  const { ranked, misses } = outputEntries(state, keep);
  const candidates = rankedCandidates(space, ranked);
  const result: SweepResult = {
    candidates,
    nearMisses: rankedCandidates(space, misses),
    front: frontCandidates(space, state.pool, candidates),
    counts: { ...state.counts },
    complete: finished === batchCount,
    samples: total,
    objectives: parsed.objectives.map((o) => ({ metric: o.metric, sense: o.sense })),
  };
  internals.set(result, { spec: parsed, space, state });
  return result;
}

/** Options of {@link refine}. */
export interface RefineOptions {
  /** Nelder–Mead starts (as `--starts`); default 8. */
  starts?: number;
  /** The evaluation budget shared by the starts (as `--evaluations`); default 2000. */
  evaluations?: number;
  /** Worker threads; 0 evaluates in this thread. Default: the machine's available parallelism. */
  workers?: number;
  /** Designs per task; default 16. */
  batchSize?: number;
  /** Aborts the refinement: the promise rejects with the signal's reason once the tasks in flight end. */
  signal?: AbortSignal;
}

/** What {@link refine} returns. */
export interface RefineResult {
  /**
   * Every feasible design the refinement evaluated, ranked, at most the sweep's `keep`
   * (refine-trials.csv); their sample indices follow the sweep's samples.
   */
  refined: Candidate[];
  /** The sweep's front merged with the refined designs: the non-dominated feasible set (front.csv after refine). */
  front: Candidate[];
  /** Hypervolume of the sweep's front (minimisation convention), or `null` without a front. */
  hypervolumeBefore: number | null;
  /** Hypervolume of the merged front against the same reference point, or `null`. */
  hypervolumeAfter: number | null;
  /** Designs evaluated. */
  evaluations: number;
}

/**
 * Refines a sweep's result with Nelder–Mead: from its best candidates (one objective) or spread over its
 * Pareto front (several objectives), as `coilfront refine` does. Deterministic for a given budget.
 *
 * @param result What {@link sweep} returned.
 * @param options Starts, budget, workers, an AbortSignal.
 * @returns The refined designs and the merged front.
 * @throws {@link InputError} for a result that did not come from {@link sweep} or a bad option; rejects
 *   with the signal's reason when aborted.
 */
export async function refine(result: SweepResult, options: RefineOptions = {}): Promise<RefineResult> {
  const inside = internals.get(result);
  if (!inside) throw optionError('refine', 'expected the result of sweep()');
  checkWholeNumber('starts', options.starts, 1);
  checkWholeNumber('evaluations', options.evaluations, 1);
  checkWholeNumber('workers', options.workers, 0);
  checkWholeNumber('batchSize', options.batchSize, 1);
  const { spec, space, state } = inside;
  const signal = options.signal;
  signal?.throwIfAborted();
  const inner = evaluatorOf(spec, space, options.workers ?? defaultWorkerCount());
  // Every task checks the signal first, so an abort ends the refinement at its next batch.
  const evaluator: BatchEvaluator = {
    evaluate: async (task) => {
      signal?.throwIfAborted();
      return inner.evaluate(task);
    },
    close: () => inner.close(),
  };
  let outcome: Awaited<ReturnType<typeof refineSweep>>;
  try {
    outcome = await refineSweep(space, state, spec.samples, evaluator, {
      starts: options.starts ?? 8,
      evaluations: options.evaluations ?? 2000,
      referencePoint: spec.referencePoint,
      batchSize: options.batchSize ?? 16,
    });
  } finally {
    await evaluator.close();
  }
  const refined = rankedCandidates(space, outcome.refined.ranked(state.keep));
  return {
    refined,
    front: frontCandidates(space, outcome.merged, refined),
    hypervolumeBefore: outcome.hypervolumeBefore,
    hypervolumeAfter: outcome.hypervolumeAfter,
    evaluations: outcome.evaluations,
  };
}
