/**
 * Rules of thumb of the trade for sparks: length from input power, and the resonance with the
 * streamers' loading of the topload (their capacitance, 1 pF per foot, is in
 * core/capacitance/streamer.ts). Both are common practice (refs §9 [C]) with no controlled
 * study behind them: every report that shows them says so.
 */

/** Spark length per √watt, m/√W: L[in] ≈ 1.7 √P[W], i.e. L[m] ≈ 0.043 √P[W] (common practice, refs §9 [C]). */
export const SPARK_LENGTH_PER_ROOT_WATT = 0.043;

/**
 * Spark-length estimate from the average input power, m: L ≈ 0.043 √P (common practice, §9 [C]).
 * @param inputPower average real input power, W (≥ 0)
 * Meant for spark-gap drivers; for any driver it is no better than a rule of thumb.
 */
export function sparkLengthEstimate(inputPower: number): number {
  return SPARK_LENGTH_PER_ROOT_WATT * Math.sqrt(Math.max(0, inputPower));
}

/**
 * Resonant frequency of the secondary with extra capacitance at the top, Hz: 1/(2π√(L (C + ΔC))).
 * @param inductance L2, H; @param capacitance C2 without streamers, F; @param extraCapacitance ΔC, F
 * Source: the lumped LC resonance (Thomson's formula).
 */
export function loadedResonantFrequency(inductance: number, capacitance: number, extraCapacitance: number): number {
  return 1 / (2 * Math.PI * Math.sqrt(inductance * (capacitance + extraCapacitance)));
}
