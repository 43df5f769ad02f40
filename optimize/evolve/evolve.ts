/**
 * The evolutionary stage: a (μ + λ) multi-objective genetic algorithm with Deb's constraint rules
 * [deb2000constraints], non-dominated sorting [deb2002], a diversity measure for the last admitted front
 * (selection.ts), simulated binary crossover [deb1995sbx] and polynomial mutation [deb1996pm] on real
 * fields, level moves on discrete ones (operators.ts).
 *
 * A run is a pure function of (problem, seed, budget, population size, seeds): every random number is a
 * counter-based draw (optimize/random.ts), and evaluation order never matters. It advances one
 * generation at a time from a plain state, so a caller can journal the state after each generation and
 * resume from it with identical results.
 */
import {
  DEFAULT_VARIATION,
  Draws,
  type EvolveField,
  makeChildren,
  randomGenome,
  type VariationSettings,
} from './operators.ts';
import { type Diversity, type Individual, matingKeys, survivors, tournament } from './selection.ts';

/** What evaluating one genome gives: objectives (minimisation) and total constraint violation (0: feasible). */
export interface Outcome {
  objectives: Float64Array;
  violation: number;
}

/** The problem as the stage sees it: its fields and a batch evaluation (e.g. through the worker pool). */
export interface EvolveProblem {
  fields: readonly EvolveField[];
  /** Evaluates genomes; the answers in the same order. Level fields hold level indices. */
  evaluate(genomes: readonly Float64Array[]): Promise<Outcome[]>;
}

export interface EvolveOptions {
  seed: number;
  /** New evaluations this stage may spend (seeds already evaluated are free). */
  evaluations: number;
  /** Population size μ (and offspring per generation λ = μ). */
  population: number;
  diversity?: Diversity;
  variation?: Partial<VariationSettings>;
}

/** Where a run stands: a plain value that can be journaled (genomes and objectives as arrays). */
export interface EvolveState {
  /** Generations completed (0: the first population is in place). */
  generation: number;
  /** New evaluations spent so far. */
  used: number;
  /** The index the next new member gets (ties are broken by index: older first). */
  nextIndex: number;
  population: Individual[];
}

function checkOptions(problem: EvolveProblem, options: EvolveOptions): void {
  if (!Number.isInteger(options.population) || options.population < 4)
    throw new RangeError(`evolve: population must be an integer of at least 4, got ${options.population}`);
  if (!Number.isInteger(options.evaluations) || options.evaluations < 0)
    throw new RangeError(`evolve: evaluations must be a non-negative integer, got ${options.evaluations}`);
  if (problem.fields.length === 0) throw new RangeError('evolve: the problem has no fields');
}

async function evaluateAll(problem: EvolveProblem, genomes: Float64Array[], firstIndex: number): Promise<Individual[]> {
  if (genomes.length === 0) return [];
  const outcomes = await problem.evaluate(genomes);
  if (outcomes.length !== genomes.length)
    throw new Error(`evolve: asked for ${genomes.length} evaluations, got ${outcomes.length}`);
  return outcomes.map((outcome, i) => ({
    index: firstIndex + i,
    genome: genomes[i],
    objectives: outcome.objectives,
    // NaN objectives or violation: treated as the worst infeasible (an impossible design, never a crash).
    violation: Number.isNaN(outcome.violation) || outcome.objectives.some(Number.isNaN) ? Infinity : outcome.violation,
  }));
}

/**
 * The first population: the best `population` of the seeds under constraint domination (survivors), filled
 * up with uniformly random genomes (generation 0 draws) when there are fewer seeds; the random ones count
 * against the budget (at most the whole budget).
 * @param seeds already evaluated members (e.g. a sweep's front and best of the rest), indices unique.
 * @param onEvaluated called with every newly evaluated member (for journals and outputs).
 */
export async function initialState(
  problem: EvolveProblem,
  options: EvolveOptions,
  seeds: readonly Individual[] = [],
  onEvaluated?: (members: Individual[]) => void | Promise<void>,
): Promise<EvolveState> {
  checkOptions(problem, options);
  let nextIndex = 0;
  for (const s of seeds) nextIndex = Math.max(nextIndex, s.index + 1);
  const missing = Math.min(Math.max(0, options.population - seeds.length), options.evaluations);
  const genomes: Float64Array[] = [];
  for (let i = 0; i < missing; i++) genomes.push(randomGenome(problem.fields, new Draws(options.seed, 0, i)));
  const fresh = await evaluateAll(problem, genomes, nextIndex);
  if (fresh.length > 0) await onEvaluated?.(fresh);
  const diversity = options.diversity ?? 'auto';
  return {
    generation: 0,
    used: fresh.length,
    nextIndex: nextIndex + fresh.length,
    population: survivors(seeds.concat(fresh), options.population, diversity),
  };
}

/** Whether the budget allows another generation. */
export function hasBudget(options: EvolveOptions, state: EvolveState): boolean {
  return state.used < options.evaluations && state.population.length >= 2;
}

/**
 * One generation: min(μ, budget left) offspring by binary tournament, crossover and mutation (pair s of
 * generation g draws from (seed, g, s) only), evaluated as one batch, then (μ + λ) survival.
 */
export async function stepGeneration(
  problem: EvolveProblem,
  options: EvolveOptions,
  state: EvolveState,
  onEvaluated?: (members: Individual[]) => void | Promise<void>,
): Promise<EvolveState> {
  const settings: VariationSettings = { ...DEFAULT_VARIATION, ...options.variation };
  const generation = state.generation + 1;
  const count = Math.min(options.population, options.evaluations - state.used);
  const keys = matingKeys(state.population);
  const genomes: Float64Array[] = [];
  for (let slot = 0; genomes.length < count; slot++) {
    const draws = new Draws(options.seed, generation, slot);
    const a = tournament(state.population, keys, draws);
    const b = tournament(state.population, keys, draws);
    const [childA, childB] = makeChildren(
      problem.fields,
      state.population[a].genome,
      state.population[b].genome,
      settings,
      draws,
    );
    genomes.push(childA);
    if (genomes.length < count) genomes.push(childB);
  }
  const offspring = await evaluateAll(problem, genomes, state.nextIndex);
  if (offspring.length > 0) await onEvaluated?.(offspring);
  return {
    generation,
    used: state.used + offspring.length,
    nextIndex: state.nextIndex + offspring.length,
    population: survivors(state.population.concat(offspring), options.population, options.diversity ?? 'auto'),
  };
}

/** A whole run: the first population, then generations until the budget is spent. */
export async function evolve(
  problem: EvolveProblem,
  options: EvolveOptions,
  seeds: readonly Individual[] = [],
  onEvaluated?: (members: Individual[]) => void | Promise<void>,
): Promise<EvolveState> {
  let state = await initialState(problem, options, seeds, onEvaluated);
  while (hasBudget(options, state)) state = await stepGeneration(problem, options, state, onEvaluated);
  return state;
}
