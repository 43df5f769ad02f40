// The evolutionary stage of optimize/: operators, selection, and the generation-by-generation engine.
export {
  DEFAULT_VARIATION,
  Draws,
  levelCrossover,
  levelMutation,
  makeChildren,
  polynomialMutation,
  randomGenome,
  sbx,
} from './operators.ts';
export type { EvolveField, VariationSettings } from './operators.ts';
export { matingKeys, survivors, thinFront, tournament } from './selection.ts';
export type { Diversity, Individual, MatingKeys } from './selection.ts';
export { evolve, hasBudget, initialState, stepGeneration } from './evolve.ts';
export type { EvolveOptions, EvolveProblem, EvolveState, Outcome } from './evolve.ts';
