/**
 * A dynamic store of objective vectors answering the two questions of the K-dominance filter quickly:
 * "how many stored points dominate p (stop counting at a limit)" and "which stored points does p
 * dominate". It is a bucket k-d tree (Bentley, "Multidimensional binary search trees used for associative
 * searching", CACM 18(9), 1975) with a bounding box per node, rebuilt from time to time:
 *
 * - points live in slots; after a rebuild, slots [0, treeSize) are in tree order, so every leaf covers a
 *   contiguous range of slots; a newer point walks down by the split values, widening the boxes on its
 *   path, and joins its leaf's overflow list (O(depth)); the tree is rebuilt (O(M·n log n)) once as many
 *   points were added as it was built with, or when half of its points are dead: amortised O(M log n)
 *   per insertion;
 * - a removal marks its slot dead and lowers the live counts on its root-to-leaf path;
 * - a query skips a node whose box cannot hold a dominator (some minimum above p) or a dominated point
 *   (some maximum below p), and counts a node whose box lies wholly in p's dominating region as a whole
 *   (every maximum ≤ p, one strictly below: every point in it is strictly better in that objective).
 *
 * Answers are exact (boxes include dead points, which only makes them conservative); the structure only
 * changes the cost. Not exported from the package barrel: CandidatePool's engine.
 */

import { dominatesAt } from './dominates.ts';

const LEAF_SIZE = 16;
/** What a node's box can hold (DominanceIndex.boxHolds). */
const NO_MATCH = 0;
const SOME_MATCH = 1;
const ALL_MATCH = 2;

export class DominanceIndex {
  readonly dimensions: number;
  /** Number of slots in use (live and dead). */
  slotCount = 0;
  /** Number of live points. */
  liveCount = 0;
  objectives = new Float64Array(0);
  dominatorCounts = new Int32Array(0);
  sampleIndices = new Float64Array(0);
  live = new Uint8Array(0);
  payloads: unknown[] = [];

  private capacity = 0;
  private treeSize = 0;
  private deadInTree = 0;
  private nodeCount = 0;
  private nodeStart = new Int32Array(0);
  private nodeEnd = new Int32Array(0);
  private nodeLeft = new Int32Array(0);
  private nodeLive = new Int32Array(0);
  private nodeMin = new Float64Array(0);
  private nodeMax = new Float64Array(0);
  private nodeParent = new Int32Array(0);
  private nodeSplitObjective = new Int32Array(0);
  private nodeSplitValue = new Float64Array(0);
  /** Per leaf: first slot of its overflow list (−1 none); per slot: the next one, and the slot's leaf. */
  private leafOverflow = new Int32Array(0);
  private nextOverflow = new Int32Array(0);
  private leafOf = new Int32Array(0);
  private insertedSinceRebuild = 0;
  private stack = new Int32Array(256);

  constructor(dimensions: number) {
    this.dimensions = dimensions;
  }

  /** Does the stored point in `slot` dominate p (minimisation)? */
  private slotDominates(slot: number, point: ArrayLike<number>): boolean {
    return dominatesAt(this.objectives, slot * this.dimensions, point, 0, this.dimensions);
  }

  /** Does p dominate the stored point in `slot`? */
  private dominatesSlot(point: ArrayLike<number>, slot: number): boolean {
    return dominatesAt(point, 0, this.objectives, slot * this.dimensions, this.dimensions);
  }

  /**
   * Number of live points dominating p, counted up to `limit` (the result is min(true count, ≥ limit):
   * once it reaches `limit` the search stops).
   */
  countDominators(point: ArrayLike<number>, limit: number): number {
    return this.walk(point, true, limit, undefined);
  }

  /** Calls visit(slot) for every live point that p dominates (visit may remove that slot). */
  forEachDominated(point: ArrayLike<number>, visit: (slot: number) => void): void {
    this.walk(point, false, Infinity, visit);
  }

  /**
   * What node's box can hold: NO_MATCH, SOME_MATCH, or (seeking dominators only) ALL_MATCH, when the box lies
   * wholly in p's dominating region (every maximum ≤ p, one strictly below). Seeking dominators, a box with
   * some minimum above p holds none; seeking dominated points, a box with some maximum below p holds none.
   */
  private boxHolds(node: number, point: ArrayLike<number>, seekDominators: boolean): number {
    const m = this.dimensions;
    const base = node * m;
    if (!seekDominators) {
      for (let j = 0; j < m; j++) if (this.nodeMax[base + j] < point[j]) return NO_MATCH;
      return SOME_MATCH;
    }
    let inside = true;
    let strictly = false;
    for (let j = 0; j < m; j++) {
      const p = point[j];
      if (this.nodeMin[base + j] > p) return NO_MATCH;
      const high = this.nodeMax[base + j];
      if (high > p) inside = false;
      else if (high < p) strictly = true;
    }
    return inside && strictly ? ALL_MATCH : SOME_MATCH;
  }

  /**
   * Counts, from `count` up to `limit`, the live points in slots [start, end) and on the overflow list from
   * `overflow` that dominate p (seekDominators) or that p dominates, passing the latter to `visit`. The mode
   * is chosen once per leaf: the slot loops stay as tight as two separate walks would have them.
   */
  private scanSlots(
    point: ArrayLike<number>,
    seekDominators: boolean,
    start: number,
    end: number,
    overflow: number,
    count: number,
    limit: number,
    visit: ((slot: number) => void) | undefined,
  ): number {
    const live = this.live;
    if (seekDominators) {
      for (let slot = start; slot < end; slot++) {
        if (live[slot] === 1 && this.slotDominates(slot, point) && ++count >= limit) return count;
      }
      for (let slot = overflow; slot >= 0; slot = this.nextOverflow[slot]) {
        if (live[slot] === 1 && this.slotDominates(slot, point) && ++count >= limit) return count;
      }
      return count;
    }
    for (let slot = start; slot < end; slot++) {
      if (live[slot] === 1 && this.dominatesSlot(point, slot)) {
        visit?.(slot);
        if (++count >= limit) return count;
      }
    }
    for (let slot = overflow; slot >= 0; slot = this.nextOverflow[slot]) {
      if (live[slot] === 1 && this.dominatesSlot(point, slot)) {
        visit?.(slot);
        if (++count >= limit) return count;
      }
    }
    return count;
  }

  /**
   * The traversal behind both queries: the live points that dominate p (seekDominators) or that p dominates,
   * counted up to `limit`, each passed to `visit` when one is given (a whole node is counted, never visited:
   * that happens only when seeking dominators, which passes no visit). Returns the count.
   */
  private walk(
    point: ArrayLike<number>,
    seekDominators: boolean,
    limit: number,
    visit: ((slot: number) => void) | undefined,
  ): number {
    let count = 0;
    if (this.nodeCount > 0) {
      const stack = this.stack;
      let top = 0;
      stack[top++] = 0;
      while (top > 0) {
        const node = stack[--top];
        if (this.nodeLive[node] === 0) continue;
        const holds = this.boxHolds(node, point, seekDominators);
        if (holds === NO_MATCH) continue;
        if (holds === ALL_MATCH) {
          count += this.nodeLive[node];
          if (count >= limit) return count;
          continue;
        }
        const left = this.nodeLeft[node];
        if (left >= 0) {
          // The half taken first is pushed last: dominators lie more in the lower half, dominated points in the upper.
          stack[top++] = seekDominators ? left + 1 : left;
          stack[top++] = seekDominators ? left : left + 1;
          continue;
        }
        // A leaf: it ends the walk only when one of its points took the count to the limit.
        const before = count;
        count = this.scanSlots(
          point,
          seekDominators,
          this.nodeStart[node],
          this.nodeEnd[node],
          this.leafOverflow[node],
          count,
          limit,
          visit,
        );
        if (count !== before && count >= limit) return count;
      }
    }
    // Before the first tree: a plain scan.
    const from = this.nodeCount > 0 ? this.slotCount : 0;
    return this.scanSlots(point, seekDominators, from, this.slotCount, -1, count, limit, visit);
  }

  /** Stores a point; may rebuild the tree (slots move: callers must not hold slot numbers across it). */
  insert(point: ArrayLike<number>, dominators: number, index: number, payload: unknown): void {
    const m = this.dimensions;
    if (this.slotCount === this.capacity) this.reserve(Math.max(64, this.capacity * 2));
    const slot = this.slotCount++;
    for (let j = 0; j < m; j++) this.objectives[slot * m + j] = point[j];
    this.dominatorCounts[slot] = dominators;
    this.sampleIndices[slot] = index;
    this.live[slot] = 1;
    this.payloads[slot] = payload;
    this.liveCount++;
    if (this.nodeCount === 0) {
      if (this.slotCount > 64) this.rebuild();
      return;
    }
    // Walk down by the split values, widening the boxes on the way; join the leaf's overflow list.
    let node = 0;
    for (;;) {
      const base = node * m;
      for (let j = 0; j < m; j++) {
        const value = point[j];
        if (value < this.nodeMin[base + j]) this.nodeMin[base + j] = value;
        if (value > this.nodeMax[base + j]) this.nodeMax[base + j] = value;
      }
      this.nodeLive[node]++;
      const left = this.nodeLeft[node];
      if (left < 0) break;
      node = point[this.nodeSplitObjective[node]] < this.nodeSplitValue[node] ? left : left + 1;
    }
    this.nextOverflow[slot] = this.leafOverflow[node];
    this.leafOverflow[node] = slot;
    this.leafOf[slot] = node;
    this.insertedSinceRebuild++;
    if (this.insertedSinceRebuild > Math.max(64, this.treeSize) || this.deadInTree * 2 > this.treeSize + 64)
      this.rebuild();
  }

  /** Removes the point in `slot`. */
  remove(slot: number): void {
    if (this.live[slot] === 0) return;
    this.live[slot] = 0;
    this.payloads[slot] = undefined;
    this.liveCount--;
    if (this.nodeCount > 0) {
      this.deadInTree++;
      for (let node = this.leafOf[slot]; node >= 0; node = this.nodeParent[node]) this.nodeLive[node]--;
    }
  }

  private reserve(capacity: number): void {
    const m = this.dimensions;
    const objectives = new Float64Array(capacity * m);
    objectives.set(this.objectives.subarray(0, this.slotCount * m));
    const counts = new Int32Array(capacity);
    counts.set(this.dominatorCounts.subarray(0, this.slotCount));
    const indices = new Float64Array(capacity);
    indices.set(this.sampleIndices.subarray(0, this.slotCount));
    const live = new Uint8Array(capacity);
    live.set(this.live.subarray(0, this.slotCount));
    const nextOverflow = new Int32Array(capacity);
    nextOverflow.set(this.nextOverflow.subarray(0, this.slotCount));
    const leafOf = new Int32Array(capacity);
    leafOf.set(this.leafOf.subarray(0, this.slotCount));
    this.objectives = objectives;
    this.dominatorCounts = counts;
    this.sampleIndices = indices;
    this.live = live;
    this.nextOverflow = nextOverflow;
    this.leafOf = leafOf;
    this.capacity = capacity;
  }

  /** Compacts the live points and rebuilds the tree over all of them. */
  rebuild(): void {
    const m = this.dimensions;
    const order = new Int32Array(this.liveCount);
    let n = 0;
    for (let slot = 0; slot < this.slotCount; slot++) if (this.live[slot] === 1) order[n++] = slot;
    // Median splits of nodes above LEAF_SIZE leave leaves of at least LEAF_SIZE/2 points: < n/4 + 2 nodes.
    const maxNodes = Math.ceil(n / 4) + 8;
    this.nodeStart = new Int32Array(maxNodes);
    this.nodeEnd = new Int32Array(maxNodes);
    this.nodeLeft = new Int32Array(maxNodes);
    this.nodeLive = new Int32Array(maxNodes);
    this.nodeMin = new Float64Array(maxNodes * m);
    this.nodeMax = new Float64Array(maxNodes * m);
    this.nodeParent = new Int32Array(maxNodes);
    this.nodeSplitObjective = new Int32Array(maxNodes);
    this.nodeSplitValue = new Float64Array(maxNodes);
    this.leafOverflow = new Int32Array(maxNodes).fill(-1);
    const capacity = Math.max(64, this.capacity);
    this.leafOf = new Int32Array(capacity);
    this.nextOverflow = new Int32Array(capacity).fill(-1);
    this.nodeCount = 0;
    if (n > 0) {
      this.nodeParent[0] = -1;
      this.nodeCount = 1;
      this.buildNode(0, order, 0, n);
    }
    // Move the data into tree order.
    const objectives = new Float64Array(capacity * m);
    const counts = new Int32Array(capacity);
    const indices = new Float64Array(capacity);
    const live = new Uint8Array(capacity);
    const payloads: unknown[] = new Array(n);
    for (let i = 0; i < n; i++) {
      const slot = order[i];
      objectives.set(this.objectives.subarray(slot * m, slot * m + m), i * m);
      counts[i] = this.dominatorCounts[slot];
      indices[i] = this.sampleIndices[slot];
      live[i] = 1;
      payloads[i] = this.payloads[slot];
    }
    this.objectives = objectives;
    this.dominatorCounts = counts;
    this.sampleIndices = indices;
    this.live = live;
    this.payloads = payloads;
    this.capacity = capacity;
    this.slotCount = n;
    this.treeSize = n;
    this.deadInTree = 0;
    this.insertedSinceRebuild = 0;
  }

  /** Fills node `node` over order[start, end) (positions in the future tree order), children recursively. */
  private buildNode(node: number, order: Int32Array, start: number, end: number): void {
    const m = this.dimensions;
    this.nodeStart[node] = start;
    this.nodeEnd[node] = end;
    this.nodeLive[node] = end - start;
    const base = node * m;
    let widest = 0;
    let widestExtent = -1;
    for (let j = 0; j < m; j++) {
      let low = Infinity;
      let high = -Infinity;
      for (let i = start; i < end; i++) {
        const value = this.objectives[order[i] * m + j];
        if (value < low) low = value;
        if (value > high) high = value;
      }
      this.nodeMin[base + j] = low;
      this.nodeMax[base + j] = high;
      if (high - low > widestExtent) {
        widestExtent = high - low;
        widest = j;
      }
    }
    if (end - start <= LEAF_SIZE || !(widestExtent > 0)) {
      this.nodeLeft[node] = -1;
      for (let i = start; i < end; i++) this.leafOf[i] = node;
      return;
    }
    const middle = (start + end) >>> 1;
    this.selectByObjective(order, start, end, middle, widest);
    this.nodeSplitObjective[node] = widest;
    this.nodeSplitValue[node] = this.objectives[order[middle] * m + widest];
    // Children are a consecutive pair: the right child is left + 1.
    const left = this.nodeCount;
    this.nodeCount += 2;
    this.nodeLeft[node] = left;
    this.nodeParent[left] = node;
    this.nodeParent[left + 1] = node;
    this.buildNode(left, order, start, middle);
    this.buildNode(left + 1, order, middle, end);
  }

  /** Hoare's selection (CACM 4(7), 1961, "FIND"): order[k] gets the k-th value, smaller before, larger after. */
  private selectByObjective(order: Int32Array, start: number, end: number, k: number, objective: number): void {
    const m = this.dimensions;
    const values = this.objectives;
    let left = start;
    let right = end - 1;
    while (right > left) {
      const pivot = values[order[(left + right) >>> 1] * m + objective];
      let i = left;
      let j = right;
      while (i <= j) {
        while (values[order[i] * m + objective] < pivot) i++;
        while (values[order[j] * m + objective] > pivot) j--;
        if (i <= j) {
          const swap = order[i];
          order[i] = order[j];
          order[j] = swap;
          i++;
          j--;
        }
      }
      if (k <= j) right = j;
      else if (k >= i) left = i;
      else break;
    }
  }
}
