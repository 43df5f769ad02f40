export { SaltelliDesign, sobolIndices } from './saltelli.ts';
export type { IndexEstimate, SobolIndices, SobolOptions } from './saltelli.ts';
