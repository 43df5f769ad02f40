import type { Scored } from './scored.ts';
import { BoundedBest } from './bounded-best.ts';
import { rankCandidates } from './rank-candidates.ts';
import { DominanceIndex } from './dominance-index.ts';
import { must } from '../../core/must.ts';

/** One kept candidate with the caller's payload (e.g. its design and metrics row). */
export interface PoolEntry<T> {
  item: Scored;
  payload: T;
  /** Feasible: how many offered feasible candidates dominate it (0 = on the Pareto front); null infeasible. */
  dominatedBy: number | null;
}

/** A kept candidate in final order, from {@link CandidatePool.ranked}. */
export interface RankedEntry<T> extends PoolEntry<T> {
  /** 1-based Pareto rank (feasible), 0 for infeasible. */
  paretoRank: number;
  /** Crowding distance in its front (Infinity at the boundaries), 0 for infeasible. */
  crowding: number;
}

/** A number as JSON keeps it: finite numbers as they are, NaN and ±Infinity as the strings "NaN", "Infinity", "-Infinity". */
export type JsonNumber = number | string;

const toJsonNumber = (value: number): JsonNumber => (Number.isFinite(value) ? value : String(value));
const fromJsonNumber = (value: JsonNumber): number => (typeof value === 'number' ? value : Number(value));

/** Serialised candidate (plain JSON). */
export interface PoolRecord<T> {
  index: number;
  violation: JsonNumber;
  objectives: JsonNumber[];
  dominatedBy: number | null;
  payload: T;
}

/** The serialised form of a {@link CandidatePool}: plain JSON data for checkpoints and shard files. */
export interface CandidatePoolData<T> {
  kind: 'coilfront-candidate-pool';
  version: 1;
  keep: number;
  objectiveCount: number;
  feasible: PoolRecord<T>[];
  infeasible: PoolRecord<T>[];
}

interface InfeasiblePayload<T> {
  objectives: Float64Array;
  payload: T;
}

/**
 * The main thread's bounded, exact, order-independent store of the best candidates of a sweep: the
 * "K-dominance filter". With K = keep:
 *
 * - feasible candidates, two or more objectives: keep every point dominated by fewer than K of the
 *   feasible points offered so far; drop a kept point once K kept points dominate it; reject an offer that
 *   K kept points dominate;
 * - feasible, one objective: the K smallest by (value, index), a bounded top-K;
 * - infeasible: separately, the K smallest by (violation, index).
 *
 * Claims (the tests check each against brute force on random sets in random arrival orders), with S the set
 * of feasible points offered, D(p) = {q ∈ S : q dominates p}, and F(S) = {p ∈ S : |D(p)| < K}:
 *
 * (a) The kept set is exactly F(S), whatever the order of arrival. Invariant: after each offer the kept set
 *     is F of the points seen. If q dominates p then D(q) ⊂ D(p) and q ∉ D(q), so |D(q)| < |D(p)| (domination
 *     is a strict partial order: transitive, irreflexive). Hence F is closed under "dominated-by" (every
 *     dominator of a kept point is kept), and a kept point's count over the kept set equals its count over
 *     all points seen. A point p with |D(p)| ≥ K also has ≥ K kept dominators, by induction on |D(p)|: if
 *     some q ∈ D(p) is not kept, q has ≥ K kept dominators (|D(q)| < |D(p)|), and they all dominate p by
 *     transitivity (a dropped point's K dominators also dominate everything it dominates). So counting
 *     over the kept set decides membership exactly; a newcomer p adds one to the counts of exactly the
 *     points it dominates (a rejected p dominates no kept point, else that point would have ≥ K
 *     dominators); points reaching K leave. F(S) depends only on S, not on the order.
 * (b) Closed under "dominated-by" (above), so the Pareto rank of a kept point — the length of the longest
 *     chain of dominators above it — is the same on the kept set as on S.
 * (c) Let front F be the front of S where the K-th candidate of the final order falls; fronts 1 .. F−1
 *     hold fewer than K points. A point of front f ≤ F is dominated only by points of fronts < f, fewer
 *     than K, so it is kept: fronts 1 .. F are complete in the pool, their crowding distances (computed
 *     within a front) are the same, and rankCandidates on the pool gives the same first K as on S.
 * (d) Merge: F(F(A) ∪ F(B)) = F(A ∪ B). A point with fewer than K dominators in A ∪ B has fewer in A (and in
 *     B), so it is in F(A) ∪ F(B) =: U, as are its dominators; its count in U is its count in A ∪ B. A point
 *     of U with ≥ K dominators in A ∪ B has ≥ K in U, by the induction of (a) (a dominator outside U has ≥ K
 *     dominators within A or within B).
 *
 * Equal objective vectors do not dominate each other (all of them stay while fewer than K points dominate
 * them). Offering a sample index that is already kept is ignored, and one that was dropped is rejected
 * again, so re-offering (overlapping shards, a replayed batch) is harmless as long as an index always comes
 * with the same values. The kept set is bounded by the data, not only by K: for n independent uniform
 * objectives it is about K·Σ_{j<M} (ln(n/K))^j / j! points (a point is kept when n·Π f_j < K; at n = 10^6,
 * K = 1000: 7.9·10^3 for M = 2, 3.2·10^4 for M = 3, 8.7·10^4 for M = 4; bench/pareto.ts measures these),
 * so it grows like (ln n)^(M−1), not like n; fewer for correlated objectives, more for objectives that
 * trade off along a thick front, and all copies of a repeated vector stay.
 *
 * Memory is that of the kept set: measured about 120 bytes per kept point (4 objectives) plus the
 * payload (a Float64Array of 30 metrics adds about 460 bytes; bench/pareto.ts). Because designs
 * are index-addressable and evaluation is deterministic, a runner short of memory can pass a small
 * payload (or null) and re-evaluate the few kept designs it writes out at the end.
 *
 * Cost of an offer: the kept points sit in a k-d tree with bounding boxes (dominance-index.ts), so a
 * rejection usually stops after counting K dominators in a few whole subtrees, and an acceptance visits
 * only the subtrees that can hold its dominators or the points it dominates; O(M·n_kept) at worst.
 *
 * Feasible objectives must be finite numbers (the caller turns NaN or infinite metrics into infeasible
 * candidates); a violation must be a number ≥ 0.
 * @example
 * const pool = new CandidatePool<number[]>(1000, 2);
 * pool.offer({ index: 7, violation: 0, objectives: Float64Array.of(-3.2e5, 0.41) }, metricsRow);
 * const best = pool.ranked(); // the first 1000 in final order, with Pareto rank and crowding
 * const front = pool.front(); // every non-dominated feasible candidate seen, for front.csv
 */
export class CandidatePool<T> {
  readonly keep: number;
  readonly objectiveCount: number;

  // Feasible, objectiveCount ≥ 2: the kept points with their dominator counts, in a k-d tree.
  private readonly index: DominanceIndex | null;
  private readonly keptIndices = new Set<number>();

  // Feasible with one objective (or none): bounded top-K by (value, index).
  private readonly single: BoundedBest<T> | null;
  // Infeasible: bounded top-K by (violation, index).
  private readonly infeasible: BoundedBest<InfeasiblePayload<T>>;

  /**
   * @param keep K, the number of candidates the final ranking must get exactly right (--keep), ≥ 1.
   * @param objectiveCount number of objectives (0 for a feasibility-only sweep).
   */
  constructor(keep: number, objectiveCount: number) {
    if (!Number.isInteger(keep) || keep < 1) {
      throw new RangeError(`CandidatePool: keep must be an integer of at least 1, got ${keep}`);
    }
    if (!Number.isInteger(objectiveCount) || objectiveCount < 0) {
      throw new RangeError(`CandidatePool: objectiveCount must be a non-negative integer, got ${objectiveCount}`);
    }
    this.keep = keep;
    this.objectiveCount = objectiveCount;
    this.single = objectiveCount <= 1 ? new BoundedBest<T>(keep) : null;
    this.index = objectiveCount <= 1 ? null : new DominanceIndex(objectiveCount);
    this.infeasible = new BoundedBest<InfeasiblePayload<T>>(keep);
  }

  /** Number of candidates kept (feasible and infeasible). */
  get size(): number {
    return this.feasibleSize + this.infeasible.size;
  }

  /** Number of feasible candidates kept. */
  get feasibleSize(): number {
    return this.single === null ? must(this.index).liveCount : this.single.size;
  }

  /**
   * Offers one evaluated candidate. The objectives are copied; `item` may be reused by the caller.
   * @returns true if it is kept (for now), false if it is rejected.
   * @throws RangeError for a NaN or negative violation, a wrong number of objectives, or a feasible item
   *   with a non-finite objective.
   */
  offer(item: Scored, payload: T): boolean {
    return this.offerWith(item, () => payload);
  }

  /**
   * Like {@link CandidatePool.offer}, but builds the payload only when the candidate is kept, which spares
   * an allocation for the many offers a long sweep rejects. Same result as offer(item, makePayload()).
   * @example pool.offerWith(item, () => ({ metrics: Array.from(row) }))
   */
  offerWith(item: Scored, makePayload: () => T): boolean {
    const { index, violation, objectives } = item;
    if (!(violation >= 0)) {
      throw new RangeError(`CandidatePool.offer: violation must be a number ≥ 0, got ${violation} (index ${index})`);
    }
    if (violation > 0) {
      if (!this.infeasible.wouldKeep(violation, index)) return false;
      return this.infeasible.offer(violation, index, {
        objectives: Float64Array.from(objectives),
        payload: makePayload(),
      });
    }
    const m = this.objectiveCount;
    if (objectives.length !== m) {
      throw new RangeError(
        `CandidatePool.offer: objectives must have ${m} values, got ${objectives.length} (index ${index})`,
      );
    }
    for (let j = 0; j < m; j++) {
      const value = objectives[j];
      if (!Number.isFinite(value)) {
        throw new RangeError(`CandidatePool.offer: feasible objectives must be finite, got ${value} (index ${index})`);
      }
    }
    if (this.single !== null) {
      const key = m === 0 ? 0 : objectives[0];
      if (!this.single.wouldKeep(key, index)) return false;
      return this.single.offer(key, index, makePayload());
    }
    if (this.keptIndices.has(index)) return true;
    return this.offerFeasible(index, objectives, makePayload);
  }

  private offerFeasible(sampleIndex: number, point: Float64Array, makePayload: () => T): boolean {
    const keep = this.keep;
    const index = must(this.index);
    // Rejected when K kept points dominate it (the count stops at K).
    const dominators = index.countDominators(point, keep);
    if (dominators >= keep) return false;
    // Kept: every kept point it dominates gains one dominator; at K it leaves.
    index.forEachDominated(point, (slot) => {
      if (++index.dominatorCounts[slot] >= keep) {
        this.keptIndices.delete(index.sampleIndices[slot]);
        index.remove(slot);
      }
    });
    index.insert(point, dominators, sampleIndex, makePayload());
    this.keptIndices.add(sampleIndex);
    return true;
  }

  /** The kept feasible candidates, by sample index. */
  feasibleEntries(): PoolEntry<T>[] {
    const entries: PoolEntry<T>[] = [];
    if (this.single !== null) {
      const kept = this.single.entries();
      let smaller = 0;
      kept.forEach((entry, i) => {
        if (i > 0 && entry.key !== kept[i - 1].key) smaller = i;
        const objectives = this.objectiveCount === 0 ? new Float64Array(0) : Float64Array.of(entry.key);
        entries.push({
          item: { index: entry.index, violation: 0, objectives },
          payload: entry.payload,
          dominatedBy: this.objectiveCount === 0 ? 0 : smaller,
        });
      });
    } else {
      const m = this.objectiveCount;
      const index = must(this.index);
      for (let slot = 0; slot < index.slotCount; slot++) {
        if (index.live[slot] === 0) continue;
        entries.push({
          item: {
            index: index.sampleIndices[slot],
            violation: 0,
            objectives: index.objectives.slice(slot * m, slot * m + m),
          },
          payload: index.payloads[slot] as T,
          dominatedBy: index.dominatorCounts[slot],
        });
      }
    }
    return entries.sort((a, b) => a.item.index - b.item.index);
  }

  /** The kept infeasible candidates (the K with the smallest violation), by sample index. */
  infeasibleEntries(): PoolEntry<T>[] {
    return this.infeasible
      .entries()
      .map(({ key, index, payload }) => ({
        item: { index, violation: key, objectives: payload.objectives.slice() },
        payload: payload.payload,
        dominatedBy: null,
      }))
      .sort((a, b) => a.item.index - b.item.index);
  }

  /** Every kept candidate: feasible ones by index, then infeasible ones by index. */
  entries(): PoolEntry<T>[] {
    return [...this.feasibleEntries(), ...this.infeasibleEntries()];
  }

  /**
   * The non-dominated feasible candidates of everything offered (front.csv), by index: the kept points
   * that nothing dominates. With one objective: those sharing the smallest value (at most K of them).
   */
  front(): PoolEntry<T>[] {
    return this.feasibleEntries().filter((entry) => entry.dominatedBy === 0);
  }

  /**
   * The first `limit` candidates (default K) in final order (see rankCandidates): exactly those of the
   * whole stream, by claim (c).
   */
  ranked(limit = this.keep): RankedEntry<T>[] {
    const all = this.entries();
    const { order, paretoRank, crowding } = rankCandidates(
      all.map((entry) => entry.item),
      limit,
    );
    return order.map((position) => ({
      ...all[position],
      paretoRank: paretoRank[position],
      crowding: crowding[position],
    }));
  }

  /** Adds everything another pool kept (e.g. another shard's): the result is the pool of the union, claim (d). */
  merge(other: CandidatePool<T>): void {
    if (other.keep !== this.keep || other.objectiveCount !== this.objectiveCount) {
      throw new RangeError(
        `CandidatePool.merge: pools must share keep and objectiveCount, got ${other.keep}/${other.objectiveCount} and ${this.keep}/${this.objectiveCount}`,
      );
    }
    for (const entry of other.entries()) this.offer(entry.item, entry.payload);
  }

  /** Plain data for a checkpoint or shard file (payloads must be JSON-serialisable for JSON.stringify). */
  toJSON(): CandidatePoolData<T> {
    const record = (entry: PoolEntry<T>): PoolRecord<T> => ({
      index: entry.item.index,
      violation: toJsonNumber(entry.item.violation),
      objectives: Array.from(entry.item.objectives, toJsonNumber),
      dominatedBy: entry.dominatedBy,
      payload: entry.payload,
    });
    return {
      kind: 'coilfront-candidate-pool',
      version: 1,
      keep: this.keep,
      objectiveCount: this.objectiveCount,
      feasible: this.feasibleEntries().map(record),
      infeasible: this.infeasibleEntries().map(record),
    };
  }

  /**
   * Rebuilds a pool from {@link CandidatePool.toJSON} data, in O(n log n): the stored dominator counts are
   * taken as they are (data written by toJSON), not recomputed.
   */
  static restore<T>(data: CandidatePoolData<T>): CandidatePool<T> {
    if (data.kind !== 'coilfront-candidate-pool' || data.version !== 1) {
      throw new RangeError(
        `CandidatePool.restore: data must be a version 1 candidate pool, got ${data.kind} ${data.version}`,
      );
    }
    const pool = new CandidatePool<T>(data.keep, data.objectiveCount);
    const objectivesOf = (record: PoolRecord<T>) => Float64Array.from(record.objectives, fromJsonNumber);
    for (const record of data.infeasible) {
      pool.offer(
        { index: record.index, violation: fromJsonNumber(record.violation), objectives: objectivesOf(record) },
        record.payload,
      );
    }
    if (pool.single !== null) {
      for (const record of data.feasible) {
        pool.offer({ index: record.index, violation: 0, objectives: objectivesOf(record) }, record.payload);
      }
      return pool;
    }
    const m = data.objectiveCount;
    for (const record of data.feasible) {
      if (
        record.objectives.length !== m ||
        !(record.dominatedBy !== null && record.dominatedBy >= 0 && record.dominatedBy < data.keep)
      ) {
        throw new RangeError(
          `CandidatePool.restore: record ${record.index} is not a kept feasible candidate of this pool`,
        );
      }
      must(pool.index).insert(objectivesOf(record), record.dominatedBy, record.index, record.payload);
      pool.keptIndices.add(record.index);
    }
    must(pool.index).rebuild();
    return pool;
  }
}
