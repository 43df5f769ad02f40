export { SaltelliDesign, sobolIndices } from './saltelli.ts';
export type { IndexEstimate, SobolIndices, SobolOptions } from './saltelli.ts';
export { spaceSensitivity } from './space-sensitivity.ts';
export type { MetricSensitivity } from './space-sensitivity.ts';
export { wilsonInterval } from './wilson.ts';
export type { ProportionInterval } from './wilson.ts';
