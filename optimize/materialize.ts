/**
 * Rows for the designs a run writes out. The sweep state keeps its candidates without their rows (a
 * design is a pure function of the spec and its sample index), so at the end the few hundred or
 * thousand designs of candidates.csv, infeasible.csv and front.csv are evaluated again, through
 * the same BatchEvaluator, giving exactly the numbers of the first evaluation.
 */
import type { DesignSpace } from './design-space.ts';
import type { BatchEvaluator } from './evaluate-batch.ts';
import type { PoolEntry } from './pareto/candidate-pool.ts';
import type { CandidateRow, SweepState } from './sweep-state.ts';

/** The sample indices of the entries that still lack a row, sorted and unique. */
export function indicesWithoutRows(entries: ReadonlyArray<PoolEntry<CandidateRow | null>>): number[] {
  const indices = new Set<number>();
  for (const entry of entries) if (entry.payload === null) indices.add(entry.item.index);
  return [...indices].sort((a, b) => a - b);
}

/** Evaluates sample designs again and returns their rows by sample index. */
export async function materializeRows(
  space: DesignSpace,
  state: SweepState,
  indices: readonly number[],
  evaluator: BatchEvaluator,
  batchSize: number,
): Promise<Map<number, CandidateRow>> {
  const dimensions = space.dimensionCount;
  const rows = new Map<number, CandidateRow>();
  const chunks: number[][] = [];
  for (let start = 0; start < indices.length; start += batchSize) chunks.push(indices.slice(start, start + batchSize));
  const values = new Float64Array(dimensions);
  await Promise.all(
    chunks.map(async (chunk) => {
      const packed = new Float64Array(chunk.length * dimensions);
      chunk.forEach((index, i) => {
        space.valuesAt(index, values);
        packed.set(values, i * dimensions);
      });
      const result = await evaluator.evaluate({ kind: 'values', values: packed, count: chunk.length });
      chunk.forEach((index, i) => rows.set(index, state.rowOf(result, i, dimensions)));
    }),
  );
  return rows;
}

/** A pool entry's row: its own payload, or the materialized one. */
export function rowOfEntry(entry: PoolEntry<CandidateRow | null>, rows: ReadonlyMap<number, CandidateRow>): CandidateRow {
  const row = entry.payload ?? rows.get(entry.item.index);
  if (!row) throw new Error(`no row for sample ${entry.item.index}: materializeRows was not asked for it`);
  return row;
}
