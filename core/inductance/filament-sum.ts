/**
 * Inductance of a single-layer winding as an exact sum over coaxial round-wire loops: each turn is
 * a closed circular loop (pitch current ignored), self terms by loop.ts, mutual terms by Maxwell.
 */
import type { CurrentDistribution } from './current-distribution.ts';
import { turnMutuals } from './turn-mutuals.ts';
import { loopSelfInductance } from './loop.ts';

/**
 * Inductance of N equal coaxial loops at spacing p, H:
 * L = Σ_i w_i² L_loop + 2 Σ_{s≥1} C(s) M(a, a, s p), C(s) = Σ_i w_i w_{i+s}.
 * Equal loops: M depends only on the separation, so the sum costs O(N) Maxwell evaluations.
 * A fractional N uses ceil(N) loops, the last carrying the weight N − floor(N) (the same partial-
 * turn weighting as the primary taps); whole N gives the plain double sum.
 * @param radius loop radius (wire centre line), m
 * @param turns N > 0
 * @param pitch axial spacing of loops, m
 * @param wireRadius bare wire radius, m
 * @param distribution 'uniform' (DC) or 'surface' (HF) for the self terms
 * Source: Maxwell (1873) §701 for the mutuals; Grover (1946) for the loop self-inductance.
 */
export function loopSumSolenoidInductance(
  radius: number,
  turns: number,
  pitch: number,
  wireRadius: number,
  distribution: CurrentDistribution,
): number {
  if (!(turns > 0)) return Number.NaN;
  const loopCount = Math.ceil(turns - 1e-9);
  const lastWeight = turns - (loopCount - 1);
  const self = loopSelfInductance(radius, wireRadius, distribution);
  let total = (loopCount - 1 + lastWeight * lastWeight) * self;
  const mutuals = turnMutuals(radius, pitch, loopCount);
  for (let separation = 1; separation < loopCount; separation++) {
    // pairs (i, i + s): loopCount − s of them, one of which involves the last loop
    const pairWeight = loopCount - separation - 1 + lastWeight;
    total += 2 * pairWeight * mutuals[separation];
  }
  return total;
}
