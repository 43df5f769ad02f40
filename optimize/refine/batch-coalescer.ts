import { refineRangeError } from './refine-errors.ts';

/**
 * Gathers the batch calls that many concurrent callers make in the same turn of the event loop
 * into one call of the underlying batch function (split into chunks of at most `maxBatchSize`),
 * and hands each caller its own slice of the answer. With many refinement starts awaiting the
 * same pool, every start's next step is asked in the same turn after a batch comes back, so the
 * pool sees one large batch per round instead of one small batch per start (piscina: tasks must be
 * large enough that sending them costs little).
 *
 * Flushes on `setImmediate`, after all pending promise callbacks have run.
 *
 * @example
 * const shared = coalesceBatches(async (points) => pool.run(points), { maxBatchSize: 512 });
 * await Promise.all(starts.map((start) => refineStart(start, shared, ...)));
 */
export function coalesceBatches<P, R>(
  evaluateBatch: (items: P[]) => Promise<ReadonlyArray<R>>,
  options: { maxBatchSize?: number } = {},
): (items: P[]) => Promise<R[]> {
  const maxBatchSize = options.maxBatchSize ?? Infinity;
  if (!(maxBatchSize >= 1)) throw refineRangeError('coalesceBatches', 'maxBatchSize >= 1', maxBatchSize);
  let queue: Array<{ items: P[]; resolve: (values: R[]) => void; reject: (error: unknown) => void }> = [];
  let scheduled = false;

  const flush = (): void => {
    scheduled = false;
    const callers = queue;
    queue = [];
    const all = callers.flatMap((caller) => caller.items);
    const chunks: P[][] = [];
    for (let start = 0; start < all.length; start += Number.isFinite(maxBatchSize) ? maxBatchSize : all.length) {
      chunks.push(all.slice(start, start + (Number.isFinite(maxBatchSize) ? maxBatchSize : all.length)));
    }
    Promise.all(chunks.map((chunk) => evaluateBatch(chunk)))
      .then((answers) => {
        const values = answers.flatMap((answer, index) => {
          if (answer.length !== chunks[index].length) {
            throw refineRangeError(
              'a coalesced batch function',
              `one value per item (${chunks[index].length})`,
              answer.length,
            );
          }
          return Array.from(answer);
        });
        let offset = 0;
        for (const caller of callers) {
          caller.resolve(values.slice(offset, offset + caller.items.length));
          offset += caller.items.length;
        }
      })
      .catch((error: unknown) => {
        for (const caller of callers) caller.reject(error);
      });
  };

  return (items: P[]) => {
    if (items.length === 0) return Promise.resolve([]);
    return new Promise<R[]>((resolve, reject) => {
      queue.push({ items, resolve, reject });
      if (!scheduled) {
        scheduled = true;
        setImmediate(flush);
      }
    });
  };
}
