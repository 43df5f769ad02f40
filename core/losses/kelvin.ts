/**
 * Kelvin functions of order zero, ber x, bei x, and their derivatives, by their power series.
 *
 * ber x + j bei x = J0(x e^{3jπ/4}) (A&S §9.9). The series (A&S 9.9.10) converge for every x, but
 * their terms grow like e^{x}/√(2πx) while the sums grow like e^{x/√2}/√(2πx), so about
 * 0.13·x decimal digits are lost to cancellation: the series are used up to x ≈ 12 (two digits
 * lost); beyond that, see `round-wire.ts` (Hankel asymptotic expansion).
 */

/** ber x, bei x, ber′ x, bei′ x at one argument (dimensionless). */
export interface KelvinValues {
  ber: number;
  bei: number;
  berPrime: number;
  beiPrime: number;
}

/**
 * Kelvin functions ber, bei and their first derivatives by power series.
 * @param x real argument, ≥ 0 (dimensionless); accurate to ~1e-13 relative for x ≤ 12
 * Source: Abramowitz & Stegun (1964) 9.9.10:
 *   ber x = Σ (−1)^k (x/2)^{4k} / ((2k)!)², bei x = Σ (−1)^k (x/2)^{4k+2} / ((2k+1)!)²,
 * differentiated term by term.
 */
export function kelvinSeries(x: number): KelvinValues {
  const half = x / 2;
  const quarterPower = half * half * half * half; // (x/2)^4
  let ber = 0;
  let bei = 0;
  let berPrime = 0;
  let beiPrime = 0;
  // termBer = (−1)^k (x/2)^{4k} / ((2k)!)²; termBei = (−1)^k (x/2)^{4k+2} / ((2k+1)!)²
  let termBer = 1;
  let termBei = half * half;
  for (let k = 0; k < 200; k++) {
    ber += termBer;
    bei += termBei;
    // d/dx (x/2)^n = (n/2)(x/2)^{n−1} = (n/x)(x/2)^n
    if (x > 0) {
      berPrime += ((4 * k) / x) * termBer;
      beiPrime += ((4 * k + 2) / x) * termBei;
    }
    const nextBerDenominator = (2 * k + 1) * (2 * k + 2);
    const nextBeiDenominator = (2 * k + 2) * (2 * k + 3);
    termBer *= -quarterPower / (nextBerDenominator * nextBerDenominator);
    termBei *= -quarterPower / (nextBeiDenominator * nextBeiDenominator);
    if (Math.abs(termBer) < 1e-17 * Math.abs(ber) && Math.abs(termBei) < 1e-17 * Math.abs(bei) + 1e-300) break;
  }
  return { ber, bei, berPrime, beiPrime };
}
