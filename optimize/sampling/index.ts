// Sampling of the unit cube, index-addressable and seeded, and the maps from it to design parameters.

// Samplers
export type { UnitCubeSampler, SamplerOptions, SamplingMethod } from './unit-cube-sampler.ts';
export { createSampler } from './create-sampler.ts';
export { SobolSampler, createSobolSampler, sobolDirectionNumbers, owenScramble } from './sobol-sampler.ts';
export { LatinHypercubeSampler, permuteAt } from './latin-hypercube-sampler.ts';
export { GridSampler } from './grid-sampler.ts';
export { RandomSampler } from './random-sampler.ts';
export { JOE_KUO_DIRECTION_ROWS, JOE_KUO_MAX_DIMENSIONS } from './joe-kuo-directions.ts';

// From the unit cube to parameters
export { mapUnitToRange, mapUnitToChoice } from './unit-interval-mapping.ts';
export type { UnitRange } from './unit-interval-mapping.ts';

// Order-independent subsample for summary statistics
export { IndexSample } from './index-sample.ts';
export type { IndexSampleData } from './index-sample.ts';
