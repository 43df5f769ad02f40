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
import { fieldError, InputError, type InputIssue } from '../run/input-error.ts';
import { metricKind } from './metric-kinds.ts';
import { parseInputText, readInputFile } from './read-file.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { suggest } from './suggest.ts';
import { isRobustMetric, type RobustDefinition } from '../optimize/tolerance/robust-yield.ts';
import { readQuantileMerits } from './quantile-merits.ts';
import { ToleranceSetupError, toleranceSpace } from '../optimize/tolerance/tolerance-space.ts';
import { readTolerances, type ToleranceSection } from './tolerance-spec.ts';
import { describeValue, readQuantity } from './units.ts';
import { must } from '../core/must.ts';
import { readStages, type StageSpec } from './sweep-stages.ts';
import type { ConstraintDefinition, ObjectiveDefinition } from '../optimize/sweep-state.ts';

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

/** Reads and validates a sweep from its parsed value. Throws the first problem as an InputError. */
export function sweepFromValue(value: unknown, file: string, options: SweepReadOptions = {}): SweepSpec {
  const issues: InputIssue[] = [];
  const fail = (): never => {
    throw fieldError(file, issues[0]);
  };
  if (!isMapping(value)) {
    throw new InputError(
      `${file}: expected a mapping with design, constraints, objectives and sweep, got ${describeValue(value)}`,
    );
  }
  for (const key of Object.keys(value)) {
    if (TOP_KEYS.includes(key)) continue;
    if (key in DESIGN_SECTIONS) {
      issues.push({
        path: [key],
        message: `unknown key '${key}': a sweep file puts the design tree under 'design:' (for one design, use npx coilfront evaluate)`,
      });
    } else issues.push(unknownKey([], key, TOP_KEYS));
  }
  if (issues.length) fail();
  if (value.design === undefined) {
    issues.push({ path: ['design'], message: 'required: the design tree, where leaves may be ranges or sets' });
    fail();
  }
  const reading = readDesignTree(value.design, 'sweep', ['design']);
  if (reading.issues.length) {
    issues.push(reading.issues[0]);
    fail();
  }
  // Quantile merits ({ p05: metric }) become their build_quantile_k slots before the usual reading.
  const merits = readQuantileMerits(value.objectives, value.constraints, issues);
  if (issues.length) fail();
  const constraints = readConstraints(merits.constraints, issues);
  if (issues.length) fail();
  const objectives = readObjectives(merits.objectives, issues);
  if (issues.length) fail();
  const tolerances = value.tolerances === undefined ? null : readTolerances(value.tolerances, ['tolerances'], issues);
  if (issues.length) fail();

  const sweep = value.sweep ?? {};
  if (!isMapping(sweep)) {
    issues.push({
      path: ['sweep'],
      message: `expected a mapping (method, samples, seed), got ${describeValue(sweep)}`,
    });
    fail();
  }
  const settings = sweep as Record<string, unknown>;
  for (const key of Object.keys(settings))
    if (!SWEEP_KEYS.includes(key)) issues.push(unknownKey(['sweep'], key, SWEEP_KEYS));
  if (issues.length) fail();
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
  const stages = readStages(settings.stages, issues);
  let samples = 0;
  if (issues.length) fail();
  const dimensions = reading.dimensions;
  let gridLevels: number[] | null = null;
  if (method === 'grid') {
    if (settings.samples !== undefined) {
      issues.push({
        path: ['sweep', 'samples'],
        message: 'a grid has no sample count: its size is the product of its levels (set sweep.levels)',
      });
      fail();
    }
    gridLevels = dimensions.map((d) => discreteLevels(d) ?? levels);
    samples = gridLevels.reduce((product, n) => product * n, 1);
  } else {
    if (settings.samples === undefined) {
      issues.push({
        path: ['sweep', 'samples'],
        message: `required for method ${method}: the number of designs to evaluate`,
      });
      fail();
    }
    samples = parseSetting('samples', integerSetting('a whole number of samples', 1, MAX_SAMPLES), 0);
    if (issues.length) fail();
    if (method === 'sobol' && dimensions.length > 64) {
      issues.push({
        path: ['design'],
        message: `${dimensions.length} varied fields; Sobol sampling here supports up to 64 (use lhs or random)`,
      });
      fail();
    }
  }
  if (samples > MAX_SAMPLES) {
    issues.push({
      path: ['sweep', method === 'grid' ? 'levels' : 'samples'],
      message: `${samples} designs is beyond the limit of ${MAX_SAMPLES}`,
    });
    fail();
  }
  if (samples > MAX_SAMPLES_WITHOUT_FORCE && !options.force) {
    issues.push({
      path: ['sweep', method === 'grid' ? 'levels' : 'samples'],
      message: `${samples} designs is more than ${MAX_SAMPLES_WITHOUT_FORCE}; run with --force if you mean it`,
    });
    fail();
  }
  if (dimensions.length === 0) {
    issues.push({
      path: ['design'],
      message: 'nothing varies: give at least one range or set (or use npx coilfront evaluate)',
    });
    fail();
  }
  // The reference point: a mapping metric -> value, in objective units.
  let referencePoint: number[] | null = null;
  if (settings.reference_point !== undefined) {
    const given = settings.reference_point;
    if (!isMapping(given)) {
      issues.push({
        path: ['sweep', 'reference_point'],
        message: `expected a mapping objective metric: value, got ${describeValue(given)}`,
      });
      fail();
    }
    const point: number[] = [];
    for (const objective of objectives) {
      const bound = (given as Record<string, unknown>)[objective.metric];
      if (bound === undefined) {
        issues.push({
          path: ['sweep', 'reference_point', objective.metric],
          message: 'required: one value for each objective',
        });
        fail();
      }
      const read = readBound(objective.metric, bound, ['sweep', 'reference_point', objective.metric], issues);
      if (read === undefined) fail();
      point.push(objective.sense === 'maximize' ? -must(read) : must(read));
    }
    for (const key of Object.keys(given as object)) {
      if (!objectives.some((o) => o.metric === key)) {
        issues.push({ path: ['sweep', 'reference_point', key], message: `'${key}' is not an objective` });
        fail();
      }
    }
    referencePoint = point;
  }
  // Structural check: the first corner of the space must build as a design (field combinations).
  const probe = fillSlots(
    reading.tree,
    dimensions,
    dimensions.map((d) => (d.kind === 'range' ? d.from : 0)),
  );
  const built = buildDesign(probe, ['design']);
  const structural = built.issues.find((issue) => !issue.byValue);
  if (structural) {
    issues.push(structural);
    fail();
  }
  // Tolerances: every field must find its nominal in this space; build_yield needs tolerances.sweep_draws.
  let robust: RobustDefinition | undefined;
  if (tolerances) {
    let space: ReturnType<typeof toleranceSpace> | null = null;
    try {
      space = toleranceSpace({ tree: reading.tree, dimensions, method, samples, seed, gridLevels }, tolerances.fields);
    } catch (error) {
      if (!(error instanceof ToleranceSetupError)) throw error;
      issues.push({ path: ['tolerances', ...error.path], message: error.message });
    }
    if (issues.length || space === null) fail();
    const usesRobust =
      merits.quantiles.length > 0 ||
      objectives.some((o) => o.metric === 'build_yield') ||
      constraints.some((c) => c.metric === 'build_yield');
    if (usesRobust && tolerances.sweepDraws === null) {
      issues.push({
        path: ['tolerances', 'sweep_draws'],
        message:
          'required for build_yield or a quantile merit: the tolerance draws per design (each costs one more evaluation)',
      });
      fail();
    }
    if (usesRobust) {
      robust = {
        tolerance: space as ReturnType<typeof toleranceSpace>,
        draws: tolerances.sweepDraws as number,
        seed: tolerances.seed ?? seed,
        constraints: constraints.filter((c) => !isRobustMetric(c.metric)),
        required: objectives.map((o) => o.metric).filter((m) => !isRobustMetric(m)),
        ...(merits.quantiles.length > 0 ? { quantiles: merits.quantiles } : {}),
      };
    }
  } else if (
    merits.quantiles.length > 0 ||
    objectives.some((o) => o.metric === 'build_yield') ||
    constraints.some((c) => c.metric === 'build_yield')
  ) {
    issues.push({
      path: ['tolerances'],
      message: 'required for build_yield or a quantile merit: a tolerances section with sweep_draws',
    });
    fail();
  }
  return {
    ...(robust ? { robust } : {}),
    tree: reading.tree,
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
  if (!existsSync(path)) throw new InputError(`${directory}: not a coilfront run directory (no ${RUN_FILES.spec})`);
  return sweepFromValue(parseInputText(readFileSync(path, 'utf8'), path), path, { force: true });
}
