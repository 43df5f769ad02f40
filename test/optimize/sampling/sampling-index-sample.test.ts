import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { IndexSample } from '../../../optimize/sampling/index-sample.ts';
import { uniformAt } from '../../../optimize/random.ts';

function shuffled<T>(values: T[], seed: number): T[] {
  const copy = values.slice();
  for (let i = copy.length - 1; i > 0; i--) {
    const j = Math.floor(uniformAt(seed, i, 77) * (i + 1));
    [copy[i], copy[j]] = [copy[j], copy[i]];
  }
  return copy;
}

describe('IndexSample', () => {
  it('keeps everything, in index order, while at most capacity items were offered', () => {
    const sample = new IndexSample<string>(5, 1);
    for (const i of [9, 3, 7]) sample.offer(i, `row ${i}`);
    expect(sample.items()).toEqual([
      { index: 3, payload: 'row 3' },
      { index: 7, payload: 'row 7' },
      { index: 9, payload: 'row 9' },
    ]);
    expect(sample.offered).toBe(3);
  });

  it('is empty before any offer, and with capacity 0 keeps nothing', () => {
    expect(new IndexSample<number>(10, 0).items()).toEqual([]);
    const none = new IndexSample<number>(0, 0);
    none.offer(1, 1);
    expect(none.size).toBe(0);
  });

  it('keeps the capacity items with the smallest hash keys, whatever the arrival order (brute force)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 400 }),
        fc.integer({ min: 1, max: 50 }),
        fc.integer({ min: 0, max: 1000 }),
        (count, capacity, seed) => {
          const indices = Array.from({ length: count }, (_, i) => i * 3 + 1);
          const expected = indices
            .map((index) => ({ index, key: uniformAt(seed, index, 0x5a3e) }))
            .sort((a, b) => a.key - b.key || a.index - b.index)
            .slice(0, capacity)
            .map((e) => e.index)
            .sort((a, b) => a - b);
          const sample = new IndexSample<number>(capacity, seed);
          for (const index of shuffled(indices, seed + 1)) sample.offer(index, index);
          expect(sample.items().map((e) => e.index)).toEqual(expected);
        },
      ),
      { numRuns: 50, seed: 7 },
    );
  });

  it('merge of two shards equals the sample of the whole stream; restore(toJSON()) round-trips through JSON', () => {
    const whole = new IndexSample<number>(100, 9);
    const first = new IndexSample<number>(100, 9);
    const second = new IndexSample<number>(100, 9);
    for (let i = 0; i < 5000; i++) {
      whole.offer(i, i * 2);
      (i % 3 === 0 ? first : second).offer(i, i * 2);
    }
    first.merge(second);
    expect(first.items()).toEqual(whole.items());
    expect(first.offered).toBe(5000);
    const restored = IndexSample.restore<number>(JSON.parse(JSON.stringify(whole)));
    expect(restored.items()).toEqual(whole.items());
    expect(restored.offered).toBe(5000);
  });

  it('is a roughly uniform subsample: 1000 of 10^5 indices have mean index near 5·10^4 (common practice: within 4 standard errors)', () => {
    const sample = new IndexSample<null>(1000, 3);
    for (let i = 0; i < 100_000; i++) sample.offer(i, null);
    const mean = sample.items().reduce((s, e) => s + e.index, 0) / 1000;
    expect(Math.abs(mean - 49_999.5)).toBeLessThan((4 * (100_000 / Math.sqrt(12))) / Math.sqrt(1000));
  });

  it('merge rejects samples with another seed or capacity; restore rejects foreign data', () => {
    expect(() => new IndexSample(10, 1).merge(new IndexSample(10, 2))).toThrow(RangeError);
    expect(() => IndexSample.restore({ kind: 'other', version: 1 } as never)).toThrow(RangeError);
  });
});
