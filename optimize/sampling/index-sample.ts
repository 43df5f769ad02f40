import { BoundedBest } from '../pareto/bounded-best.ts';
import { assertSeed, uniformAt } from '../random.ts';

/** The serialised form of an {@link IndexSample}: plain JSON data. */
export interface IndexSampleData<T> {
  kind: 'coilfront-index-sample';
  version: 1;
  capacity: number;
  seed: number;
  offered: number;
  items: { index: number; payload: T }[];
}

/**
 * An order-independent, mergeable uniform subsample of a stream of indexed items (bottom-k sampling,
 * E. Cohen & H. Kaplan, "Summarizing data using bottom-k sketches", PODC 2007): keep the `capacity` items
 * with the smallest key uniformAt(seed, index, 0x5a3e) (ties by index). The sample is a function of the
 * set of offered indices and the seed: exact (everything) while at most `capacity` items were offered, a
 * uniform deterministic subsample otherwise; merging two samples gives the sample of the union.
 * Memory O(capacity). For summary statistics (quantiles, rank correlations) with flat memory.
 * @example
 * const sample = new IndexSample<Float64Array>(10_000, 99);
 * sample.offer(12, metricsRow);
 * sample.items(); // [{ index: 12, payload: metricsRow }]
 */
export class IndexSample<T> {
  readonly capacity: number;
  readonly seed: number;
  private readonly best: BoundedBest<T>;
  private offeredCount = 0;

  /** @param capacity k ≥ 0 (10 000 for summary.json). @param seed unsigned 32-bit. */
  constructor(capacity: number, seed: number) {
    assertSeed(seed, 'IndexSample');
    this.capacity = capacity;
    this.seed = seed;
    this.best = new BoundedBest<T>(capacity);
  }

  /** Number of items kept (≤ capacity). */
  get size(): number {
    return this.best.size;
  }

  /** Number of offers so far (a merged sample adds the other's count; repeated indices count again). */
  get offered(): number {
    return this.offeredCount;
  }

  /** Offers item `index` (a non-negative integer, offered once) with its payload. */
  offer(index: number, payload: T): void {
    this.offeredCount++;
    this.best.offer(uniformAt(this.seed, index, 0x5a3e), index, payload);
  }

  /** The kept items in index order. */
  items(): { index: number; payload: T }[] {
    return this.best
      .entries()
      .map(({ index, payload }) => ({ index, payload }))
      .sort((a, b) => a.index - b.index);
  }

  /** Adds another sample of the same capacity and seed (e.g. another shard's). */
  merge(other: IndexSample<T>): void {
    if (other.capacity !== this.capacity || other.seed !== this.seed) {
      throw new RangeError(
        `IndexSample.merge: samples must share capacity and seed, got ${other.capacity}/${other.seed} and ${this.capacity}/${this.seed}`,
      );
    }
    for (const { index, payload } of other.items())
      this.best.offer(uniformAt(this.seed, index, 0x5a3e), index, payload);
    this.offeredCount += other.offeredCount;
  }

  /** Plain data for a checkpoint (payloads must be JSON-serialisable for JSON.stringify). */
  toJSON(): IndexSampleData<T> {
    return {
      kind: 'coilfront-index-sample',
      version: 1,
      capacity: this.capacity,
      seed: this.seed,
      offered: this.offeredCount,
      items: this.items(),
    };
  }

  /** Rebuilds a sample from {@link IndexSample.toJSON} data. */
  static restore<T>(data: IndexSampleData<T>): IndexSample<T> {
    if (data.kind !== 'coilfront-index-sample' || data.version !== 1) {
      throw new RangeError(
        `IndexSample.restore: data must be a version 1 index sample, got ${data.kind} ${data.version}`,
      );
    }
    const sample = new IndexSample<T>(data.capacity, data.seed);
    for (const { index, payload } of data.items) sample.best.offer(uniformAt(data.seed, index, 0x5a3e), index, payload);
    sample.offeredCount = data.offered;
    return sample;
  }
}
