/**
 * American Wire Gauge diameters by the geometric rule of ASTM B258.
 *
 * ASTM B258 defines the series by two fixed points, 36 AWG = 0.005 in and 0000 AWG = 0.4600 in,
 * and 39 geometric steps between them: d_n = 0.005 in × 92^((36 − n)/39). The standard's tables
 * round the nominal diameters (18 AWG is listed as 0.0403 in); this function returns the
 * unrounded value of the rule.
 */

/** One inch, m (exact by definition). */
const INCH = 0.0254;

/**
 * Bare diameter of an AWG size by the ASTM B258 rule, m.
 * @param gauge the AWG number; 0 = "1/0", −1 = "2/0", −2 = "3/0", −3 = "4/0" (0000); fractional
 *   gauges follow the same geometric rule (half sizes).
 * @returns diameter in metres; NaN for a gauge outside −3 … 56 (the rule is not meant beyond).
 * Source: ASTM B258, "Standard Specification for Standard Nominal Diameters and Cross-Sectional
 * Areas of AWG Sizes of Solid Round Wires Used as Electrical Conductors".
 */
export function awgDiameter(gauge: number): number {
  if (!(gauge >= -3 && gauge <= 56)) return Number.NaN;
  // ASTM B258: d = 0.005 in × 92^((36 − n)/39)
  return 0.005 * INCH * 92 ** ((36 - gauge) / 39);
}
