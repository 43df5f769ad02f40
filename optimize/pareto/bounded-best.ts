/**
 * The `keep` smallest items by (key, index), exact and independent of arrival order: the kept set is a
 * function of the set of offers (the order (key, index) is total when indices are distinct), so two
 * workers, resumed runs and merged shards agree. Memory O(keep); an offer costs O(log keep) to reject and
 * O(keep) (one array shift) to accept. Offering the same index twice keeps it once.
 */
export class BoundedBest<T> {
  readonly keep: number;
  private keys: number[] = [];
  private indices: number[] = [];
  private payloads: T[] = [];

  /** @param keep how many to keep, an integer ≥ 0. */
  constructor(keep: number) {
    if (!Number.isInteger(keep) || keep < 0) {
      throw new RangeError(`BoundedBest: keep must be a non-negative integer, got ${keep}`);
    }
    this.keep = keep;
  }

  /** Number of items kept. */
  get size(): number {
    return this.keys.length;
  }

  /** The position where (key, index) belongs in the sorted lists. */
  private positionOf(key: number, index: number): number {
    let low = 0;
    let high = this.keys.length;
    while (low < high) {
      const middle = (low + high) >>> 1;
      const k = this.keys[middle];
      if (k < key || (k === key && this.indices[middle] < index)) low = middle + 1;
      else high = middle;
    }
    return low;
  }

  /**
   * Offers an item. @param key a number, not NaN (−0 and 0 are equal). @param index the sample index.
   * @returns true when the item is kept (for now).
   */
  offer(key: number, index: number, payload: T): boolean {
    if (Number.isNaN(key)) throw new RangeError(`BoundedBest.offer: key must not be NaN (index ${index})`);
    const count = this.keys.length;
    if (count === this.keep) {
      if (count === 0) return false;
      const lastKey = this.keys[count - 1];
      if (key > lastKey || (key === lastKey && index >= this.indices[count - 1])) {
        return key === lastKey && index === this.indices[count - 1];
      }
    }
    const position = this.positionOf(key, index);
    if (position < count && this.keys[position] === key && this.indices[position] === index) return true;
    this.keys.splice(position, 0, key);
    this.indices.splice(position, 0, index);
    this.payloads.splice(position, 0, payload);
    if (this.keys.length > this.keep) {
      this.keys.pop();
      this.indices.pop();
      this.payloads.pop();
    }
    return true;
  }

  /**
   * Whether an offer of (key, index) would be kept now (true also when it is already kept); lets a caller
   * skip building a payload for an offer that would be rejected.
   */
  wouldKeep(key: number, index: number): boolean {
    const count = this.keys.length;
    if (count < this.keep) return true;
    if (count === 0) return false;
    const lastKey = this.keys[count - 1];
    return key < lastKey || (key === lastKey && index <= this.indices[count - 1]);
  }

  /** The kept items in (key, index) order. */
  entries(): { key: number; index: number; payload: T }[] {
    return this.keys.map((key, i) => ({ key, index: this.indices[i], payload: this.payloads[i] }));
  }

  /** The largest kept key, or Infinity while fewer than `keep` are kept. */
  threshold(): number {
    return this.keys.length < this.keep ? Infinity : this.keys[this.keys.length - 1];
  }
}
