/**
 * Quantile merits in a sweep file: an objective `{ minimize: { p95: topload_peak_field } }` or a constraint
 * `constraints: { p05: { breakout_margin: { min: 1.1 } } }` asks for that quantile of the metric over the
 * sweep's tolerance draws (tolerances.sweep_draws) instead of the design's own value.
 *
 * The reader runs before the objectives and constraints are read: it gives each distinct (quantile, metric)
 * a slot, build_quantile_1 … build_quantile_4 (objectives first, then constraints, in the file's order),
 * and rewrites the objective or constraint to name its slot, with the bounds already in SI; what is left
 * is read as usual. The worker fills the slots (optimize/tolerance/robust-yield.ts).
 */
import { METRIC_KEYS } from '../core/metrics.ts';
import type { RobustQuantile } from '../optimize/space-definition.ts';
import { isRobustMetric, QUANTILE_SLOTS } from '../optimize/tolerance/robust-yield.ts';
import type { InputIssue } from '../run/input-error.ts';
import { metricKind } from './metric-kinds.ts';
import { suggest } from './suggest.ts';
import { describeValue, readQuantity } from './units.ts';

/** A quantile key: p01 … p99, the percentage in two digits. */
const QUANTILE_KEY = /^p(\d\d)$/;

export interface QuantileMeritReading {
  /** The objectives and constraints with every quantile merit replaced by its slot. */
  objectives: unknown;
  constraints: unknown;
  /** The merits, in slot order. */
  quantiles: RobustQuantile[];
}

function isMapping(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** p of a key `pNN`, or null when it is not a quantile key. */
export function quantileOfKey(key: string): number | null {
  const match = QUANTILE_KEY.exec(key);
  if (!match) return null;
  const percent = Number(match[1]);
  return percent >= 1 && percent <= 99 ? percent / 100 : null;
}

/** The column name a quantile merit stands for in messages and summaries: `breakout_margin p05`. */
export function quantileLabel(quantile: RobustQuantile): string {
  return `${quantile.metric} p${String(Math.round(quantile.p * 100)).padStart(2, '0')}`;
}

/** What one build_quantile_k column holds, as summary.json (version 2) records it. */
export interface QuantileSlotEntry {
  column: string;
  metric: string;
  /** The quantile as a fraction (0.05). */
  quantile: number;
  /** `breakout_margin p05`. */
  label: string;
}

/** The build_quantile_k columns of a sweep's quantile merits (slot order), with what each holds. */
export function quantileSlotEntries(quantiles: readonly RobustQuantile[] | undefined): QuantileSlotEntry[] {
  return (quantiles ?? []).map((q, k) => ({
    column: QUANTILE_SLOTS[k],
    metric: q.metric,
    quantile: q.p,
    label: quantileLabel(q),
  }));
}

/**
 * The build_quantile_k columns a summary.json records: version 2 and later under `build_quantiles`; a
 * version 1 summary recorded none, so the mapping is unknown there (an empty list).
 */
export function summaryQuantileSlots(summary: { version?: unknown; build_quantiles?: unknown }): QuantileSlotEntry[] {
  if (typeof summary.version !== 'number' || summary.version < 2 || !Array.isArray(summary.build_quantiles)) return [];
  return summary.build_quantiles as QuantileSlotEntry[];
}

class Slots {
  readonly quantiles: RobustQuantile[] = [];

  /** The slot of (metric, p), a new one when it is not yet used; null (with an issue) past the last slot. */
  slotOf(metric: string, p: number, path: Array<string | number>, issues: InputIssue[]): string | null {
    let k = this.quantiles.findIndex((q) => q.metric === metric && q.p === p);
    if (k < 0) {
      if (this.quantiles.length === QUANTILE_SLOTS.length) {
        issues.push({ path, message: `at most ${QUANTILE_SLOTS.length} quantile merits in one sweep` });
        return null;
      }
      this.quantiles.push({ metric, p });
      k = this.quantiles.length - 1;
    }
    return QUANTILE_SLOTS[k];
  }
}

/** The metric of a quantile merit, or null with an issue. */
function meritMetric(name: unknown, path: Array<string | number>, issues: InputIssue[]): string | null {
  if (typeof name !== 'string' || !METRIC_KEYS.includes(name)) {
    const guess = typeof name === 'string' ? suggest(name, [...METRIC_KEYS]) : null;
    issues.push({
      path,
      message: `unknown metric ${describeValue(name)}${guess ? ` (did you mean '${guess}'?)` : '; see the README for the list'}`,
    });
    return null;
  }
  if (isRobustMetric(name)) {
    issues.push({ path, message: `'${name}' is itself a merit over the draws: a quantile of it is not offered` });
    return null;
  }
  return name;
}

function rewriteObjectives(input: unknown, slots: Slots, issues: InputIssue[]): unknown {
  if (!Array.isArray(input)) return input;
  return input.map((item, i) => {
    if (!isMapping(item) || Object.keys(item).length !== 1) return item;
    const sense = Object.keys(item)[0];
    const what = item[sense];
    const path = ['objectives', i, sense];
    if (typeof what === 'string' && QUANTILE_SLOTS.includes(what)) {
      issues.push({ path, message: `write a quantile merit as { p05: metric }, not its column '${what}'` });
      return item;
    }
    if (!isMapping(what)) return item;
    const keys = Object.keys(what);
    const p = keys.length === 1 ? quantileOfKey(keys[0]) : null;
    if (p === null) {
      issues.push({
        path,
        message: `expected a metric name or one quantile such as { p05: metric } (p01 … p99), got ${describeValue(what)}`,
      });
      return item;
    }
    const metric = meritMetric(what[keys[0]], [...path, keys[0]], issues);
    const slot = metric === null ? null : slots.slotOf(metric, p, path, issues);
    return slot === null ? item : { [sense]: slot };
  });
}

/** The bounds { min, max } of a quantile constraint in SI, or null with an issue. */
function readQuantileBounds(
  metric: string,
  bounds: unknown,
  path: Array<string | number>,
  issues: InputIssue[],
): Record<string, number> | null {
  if (!isMapping(bounds)) {
    issues.push({ path, message: `expected { min, max } (one or both), got ${describeValue(bounds)}` });
    return null;
  }
  const read: Record<string, number> = {};
  for (const [key, given] of Object.entries(bounds)) {
    if (key !== 'min' && key !== 'max') {
      issues.push({ path: [...path, key], message: `unknown key '${key}'; expected one of min, max` });
      return null;
    }
    const result = readQuantity(given, metricKind(metric) ?? 'dimensionless');
    if (!result.ok) {
      issues.push({ path: [...path, key], message: result.reason });
      return null;
    }
    read[key] = result.value;
  }
  if (Object.keys(read).length === 0) {
    issues.push({ path, message: 'give min, max or both' });
    return null;
  }
  return read;
}

function rewriteConstraints(input: unknown, slots: Slots, issues: InputIssue[]): unknown {
  if (!isMapping(input)) return input;
  const plain: Record<string, unknown> = {};
  const robust: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(input)) {
    const p = quantileOfKey(key);
    if (QUANTILE_SLOTS.includes(key)) {
      issues.push({ path: ['constraints', key], message: `write a quantile merit as p05: { metric: { min } }` });
      return input;
    }
    if (p === null) {
      plain[key] = value;
      continue;
    }
    if (!isMapping(value)) {
      issues.push({
        path: ['constraints', key],
        message: `expected a mapping of metric: { min, max }, got ${describeValue(value)}`,
      });
      return input;
    }
    for (const [name, bounds] of Object.entries(value)) {
      const path = ['constraints', key, name];
      const metric = meritMetric(name, path, issues);
      if (metric === null) return input;
      const read = readQuantileBounds(metric, bounds, path, issues);
      const slot = read === null ? null : slots.slotOf(metric, p, path, issues);
      if (slot === null || read === null) return input;
      if (slot in robust) {
        issues.push({ path, message: `the ${key} of '${metric}' is already constrained` });
        return input;
      }
      robust[slot] = read;
    }
  }
  return { ...plain, ...robust };
}

/** Reads the quantile merits of a sweep file's objectives and constraints (issues pushed on bad input). */
export function readQuantileMerits(
  objectives: unknown,
  constraints: unknown,
  issues: InputIssue[],
): QuantileMeritReading {
  const slots = new Slots();
  const rewrittenObjectives = rewriteObjectives(objectives, slots, issues);
  const rewrittenConstraints = issues.length ? constraints : rewriteConstraints(constraints, slots, issues);
  return { objectives: rewrittenObjectives, constraints: rewrittenConstraints, quantiles: slots.quantiles };
}
