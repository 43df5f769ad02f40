/**
 * Inductance of a uniform cylindrical current sheet: Lorenz's formula written with Nagaoka's
 * coefficient, L_s = μ0 N² π a² / l · K_N(D/l).
 */
import { agmSeries } from '../elliptic.ts';
import { VACUUM_PERMEABILITY } from './vacuum.ts';

/**
 * Nagaoka's coefficient K_N of a current sheet, dimensionless, exact (elliptic form).
 *
 * With k² = m = D²/(D² + l²) and k′ = l/√(D² + l²):
 * K_N = (4 / (3π k′)) · [ (k′²/k²)(K(m) − E(m)) + E(m) − k ] (K, E in the parameter convention).
 * @param diameterOverLength D/l of the sheet, > 0 (any value; 1 − 4x/(3π) + … as x → 0)
 * @returns K_N in (0, 1); NaN for a non-positive argument
 * Source: L. Lorenz 1879 and H. Nagaoka, J. Coll. Sci. Tokyo 27 (1909); exact elliptic form as in
 * F. W. Grover, Inductance Calculations (1946) ch. 16.
 */
export function nagaokaCoefficient(diameterOverLength: number): number {
  const x = diameterOverLength;
  if (!(x > 0) || !Number.isFinite(x)) return Number.NaN;
  const denominator = 1 + x * x;
  const m = (x * x) / denominator; // k²
  const m1 = 1 / denominator; // k′², formed without subtraction
  // K − E = K (m + tail)/2 without cancellation (agm-series.ts), so (K − E)/m stays exact for
  // long coils (m → 0); m1 = 1/(1 + x²) is formed directly for short coils (m → 1).
  const { completeK, tail } = agmSeries(m, m1);
  const kMinusEOverM = (completeK * (1 + tail / m)) / 2;
  const completeE = completeK - m * kMinusEOverM;
  const k = Math.sqrt(m);
  const kPrime = Math.sqrt(m1);
  // E − k = (E − 1) + (1 − k), with 1 − k = k′²/(1 + k) to avoid one cancellation.
  const eMinusK = completeE - 1 + m1 / (1 + k);
  const bracket = m1 * kMinusEOverM + eMinusK;
  return (4 / (3 * Math.PI * kPrime)) * bracket;
}

/**
 * Inductance of a uniform current sheet, H: L_s = μ0 N² π a² K_N(2a/l) / l.
 * @param radius sheet radius, m (for a winding: the radius of the wire's centre line)
 * @param length sheet length, m (for a winding of pitch p: N·p)
 * @param turns number of turns N (may be fractional)
 * Valid for a uniform azimuthal surface current; see rosa.ts for round wire.
 * Source: Lorenz (1879) / Nagaoka (1909), Grover (1946) ch. 16.
 */
export function currentSheetInductance(radius: number, length: number, turns: number): number {
  const coefficient = nagaokaCoefficient((2 * radius) / length);
  return (VACUUM_PERMEABILITY * turns * turns * Math.PI * radius * radius * coefficient) / length;
}
