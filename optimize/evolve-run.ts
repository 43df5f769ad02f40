/**
 * A whole evolutionary stage on a sweep's result: the engine of optimize/evolve/ seeded by the sweep's
 * kept candidates (its front first, then the best of the rest: the engine's constraint-domination
 * survival picks the first population from them), driven through a BatchEvaluator in chunks, and the
 * evolved designs merged with the sweep's front.
 *
 * A pure function of (sweep state, seed, budget, population): counter-based draws, chunked evaluation in
 * a fixed order. Each finished generation is handed to `journal.append` as a plain record; given the
 * records of an interrupted run (`journal.replay`), it continues from the last one with identical results.
 */
import type { DesignSpace } from './design-space.ts';
import type { BatchEvaluator, BatchResult } from './evaluate-batch.ts';
import { designProblem } from './evolve/design-problem.ts';
import { type EvolveOptions, type EvolveState, hasBudget, initialState, stepGeneration } from './evolve/evolve.ts';
import type { VariationSettings } from './evolve/operators.ts';
import type { Diversity, Individual } from './evolve/selection.ts';
import { packRow, type PackedRow } from './packed-row.ts';
import { CandidatePool, type JsonNumber } from './pareto/candidate-pool.ts';
import { defaultReferencePoint, hypervolume } from './pareto/hypervolume.ts';
import type { CandidateRow, SweepState } from './sweep-state.ts';
import { splitValuesTasks } from './split-values.ts';
import { type ShouldStop, stopIfAsked } from './stage-stop.ts';

export interface EvolveRunOptions {
  seed: number;
  /** New evaluations the stage may spend. */
  evaluations: number;
  population: number;
  /** Largest pool task (designs per chunk). */
  batchSize: number;
  /** Hypervolume reference point (minimisation convention), or null for the default from the sweep's front. */
  referencePoint: number[] | null;
  /** Polled after each journalled generation: true stops the stage with StageStopped (the journal stays). */
  shouldStop?: ShouldStop;
  /** Operator settings other than the engine's defaults (benchmarks); unset: DEFAULT_VARIATION. */
  variation?: Partial<VariationSettings>;
  /** The diversity measure of the last admitted front; unset: 'auto'. */
  diversity?: Diversity;
}

/** A member as journaled: numbers that JSON cannot hold (Infinity) as strings. */
interface MemberData {
  index: number;
  violation: JsonNumber;
  objectives: JsonNumber[];
  genome: number[];
}

/** One finished generation: the engine's state after it and the rows of the designs it evaluated. */
export interface GenerationRecord {
  generation: number;
  used: number;
  nextIndex: number;
  population: MemberData[];
  evaluated: Array<{ index: number; violation: JsonNumber; objectives: JsonNumber[]; row: CandidateRow }>;
}

export interface EvolveJournal {
  /**
   * The records of an interrupted run of the same stage, in order (may be empty). Read once, one at a
   * time: a caller may stream them from the file, so that memory does not grow with the journal.
   */
  replay: Iterable<GenerationRecord>;
  append(record: GenerationRecord): void;
}

export interface EvolveOutcome {
  /** Every feasible design the stage evaluated (pool index: sample count + its order of evaluation). */
  evolved: CandidatePool<PackedRow>;
  /** The sweep's front merged with the evolved designs. */
  merged: CandidatePool<PackedRow>;
  hypervolumeBefore: number | null;
  hypervolumeAfter: number | null;
  referencePoint: number[] | null;
  evaluations: number;
  generations: number;
  replayedGenerations: number;
}

const toJson = (value: number): JsonNumber => (Number.isFinite(value) ? value : String(value));
const fromJson = (value: JsonNumber): number => (typeof value === 'number' ? value : Number(value));

function memberData(m: Individual): MemberData {
  return {
    index: m.index,
    violation: toJson(m.violation),
    objectives: Array.from(m.objectives, toJson),
    genome: [...m.genome],
  };
}

function memberOf(data: MemberData): Individual {
  return {
    index: data.index,
    violation: fromJson(data.violation),
    objectives: Float64Array.from(data.objectives, fromJson),
    genome: Float64Array.from(data.genome),
  };
}

export async function evolveSweep(
  designSpace: DesignSpace,
  state: SweepState,
  sampleCount: number,
  evaluator: BatchEvaluator,
  options: EvolveRunOptions,
  journal: EvolveJournal,
): Promise<EvolveOutcome> {
  const dimensions = designSpace.definition.dimensions;
  let lastResult: BatchResult | null = null;
  const problem = designProblem(dimensions, splitValuesTasks(evaluator, options.batchSize), state, (result) => {
    lastResult = result;
  });
  const engine: EvolveOptions = {
    seed: options.seed,
    evaluations: options.evaluations,
    population: options.population,
    ...(options.variation ? { variation: options.variation } : {}),
    ...(options.diversity ? { diversity: options.diversity } : {}),
  };
  const seeds = seedsOf(state, problem);
  const base = seeds.reduce((next, s) => Math.max(next, s.index + 1), 0);
  const recorder = generationRecorder(state, journal, (members) => {
    const result = lastResult;
    if (!result) throw new Error('evolve: members evaluated without a result');
    return members.map((m, row) => ({
      index: sampleCount + (m.index - base),
      violation: toJson(m.violation),
      objectives: Array.from(m.objectives, toJson),
      row: state.rowOf(result, row, dimensions.length),
    }));
  });

  const replayed = recorder.replay();
  let current: EvolveState;
  if (replayed.last !== null) {
    const last = replayed.last;
    current = {
      generation: last.generation,
      used: last.used,
      nextIndex: last.nextIndex,
      population: last.population.map(memberOf),
    };
  } else {
    current = await initialState(problem, engine, seeds, recorder.onEvaluated);
    recorder.finish(current);
  }
  while (hasBudget(engine, current)) {
    stopIfAsked(options.shouldStop, 'evolve');
    current = await stepGeneration(problem, engine, current, recorder.onEvaluated);
    recorder.finish(current);
  }
  return {
    ...mergedFront(state, recorder.evolved, options.referencePoint),
    evaluations: current.used,
    generations: current.generation,
    replayedGenerations: replayed.count,
  };
}

/** The seeds: every kept candidate of the sweep, by its sample index; new members number on from there. */
function seedsOf(state: SweepState, problem: ReturnType<typeof designProblem>): Individual[] {
  const seeds: Individual[] = state.pool.entries().map((entry) => ({
    index: entry.item.index,
    violation: entry.item.violation,
    objectives: Float64Array.from(entry.item.objectives),
    genome: problem.genomeOf(entry.payload.packed.subarray(0, entry.payload.dimensions)),
  }));
  seeds.sort((a, b) => a.index - b.index);
  return seeds;
}

type EvaluatedRows = GenerationRecord['evaluated'];

/**
 * The bookkeeping of the generations: `onEvaluated` keeps the rows of the members just evaluated (made by
 * `rowsOf`), `finish` journals the finished generation with them and offers the feasible ones to `evolved`,
 * `replay` offers those of an interrupted run's records and returns the last record and their count.
 */
function generationRecorder(
  state: SweepState,
  journal: EvolveJournal,
  rowsOf: (members: Individual[]) => EvaluatedRows,
): {
  evolved: CandidatePool<PackedRow>;
  onEvaluated: (members: Individual[]) => void;
  finish: (next: EvolveState) => void;
  replay: () => { last: GenerationRecord | null; count: number };
} {
  const evolved = new CandidatePool<PackedRow>(state.keep, state.objectives.length);
  const take = (entry: EvaluatedRows[number]): void => {
    const violation = fromJson(entry.violation);
    if (violation !== 0) return;
    evolved.offer(
      { index: entry.index, violation, objectives: Float64Array.from(entry.objectives, fromJson) },
      packRow(entry.row),
    );
  };
  let pending: EvaluatedRows = [];
  const onEvaluated = (members: Individual[]): void => {
    pending = rowsOf(members);
  };
  const finish = (next: EvolveState): void => {
    const record: GenerationRecord = {
      generation: next.generation,
      used: next.used,
      nextIndex: next.nextIndex,
      population: next.population.map(memberData),
      evaluated: pending,
    };
    for (const entry of pending) take(entry);
    pending = [];
    journal.append(record);
  };
  const replay = (): { last: GenerationRecord | null; count: number } => {
    let last: GenerationRecord | null = null;
    let count = 0;
    for (const record of journal.replay) {
      for (const entry of record.evaluated) take(entry);
      last = record;
      count++;
    }
    return { last, count };
  };
  return { evolved, onEvaluated, finish, replay };
}

/** The sweep's front merged with the evolved designs, and the hypervolumes of both fronts. */
function mergedFront(
  state: SweepState,
  evolved: CandidatePool<PackedRow>,
  referencePoint: number[] | null,
): Pick<EvolveOutcome, 'evolved' | 'merged' | 'hypervolumeBefore' | 'hypervolumeAfter' | 'referencePoint'> {
  const front = state.pool.front();
  const merged = new CandidatePool<PackedRow>(state.keep, state.objectives.length);
  for (const entry of front) merged.offer(entry.item, entry.payload);
  for (const entry of evolved.feasibleEntries()) merged.offer(entry.item, entry.payload);
  const before = front.map((entry) => entry.item.objectives);
  const after = merged.front().map((entry) => entry.item.objectives);
  const reference = referencePoint
    ? Float64Array.from(referencePoint)
    : before.length > 0
      ? defaultReferencePoint(before)
      : null;
  return {
    evolved,
    merged,
    hypervolumeBefore: reference && before.length > 0 ? hypervolume(before, reference) : null,
    hypervolumeAfter: reference && after.length > 0 ? hypervolume(after, reference) : null,
    referencePoint: reference ? Array.from(reference) : null,
  };
}
