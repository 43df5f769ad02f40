/**
 * The files a sweep leaves for the morning: candidates.csv (the ranked top K feasible designs),
 * infeasible.csv (the K closest misses, with their reasons), front.csv (the whole non-dominated
 * feasible set), front.svg (the trade-offs drawn), summary.json (identity, counts, constraint rejections, hypervolume,
 * metric quantiles, parameter sensitivities, timing). Written atomically, so a reader never sees half
 * a file, and from the order-independent state alone, so they are byte-identical however the run went.
 */
import { join } from 'node:path';
import { quantileSorted, sampleRankCorrelation } from 'simple-statistics';
import { METRIC_KEYS } from '../core/metrics.ts';
import type { Dimension } from '../optimize/design-tree.ts';
import { defaultReferencePoint, hypervolume } from '../optimize/pareto/hypervolume.ts';
import type { CandidatePool, RankedEntry } from '../optimize/pareto/candidate-pool.ts';
import { type SweepState, sortedCounts } from '../optimize/sweep-state.ts';
import { unpackRow, type PackedRow } from '../optimize/packed-row.ts';
import { csvChunks, DEFAULT_DIGITS, type Cell } from '../run/csv.ts';
import { writeChunksAtomicSync, writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { candidateCells, columnSet } from './sweep-columns.ts';
import { frontPlotSvg } from './plots.ts';
import { SAFETY_LINE } from './safety.ts';
import type { SweepSpec } from './sweep-spec.ts';
import { quantileSlotEntries } from './quantile-merits.ts';

export interface RunIdentity {
  specHash: string;
  seed: number;
  method: string;
  /** Samples of the whole sweep (all shards). */
  samples: number;
  /** The index range this run covers. */
  range: [number, number];
  shard: { index: number; count: number } | null;
  keep: number;
  /** Significant digits of CSV numbers (DEFAULT_DIGITS when absent). */
  digits?: number;
}

export interface Timing {
  wallSeconds: number;
  designsPerSecond: number;
  workers: number;
}

const QUANTILES = [0, 0.05, 0.25, 0.5, 0.75, 0.95, 1];

/** Rows of a ranked list in CSV cells. */
export function rankedRows(
  dimensions: readonly Dimension[],
  ranked: readonly RankedEntry<PackedRow>[],
  numbering?: ReadonlyMap<number, { rank: number; crowding: number }>,
): Cell[][] {
  return [...rankedRowsOneByOne(dimensions, ranked, numbering)];
}

/** The same rows made one at a time, as they are read (for csvChunks: no table of cells in memory). */
export function* rankedRowsOneByOne(
  dimensions: readonly Dimension[],
  ranked: readonly RankedEntry<PackedRow>[],
  numbering?: ReadonlyMap<number, { rank: number; crowding: number }>,
): Generator<Cell[]> {
  for (let position = 0; position < ranked.length; position++) {
    const entry = ranked[position];
    // With a numbering (front.csv), a design carries its rank and crowding from candidates.csv.
    const known = numbering?.get(entry.item.index);
    yield candidateCells(
      dimensions,
      {
        rank: numbering ? (known?.rank ?? null) : position + 1,
        paretoRank: entry.item.violation === 0 ? entry.paretoRank : null,
        crowding: entry.item.violation === 0 ? (numbering ? (known?.crowding ?? null) : entry.crowding) : null,
        feasible: entry.item.violation === 0,
        violation: entry.item.violation,
        index: entry.item.index,
      },
      unpackRow(entry.payload),
    );
  }
}

/** Each candidates.csv design by its sample index: its rank there and its crowding distance. */
export function candidateNumbering(
  ranked: readonly RankedEntry<PackedRow>[],
): Map<number, { rank: number; crowding: number }> {
  return new Map(ranked.map((entry, position) => [entry.item.index, { rank: position + 1, crowding: entry.crowding }]));
}

/** The front in a stable order for plotting: by the first objective, then the others, then index. */
export function sortedFront(pool: CandidatePool<PackedRow>): RankedEntry<PackedRow>[] {
  const front = pool.front().map((entry) => ({ ...entry, paretoRank: 1, crowding: 0 }));
  front.sort((a, b) => {
    for (let j = 0; j < a.item.objectives.length; j++) {
      const difference = a.item.objectives[j] - b.item.objectives[j];
      if (difference !== 0) return difference;
    }
    return a.item.index - b.item.index;
  });
  return front;
}

/** Each front entry's rank in the ranked list (candidates.csv), by sample index; null if not listed. */
export function frontRanks(
  ranked: readonly RankedEntry<PackedRow>[],
  front: readonly RankedEntry<PackedRow>[],
): Array<number | null> {
  const rankOf = new Map(ranked.map((entry, position) => [entry.item.index, position + 1]));
  return front.map((entry) => rankOf.get(entry.item.index) ?? null);
}

/** Hypervolume of the front, minimisation convention, with its reference point (spec or default). */
export function frontHypervolume(
  front: readonly { item: { objectives: Float64Array } }[],
  reference: readonly number[] | null,
): { value: number; reference_point: number[] } | null {
  if (front.length === 0 && !reference) return null;
  const points = front.map((entry) => entry.item.objectives);
  const point = reference ? Float64Array.from(reference) : defaultReferencePoint(points);
  return { value: points.length === 0 ? 0 : hypervolume(points, point), reference_point: Array.from(point) };
}

function summaryStatistics(
  spec: SweepSpec,
  state: SweepState,
): { quantiles: Record<string, Record<string, number>>; sensitivities: Record<string, Record<string, number | null>> } {
  const items = state.sample.items();
  const dimensionCount = spec.dimensions.length;
  const quantiles: Record<string, Record<string, number>> = {};
  METRIC_KEYS.forEach((key, m) => {
    const values = items
      .map((item) => item.payload[dimensionCount + m])
      .filter((v) => Number.isFinite(v))
      .sort((a, b) => a - b);
    if (values.length === 0) return;
    const entry: Record<string, number> = {};
    for (const q of QUANTILES) entry[`q${String(Math.round(q * 100)).padStart(2, '0')}`] = quantileSorted(values, q);
    quantiles[key] = entry;
  });
  const sensitivities: Record<string, Record<string, number | null>> = {};
  spec.dimensions.forEach((dimension, d) => {
    const row: Record<string, number | null> = {};
    for (const objective of spec.objectives) {
      const column = dimensionCount + METRIC_KEYS.indexOf(objective.metric);
      const pairs = items
        .map((item) => [item.payload[d], item.payload[column]])
        .filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y));
      let rho: number | null = null;
      if (pairs.length >= 3) {
        const value = sampleRankCorrelation(
          pairs.map((p) => p[0]),
          pairs.map((p) => p[1]),
        );
        rho = Number.isFinite(value) ? value : null;
      }
      row[objective.metric] = rho;
    }
    sensitivities[dimension.path.join('.')] = row;
  });
  return { quantiles, sensitivities };
}

/** The summary.json object (timing under "timing", the only part that differs between equal runs). */
export function summaryObject(
  spec: SweepSpec,
  state: SweepState,
  identity: RunIdentity,
  timing: Timing,
  complete: boolean,
  front: readonly RankedEntry<PackedRow>[] = sortedFront(state.pool),
): Record<string, unknown> {
  const { quantiles, sensitivities } = summaryStatistics(spec, state);
  return {
    format: 'coilfront-summary',
    // Version 2 adds build_quantiles (what each build_quantile_k column holds); nothing else changed.
    version: 2,
    complete,
    spec_hash: identity.specHash,
    seed: identity.seed,
    method: identity.method,
    samples: identity.samples,
    range: identity.range,
    shard: identity.shard,
    keep: identity.keep,
    counts: { ...state.counts },
    constraints: spec.constraints.map((constraint, c) => ({ ...constraint, rejected: state.rejectedBy[c] })),
    impossible_by: sortedCounts(state.impossibleBy),
    objectives: spec.objectives,
    front_size: front.length,
    hypervolume: frontHypervolume(front, spec.referencePoint),
    sample_size: state.sample.size,
    quantiles,
    sensitivities,
    build_quantiles: quantileSlotEntries(spec.robust?.quantiles),
    timing: { wall_seconds: timing.wallSeconds, designs_per_second: timing.designsPerSecond, workers: timing.workers },
    units:
      'SI base units (H, F, Hz, V, m, kg, ohm, V/m); hypervolume in the minimisation convention, maximised objectives negated',
    safety: SAFETY_LINE,
  };
}

/** What the output files list: the ranked feasible top K, the K closest misses, the front. */
export function outputEntries(
  state: SweepState,
  keep: number,
): {
  ranked: RankedEntry<PackedRow>[];
  misses: RankedEntry<PackedRow>[];
  front: RankedEntry<PackedRow>[];
} {
  // candidates.csv holds feasible designs only; the closest misses go to infeasible.csv.
  const ranked = state.pool.ranked(keep).filter((entry) => entry.item.violation === 0);
  const misses = state.pool
    .infeasibleEntries()
    .sort((a, b) => a.item.violation - b.item.violation || a.item.index - b.item.index)
    .slice(0, keep)
    .map((entry) => ({ ...entry, paretoRank: 0, crowding: 0 }));
  return { ranked, misses, front: sortedFront(state.pool) };
}

/** Writes candidates.csv, infeasible.csv, front.csv and summary.json into `directory`. */
export async function writeSweepOutputs(
  directory: string,
  spec: SweepSpec,
  state: SweepState,
  identity: RunIdentity,
  timing: Timing,
  complete: boolean,
): Promise<void> {
  const columns = columnSet(spec.dimensions);
  const { ranked, misses, front } = outputEntries(state, identity.keep);
  const digits = identity.digits ?? DEFAULT_DIGITS;
  // Written chunk by chunk: a table of a thousand rows built whole was the run's peak of memory.
  const csv = (entries: readonly RankedEntry<PackedRow>[], numbering?: ReturnType<typeof candidateNumbering>) =>
    csvChunks(columns.header, rankedRowsOneByOne(spec.dimensions, entries, numbering), digits);
  writeChunksAtomicSync(join(directory, 'candidates.csv'), csv(ranked));
  writeChunksAtomicSync(join(directory, 'infeasible.csv'), csv(misses));
  writeChunksAtomicSync(join(directory, 'front.csv'), csv(front, candidateNumbering(ranked)));
  writeFileAtomicSync(
    join(directory, 'summary.json'),
    `${JSON.stringify(summaryObject(spec, state, identity, timing, complete, front), null, 2)}\n`,
  );
  const svg = await frontPlotSvg(
    spec.objectives,
    ranked.map((entry) => unpackRow(entry.payload)),
    front.map((entry) => unpackRow(entry.payload)),
    { ranks: frontRanks(ranked, front) },
  );
  writeFileAtomicSync(join(directory, 'front.svg'), svg);
}
