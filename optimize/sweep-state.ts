/**
 * What the main thread keeps of a sweep while it runs: the counts, how many designs each constraint
 * rejected, the exact bounded store of the best candidates (CandidatePool: top-K and the whole
 * non-dominated feasible set), and a uniform sample of feasible designs for the summary statistics.
 *
 * Everything here is a function of the *set* of evaluated designs, never of the order in which batches
 * came back: the same sweep gives the same state with 1 or 16 workers, after a resume, or merged from
 * cluster shards. Memory is bounded by `keep` and the sample size, not by the number of samples.
 */
import { METRIC_KEYS, metricIndex } from '../core/metrics.ts';
import { STATUS_FAILED, STATUS_OK, STATUS_PROBLEM, type BatchResult } from './evaluate-batch.ts';
import { CandidatePool, type CandidatePoolData } from './pareto/candidate-pool.ts';
import { totalViolation } from './pareto/constraint-violation.ts';
import { IndexSample, type IndexSampleData } from './sampling/index-sample.ts';
import { type CandidateRow, PackedRow, packRow, type PackedRowData } from './packed-row.ts';

export type { CandidateRow };
import { must } from '../core/must.ts';

/** One objective of a sweep. */
export interface ObjectiveDefinition {
  /** The metric's key. */
  metric: string;
  /** Whether smaller or larger is better. */
  sense: 'minimize' | 'maximize';
}

export interface ConstraintDefinition {
  metric: string;
  min?: number;
  max?: number;
}

/** Violation given to designs that could not be built (after every evaluated infeasible design). */
export const PROBLEM_VIOLATION = 1e9;
/** Violation given to designs whose evaluation failed (last of all). */
export const FAILED_VIOLATION = 2e9;

/** How many designs a sweep evaluated, by outcome. */
export interface SweepCounts {
  /** Every design evaluated. */
  evaluated: number;
  /** Meeting every constraint. */
  feasible: number;
  /** Evaluated, but violating at least one constraint (or lacking an objective). */
  infeasible: number;
  /** Could not be built as given (impossible geometry): infeasible with a reason. */
  impossible: number;
  /** The evaluation threw, gave a non-finite metric, or its worker died twice: infeasible with a reason. */
  failed: number;
}

export interface SweepStateData {
  kind: 'coilfront-sweep-state';
  version: 1;
  counts: SweepCounts;
  rejectedBy: number[];
  /** Designs that could not be built, counted by the kind of their reason (absent in older files). */
  impossibleBy?: Record<string, number>;
  pool: CandidatePoolData<PackedRowData>;
  sample: IndexSampleData<number[]>;
}

/** Size of the feasible sample behind summary quantiles and rank correlations. */
export const SUMMARY_SAMPLE_SIZE = 10_000;

export class SweepState {
  counts: SweepCounts = { evaluated: 0, feasible: 0, infeasible: 0, impossible: 0, failed: 0 };
  rejectedBy: number[];
  /** Designs that could not be built, by the kind of their reason (reasonKind). */
  impossibleBy: Record<string, number>;
  /** The candidates, each with its packed row (built only for the ones kept). */
  pool: CandidatePool<PackedRow>;
  /** Feasible designs: dimension values followed by metrics (NaN as null). */
  sample: IndexSample<number[]>;
  private readonly constraintColumns: number[];
  private readonly objectiveColumns: number[];

  constructor(
    readonly objectives: readonly ObjectiveDefinition[],
    readonly constraints: readonly ConstraintDefinition[],
    readonly keep: number,
    readonly seed: number,
  ) {
    this.rejectedBy = constraints.map(() => 0);
    this.impossibleBy = {};
    this.pool = new CandidatePool<PackedRow>(keep, objectives.length);
    this.sample = new IndexSample<number[]>(SUMMARY_SAMPLE_SIZE, seed);
    this.constraintColumns = constraints.map((c) => metricIndex(c.metric));
    this.objectiveColumns = objectives.map((o) => metricIndex(o.metric));
  }

  /** Objective vector of a metrics row in the minimisation convention, or null if one is missing. */
  objectiveVector(metrics: ArrayLike<number>, offset = 0): Float64Array | null {
    const vector = new Float64Array(this.objectives.length);
    for (let j = 0; j < this.objectives.length; j++) {
      const value = metrics[offset + this.objectiveColumns[j]];
      if (!Number.isFinite(value)) return null;
      vector[j] = this.objectives[j].sense === 'maximize' ? -value : value;
    }
    return vector;
  }

  /** Constraint violation of a metrics row (Deb 2000; missing constrained metric counts 1). */
  violationOf(metrics: ArrayLike<number>, offset = 0): number {
    const values = this.constraintColumns.map((column) => metrics[offset + column]);
    return totalViolation(values, this.constraints);
  }

  /**
   * How one result row ranks: its violation (0 feasible; PROBLEM_VIOLATION or FAILED_VIOLATION when
   * it could not be built or evaluated), its objective vector (minimisation convention, null when not
   * evaluated) and the reason it is infeasible. Also counts it, when `count` is set.
   */
  classifyRow(
    result: BatchResult,
    row: number,
    count = false,
  ): { violation: number; objectives: Float64Array; reason: string | null } {
    const metricCount = METRIC_KEYS.length;
    const offset = row * metricCount;
    const status = result.status[row];
    if (count) this.counts.evaluated++;
    if (status !== STATUS_OK) {
      if (count) {
        if (status === STATUS_PROBLEM) this.counts.impossible++;
        else this.counts.failed++;
      }
      const reason = result.reasons.find(([r]) => r === row)?.[1] ?? 'not evaluated';
      if (count && status === STATUS_PROBLEM) {
        const kind = reasonKind(reason);
        this.impossibleBy[kind] = (this.impossibleBy[kind] ?? 0) + 1;
      }
      return {
        violation: status === STATUS_FAILED ? FAILED_VIOLATION : PROBLEM_VIOLATION,
        objectives: new Float64Array(this.objectives.length),
        reason,
      };
    }
    let violation = this.violationOf(result.metrics, offset);
    if (count) {
      for (let c = 0; c < this.constraints.length; c++)
        if (this.constraintMiss(result.metrics, offset, c) !== null) this.rejectedBy[c]++;
    }
    const objectives = this.objectiveVector(result.metrics, offset);
    let reason: string | null = null;
    if (objectives === null) {
      const missing = must(
        this.objectives.find((o) => !Number.isFinite(result.metrics[offset + metricIndex(o.metric)])),
      );
      reason = `objective ${missing.metric} is not available for this design`;
      violation += 1;
    } else if (violation > 0) {
      reason = this.describeViolation(result.metrics, offset);
    }
    if (count) {
      if (violation > 0) this.counts.infeasible++;
      else this.counts.feasible++;
    }
    return { violation, objectives: objectives ?? new Float64Array(this.objectives.length), reason };
  }

  /**
   * The stored row of one result row (dimension values, metrics with null, status, reason). Give the
   * reason when classifyRow already found it, so the row is not classified twice.
   */
  rowOf(
    result: BatchResult,
    row: number,
    dimensionCount: number,
    reason = this.classifyRow(result, row).reason,
  ): CandidateRow {
    const metricCount = METRIC_KEYS.length;
    const offset = row * metricCount;
    return {
      values: Array.from(result.values.subarray(row * dimensionCount, (row + 1) * dimensionCount)),
      metrics: Array.from(result.metrics.subarray(offset, offset + metricCount), (v) =>
        Number.isFinite(v) ? v : null,
      ),
      status: result.status[row],
      reason,
      warningMask: result.warningMasks[row],
    };
  }

  /** Takes in one batch of results: sample indices `start + row`. */
  offerBatch(result: BatchResult, dimensionCount: number): void {
    const metricCount = METRIC_KEYS.length;
    for (let row = 0; row < result.count; row++) {
      const index = result.start + row;
      const { violation, objectives, reason } = this.classifyRow(result, row, true);
      this.pool.offerWith({ index, violation, objectives }, () =>
        packRow(this.rowOf(result, row, dimensionCount, reason)),
      );
      if (violation === 0) {
        const offset = row * metricCount;
        const sampleRow: number[] = new Array(dimensionCount + metricCount);
        for (let d = 0; d < dimensionCount; d++) sampleRow[d] = result.values[row * dimensionCount + d];
        for (let m = 0; m < metricCount; m++) sampleRow[dimensionCount + m] = result.metrics[offset + m];
        this.sample.offer(index, sampleRow);
      }
    }
  }

  /** Which constraints a row violates, in words: 'resonant_frequency below its min; overall_height above its max'. */
  describeViolation(metrics: ArrayLike<number>, offset = 0): string {
    const parts: string[] = [];
    const words = { missing: 'not available', below: 'below its min', above: 'above its max' };
    for (let c = 0; c < this.constraints.length; c++) {
      const miss = this.constraintMiss(metrics, offset, c);
      if (miss !== null) parts.push(`${this.constraints[c].metric} ${words[miss]}`);
    }
    return parts.join('; ');
  }

  /** How a metrics row misses constraint c: its metric missing, below its min, above its max, or null. */
  private constraintMiss(metrics: ArrayLike<number>, offset: number, c: number): 'missing' | 'below' | 'above' | null {
    const value = metrics[offset + this.constraintColumns[c]];
    const { min, max } = this.constraints[c];
    if (!Number.isFinite(value)) return 'missing';
    if (min !== undefined && value < min) return 'below';
    if (max !== undefined && value > max) return 'above';
    return null;
  }

  /** Adds another state (another shard's): the result is the state of the union of their designs. */
  merge(other: SweepState): void {
    for (const key of Object.keys(this.counts) as Array<keyof SweepCounts>) this.counts[key] += other.counts[key];
    other.rejectedBy.forEach((n, c) => {
      this.rejectedBy[c] = (this.rejectedBy[c] ?? 0) + n;
    });
    for (const [kind, n] of Object.entries(other.impossibleBy))
      this.impossibleBy[kind] = (this.impossibleBy[kind] ?? 0) + n;
    this.pool.merge(other.pool);
    this.sample.merge(other.sample);
  }

  toJSON(): SweepStateData {
    return {
      kind: 'coilfront-sweep-state',
      version: 1,
      counts: { ...this.counts },
      rejectedBy: [...this.rejectedBy],
      impossibleBy: sortedCounts(this.impossibleBy),
      pool: this.pool.toJSON() as unknown as CandidatePoolData<PackedRowData>,
      // The sample's rows as they are (no JSON-safe copy): JSON text writes their NaN as null, as
      // restore expects; a copy of 10⁴ rows of every metric, made whole, was the run's peak of memory.
      sample: this.sample.toJSON(),
    };
  }

  static restore(
    data: SweepStateData,
    objectives: readonly ObjectiveDefinition[],
    constraints: readonly ConstraintDefinition[],
    keep: number,
    seed: number,
  ): SweepState {
    const state = new SweepState(objectives, constraints, keep, seed);
    state.counts = { ...data.counts };
    state.rejectedBy = [...data.rejectedBy];
    state.impossibleBy = { ...(data.impossibleBy ?? {}) };
    const revive = (records: CandidatePoolData<PackedRowData>['feasible']) =>
      records.map((record) => ({ ...record, payload: PackedRow.revive(record.payload) }));
    state.pool = CandidatePool.restore<PackedRow>({
      ...data.pool,
      feasible: revive(data.pool.feasible),
      infeasible: revive(data.pool.infeasible),
    });
    state.sample = IndexSample.restore({
      ...data.sample,
      items: data.sample.items.map((item) => ({
        index: item.index,
        payload: item.payload.map((v) => (v === null ? Number.NaN : v)),
      })),
    });
    return state;
  }
}

/**
 * The kind of a could-not-build reason, for counting: the field and the reason's words up to its
 * first number or quoted value ("primary.turns: primary cannot tune: needs 24 µH…" → "primary.turns:
 * primary cannot tune").
 */
export function reasonKind(reason: string): string {
  const colon = reason.indexOf(': ');
  const field = colon >= 0 ? reason.slice(0, colon) : '';
  const rest = colon >= 0 ? reason.slice(colon + 2) : reason;
  const cut = rest.search(/[:(;'"]|\d/);
  const words = (cut >= 0 ? rest.slice(0, cut) : rest).trim().replace(/[\s,]+$/, '');
  return field ? `${field}: ${words}` : words;
}

/** A count record with its keys in a fixed order (largest count first, then by key). */
export function sortedCounts(counts: Readonly<Record<string, number>>): Record<string, number> {
  const entries = Object.entries(counts).sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0));
  return Object.fromEntries(entries);
}
