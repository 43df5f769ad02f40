/**
 * Resonance of the secondary as a lumped LC: f = 1/(2π√(L C)) (Thomson's formula), with the
 * energy-based total capacitance at the top of the winding as C.
 */

/**
 * Resonant frequency, Hz.
 * @param inductance H (> 0)
 * @param capacitance F (> 0)
 * @returns NaN for non-positive arguments
 */
export function lcResonantFrequency(inductance: number, capacitance: number): number {
  if (!(inductance > 0) || !(capacitance > 0)) return Number.NaN;
  return 1 / (2 * Math.PI * Math.sqrt(inductance * capacitance));
}
