import type { EvaluationCache } from './evaluation-cache.ts';
import type { Merit } from './merit.ts';
import { toMerit } from './merit.ts';
import { mixedPointKey } from './mixed-point.ts';
import type { MixedPoint } from './mixed-point.ts';

/** Scores a record returned by the evaluator (e.g. a Chebyshev merit of its objectives). */
export type MeritOf<R> = (record: R, point: MixedPoint) => Merit;

/**
 * One start's view of a shared EvaluationCache with its own evaluation budget: the budget counts
 * the distinct designs this start has asked for, whether or not another start already had them
 * evaluated, so a start's course and its count do not depend on what runs beside it.
 */
export class StartLedger<R> {
  private readonly cache: EvaluationCache<R>;
  private readonly meritOf: MeritOf<R>;
  private readonly asked = new Set<string>();
  readonly budget: number;

  constructor(cache: EvaluationCache<R>, meritOf: MeritOf<R>, budget: number) {
    this.cache = cache;
    this.meritOf = meritOf;
    this.budget = budget;
  }

  /** Distinct designs asked for so far (the start's evaluation count). */
  get used(): number {
    return this.asked.size;
  }

  /** Budget left. */
  get remaining(): number {
    return Math.max(0, this.budget - this.asked.size);
  }

  /** How many of these points would be new to this start (what they would cost). */
  cost(points: ReadonlyArray<MixedPoint>): number {
    const fresh = new Set<string>();
    for (const point of points) {
      const key = mixedPointKey(point);
      if (!this.asked.has(key)) fresh.add(key);
    }
    return fresh.size;
  }

  /** Merits of the points (through the cache), charging each new design once. */
  async merits(points: ReadonlyArray<MixedPoint>): Promise<Merit[]> {
    for (const point of points) this.asked.add(mixedPointKey(point));
    const records = await this.cache.evaluate(points);
    return records.map((record, index) => toMerit(this.meritOf(record, points[index])));
  }
}
