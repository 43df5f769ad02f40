/**
 * The few lines a sweep prints at the end: the best candidates with their objectives in practical
 * units, where the files are, and the safety cautions.
 */
import { join } from 'node:path';
import { metricIndex } from '../core/metrics.ts';
import type { SweepState } from '../optimize/sweep-state.ts';
import { unpackRow } from '../optimize/packed-row.ts';
import { METRIC_DISPLAY, formatNumber, humanUnit } from './display-units.ts';
import { parameterCells } from './sweep-columns.ts';
import { SAFETY_CAUTIONS } from './safety.ts';
import type { SweepSpec } from './sweep-spec.ts';

export function formatTopCandidates(directory: string, spec: SweepSpec, state: SweepState, count: number): string {
  const ranked = state.pool.ranked(count);
  const lines: string[] = [];
  const c = state.counts;
  lines.push(
    `${c.evaluated} designs: ${c.feasible} feasible, ${c.infeasible} outside the constraints, ${c.impossible} impossible, ${c.failed} failed`,
  );
  lines.push(`best ${Math.min(count, ranked.length)}:`);
  for (let i = 0; i < ranked.length; i++) {
    const entry = ranked[i];
    const row = unpackRow(entry.payload);
    const objectives = spec.objectives.map((objective) => {
      const value = row.metrics[metricIndex(objective.metric)];
      const display = METRIC_DISPLAY[objective.metric];
      const shown =
        value === null || value === undefined ? 'n/a' : formatNumber(display ? value / display.divisor : value);
      return `${objective.metric} ${shown}${display ? ` ${humanUnit(display.label)}` : ''}`;
    });
    const parameters = parameterCells(spec.dimensions, row.values).map((cell, d) => {
      const text = typeof cell === 'number' ? formatNumber(cell) : String(cell);
      return `${spec.dimensions[d].path.join('.')}=${text}`;
    });
    const status = entry.item.violation === 0 ? '' : ` [infeasible: ${row.reason ?? 'constraints'}]`;
    lines.push(`  ${i + 1}. ${objectives.join(', ')}${status}`);
    lines.push(`     ${parameters.join(' ')}`);
  }
  lines.push('');
  lines.push(
    `files: ${join(directory, 'candidates.csv')}, ${join(directory, 'front.csv')}, ${join(directory, 'summary.json')}`,
  );
  lines.push(
    `full report of a candidate: npx coilfront show ${directory} RANK > design.yaml && npx coilfront evaluate design.yaml`,
  );
  lines.push('');
  lines.push('SAFETY', ...SAFETY_CAUTIONS, '');
  return lines.join('\n');
}
