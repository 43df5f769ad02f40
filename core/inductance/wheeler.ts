/**
 * Wheeler's long-coil formula for a single-layer solenoid.
 */

/** One inch, m. */
const INCH = 0.0254;

/**
 * Wheeler's long-coil inductance, H, from the inch formula L[µH] = a² N² / (9a + 10l)
 * (a = radius, l = length, in inches).
 * @param radius coil radius, m
 * @param length winding length, m
 * @param turns number of turns
 * Accuracy: within about 0.33 % of the current-sheet value for D/l ≤ 2.5 (0.31 % for D/l ≤ 1),
 * worse for short coils (−3.8 % at D/l = 5); the inch formula also carries a factor 1/1.0027
 * relative to the exact μ0 (computed error band and factor from the project's reference notes).
 * Source: H. A. Wheeler, "Simple inductance formulas for radio coils", Proc. IRE 16(10), 1928.
 */
export function wheelerLongCoilInductance(radius: number, length: number, turns: number): number {
  const radiusInches = radius / INCH;
  const lengthInches = length / INCH;
  // Wheeler 1928: L[µH] = a²N² / (9a + 10l), inches
  return (1e-6 * radiusInches * radiusInches * turns * turns) / (9 * radiusInches + 10 * lengthInches);
}

/**
 * The Nagaoka coefficient implied by Wheeler's formula in SI form: K_W = 1 / (1 + 0.45 D/l).
 * @param diameterOverLength D/l, > 0
 * Source: Wheeler (1928), rewritten as a coefficient of the current-sheet formula.
 */
export function wheelerNagaokaCoefficient(diameterOverLength: number): number {
  return 1 / (1 + 0.45 * diameterOverLength);
}
