/**
 * The few lines a sweep prints at the end: the front (or, with nothing feasible, why), each design
 * by its rank in candidates.csv with its objectives and parameters in practical units, every file
 * the run wrote, and the safety cautions.
 */
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { metricIndex } from '../core/metrics.ts';
import type { ConstraintDefinition, SweepState } from '../optimize/sweep-state.ts';
import { sortedCounts } from '../optimize/sweep-state.ts';
import { unpackRow } from '../optimize/packed-row.ts';
import { formatNumber, humanUnit, KIND_DISPLAY, METRIC_DISPLAY } from './display-units.ts';
import { parameterCells } from './sweep-columns.ts';
import { SAFETY_CAUTIONS } from './safety.ts';
import type { SweepSpec } from './sweep-spec.ts';
import type { QuantityKind } from './units.ts';
import { quantileSlotEntries } from './quantile-merits.ts';

/** Exit status of a finished sweep in which no design met every constraint (documented in the README). */
export const NO_FEASIBLE_EXIT_CODE = 3;

/** Files of a run directory that are the run's own machinery, not outputs to read. */
const INTERNAL_FILE = /^(journal-\d+\.log|checkpoint\.json|run\.json|spec\.yaml|run\.lock.*|\..*)$/;

/** A metric value in its display unit, with the unit: '465.2 kV'. */
export function metricText(key: string, value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return 'n/a';
  const display = METRIC_DISPLAY[key];
  return display ? `${formatNumber(value / display.divisor)} ${humanUnit(display.label)}` : formatNumber(value);
}

/** The range a constraint allows, in display units: '≤ 400 kV/m', '≥ 1.2', '100 kHz … 300 kHz'. */
export function constraintText(constraint: Pick<ConstraintDefinition, 'metric' | 'min' | 'max'>): string {
  const low = constraint.min === undefined ? null : metricText(constraint.metric, constraint.min);
  const high = constraint.max === undefined ? null : metricText(constraint.metric, constraint.max);
  if (low !== null && high !== null) return `${low} … ${high}`;
  return low !== null ? `≥ ${low}` : `≤ ${high}`;
}

export function formatTopCandidates(directory: string, spec: SweepSpec, state: SweepState, count: number): string {
  const lines: string[] = [];
  const c = state.counts;
  lines.push(
    `${c.evaluated} designs: ${c.feasible} feasible, ${c.infeasible} outside the constraints, ${c.impossible} impossible, ${c.failed} failed`,
  );
  if (c.feasible === 0) lines.push(...nothingFeasible(directory, spec, state));
  else lines.push(...impossibleLines(directory, state), ...frontLines(spec, state, count));
  lines.push('');
  lines.push(`files: ${outputFiles(directory).join(', ')}`);
  lines.push(
    `full report of a candidate: npx coilfront show ${directory} RANK > design.yaml && npx coilfront evaluate design.yaml`,
  );
  lines.push('');
  lines.push('SAFETY', ...SAFETY_CAUTIONS, '');
  return lines.join('\n');
}

/** The first `count` designs of the front sorted by the first objective, each by its candidates.csv rank. */
function frontLines(spec: SweepSpec, state: SweepState, count: number): string[] {
  const first = spec.objectives[0];
  const column = first ? metricIndex(first.metric) : -1;
  // Each front design once, unpacked once, with its rank in candidates.csv and its first objective.
  const front = state.pool
    .ranked()
    .map((entry, position) => ({ entry, rank: position + 1 }))
    .filter((e) => e.entry.paretoRank === 1)
    .map(({ entry, rank }) => {
      const row = unpackRow(entry.payload);
      return { row, rank, key: row.metrics[column] ?? Number.NaN };
    });
  if (first) {
    const sign = first.sense === 'maximize' ? -1 : 1;
    front.sort((a, b) => sign * (a.key - b.key) || a.rank - b.rank);
  }
  const shown = front.slice(0, count);
  const lines = [
    `the front: ${front.length} designs; ${shown.length === front.length ? 'all' : `the first ${shown.length}`} by ${first ? `${first.metric} (${first.sense === 'maximize' ? 'highest' : 'lowest'} first)` : 'rank'}, each with its rank in candidates.csv:`,
  ];
  // The quantile merits' columns by what they hold (summary.json's build_quantiles).
  const slots = quantileSlotEntries(spec.robust?.quantiles);
  if (slots.length > 0)
    lines.push(`  (${slots.map((q) => `${q.column} = ${q.label} over the tolerance draws`).join('; ')})`);
  for (const { row, rank } of shown) {
    const objectives = spec.objectives.map(
      (o) => `${o.metric} ${metricText(o.metric, row.metrics[metricIndex(o.metric)])}`,
    );
    lines.push(`  #${rank}  ${objectives.join(', ')}`);
    lines.push(`       ${parameterText(spec, row.values)}`);
  }
  return lines;
}

/** The varied parameters in display units with their units: 'secondary.base_height=749.6 mm'. */
function parameterText(spec: SweepSpec, values: readonly number[]): string {
  return spec.dimensions
    .map((dimension, d) => {
      const name = dimension.path.join('.');
      // The dimension's own cells: one, or a wire's label and then its bare diameter in mm.
      const [cell, bare] = parameterCells([dimension], [values[d] ?? Number.NaN]);
      if (dimension.kind === 'choose' && dimension.wire)
        return `${name}=${String(cell)}${typeof bare === 'number' ? ` (${formatNumber(bare)} mm)` : ''}`;
      if (typeof cell !== 'number') return `${name}=${String(cell)}`;
      const unit = dimension.quantity === undefined ? undefined : KIND_DISPLAY[dimension.quantity as QuantityKind];
      return `${name}=${formatNumber(cell)}${unit?.label ? ` ${humanUnit(unit.label)}` : ''}`;
    })
    .join(' ');
}

/** Why designs could not be built, the three most common reasons first (none when every design could be). */
function impossibleLines(directory: string, state: SweepState): string[] {
  const reasons = Object.entries(sortedCounts(state.impossibleBy));
  if (reasons.length === 0) return [];
  const lines = ['the impossible designs could not be built because (most common first):'];
  for (const [kind, n] of reasons.slice(0, 3)) lines.push(`  ${n} ${kind}`);
  const more = reasons.length > 3 ? `, ${reasons.length - 3} other reason${reasons.length > 4 ? 's' : ''}` : '';
  lines.push(`  (each design's reason in ${join(directory, 'infeasible.csv')}${more})`);
  return lines;
}

/** What rejected the designs when none was feasible, largest counts first. */
function nothingFeasible(directory: string, spec: SweepSpec, state: SweepState): string[] {
  const lines = ['no design met every constraint. What rejected them (a design may miss several constraints):'];
  const misses = spec.constraints
    .map((constraint, index) => ({ constraint, count: state.rejectedBy[index] ?? 0 }))
    .filter((m) => m.count > 0)
    .sort((a, b) => b.count - a.count);
  for (const { constraint, count } of misses)
    lines.push(`  ${count} outside ${constraint.metric} ${constraintText(constraint)}`);
  for (const [kind, n] of Object.entries(sortedCounts(state.impossibleBy)).slice(0, 5))
    lines.push(`  ${n} could not be built: ${kind}`);
  lines.push(`the nearest misses and every reason are in ${join(directory, 'infeasible.csv')};`);
  lines.push(`  widen the constraints or the ranges above, then sweep again (exit status ${NO_FEASIBLE_EXIT_CODE})`);
  return lines;
}

/** Every output file in the run directory, in name order. */
function outputFiles(directory: string): string[] {
  try {
    return readdirSync(directory)
      .filter((name) => !INTERNAL_FILE.test(name))
      .sort()
      .map((name) => join(directory, name));
  } catch {
    return [directory];
  }
}
