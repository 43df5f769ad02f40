/**
 * The mutual inductances of two turns of a single-layer winding s pitches apart, M(a, a, s·p) for
 * s = 1 … count − 1 (Maxwell's formula, coaxial-loops.ts; [maxwell1873] §701). The loop sum of the
 * secondary's inductance (filament-sum.ts) and the segment inductance matrix of the distributed
 * winding (resonator/segment-inductance.ts) both need exactly this series for the same winding in
 * one evaluation: the last one is kept, so that it is computed once per design. A pure function of
 * its arguments (the kept series is returned only for the same numbers), so results do not depend
 * on the order of evaluations.
 */
import { coaxialLoopMutualInductance } from './coaxial-loops.ts';

let last: { radius: number; pitch: number; count: number; mutuals: Float64Array } | null = null;

/**
 * M(radius, radius, s·pitch) at index s for s = 1 … count − 1, H (index 0 is 0). Read-only: the
 * array may be handed out again to the next caller with the same arguments.
 * @param radius the turns' radius, m
 * @param pitch the axial distance between neighbouring turns, m
 * @param count the number of turns (whole), ≥ 1
 */
export function turnMutuals(radius: number, pitch: number, count: number): Float64Array {
  if (last && last.radius === radius && last.pitch === pitch && last.count === count) return last.mutuals;
  const mutuals = new Float64Array(Math.max(1, count));
  for (let s = 1; s < count; s++) mutuals[s] = coaxialLoopMutualInductance(radius, radius, s * pitch);
  last = { radius, pitch, count, mutuals };
  return mutuals;
}
