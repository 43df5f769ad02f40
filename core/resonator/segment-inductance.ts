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
import { turnMutuals } from '../inductance/turn-mutuals.ts';
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
 * The turns that each segment owns, flat: segment k has whole turns first[k] … last[k] − 1 and up
 * to two partial turns at its ends (turn partialTurn[2k + j] with weight partialWeight[2k + j];
 * weight 0 where there is none).
 */
interface SegmentTurns {
  first: Int32Array;
  last: Int32Array;
  partialTurn: Int32Array;
  partialWeight: Float64Array;
}

/** The turns that the segments between the boundaries (fractions of the length) own. */
function segmentTurns(turns: number, count: number, boundaries: readonly number[]): SegmentTurns {
  const n = boundaries.length - 1;
  const segments: SegmentTurns = {
    first: new Int32Array(n),
    last: new Int32Array(n),
    partialTurn: new Int32Array(2 * n),
    partialWeight: new Float64Array(2 * n),
  };
  for (let k = 0; k < n; k++) {
    const from = boundaries[k] * turns;
    const to = boundaries[k + 1] * turns;
    const low = Math.min(Math.floor(from), count - 1);
    const high = Math.max(low, Math.min(Math.ceil(to) - 1, count - 1));
    const whole = (t: number) => overlap(t, turns, from, to) > 1 - 1e-12;
    const first = whole(low) ? low : low + 1;
    const last = high >= first && whole(high) ? high + 1 : high;
    segments.first[k] = first;
    segments.last[k] = Math.max(first, last);
    if (!whole(low)) {
      segments.partialTurn[2 * k] = low;
      segments.partialWeight[2 * k] = overlap(low, turns, from, to);
    }
    if (high !== low && !whole(high)) {
      segments.partialTurn[2 * k + 1] = high;
      segments.partialWeight[2 * k + 1] = overlap(high, turns, from, to);
    }
  }
  return segments;
}

/**
 * The n × n segment inductance matrix, H, row-major.
 * @param winding the winding
 * @param boundaries n + 1 increasing fractions of the winding length, 0 first and 1 last
 * @param distribution 'surface' (HF) or 'uniform' (DC) for the loop self terms
 * Cost: one Maxwell evaluation per turn separation (the loop tables), then O(1) per entry (see
 * blockLinkage).
 */
export function segmentInductanceMatrix(
  winding: SegmentedWinding,
  boundaries: readonly number[],
  distribution: CurrentDistribution = 'surface',
): Float64Array {
  const n = boundaries.length - 1;
  const count = Math.ceil(winding.turns - 1e-9);
  const tables = loopTables(winding, count, distribution);
  const segments = segmentTurns(winding.turns, count, boundaries);
  const matrix = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    for (let l = k; l < n; l++) {
      const value = blockLinkage(tables, segments, k, l);
      matrix[k * n + l] = value;
      matrix[l * n + k] = value;
    }
  }
  return matrix;
}

/** S(x₁) − S(x₂) of blockLinkage, high and low parts apart; S is flat outside −count … count − 1. */
function onceDifference(tables: LoopTables, x1: number, x2: number): number {
  const { once, onceLow, count } = tables;
  const i1 = Math.max(-count, Math.min(x1, count - 1)) + count;
  const i2 = Math.max(-count, Math.min(x2, count - 1)) + count;
  return once[i1] - once[i2] + (onceLow[i1] - onceLow[i2]);
}

/**
 * Σ_t Σ_t′ w_at w_bt′ F(|t − t′|) for segments a and b, in O(1). With S(x) = Σ_(s ≤ x) F(|s|) and
 * T(x) = Σ_(y ≤ x) S(y) (exact sums of the table; both taken relative to their values at x = −1,
 * which cancels in every difference below and keeps the numbers small):
 *   whole turns [a₁, a₂) × [b₁, b₂):  T(a₂−1−b₁) − T(a₁−1−b₁) − T(a₂−1−b₂) + T(a₁−1−b₂),
 *   whole turns [a₁, a₂) × turn p:    S(a₂−1−p) − S(a₁−1−p),
 *   turn p × turn p′:                 F(|p − p′|).
 * The second difference of T for two segments far apart is small beside T itself, so S and T are
 * kept in double length (see sumError): the entries keep the precision of a term-by-term sum.
 */
function blockLinkage(tables: LoopTables, segments: SegmentTurns, a: number, b: number): number {
  const { loop, twice, twiceLow, count } = tables;
  const { first, last, partialTurn, partialWeight } = segments;
  let value = 0;
  const wholeA = last[a] > first[a];
  const wholeB = last[b] > first[b];
  if (wholeA && wholeB) {
    // twice[x + count + 1] = T(x) − T(−1) − (x + 1)·S(−1), x ≥ −count − 1.
    const i1 = last[a] - first[b] + count;
    const i2 = first[a] - first[b] + count;
    const i3 = last[a] - last[b] + count;
    const i4 = first[a] - last[b] + count;
    value +=
      twice[i1] - twice[i2] - (twice[i3] - twice[i4]) + (twiceLow[i1] - twiceLow[i2] - (twiceLow[i3] - twiceLow[i4]));
  }
  for (let j = 0; j < 2; j++) {
    const wb = partialWeight[2 * b + j];
    if (wholeA && wb !== 0) {
      const p = partialTurn[2 * b + j];
      value += wb * onceDifference(tables, last[a] - 1 - p, first[a] - 1 - p);
    }
    const wa = partialWeight[2 * a + j];
    if (wa === 0) continue;
    const p = partialTurn[2 * a + j];
    if (wholeB) value += wa * onceDifference(tables, p - first[b], p - last[b]);
    for (let i = 0; i < 2; i++) {
      const w = partialWeight[2 * b + i];
      if (w !== 0) value += wa * w * loop[Math.abs(p - partialTurn[2 * b + i])];
    }
  }
  return value;
}

/** F(s) for s = 0 … count − 1 and its running sums in double length, high and low parts (see blockLinkage). */
interface LoopTables {
  /** What the tables were made for (the cache key: the winding's numbers, exactly). */
  radius: number;
  pitch: number;
  wireRadius: number;
  distribution: CurrentDistribution;
  count: number;
  loop: Float64Array;
  once: Float64Array;
  onceLow: Float64Array;
  twice: Float64Array;
  twiceLow: Float64Array;
}

/**
 * The rounding error of sum = fl(a + b): a + b = sum + error exactly (Knuth's error-free sum of two
 * numbers; compensated summation [higham2002] §4.3, refs §11.8). Running sums kept as high + low
 * with it carry the exact sum of their terms to about ε² of its size.
 */
function sumError(a: number, b: number, sum: number): number {
  const back = sum - a;
  return a - (sum - back) + (b - back);
}

/** The last winding's loop tables: one design asks for several segment counts of the same winding. */
let lastTables: LoopTables | null = null;

/** F(s), the mutual of two turns s apart (s = 0: the loop's self-inductance), and its running sums. */
function loopTables(winding: SegmentedWinding, count: number, distribution: CurrentDistribution): LoopTables {
  const last = lastTables;
  if (
    last &&
    last.radius === winding.radius &&
    last.pitch === winding.pitch &&
    last.wireRadius === winding.wireRadius &&
    last.count === count &&
    last.distribution === distribution
  )
    return last;
  // The same turn-to-turn mutuals as the secondary's loop sum (computed once for both).
  const loop = turnMutuals(winding.radius, winding.pitch, count).slice(0, count);
  loop[0] = loopSelfInductance(winding.radius, winding.wireRadius, distribution);
  // once(x) = S(x) − S(−1) for x = −count … count − 1: Σ_(s=0)^x F(s) for x ≥ 0 and
  // −Σ_(s=1)^(−x−1) F(s) for x < 0 (S is flat below −(count − 1): no loops that far apart).
  const once = new Float64Array(2 * count);
  const onceLow = new Float64Array(2 * count);
  let high = 0;
  let low = 0;
  for (let x = 0; x < count; x++) {
    const sum = high + loop[x];
    low += sumError(high, loop[x], sum);
    high = sum;
    once[x + count] = high;
    onceLow[x + count] = low;
  }
  high = 0;
  low = 0;
  for (let x = -1; x >= -count; x--) {
    once[x + count] = -high;
    onceLow[x + count] = -low;
    if (-x < count) {
      const sum = high + loop[-x];
      low += sumError(high, loop[-x], sum);
      high = sum;
    }
  }
  // twice(x) = Σ_(y=0)^x once(y) for x ≥ 0, −Σ_(y=x+1)^(−1) once(y) for x < 0, x = −count − 1 … count − 1,
  // stored at x + count + 1.
  const twice = new Float64Array(2 * count + 1);
  const twiceLow = new Float64Array(2 * count + 1);
  high = 0;
  low = 0;
  for (let x = 0; x < count; x++) {
    const sum = high + once[x + count];
    low += sumError(high, once[x + count], sum) + onceLow[x + count];
    high = sum;
    twice[x + count + 1] = high;
    twiceLow[x + count + 1] = low;
  }
  high = 0;
  low = 0;
  for (let x = -1; x >= -count - 1; x--) {
    twice[x + count + 1] = -high;
    twiceLow[x + count + 1] = -low;
    if (x >= -count) {
      const sum = high + once[x + count];
      low += sumError(high, once[x + count], sum) + onceLow[x + count];
      high = sum;
    }
  }
  lastTables = {
    radius: winding.radius,
    pitch: winding.pitch,
    wireRadius: winding.wireRadius,
    distribution,
    count,
    loop,
    once,
    onceLow,
    twice,
    twiceLow,
  };
  return lastTables;
}
