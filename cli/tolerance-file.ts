/**
 * A `--tolerances FILE`: the tolerances: section, and for a lone design the constraints to meet, the
 * objectives (metrics a build must have) and further metrics to report.
 */
import { fileError } from './input-errors.ts';
import { METRIC_KEYS } from '../core/metrics.ts';
import type { ConstraintDefinition, ObjectiveDefinition } from '../optimize/sweep-state.ts';
import { fieldError, type InputIssue } from '../run/input-error.ts';
import { readInputFile } from './read-file.ts';
import { suggest } from './suggest.ts';
import { readConstraints, readObjectives } from './sweep-spec.ts';
import { readTolerances, type ToleranceSection } from './tolerance-spec.ts';
import { describeValue } from './units.ts';

/** What a `--tolerances FILE` holds. */
export interface ToleranceFile {
  tolerances: ToleranceSection;
  constraints: ConstraintDefinition[];
  objectives: ObjectiveDefinition[];
  metrics: string[];
}

const FILE_KEYS = ['tolerances', 'constraints', 'objectives', 'metrics'];

function unknownKeyIssue(key: string): InputIssue {
  const guess = suggest(key, FILE_KEYS);
  return {
    path: [key],
    message: guess
      ? `unknown key '${key}' (did you mean '${guess}'?)`
      : `unknown key '${key}'; expected one of ${FILE_KEYS.join(', ')}`,
  };
}

/** The `metrics:` list: metric names of the contract. */
function readMetricList(input: unknown, issues: InputIssue[]): string[] {
  if (input === undefined) return [];
  if (!Array.isArray(input)) {
    issues.push({ path: ['metrics'], message: `expected a list of metric names, got ${describeValue(input)}` });
    return [];
  }
  const metrics: string[] = [];
  for (let i = 0; i < input.length; i++) {
    const name: unknown = input[i];
    if (typeof name === 'string' && METRIC_KEYS.includes(name)) {
      metrics.push(name);
      continue;
    }
    const guess = typeof name === 'string' ? suggest(name, [...METRIC_KEYS]) : null;
    issues.push({
      path: ['metrics', i],
      message: `unknown metric ${describeValue(name)}${guess ? ` (did you mean '${guess}'?)` : '; see the README for the list'}`,
    });
    return [];
  }
  return metrics;
}

/** Reads a `--tolerances FILE`; bad input is one InputError naming the field. */
export function readToleranceFile(file: string): ToleranceFile {
  const value = readInputFile(file);
  const issues: InputIssue[] = [];
  const fail = (): never => {
    throw fieldError(file, issues[0]);
  };
  if (typeof value !== 'object' || value === null || Array.isArray(value))
    throw fileError(
      file,
      `expected a mapping with tolerances (and constraints, objectives, metrics), got ${describeValue(value)}`,
    );
  const input = value as Record<string, unknown>;
  const unknown = Object.keys(input).find((key) => !FILE_KEYS.includes(key));
  if (unknown !== undefined) {
    issues.push(unknownKeyIssue(unknown));
    fail();
  }
  if (input.tolerances === undefined) {
    issues.push({
      path: ['tolerances'],
      message: "required: the fields' spreads, e.g. secondary: { winding_length: ±1 % }",
    });
    fail();
  }
  const tolerances = readTolerances(input.tolerances, ['tolerances'], issues);
  if (!tolerances) fail();
  const constraints = readConstraints(input.constraints, issues);
  if (issues.length) fail();
  const objectives = input.objectives === undefined ? [] : readObjectives(input.objectives, issues);
  if (issues.length) fail();
  const metrics = readMetricList(input.metrics, issues);
  if (issues.length) fail();
  return { tolerances: tolerances as ToleranceSection, constraints, objectives, metrics };
}
