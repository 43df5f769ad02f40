export { normalCdf, normalDensity, normalQuantile, normalTail } from './normal.ts';
export { deviateCdf, deviatedValue, standardDeviate, ToleranceDraws } from './tolerance-draws.ts';
export type { ToleranceDistribution, ToleranceField } from './tolerance-draws.ts';
export { drawRow, nominalOf, ToleranceSetupError, toleranceSpace } from './tolerance-space.ts';
export type { NominalSource, ToleranceConstraint, ToleranceSpace } from '../space-definition.ts';
export { candidateTolerance, sortedQuantile } from './tolerance-run.ts';
export type { CandidateTolerance, MetricQuantiles, ToleranceSettings } from './tolerance-run.ts';
