import { copyMixedPoint, mixedPointKey } from './mixed-point.ts';
import type { MixedBatchEvaluator, MixedPoint } from './mixed-point.ts';
import { refineRangeError } from './refine-errors.ts';

/** One design evaluated through the cache: the point and the record the evaluator returned. */
export interface CachedEvaluation<R> {
  point: MixedPoint;
  record: R;
}

/**
 * A cache in front of a batch evaluator, keyed by `mixedPointKey`, so no design is evaluated
 * twice: repeats inside one batch, repeats of earlier batches, and repeats of points still in
 * flight (asked by another start at the same time) are all answered from it. Shared by every start
 * of a refinement, it also holds every record evaluated, for merging into the front afterwards.
 *
 * A failed batch leaves its points out of the cache, so they can be asked again.
 */
export class EvaluationCache<R> {
  private readonly evaluator: MixedBatchEvaluator<R>;
  private readonly settled = new Map<string, CachedEvaluation<R>>();
  private readonly inFlight = new Map<string, Promise<R>>();
  private missCount = 0;
  private hitCount = 0;

  constructor(evaluator: MixedBatchEvaluator<R>) {
    this.evaluator = evaluator;
  }

  /** Points actually sent to the evaluator. */
  get evaluations(): number {
    return this.missCount;
  }

  /** Points answered from the cache (settled or in flight). */
  get hits(): number {
    return this.hitCount;
  }

  /** Number of distinct designs evaluated. */
  get size(): number {
    return this.settled.size;
  }

  /** True when the design has been evaluated (or is being evaluated). */
  has(point: MixedPoint): boolean {
    const key = mixedPointKey(point);
    return this.settled.has(key) || this.inFlight.has(key);
  }

  /** Every design evaluated so far, in the order they were first asked. */
  entries(): CachedEvaluation<R>[] {
    return Array.from(this.settled.values());
  }

  /** Records for the points, in order; only unseen designs go to the evaluator, in one batch. */
  async evaluate(points: ReadonlyArray<MixedPoint>): Promise<R[]> {
    const answers: Array<Promise<R> | number> = []; // a number is a position in this batch's misses
    const missKeys: string[] = [];
    const missPoints: MixedPoint[] = [];
    const missPosition = new Map<string, number>();
    for (const point of points) {
      const key = mixedPointKey(point);
      const done = this.settled.get(key);
      const pending = this.inFlight.get(key);
      const repeat = missPosition.get(key);
      if (done !== undefined) answers.push(Promise.resolve(done.record));
      else if (pending !== undefined) answers.push(pending);
      else if (repeat !== undefined) answers.push(repeat);
      else {
        missPosition.set(key, missKeys.length);
        answers.push(missKeys.length);
        missKeys.push(key);
        missPoints.push(copyMixedPoint(point));
        continue;
      }
      this.hitCount++;
    }
    let records: Promise<ReadonlyArray<R>> = Promise.resolve([]);
    if (missPoints.length > 0) {
      this.missCount += missPoints.length;
      records = Promise.resolve()
        .then(() => this.evaluator(missPoints.map(copyMixedPoint)))
        .then((values) => {
          if (values.length !== missPoints.length) {
            throw refineRangeError(
              'a mixed batch evaluator',
              `one record per point (${missPoints.length})`,
              values.length,
            );
          }
          missKeys.forEach((key, index) => {
            this.settled.set(key, { point: missPoints[index], record: values[index] });
            this.inFlight.delete(key);
          });
          return values;
        });
      records.catch(() => {
        for (const key of missKeys) this.inFlight.delete(key);
      });
      missKeys.forEach((key, index) => {
        const one = records.then((values) => values[index]);
        one.catch(() => undefined); // the rejection is reported to whoever awaits it
        this.inFlight.set(key, one);
      });
    }
    return Promise.all(
      answers.map((answer) => (typeof answer === 'number' ? records.then((values) => values[answer]) : answer)),
    );
  }
}
