/**
 * The batches of a run that are finished: a contiguous prefix plus the ones finished out of order.
 * The checkpoint stores exactly this (prefix and extras), so it stays small however long the run.
 */
export class DoneSet {
  prefix = 0;
  private readonly extra = new Set<number>();
  has(batch: number): boolean {
    return batch < this.prefix || this.extra.has(batch);
  }
  add(batch: number): void {
    this.extra.add(batch);
    while (this.extra.has(this.prefix)) {
      this.extra.delete(this.prefix);
      this.prefix++;
    }
  }
  extras(): number[] {
    return [...this.extra].sort((a, b) => a - b);
  }
  get size(): number {
    return this.prefix + this.extra.size;
  }
}
