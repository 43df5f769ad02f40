/**
 * Sweep files: the design tree with ranges and sets, the constraints, the objectives and the sampling
 * settings, read and validated into a `SweepSpec`. Every problem is one line naming the field path.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import * as z from 'zod';
import { METRIC_KEYS } from '../core/metrics.ts';
import { buildDesign } from '../optimize/build-design.ts';
import { fillSlots, type Dimension, type NormalTree } from '../optimize/design-tree.ts';
import { readDesignTree } from './design-schema.ts';
import { DESIGN_SECTIONS } from './design-fields.ts';
import { fieldError, type InputIssue } from '../run/input-error.ts';
import { metricKind } from './metric-kinds.ts';
import { parseInputText, readInputFile } from './read-file.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { suggest } from './suggest.ts';
import type { RobustDefinition } from '../optimize/space-definition.ts';
import { isRobustMetric } from '../optimize/tolerance/robust-yield.ts';
import { readQuantileMerits } from './quantile-merits.ts';
import { ToleranceSetupError, toleranceSpace } from '../optimize/tolerance/tolerance-space.ts';
import { readTolerances, type ToleranceSection } from './tolerance-spec.ts';
import { describeValue, readQuantity } from './units.ts';
import { must } from '../core/must.ts';
import { readStages, type StageSpec } from './sweep-stages.ts';
import type { ConstraintDefinition, ObjectiveDefinition } from '../optimize/sweep-state.ts';
import { fileError } from './input-errors.ts';

export type SamplingMethod = 'sobol' | 'lhs' | 'grid' | 'random';

export interface SweepSpec {
  /** The design space: the normal tree with slots, and its dimensions. */
  tree: NormalTree;
  dimensions: Dimension[];
  constraints: ConstraintDefinition[];
  objectives: ObjectiveDefinition[];
  method: SamplingMethod;
  /** Number of designs (for a grid: the product of its levels). */
  samples: number;
  seed: number;
  /** Grid levels of each dimension (grid method), else null. */
  gridLevels: number[] | null;
  /** Hypervolume reference point in the minimisation convention (maximised objectives negated), SI. */
  referencePoint: number[] | null;
  /** Shard count for scheduler environments that give only an index (JOB_COMPLETION_INDEX). */
  shardCount: number | null;
  /** sha256 of the canonical JSON of the file's content: the identity of a run. */
  hash: string;
  /** The build tolerances for `coilfront tolerance`, when the file has a `tolerances:` section. */
  tolerances?: ToleranceSection | null;
  /** The robust merit build_yield, when an objective or constraint uses it (needs tolerances.sweep_draws). */
  robust?: RobustDefinition;
  /** The stages run after the sweep on its directory (`sweep.stages`), in order; none when absent. */
  stages?: StageSpec[];
}

/** Above this many designs a sweep is refused unless --force (a day of a small workstation). */
export const MAX_SAMPLES_WITHOUT_FORCE = 20_000_000;
/** Never more than this: 2^32 Sobol points; index arithmetic stays exact. */
export const MAX_SAMPLES = 2 ** 32;

const TOP_KEYS = ['design', 'constraints', 'objectives', 'sweep', 'tolerances'];
const SWEEP_KEYS = ['method', 'samples', 'seed', 'levels', 'shard_count', 'reference_point', 'stages'];

function isMapping(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function unknownKey(path: Array<string | number>, key: string, known: string[]): InputIssue {
  const guess = suggest(key, known);
  return {
    path: [...path, key],
    message: guess
      ? `unknown key '${key}' (did you mean '${guess}'?)`
      : `unknown key '${key}'; expected one of ${known.join(', ')}`,
  };
}

function unknownMetric(path: Array<string | number>, key: string): InputIssue {
  const guess = suggest(key, [...METRIC_KEYS]);
  return {
    path,
    message: `unknown metric '${key}'${guess ? ` (did you mean '${guess}'?)` : '; see the README for the list'}`,
  };
}

const integerSetting = (what: string, min: number, max: number) =>
  z.unknown().transform((input, context): number => {
    if (typeof input !== 'number' || !Number.isInteger(input) || input < min || input > max) {
      context.addIssue({
        code: 'custom',
        message: `expected ${what} from ${min} to ${max}, got ${describeValue(input)}`,
      });
      return z.NEVER;
    }
    return input;
  });

const methodSchema = z.unknown().transform((input, context): SamplingMethod => {
  const methods = ['sobol', 'lhs', 'grid', 'random'] as const;
  if (typeof input === 'string' && (methods as readonly string[]).includes(input)) return input as SamplingMethod;
  const guess = typeof input === 'string' ? suggest(input, [...methods]) : null;
  context.addIssue({
    code: 'custom',
    message: `expected one of sobol, lhs, grid, random, got ${describeValue(input)}${guess ? ` (did you mean '${guess}'?)` : ''}`,
  });
  return z.NEVER;
});

function readBound(
  metric: string,
  input: unknown,
  path: Array<string | number>,
  issues: InputIssue[],
): number | undefined {
  const kind = must(metricKind(metric));
  const result = readQuantity(input, kind);
  if (!result.ok) {
    issues.push({ path, message: result.reason });
    return undefined;
  }
  return result.value;
}

export function readConstraints(input: unknown, issues: InputIssue[]): ConstraintDefinition[] {
  if (input === undefined || input === null) return [];
  if (!isMapping(input)) {
    issues.push({
      path: ['constraints'],
      message: `expected a mapping of metric: { min, max }, got ${describeValue(input)}`,
    });
    return [];
  }
  const constraints: ConstraintDefinition[] = [];
  for (const [metric, bounds] of Object.entries(input)) {
    const path = ['constraints', metric];
    if (!METRIC_KEYS.includes(metric)) {
      issues.push(unknownMetric(path, metric));
      return [];
    }
    if (!isMapping(bounds)) {
      issues.push({ path, message: `expected { min, max } (one or both), got ${describeValue(bounds)}` });
      return [];
    }
    for (const key of Object.keys(bounds)) {
      if (key !== 'min' && key !== 'max') {
        issues.push(unknownKey(path, key, ['min', 'max']));
        return [];
      }
    }
    const constraint: ConstraintDefinition = { metric };
    if (bounds.min !== undefined) {
      const min = readBound(metric, bounds.min, [...path, 'min'], issues);
      if (min === undefined) return [];
      constraint.min = min;
    }
    if (bounds.max !== undefined) {
      const max = readBound(metric, bounds.max, [...path, 'max'], issues);
      if (max === undefined) return [];
      constraint.max = max;
    }
    if (constraint.min === undefined && constraint.max === undefined) {
      issues.push({ path, message: 'give min, max or both' });
      return [];
    }
    if (constraint.min !== undefined && constraint.max !== undefined && constraint.min > constraint.max) {
      issues.push({
        path,
        message: `min (${describeValue(bounds.min)}) is above max (${describeValue(bounds.max)}): no design can satisfy it`,
      });
      return [];
    }
    constraints.push(constraint);
  }
  return constraints;
}

export function readObjectives(input: unknown, issues: InputIssue[]): ObjectiveDefinition[] {
  if (!Array.isArray(input)) {
    issues.push({
      path: ['objectives'],
      message:
        input === undefined
          ? 'required: a list of { maximize: metric } or { minimize: metric }'
          : `expected a list of { maximize: metric } or { minimize: metric }, got ${describeValue(input)}`,
    });
    return [];
  }
  if (input.length < 1 || input.length > 4) {
    issues.push({ path: ['objectives'], message: `expected 1 to 4 objectives, got ${input.length}` });
    return [];
  }
  const objectives: ObjectiveDefinition[] = [];
  for (let i = 0; i < input.length; i++) {
    const item = input[i];
    const path = ['objectives', i];
    let sense: 'minimize' | 'maximize' | undefined;
    let metric: unknown;
    if (typeof item === 'string' && /^(maximize|minimize)\s*:?\s*\S+$/.test(item)) {
      const [word, name] = item.split(/\s*:\s*|\s+/);
      sense = word as 'minimize' | 'maximize';
      metric = name;
    } else if (isMapping(item) && Object.keys(item).length === 1) {
      const key = Object.keys(item)[0];
      if (key !== 'maximize' && key !== 'minimize') {
        issues.push(unknownKey(path, key, ['maximize', 'minimize']));
        return [];
      }
      sense = key;
      metric = item[key];
    } else {
      issues.push({
        path,
        message: `expected { maximize: metric } or { minimize: metric }, got ${describeValue(item)}`,
      });
      return [];
    }
    if (typeof metric !== 'string' || !METRIC_KEYS.includes(metric)) {
      issues.push(
        typeof metric === 'string'
          ? unknownMetric([...path, sense], metric)
          : { path: [...path, sense], message: `expected a metric name, got ${describeValue(metric)}` },
      );
      return [];
    }
    if (objectives.some((o) => o.metric === metric)) {
      issues.push({ path: [...path, sense], message: `'${metric}' is already an objective` });
      return [];
    }
    objectives.push({ metric, sense });
  }
  return objectives;
}

function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (isMapping(value)) {
    return `{${Object.keys(value)
      .sort()
      .map((key) => `${JSON.stringify(key)}:${canonicalJson(value[key])}`)
      .join(',')}}`;
  }
  return JSON.stringify(value ?? null);
}

/**
 * The file's content without `sweep.stages`: the stages run after the sweep and do not change its
 * designs, so a sweep file with stages names the same sweep (the same hash) as the file without them.
 */
function withoutStages(value: Record<string, unknown>): Record<string, unknown> {
  if (!isMapping(value.sweep) || !('stages' in value.sweep)) return value;
  const { stages: _stages, ...sweep } = value.sweep;
  return { ...value, sweep };
}

/** The canonical JSON of a file's `sweep.stages` as read, to tell two files' stages apart. */
export function stagesIdentity(spec: SweepSpec): string {
  return canonicalJson(spec.stages ?? []);
}

/** Number of levels of a dimension when it is discrete (sets, integers, steps), else null. */
export function discreteLevels(dimension: Dimension): number | null {
  if (dimension.kind === 'choose') return dimension.values.length;
  if (dimension.integer) return Math.floor(dimension.to) - Math.ceil(dimension.from) + 1;
  if (dimension.step !== null) return Math.floor((dimension.to - dimension.from) / dimension.step + 1e-9) + 1;
  return null;
}

export interface SweepReadOptions {
  force?: boolean;
}

/** Stops the read at its first problem: `file: path: reason`. */
function fail(file: string, issue: InputIssue): never {
  throw fieldError(file, issue);
}

/** Throws the first of `issues`, if any. */
function failOnFirst(file: string, issues: readonly InputIssue[]): void {
  const first = issues[0];
  if (first !== undefined) fail(file, first);
}

/** The top level's keys, the design tree, the constraints, the objectives and the tolerances. */
function readProblem(value: Record<string, unknown>, file: string) {
  const issues: InputIssue[] = [];
  for (const key of Object.keys(value)) {
    if (TOP_KEYS.includes(key)) continue;
    if (key in DESIGN_SECTIONS) {
      issues.push({
        path: [key],
        message: `unknown key '${key}': a sweep file puts the design tree under 'design:' (for one design, use npx coilfront evaluate)`,
      });
    } else issues.push(unknownKey([], key, TOP_KEYS));
  }
  failOnFirst(file, issues);
  if (value.design === undefined)
    fail(file, { path: ['design'], message: 'required: the design tree, where leaves may be ranges or sets' });
  const reading = readDesignTree(value.design, 'sweep', ['design']);
  failOnFirst(file, reading.issues);
  // Quantile merits ({ p05: metric }) become their build_quantile_k slots before the usual reading.
  const merits = readQuantileMerits(value.objectives, value.constraints, issues);
  failOnFirst(file, issues);
  const constraints = readConstraints(merits.constraints, issues);
  failOnFirst(file, issues);
  const objectives = readObjectives(merits.objectives, issues);
  failOnFirst(file, issues);
  const tolerances = value.tolerances === undefined ? null : readTolerances(value.tolerances, ['tolerances'], issues);
  failOnFirst(file, issues);
  return { reading, constraints, objectives, tolerances, quantiles: merits.quantiles };
}

/** `sweep:`'s settings (method, seed, levels, shard count, stages) and the sample count they give. */
function readSettings(
  value: unknown,
  dimensions: Dimension[],
  objectives: number,
  file: string,
  options: SweepReadOptions,
) {
  const issues: InputIssue[] = [];
  const sweep = value ?? {};
  if (!isMapping(sweep))
    fail(file, { path: ['sweep'], message: `expected a mapping (method, samples, seed), got ${describeValue(sweep)}` });
  const settings = sweep as Record<string, unknown>;
  for (const key of Object.keys(settings))
    if (!SWEEP_KEYS.includes(key)) issues.push(unknownKey(['sweep'], key, SWEEP_KEYS));
  failOnFirst(file, issues);
  const parseSetting = <T>(key: string, schema: z.ZodType<T>, fallback: T): T => {
    if (settings[key] === undefined) return fallback;
    const result = schema.safeParse(settings[key]);
    if (result.success) return result.data;
    issues.push({ path: ['sweep', key], message: result.error.issues[0].message });
    return fallback;
  };
  const method = parseSetting('method', methodSchema, 'sobol' as SamplingMethod);
  const seed = parseSetting('seed', integerSetting('an integer seed', 0, 2 ** 32 - 1), 1);
  const levels = parseSetting('levels', integerSetting('a number of grid levels', 2, 1000), 5);
  const shardCount = parseSetting('shard_count', integerSetting('a shard count', 1, 100_000), null as number | null);
  failOnFirst(file, issues);
  let samples = 0;
  let gridLevels: number[] | null = null;
  if (method === 'grid') {
    if (settings.samples !== undefined)
      fail(file, {
        path: ['sweep', 'samples'],
        message: 'a grid has no sample count: its size is the product of its levels (set sweep.levels)',
      });
    gridLevels = dimensions.map((d) => discreteLevels(d) ?? levels);
    samples = gridLevels.reduce((product, n) => product * n, 1);
  } else {
    if (settings.samples === undefined)
      fail(file, {
        path: ['sweep', 'samples'],
        message: `required for method ${method}: the number of designs to evaluate`,
      });
    samples = parseSetting('samples', integerSetting('a whole number of samples', 1, MAX_SAMPLES), 0);
    failOnFirst(file, issues);
    if (method === 'sobol' && dimensions.length > 64)
      fail(file, {
        path: ['design'],
        message: `${dimensions.length} varied fields; Sobol sampling here supports up to 64 (use lhs or random)`,
      });
  }
  const countPath = ['sweep', method === 'grid' ? 'levels' : 'samples'];
  if (samples > MAX_SAMPLES)
    fail(file, { path: countPath, message: `${samples} designs is beyond the limit of ${MAX_SAMPLES}` });
  if (samples > MAX_SAMPLES_WITHOUT_FORCE && !options.force)
    fail(file, {
      path: countPath,
      message: `${samples} designs is more than ${MAX_SAMPLES_WITHOUT_FORCE}; run with --force if you mean it`,
    });
  if (dimensions.length === 0)
    fail(file, {
      path: ['design'],
      message: 'nothing varies: give at least one range or set (or use npx coilfront evaluate)',
    });
  // A stage's unset settings come from the problem's size (the default budget split of sweep-stages.ts).
  const stages = readStages(settings.stages, issues, { samples, dimensions: dimensions.length, objectives });
  failOnFirst(file, issues);
  return { settings, method, seed, shardCount, stages, samples, gridLevels };
}

/** `sweep.reference_point`: a mapping metric -> value in objective units, to the minimisation convention. */
function readReferencePoint(given: unknown, objectives: ObjectiveDefinition[], file: string): number[] | null {
  if (given === undefined) return null;
  const base = ['sweep', 'reference_point'];
  if (!isMapping(given))
    fail(file, { path: base, message: `expected a mapping objective metric: value, got ${describeValue(given)}` });
  const point: number[] = [];
  for (const objective of objectives) {
    const path = [...base, objective.metric];
    const bound = given[objective.metric];
    if (bound === undefined) fail(file, { path, message: 'required: one value for each objective' });
    const issues: InputIssue[] = [];
    const read = readBound(objective.metric, bound, path, issues);
    failOnFirst(file, issues);
    point.push(objective.sense === 'maximize' ? -must(read) : must(read));
  }
  for (const key of Object.keys(given))
    if (!objectives.some((o) => o.metric === key))
      fail(file, { path: [...base, key], message: `'${key}' is not an objective` });
  return point;
}

/** The structural check: the first corner of the space must build as a design (field combinations). */
function checkStructure(tree: NormalTree, dimensions: Dimension[], file: string): void {
  const probe = fillSlots(
    tree,
    dimensions,
    dimensions.map((d) => (d.kind === 'range' ? d.from : 0)),
  );
  const structural = buildDesign(probe, ['design']).issues.find((issue) => !issue.byValue);
  if (structural) fail(file, structural);
}

/**
 * Tolerances: every field must find its nominal in this space; build_yield and the quantile merits
 * need tolerances.sweep_draws.
 */
function readRobust(
  tolerances: ToleranceSection | null,
  space: Parameters<typeof toleranceSpace>[0],
  constraints: ConstraintDefinition[],
  objectives: ObjectiveDefinition[],
  quantiles: NonNullable<RobustDefinition['quantiles']>,
  file: string,
): RobustDefinition | undefined {
  const usesYield =
    quantiles.length > 0 ||
    objectives.some((o) => o.metric === 'build_yield') ||
    constraints.some((c) => c.metric === 'build_yield');
  if (!tolerances) {
    if (usesYield)
      fail(file, {
        path: ['tolerances'],
        message: 'required for build_yield or a quantile merit: a tolerances section with sweep_draws',
      });
    return undefined;
  }
  let tolerance: ReturnType<typeof toleranceSpace>;
  try {
    tolerance = toleranceSpace(space, tolerances.fields);
  } catch (error) {
    if (!(error instanceof ToleranceSetupError)) throw error;
    fail(file, { path: ['tolerances', ...error.path], message: error.message });
  }
  if (!usesYield) return undefined;
  if (tolerances.sweepDraws === null)
    fail(file, {
      path: ['tolerances', 'sweep_draws'],
      message:
        'required for build_yield or a quantile merit: the tolerance draws per design (each costs one more evaluation)',
    });
  return {
    tolerance,
    draws: tolerances.sweepDraws,
    seed: tolerances.seed ?? space.seed,
    constraints: constraints.filter((c) => !isRobustMetric(c.metric)),
    required: objectives.map((o) => o.metric).filter((m) => !isRobustMetric(m)),
    ...(quantiles.length > 0 ? { quantiles } : {}),
  };
}

/** Reads and validates a sweep from its parsed value. Throws the first problem as an InputError. */
export function sweepFromValue(value: unknown, file: string, options: SweepReadOptions = {}): SweepSpec {
  if (!isMapping(value)) {
    throw fileError(
      file,
      `expected a mapping with design, constraints, objectives and sweep, got ${describeValue(value)}`,
    );
  }
  const { reading, constraints, objectives, tolerances, quantiles } = readProblem(value, file);
  const { tree, dimensions } = reading;
  const { settings, method, seed, shardCount, stages, samples, gridLevels } = readSettings(
    value.sweep,
    dimensions,
    objectives.length,
    file,
    options,
  );
  const referencePoint = readReferencePoint(settings.reference_point, objectives, file);
  checkStructure(tree, dimensions, file);
  const space = { tree, dimensions, method, samples, seed, gridLevels };
  const robust = readRobust(tolerances, space, constraints, objectives, quantiles, file);
  return {
    ...(robust ? { robust } : {}),
    tree,
    dimensions,
    constraints,
    objectives,
    method,
    samples,
    seed,
    gridLevels,
    referencePoint,
    shardCount,
    hash: createHash('sha256')
      .update(canonicalJson(withoutStages(value)))
      .digest('hex'),
    tolerances,
    stages,
  };
}

/** Loads a sweep file (YAML or JSON). */
export function loadSweepFile(file: string, options: SweepReadOptions = {}): SweepSpec {
  return sweepFromValue(readInputFile(file), file, options);
}

/** Loads the sweep file saved in a run directory (spec.yaml). */
export function loadRunSpec(directory: string): SweepSpec {
  const path = join(directory, RUN_FILES.spec);
  if (!existsSync(path)) throw fileError(directory, `not a coilfront run directory (no ${RUN_FILES.spec})`);
  return sweepFromValue(parseInputText(readFileSync(path, 'utf8'), path), path, { force: true });
}
