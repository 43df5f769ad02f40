/**
 * The rows of all.csv (`sweep --all`): every evaluated design of a batch, in sample order, as
 * candidates.csv's columns with the design's own index as its rank.
 */
import type { BatchResult } from '../../optimize/evaluate-batch.ts';
import type { SweepState } from '../../optimize/sweep-state.ts';
import { csvRows } from '../../run/csv.ts';
import { candidateCells } from '../sweep-columns.ts';
import type { SweepSpec } from '../sweep-spec.ts';

/** The all.csv writer of a run: the CSV text of one batch's rows. */
export function allCsvRows(
  dimensions: SweepSpec['dimensions'],
  digits: number,
): (state: SweepState, result: BatchResult) => string {
  return (state, result) => {
    const rows = [];
    for (let row = 0; row < result.count; row++) {
      const index = result.start + row;
      const { violation, reason } = state.classifyRow(result, row);
      rows.push(
        candidateCells(
          dimensions,
          { rank: index + 1, paretoRank: null, crowding: null, feasible: violation === 0, violation, index },
          state.rowOf(result, row, dimensions.length, reason),
        ),
      );
    }
    return csvRows(rows, digits);
  };
}
