/**
 * Skin effect in an isolated straight round wire: the exact Bessel-function solution.
 *
 * The current density in a round conductor of radius a carrying a sinusoidal current satisfies
 * ∇²J = jωμσ J; its solution J0(kr), k = (1 − j)/δ, gives the internal impedance per unit length
 * Z / R_dc = (ka/2) · J0(ka) / J1(ka) (Ramo, Whinnery & Van Duzer, Fields and Waves in
 * Communication Electronics, "internal impedance of a round wire"; S. A. Schelkunoff 1934; the
 * formula in refs §7.4 is from memory there, and its check values are [X]).
 * With x = √2 a/δ the real part is R/R_dc = (x/2)(ber x · bei′ x − bei x · ber′ x)/(ber′² + bei′²).
 */
import { kelvinSeries } from './kelvin.ts';

/** Argument x = √2·a/δ above which the asymptotic expansion replaces the Kelvin series. */
const SERIES_LIMIT = 12;

/**
 * AC-to-DC resistance ratio of an isolated straight round wire (skin effect only), exact.
 * @param radius conductor radius a, m (> 0)
 * @param skinDepthValue skin depth δ at the frequency, m (> 0)
 * @returns R_ac / R_dc (≥ 1), dimensionless
 * Valid for a solid, straight, non-magnetic wire far from other conductors (no proximity effect);
 * a tube behaves as a solid rod when its wall is more than about 2δ thick. Accurate to ~1e-12 for
 * every a/δ: Kelvin series (A&S 9.9.10) for x = √2 a/δ ≤ 12, Hankel's asymptotic expansion of J0
 * and J1 (A&S 9.2.5, 9.2.9, 9.2.10) above.
 */
export function roundWireResistanceRatio(radius: number, skinDepthValue: number): number {
  const x = (Math.SQRT2 * radius) / skinDepthValue;
  if (x <= SERIES_LIMIT) {
    const { ber, bei, berPrime, beiPrime } = kelvinSeries(x);
    if (x < 1e-4) return 1 + (x * x * x * x) / 192; // low-frequency limit of the same solution
    // Re[(ka/2) J0/J1] written with Kelvin functions (derivation in the file comment)
    return ((x / 2) * (ber * beiPrime - bei * berPrime)) / (berPrime * berPrime + beiPrime * beiPrime);
  }
  return hankelResistanceRatio(radius / skinDepthValue);
}

/**
 * Re[(z/2) J0(z)/J1(z)] for z = (1 − j)·u, u = a/δ large, by Hankel's expansion
 * J_ν(z) = √(2/(πz)) [P_ν(z) cos χ − Q_ν(z) sin χ], χ = z − νπ/2 − π/4 (A&S 9.2.5), with
 * P, Q the asymptotic series of A&S 9.2.9/9.2.10 summed until the terms stop shrinking.
 */
function hankelResistanceRatio(u: number): number {
  const zRe = u;
  const zIm = -u;
  const [p0Re, p0Im, q0Re, q0Im] = hankelSeries(0, zRe, zIm);
  const [p1Re, p1Im, q1Re, q1Im] = hankelSeries(1, zRe, zIm);
  if (u > 300) {
    // cosh would overflow; J_ν ≈ ½H⁽¹⁾_ν to e^{−2u} relative: J0/J1 = j (P0 + jQ0)/(P1 + jQ1)
    const [quotientRe, quotientIm] = complexDivide(p0Re - q0Im, p0Im + q0Re, p1Re - q1Im, p1Im + q1Re);
    const ratioRe = -quotientIm;
    const ratioIm = quotientRe;
    return (zRe * ratioRe - zIm * ratioIm) / 2;
  }
  // χ_ν = z − νπ/2 − π/4
  const j0 = cosSinCombination(p0Re, p0Im, q0Re, q0Im, zRe - Math.PI / 4, zIm);
  const j1 = cosSinCombination(p1Re, p1Im, q1Re, q1Im, zRe - (3 * Math.PI) / 4, zIm);
  // ratio = (z/2) · j0 / j1 (the common √(2/(πz)) cancels)
  const [ratioRe, ratioIm] = complexDivide(j0[0], j0[1], j1[0], j1[1]);
  return (zRe * ratioRe - zIm * ratioIm) / 2;
}

/** P_ν(z), Q_ν(z) of A&S 9.2.9–9.2.10 as [PRe, PIm, QRe, QIm]. */
function hankelSeries(order: number, zRe: number, zIm: number): [number, number, number, number] {
  const mu = 4 * order * order;
  // w = 1/(8z)
  const [wRe, wIm] = complexDivide(1, 0, 8 * zRe, 8 * zIm);
  let pRe = 1;
  let pIm = 0;
  let qRe = 0;
  let qIm = 0;
  // term_k = Π_{i=1..k} (μ − (2i−1)²) / (k! (8z)^k); P takes even k with sign (−1)^{k/2}, Q odd k with (−1)^{(k−1)/2}
  let termRe = 1;
  let termIm = 0;
  let previousMagnitude = Infinity;
  for (let k = 1; k < 80; k++) {
    const factor = (mu - (2 * k - 1) * (2 * k - 1)) / k;
    const nextRe = factor * (termRe * wRe - termIm * wIm);
    const nextIm = factor * (termRe * wIm + termIm * wRe);
    const magnitude = Math.hypot(nextRe, nextIm);
    if (magnitude > previousMagnitude || magnitude === 0) break; // optimal truncation of an asymptotic series
    previousMagnitude = magnitude;
    termRe = nextRe;
    termIm = nextIm;
    const sign = Math.floor(k / 2) % 2 === 0 ? 1 : -1;
    if (k % 2 === 0) {
      pRe += sign * termRe;
      pIm += sign * termIm;
    } else {
      qRe += sign * termRe;
      qIm += sign * termIm;
    }
    if (magnitude < 1e-18) break;
  }
  return [pRe, pIm, qRe, qIm];
}

/** P cos χ − Q sin χ for complex P, Q, χ, as [re, im]. */
function cosSinCombination(
  pRe: number,
  pIm: number,
  qRe: number,
  qIm: number,
  chiRe: number,
  chiIm: number,
): [number, number] {
  // cos(a + jb) = cos a cosh b − j sin a sinh b; sin(a + jb) = sin a cosh b + j cos a sinh b
  const cosRe = Math.cos(chiRe) * Math.cosh(chiIm);
  const cosIm = -Math.sin(chiRe) * Math.sinh(chiIm);
  const sinRe = Math.sin(chiRe) * Math.cosh(chiIm);
  const sinIm = Math.cos(chiRe) * Math.sinh(chiIm);
  return [
    pRe * cosRe - pIm * cosIm - (qRe * sinRe - qIm * sinIm),
    pRe * cosIm + pIm * cosRe - (qRe * sinIm + qIm * sinRe),
  ];
}

function complexDivide(aRe: number, aIm: number, bRe: number, bIm: number): [number, number] {
  const denominator = bRe * bRe + bIm * bIm;
  return [(aRe * bRe + aIm * bIm) / denominator, (aIm * bRe - aRe * bIm) / denominator];
}
