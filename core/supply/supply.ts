/**
 * The supply transformer that charges the tank capacitor of a spark-gap driver, seen from the tank
 * as an AC source of rms voltage V behind a reactance X = V / I, I its short-circuit current (a
 * current-limited transformer: its rated current; a stiff one: the ballast's impedance, I = V / X).
 *
 * - Resonant size: the tank capacitance whose reactance equals the source's, C_res = 1/(2π f X)
 *   = I / (2π f V) (series resonance X_L = X_C of any AC-circuit text, [terman1943]).
 * - Unloaded charge: without firing, the steady-state tank voltage of the series L–C divider is
 *   V_C = V · X_C / |X_C − X_L| = V / |1 − C/C_res| (same source), so its peak √2·V/|1 − ρ|,
 *   ρ = C/C_res, is the most the supply can bring the tank to (lossless: an upper bound).
 * - Charge per break interval: a current-limited source delivers on average the mean of its
 *   rectified sine, (2√2/π)·I ([supply-charging], an estimate, common practice), so in 1/BPS it brings the
 *   tank to (2√2/π)·I / (BPS · C), never beyond the unloaded peak.
 */

/** The supply as the core sees it, SI. */
export interface SupplySource {
  /** Rated output voltage, V rms. */
  voltage: number;
  /** Short-circuit current, A rms (current-limited: rated; stiff: V over the ballast impedance). */
  current: number;
  /** Mains frequency, Hz. */
  frequency: number;
}

/** Mean of a rectified sine over its rms value, 2√2/π (exact). */
export const RECTIFIED_MEAN_FACTOR = (2 * Math.SQRT2) / Math.PI;

/**
 * The band of tank-to-resonant capacitance ratios inside which resonant rise makes the tank
 * voltage dangerous and hard to control: common practice (builders stay well away from the
 * resonant size, larger or smaller); the edges 0.7 and 1.4 are our choice within that advice [supply-band].
 */
export const RESONANT_BAND: readonly [number, number] = [0.7, 1.4];

/** C_res = I / (2π f V), F [terman1943]. NaN for non-positive input. */
export function resonantCapacitance(source: SupplySource): number {
  const { voltage, current, frequency } = source;
  if (!(voltage > 0) || !(current > 0) || !(frequency > 0)) return Number.NaN;
  return current / (2 * Math.PI * frequency * voltage);
}

/**
 * Peak tank voltage the supply reaches without firing, √2·V/|1 − C/C_res|, V [terman1943];
 * Infinity at exact resonance.
 */
export function unloadedChargePeak(source: SupplySource, tankCapacitance: number): number {
  const ratio = tankCapacitance / resonantCapacitance(source);
  const detuning = Math.abs(1 - ratio);
  if (!Number.isFinite(ratio)) return Number.NaN;
  return detuning === 0 ? Number.POSITIVE_INFINITY : (Math.SQRT2 * source.voltage) / detuning;
}

/**
 * Tank voltage reached in one break interval of a rotary gap, V: (2√2/π)·I/(BPS·C), capped at the
 * unloaded peak ([supply-charging], an estimate, common practice).
 */
export function rotaryChargeVoltage(source: SupplySource, tankCapacitance: number, breakRate: number): number {
  if (!(tankCapacitance > 0) || !(breakRate > 0)) return Number.NaN;
  const reached = (RECTIFIED_MEAN_FACTOR * source.current) / (breakRate * tankCapacitance);
  return Math.min(reached, unloadedChargePeak(source, tankCapacitance));
}

/**
 * Firings per second a static gap set to `firingVoltage` would give from the mean rectified supply
 * current, (2√2/π)·I/(C·V_fire), Hz (the inverse of rotaryChargeVoltage; an estimate, common
 * practice).
 */
export function staticBreakRateEstimate(source: SupplySource, tankCapacitance: number, firingVoltage: number): number {
  if (!(tankCapacitance > 0) || !(firingVoltage > 0)) return Number.NaN;
  return (RECTIFIED_MEAN_FACTOR * source.current) / (tankCapacitance * firingVoltage);
}
