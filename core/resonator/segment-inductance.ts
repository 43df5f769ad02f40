/**
 * The inductance matrix of a single-layer winding cut into axial segments, from the exact sum over
 * coaxial loops (core/inductance/filament-sum.ts): turn t occupies [t, t + 1] in turn units
 * (the last one ends at N when N is fractional), segment k covers [u_k, u_{k+1}] and owns the
 * share of each turn it overlaps (the same partial-turn weighting as the loop sum's last turn).
 * Entry (k, l) = Σ_t Σ_t′ w_kt w_lt′ F(t − t′), F the loop matrix (self: loop.ts, mutual: Maxwell's
 * formula) [maxwell1873] [grover1946]. Because Σ_k w_kt is the turn's own weight, the sum of all
 * entries is exactly the loop sum of the whole winding, and the matrix is W F Wᵀ with F the
 * (positive-definite) inductance matrix of the loops.
 */
import { coaxialLoopMutualInductance } from '../inductance/coaxial-loops.ts';
import type { CurrentDistribution } from '../inductance/current-distribution.ts';
import { loopSelfInductance } from '../inductance/loop.ts';

/** The winding for the segment matrices, SI. */
export interface SegmentedWinding {
  /** Radius of the wire's centre line, m. */
  radius: number;
  /** Number of turns N > 0 (may be fractional). */
  turns: number;
  /** Axial distance between turn centres, m. */
  pitch: number;
  /** Bare wire radius, m (for the loop self-inductance). */
  wireRadius: number;
}

/** Share of turn t (in [t, min(t + 1, N)]) that lies in [from, to], turn units. */
function overlap(t: number, turns: number, from: number, to: number): number {
  return Math.max(0, Math.min(t + 1, turns, to) - Math.max(t, from));
}

/**
 * The n × n segment inductance matrix, H, row-major.
 * @param winding the winding
 * @param boundaries n + 1 increasing fractions of the winding length, 0 first and 1 last
 * @param distribution 'surface' (HF) or 'uniform' (DC) for the loop self terms
 * Cost: one Maxwell evaluation per turn separation, then O(N·n) with running sums.
 */
export function segmentInductanceMatrix(
  winding: SegmentedWinding,
  boundaries: readonly number[],
  distribution: CurrentDistribution = 'surface',
): Float64Array {
  const n = boundaries.length - 1;
  const turns = winding.turns;
  const count = Math.ceil(turns - 1e-9);
  // F(s) for s = 0 … count − 1, and its running sum over signed offsets S(x) = Σ_{s=−(count−1)}^{x} F(|s|).
  const { loop, running } = loopTables(winding, count, distribution);
  const cumulative = (x: number) => (x < -(count - 1) ? 0 : running[Math.min(x, count - 1) + count - 1]);
  // Each segment: whole turns [first, last) plus up to two partial turns at its ends.
  const segments: { first: number; last: number; partial: { t: number; w: number }[] }[] = [];
  for (let k = 0; k < n; k++) {
    const from = boundaries[k] * turns;
    const to = boundaries[k + 1] * turns;
    const low = Math.min(Math.floor(from), count - 1);
    const high = Math.max(low, Math.min(Math.ceil(to) - 1, count - 1));
    const whole = (t: number) => overlap(t, turns, from, to) > 1 - 1e-12;
    const first = whole(low) ? low : low + 1;
    const last = high >= first && whole(high) ? high + 1 : high;
    const partial: { t: number; w: number }[] = [];
    if (!whole(low)) partial.push({ t: low, w: overlap(low, turns, from, to) });
    if (high !== low && !whole(high)) partial.push({ t: high, w: overlap(high, turns, from, to) });
    segments.push({ first, last: Math.max(first, last), partial });
  }
  // g_l(t) = Σ_t′ w_lt′ F(|t − t′|) for every loop t, then M_kl = Σ_t w_kt g_l(t).
  const matrix = new Float64Array(n * n);
  const linked = (segment: (typeof segments)[number], t: number) => {
    let value = segment.last > segment.first ? cumulative(t - segment.first) - cumulative(t - segment.last) : 0;
    for (const p of segment.partial) value += p.w * loop[Math.abs(t - p.t)];
    return value;
  };
  for (let k = 0; k < n; k++) {
    const a = segments[k];
    for (let l = k; l < n; l++) {
      const b = segments[l];
      let value = 0;
      for (let t = a.first; t < a.last; t++) value += linked(b, t);
      for (const p of a.partial) value += p.w * linked(b, p.t);
      matrix[k * n + l] = value;
      matrix[l * n + k] = value;
    }
  }
  return matrix;
}

/** The last winding's loop tables: one design asks for several segment counts of the same winding. */
let lastTables: { key: string; loop: Float64Array; running: Float64Array } | null = null;

/** F(s), the mutual of two turns s apart (s = 0: the loop's self-inductance), and its running sum. */
function loopTables(
  winding: SegmentedWinding,
  count: number,
  distribution: CurrentDistribution,
): { loop: Float64Array; running: Float64Array } {
  const key = `${winding.radius}|${winding.pitch}|${winding.wireRadius}|${count}|${distribution}`;
  if (lastTables?.key === key) return lastTables;
  const loop = new Float64Array(count);
  loop[0] = loopSelfInductance(winding.radius, winding.wireRadius, distribution);
  for (let s = 1; s < count; s++)
    loop[s] = coaxialLoopMutualInductance(winding.radius, winding.radius, s * winding.pitch);
  const running = new Float64Array(2 * count); // running[x + count − 1] = S(x), x ∈ [−(count−1), count−1]
  let sum = 0;
  for (let x = -(count - 1); x <= count - 1; x++) {
    sum += loop[Math.abs(x)];
    running[x + count - 1] = sum;
  }
  lastTables = { key, loop, running };
  return lastTables;
}
