/**
 * Rosa's corrections that turn the current-sheet inductance into that of a winding of round wire:
 * L = L_s − μ0 a N (k_s + k_m).
 *
 * k_s ("self" correction) accounts for the round wire's own cross-section against a strip of
 * width p; k_m ("mutual" correction) for the mutual inductances between round turns against those
 * between strips, and depends only on N. In Rosa's and Grover's cgs notation ΔL = 0.004π a N (A + B)
 * µH with a in cm, which equals μ0 a N (A + B) in SI.
 */
import type { CurrentDistribution } from './current-distribution.ts';
import { currentSheetInductance } from './nagaoka.ts';
import { VACUUM_PERMEABILITY } from './vacuum.ts';

/**
 * Rosa's self-inductance correction k_s (Rosa's A), dimensionless.
 * uniform current: k_s = 5/4 − ln(2p/d); surface current: k_s = 3/2 − ln(2p/d).
 * Sign: k_s < 0 for thin, widely spaced wire (d < 2p·e^(−5/4) ≈ 0.573 p at DC); the correction
 * then raises L above the current-sheet value. Keep the sign.
 * @param pitch axial distance between turn centres, m
 * @param bareDiameter copper diameter, m (≤ pitch)
 * @param distribution 'uniform' (DC, Rosa's value) or 'surface' (HF limit, GMD of a circle = its radius)
 * Source: E. B. Rosa, Bull. Bur. Stand. 4 (1907/08); Grover (1946) ch. 16; the HF form by the
 * geometric-mean-distance method (GMD of a round wire ρ e^(−1/4) uniform, ρ surface; strip p e^(−3/2)).
 */
export function rosaSelfCorrection(pitch: number, bareDiameter: number, distribution: CurrentDistribution): number {
  const constant = distribution === 'uniform' ? 1.25 : 1.5;
  return constant - Math.log((2 * pitch) / bareDiameter);
}

/** ln j − ln g_j of Rosa's mutual correction, with g_j the GMD of two unit strips at spacing j. */
function roundMinusStripLogDistance(j: number): number {
  // ln g_j = [(j+1)² ln(j+1) + (j−1)² ln(j−1) − 2 j² ln j]/2 − 3/2; the ln j parts cancel exactly,
  // leaving 3/2 − [(j+1)² ln(1 + 1/j) + (j−1)² ln(1 − 1/j)]/2 (log1p keeps the digits).
  if (j === 1) return 1.5 - 2 * Math.LN2;
  return 1.5 - ((j + 1) * (j + 1) * Math.log1p(1 / j) + (j - 1) * (j - 1) * Math.log1p(-1 / j)) / 2;
}

/**
 * Rosa's mutual-inductance correction k_m (Rosa's B, Grover's H) by the exact GMD sum,
 * k_m(N) = (2/N) Σ_{j=1}^{N−1} (N − j)(ln j − ln g_j). O(N).
 * @param turns whole number of turns N ≥ 1
 * @returns k_m; NaN for a non-integer or N < 1
 * Source: Rosa (1907/08), Grover (1946) table p. 150; exact GMD form as in the reference notes.
 */
export function rosaMutualCorrectionSum(turns: number): number {
  if (!Number.isInteger(turns) || turns < 1) return Number.NaN;
  let sum = 0;
  for (let j = 1; j < turns; j++) sum += (turns - j) * roundMinusStripLogDistance(j);
  return (2 / turns) * sum;
}

/** ln(2π) − 3/2, the large-N limit of k_m. */
const MUTUAL_CORRECTION_LIMIT = Math.log(2 * Math.PI) - 1.5;

/**
 * Rosa's mutual correction k_m(N) for any N ≥ 1, smooth in N.
 * N ≥ 5: asymptotic series k_m ≈ ln(2π) − 3/2 − ln N/(6N) − 0.33084236/N − 1/(120N³) + 1/(504N⁵)
 * (|error| < 10⁻⁸ against the exact sum); 1 ≤ N < 5: the exact sum, linearly interpolated
 * between whole turns. Fractional N ≥ 5 is a smooth extension of the whole-turn values.
 * @param turns N ≥ 1 (NaN below)
 * Source: Rosa (1907/08), Grover (1946); series recalled from memory and confirmed against the sum.
 */
export function rosaMutualCorrection(turns: number): number {
  if (!(turns >= 1)) return Number.NaN;
  if (turns >= 5) {
    const n = turns;
    return MUTUAL_CORRECTION_LIMIT - Math.log(n) / (6 * n) - 0.33084236 / n - 1 / (120 * n ** 3) + 1 / (504 * n ** 5);
  }
  const lower = Math.floor(turns);
  const fraction = turns - lower;
  const lowerValue = rosaMutualCorrectionSum(lower);
  if (fraction === 0) return lowerValue;
  const upperValue = lower + 1 >= 5 ? rosaMutualCorrection(5) : rosaMutualCorrectionSum(lower + 1);
  return lowerValue + fraction * (upperValue - lowerValue);
}

/** A single-layer winding of round wire, SI. */
export interface RoundWireWinding {
  /** Radius of the wire's centre line, m. */
  radius: number;
  /** Number of turns (may be fractional). */
  turns: number;
  /** Axial distance between turn centres, m; the current-sheet length is turns × pitch. */
  pitch: number;
  /** Copper diameter, m. */
  bareDiameter: number;
}

/**
 * Inductance of a single-layer winding of round wire, H: Nagaoka's current sheet of radius a (the
 * wire's centre line) and length N·p, less Rosa's corrections μ0 a N (k_s + k_m).
 * @param winding the winding, SI
 * @param distribution current distribution in the wire ('uniform' for the low-frequency value)
 * Valid for N ≥ 1, d ≤ p ≪ a; agrees with the exact filament sum to about 10⁻⁵ for coils of tens
 * of turns and more (1.3·10⁻³ at N = 5).
 * Source: Nagaoka (1909) with Rosa (1907/08), Grover (1946) ch. 16.
 */
export function roundWireSolenoidInductance(winding: RoundWireWinding, distribution: CurrentDistribution): number {
  const { radius, turns, pitch, bareDiameter } = winding;
  const sheet = currentSheetInductance(radius, turns * pitch, turns);
  const correction = rosaSelfCorrection(pitch, bareDiameter, distribution) + rosaMutualCorrection(turns);
  return sheet - VACUUM_PERMEABILITY * radius * turns * correction;
}
