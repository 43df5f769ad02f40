/**
 * What the stages after a sweep (`evolve`, `refine`) write and print alike: their improved designs
 * (distinct designs of the stage on the merged front, ids e1 … or r1 …), a design list file with exact
 * values (evolved.json, refined.json), front.csv and front.svg rewritten with the merged front,
 * a section of summary.json, and the console lines for the designs and the hypervolume.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { metricIndex } from '../core/metrics.ts';
import type { RankedEntry } from '../optimize/pareto/candidate-pool.ts';
import { type PackedRow, unpackRow } from '../optimize/packed-row.ts';
import { STATUS_OK } from '../optimize/evaluate-batch.ts';
import { type CandidateRow, SweepState } from '../optimize/sweep-state.ts';
import { toCsv } from '../run/csv.ts';
import { formatNumber } from './display-units.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { frontPlotSvg } from './plots.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { columnSet } from './sweep-columns.ts';
import type { SweepSpec } from './sweep-spec.ts';
import { rankedRows } from './sweep-outputs.ts';
import { metricText } from './top-candidates.ts';
import { fileError } from './input-errors.ts';

/** Designs closer than this fraction of the front's extent in every objective count as one. */
const DISTINCT_FRACTION = 0.01;

/**
 * The stage's designs on the merged front (pool index in [from, to)), distinct: in front order, a
 * design is kept unless a kept one lies within DISTINCT_FRACTION of the front's extent in every
 * objective (trials near a converged point would otherwise repeat one design many times).
 */
export function improvedDesigns(
  front: readonly RankedEntry<PackedRow>[],
  from: number,
  to = Number.POSITIVE_INFINITY,
): RankedEntry<PackedRow>[] {
  const objectiveCount = front[0]?.item.objectives.length ?? 0;
  const extent = Array.from({ length: objectiveCount }, (_, j) => {
    const values = front.map((entry) => entry.item.objectives[j] ?? 0);
    return Math.max(...values) - Math.min(...values) || 1;
  });
  const kept: RankedEntry<PackedRow>[] = [];
  for (const entry of front) {
    if (entry.item.index < from || entry.item.index >= to) continue;
    const near = kept.some((other) =>
      extent.every(
        (range, j) =>
          Math.abs((entry.item.objectives[j] ?? 0) - (other.item.objectives[j] ?? 0)) <= DISTINCT_FRACTION * range,
      ),
    );
    if (!near) kept.push(entry);
  }
  return kept;
}

/**
 * A stage design as its list file keeps it: rank, id, exact dimension values, metrics, warnings. The
 * stage's other designs on the merged front (near an improved one) follow with rank and id null, so a
 * later stage starts from the same front.
 */
export interface StageDesign {
  rank: number | null;
  id: string | null;
  values: number[];
  metrics?: Array<number | null>;
  warning_mask?: number;
}

/** Writes the stage's CSV (candidates.csv columns, no sample index) and its list file. */
export function writeStageDesigns(
  directory: string,
  spec: SweepSpec,
  improved: readonly RankedEntry<PackedRow>[],
  prefix: 'e' | 'r',
  files: { csv: string; json: string; digits: number },
  near: readonly RankedEntry<PackedRow>[] = [],
): void {
  const columns = columnSet(spec.dimensions);
  const indexColumn = columns.header.indexOf('sample_index');
  const rows = rankedRows(spec.dimensions, improved);
  for (const row of rows) row[indexColumn] = null;
  writeFileAtomicSync(join(directory, files.csv), toCsv(columns.header, rows, files.digits));
  const designOf = (entry: RankedEntry<PackedRow>, rank: number | null): StageDesign => {
    const row = unpackRow(entry.payload);
    const id = rank === null ? null : `${prefix}${rank}`;
    return { rank, id, values: row.values, metrics: row.metrics, warning_mask: row.warningMask };
  };
  const designs = [
    ...improved.map((entry, i) => designOf(entry, i + 1)),
    ...near.map((entry) => designOf(entry, null)),
  ];
  writeFileAtomicSync(join(directory, files.json), `${JSON.stringify(designs, null, 1)}\n`);
}

/** The designs of a stage's list file (evolved.json, refined.json), or [] when there is none. */
export function readStageDesigns(directory: string, file: string): StageDesign[] {
  const path = join(directory, file);
  return existsSync(path) ? (JSON.parse(readFileSync(path, 'utf8')) as StageDesign[]) : [];
}

/** The stored row of a list-file design (evaluated, so feasible as it was written). */
export function rowOfStageDesign(design: StageDesign): CandidateRow {
  return {
    values: design.values,
    metrics: design.metrics ?? [],
    status: STATUS_OK,
    reason: null,
    warningMask: design.warning_mask ?? 0,
  };
}

/** How front.csv and front.svg name the merged front's designs. */
export interface FrontNames {
  /** Each swept design's rank and crowding in candidates.csv, by sample index. */
  candidates: ReadonlyMap<number, { rank: number; crowding: number }>;
  /** A stage design's id (e3, r2) by pool index; none for one near another. */
  ids: ReadonlyMap<number, string>;
  /** Which stage a design of pool index ≥ samples comes from (its mark in front.svg). */
  stageOf: (index: number) => 'evolved' | 'refined';
  digits: number;
}

/**
 * Rewrites front.csv and front.svg with the merged front: swept designs (index < samples) keep their
 * candidates.csv rank and crowding; a stage design shows its id (e3, r2) in the rank column.
 */
export async function writeMergedFront(
  directory: string,
  spec: SweepSpec,
  front: readonly RankedEntry<PackedRow>[],
  names: FrontNames,
  highlighted: readonly RankedEntry<PackedRow>[],
): Promise<void> {
  const { candidates, ids, stageOf, digits } = names;
  const columns = columnSet(spec.dimensions);
  const indexColumn = columns.header.indexOf('sample_index');
  const rankColumn = columns.header.indexOf('rank');
  const rows = rankedRows(spec.dimensions, front, candidates);
  front.forEach((entry, i) => {
    const row = rows[i];
    if (!row || entry.item.index < spec.samples) return;
    row[indexColumn] = null;
    row[rankColumn] = ids.get(entry.item.index) ?? null;
  });
  writeFileAtomicSync(join(directory, RUN_FILES.front), toCsv(columns.header, rows, digits));
  const swept = (entry: RankedEntry<PackedRow>) => entry.item.index < spec.samples;
  writeFileAtomicSync(
    join(directory, RUN_FILES.plot),
    await frontPlotSvg(
      spec.objectives,
      highlighted.map((entry) => unpackRow(entry.payload)),
      front.map((entry) => unpackRow(entry.payload)),
      {
        // Swept designs keep their rank in candidates.csv; stage designs are marked by their stage.
        ranks: front.map((entry) => (swept(entry) ? (candidates.get(entry.item.index)?.rank ?? null) : null)),
        refined: front.map((entry) => !swept(entry) && stageOf(entry.item.index) === 'refined'),
        evolved: front.map((entry) => !swept(entry) && stageOf(entry.item.index) === 'evolved'),
      },
    ),
  );
}

/** Sets one section of summary.json (created when missing); returns its path. */
export function writeSummarySection(directory: string, name: string, section: Record<string, unknown>): string {
  const path = join(directory, RUN_FILES.summary);
  const summary = existsSync(path) ? (JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>) : {};
  summary[name] = section;
  writeFileAtomicSync(path, `${JSON.stringify(summary, null, 2)}\n`);
  return path;
}

/** One section of summary.json, or null. */
export function readSummarySection(directory: string, name: string): Record<string, unknown> | null {
  const path = join(directory, RUN_FILES.summary);
  if (!existsSync(path)) return null;
  const section = (JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>)[name];
  return section && typeof section === 'object' ? (section as Record<string, unknown>) : null;
}

/** Console lines: up to ten improved designs by id with their objectives in units. */
export function designLines(
  spec: SweepSpec,
  improved: readonly RankedEntry<PackedRow>[],
  prefix: string,
  file: string,
): string[] {
  const lines: string[] = [];
  improved.slice(0, 10).forEach((entry, i) => {
    const row = unpackRow(entry.payload);
    const values = spec.objectives.map(
      (o) => `${o.metric} ${metricText(o.metric, row.metrics[metricIndex(o.metric)])}`,
    );
    lines.push(`  ${prefix}${i + 1}  ${values.join(', ')}`);
  });
  if (improved.length > 10) lines.push(`  … and ${improved.length - 10} more in ${file}`);
  return lines;
}

/** The hypervolume before → after with the gain in per cent and the reference point in units, or []. */
export function hypervolumeLines(
  spec: SweepSpec,
  before: number | null,
  after: number | null,
  referencePoint: readonly number[] | null,
): string[] {
  if (before === null || after === null || !referencePoint) return [];
  const gain =
    before > 0 ? ` (${after >= before ? '+' : ''}${formatNumber((100 * (after - before)) / before, 3)} %)` : '';
  const reference = spec.objectives
    .map((o, j) => {
      const value = (referencePoint[j] ?? Number.NaN) * (o.sense === 'maximize' ? -1 : 1);
      return `${o.metric} ${metricText(o.metric, value)}`;
    })
    .join(', ');
  return [
    `hypervolume of the front ${formatNumber(before, 6)} → ${formatNumber(after, 6)}${gain}: the objective space the front dominates up to the reference point (${reference}), in SI units multiplied`,
  ];
}

/** The sweep state a stage starts from: checkpoint.json of the run directory. */
export function readSweepState(directory: string, spec: SweepSpec, keep: number): SweepState {
  const checkpointPath = join(directory, RUN_FILES.checkpoint);
  if (!existsSync(checkpointPath))
    throw fileError(directory, `no checkpoint yet; let the sweep run (or resume it) first`);
  const checkpoint = JSON.parse(readFileSync(checkpointPath, 'utf8')) as {
    state: Parameters<typeof SweepState.restore>[0];
  };
  return SweepState.restore(checkpoint.state, spec.objectives, spec.constraints, keep, spec.seed);
}
