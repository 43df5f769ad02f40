/** A constraint on one metric: `{ min?, max? }` in the metric's SI unit; either bound may be left out. */
export interface MetricBounds {
  min?: number;
  max?: number;
}

/** The smallest scale used to normalise a violation (for bounds at or near zero). */
export const VIOLATION_SCALE_FLOOR = 1e-12;

/**
 * Total normalised constraint violation of one design (Deb 2000, CMAME 186, 311-338, sec. 3: "constraint
 * violation" as the sum of the normalised violations):
 *   Σ_c max(0, min_c − v_c)/max(|min_c|, 1e−12) + max(0, v_c − max_c)/max(|max_c|, 1e−12).
 * Dividing by the bound's magnitude makes "10 % short" count the same for a metric in hertz and one in
 * metres. A value on its bound is no violation. A missing value (null, undefined or NaN) of a metric that
 * carries a bound counts as a violation of 1 for that constraint (the design cannot show it meets it).
 * @param values metric values in the order of `constraints`. @param constraints bounds per metric.
 * @returns 0 for a feasible design, > 0 otherwise (Infinity possible for infinite values).
 * @example totalViolation([90, 5], [{ min: 100 }, { max: 10 }]) // 0.1
 */
export function totalViolation(
  values: ArrayLike<number | null | undefined>,
  constraints: readonly MetricBounds[],
): number {
  let total = 0;
  for (let c = 0; c < constraints.length; c++) {
    const { min, max } = constraints[c];
    const hasMin = min !== undefined && min !== null;
    const hasMax = max !== undefined && max !== null;
    if (!hasMin && !hasMax) continue;
    const value = values[c];
    if (value === null || value === undefined || Number.isNaN(value)) {
      total += 1;
      continue;
    }
    if (hasMin && value < min) total += (min - value) / Math.max(Math.abs(min), VIOLATION_SCALE_FLOOR);
    if (hasMax && value > max) total += (value - max) / Math.max(Math.abs(max), VIOLATION_SCALE_FLOOR);
  }
  return total;
}
