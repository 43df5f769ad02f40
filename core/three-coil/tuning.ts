/**
 * The tap of a three-coil system: the primary tap at which the three lossless mode frequencies come
 * nearest the complete-transfer ratio 1:2:3 of the triple-resonance circuit [bieniosek1990] (refs
 * §8.5), i.e. the smallest √((f2/f1 − 2)² + (f3/f1 − 3)²) over the primary's range. The tap moves
 * the tank's inductance and the coupling together; the other two conditions of complete transfer
 * (the tank and the junction empty at that time) need the line and the resonator as well, which the
 * tap alone cannot set: "as far as the geometry allows".
 */
import { losslessLoopFrequencies } from '../dynamics/loop-modes.ts';
import { type ThreeCoilCircuit, threeCoilNetwork } from '../dynamics/three-coil.ts';

/** √((f2/f1 − 2)² + (f3/f1 − 3)²) of the lossless circuit, or null when its modes cannot be found. */
export function threeCoilRatioError(circuit: ThreeCoilCircuit): number | null {
  const omega = losslessLoopFrequencies(threeCoilNetwork(circuit));
  if (!omega) return null;
  return Math.hypot(omega[1] / omega[0] - 2, omega[2] / omega[0] - 3);
}

/**
 * The tap in [lowest, turns] with the smallest ratio error: a scan of 200 taps, then golden-section
 * refinement around the best.
 * @param circuitAt the lossless circuit at a tap (its L1 and M follow the tap)
 */
export function threeCoilTap(
  lowest: number,
  turns: number,
  circuitAt: (tap: number) => ThreeCoilCircuit,
): { tapTurns: number; ratioError: number } | null {
  const error = (tap: number) => threeCoilRatioError(circuitAt(tap)) ?? Number.POSITIVE_INFINITY;
  const count = 200;
  const step = (turns - lowest) / count;
  let bestTap = turns;
  let bestError = error(turns);
  for (let k = 0; k < count; k++) {
    const tap = lowest + k * step;
    const value = error(tap);
    if (value < bestError) {
      bestError = value;
      bestTap = tap;
    }
  }
  if (!Number.isFinite(bestError)) return null;
  if (step > 0) {
    const ratio = (Math.sqrt(5) - 1) / 2;
    let low = Math.max(lowest, bestTap - step);
    let high = Math.min(turns, bestTap + step);
    for (let iteration = 0; iteration < 40; iteration++) {
      const a = high - ratio * (high - low);
      const b = low + ratio * (high - low);
      if (error(a) < error(b)) high = b;
      else low = a;
    }
    const refined = 0.5 * (low + high);
    const value = error(refined);
    if (value < bestError) {
      bestError = value;
      bestTap = refined;
    }
  }
  return { tapTurns: bestTap, ratioError: bestError };
}

/**
 * The line length in [shortest, longest] whose ratio error (at its own best tap, as `errorAt`
 * gives it) is smallest: a scan of 40 log-spaced lengths, then golden-section refinement; null when
 * no length gives modes.
 */
export function bestLineLength(
  shortest: number,
  longest: number,
  errorAt: (length: number) => number | null,
): { length: number; ratioError: number } | null {
  if (!(shortest > 0) || !(longest > shortest)) return null;
  const error = (length: number) => errorAt(length) ?? Number.POSITIVE_INFINITY;
  const count = 40;
  const factor = (longest / shortest) ** (1 / count);
  let bestLength = shortest;
  let bestError = error(shortest);
  for (let k = 1; k <= count; k++) {
    const length = shortest * factor ** k;
    const value = error(length);
    if (value < bestError) {
      bestError = value;
      bestLength = length;
    }
  }
  if (!Number.isFinite(bestError)) return null;
  const ratio = (Math.sqrt(5) - 1) / 2;
  let low = Math.log(Math.max(shortest, bestLength / factor));
  let high = Math.log(Math.min(longest, bestLength * factor));
  for (let iteration = 0; iteration < 30; iteration++) {
    const a = high - ratio * (high - low);
    const b = low + ratio * (high - low);
    if (error(Math.exp(a)) < error(Math.exp(b))) high = b;
    else low = a;
  }
  const refined = Math.exp(0.5 * (low + high));
  const value = error(refined);
  return value < bestError ? { length: refined, ratioError: value } : { length: bestLength, ratioError: bestError };
}
