export { SaltelliDesign, sobolIndices } from './saltelli.ts';
export type { IndexEstimate, SobolIndices, SobolOptions } from './saltelli.ts';
export {
  planColumns,
  ROW_FEASIBLE,
  ROW_IMPOSSIBLE,
  ROW_INFEASIBLE,
  recordSaltelliRows,
  SaltelliOutputs,
  saltelliTask,
  sensitivityOf,
  spaceSensitivity,
} from './space-sensitivity.ts';
export type {
  FeasibilitySensitivity,
  MetricSensitivity,
  SensitivityConstraint,
  SensitivityPlan,
  SpaceSensitivity,
} from './space-sensitivity.ts';
export { wilsonInterval } from './wilson.ts';
export type { ProportionInterval } from './wilson.ts';
