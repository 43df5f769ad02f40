/**
 * One evaluated candidate as the ranking sees it.
 * - index: the sample index (unique within a run; ties are broken by it).
 * - violation: total normalised constraint violation, 0 = feasible (see totalViolation).
 * - objectives: minimisation convention (the caller negates maximised metrics).
 */
export interface Scored {
  index: number;
  violation: number;
  objectives: Float64Array;
}
