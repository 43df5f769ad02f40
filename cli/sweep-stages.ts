/**
 * The pipeline shorthand of sweep files: `sweep.stages`, a list of later stages (`evolve`, `refine`,
 * `sensitivity`) that `coilfront sweep` runs on the run directory once the sweep is finished, each exactly
 * as the command of the same name would (cli/stage-runner.ts). Here: reading and describing the list.
 */
import { join } from 'node:path';
import type { InputIssue } from '../run/input-error.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { suggest } from './suggest.ts';
import { describeValue } from './units.ts';

/** The defaults of the stages: those of the `evolve`, `refine` and `sensitivity` commands. */
export const STAGE_DEFAULTS = {
  evolve: { evaluations: 2000, population: 60 },
  refine: { starts: 8, evaluations: 2000 },
  sensitivity: { samples: 512 },
} as const;

/** The size of a sweep problem, from which a stage's unset settings are chosen. */
export interface ProblemSize {
  samples: number;
  dimensions: number;
  objectives: number;
}

/**
 * The default budget split of `sweep.stages` (a stage's settings left unset), chosen from the problem's
 * size: the sweep's samples S are a tenth of sweep + evolve, evolve gets the other nine tenths (9·S
 * evaluations, at least ten generations of its population of 60), and refine, when listed, S more
 * evaluations over 4 starts per objective (at least the refine's own floor of dimensions + 2 per start).
 * Measured against DEAP's NSGA-II at equal budgets (bench/external/nsga2-compare.ts; the science-centre
 * example with 2, 3 and 4 objectives, four seeds): a tenth of sweep and nine tenths of evolve at
 * population 60 reached 1.001–1.030 of NSGA-II's hypervolume at 2,000 and 5,000 evaluations, where the
 * earlier quarter/half/quarter split at population 100 reached 0.983–1.001; refine's tenth changed the
 * figures by less than the spread between seeds.
 */
export function stageDefaults(size: ProblemSize): {
  evolve: { evaluations: number; population: number };
  refine: { starts: number; evaluations: number };
} {
  const population = STAGE_DEFAULTS.evolve.population;
  const starts = 4 * Math.max(1, size.objectives);
  return {
    evolve: { evaluations: Math.max(9 * size.samples, 10 * population), population },
    refine: { starts, evaluations: Math.max(size.samples, starts * (size.dimensions + 2)) },
  };
}

export type StageSpec =
  | { stage: 'evolve'; evaluations: number; population: number; seed?: number }
  | { stage: 'refine'; starts: number; evaluations: number }
  | { stage: 'sensitivity'; samples: number };

type StageName = StageSpec['stage'];
const STAGE_NAMES: StageName[] = ['evolve', 'refine', 'sensitivity'];
/** Each stage's settings: the least value, and the greatest (seeds are below 2^32). */
const STAGE_SETTINGS: Record<StageName, Record<string, [number, number]>> = {
  evolve: {
    evaluations: [1, Number.MAX_SAFE_INTEGER],
    population: [4, Number.MAX_SAFE_INTEGER],
    seed: [0, 2 ** 32 - 1],
  },
  refine: { starts: [1, Number.MAX_SAFE_INTEGER], evaluations: [1, Number.MAX_SAFE_INTEGER] },
  sensitivity: { samples: [2, Number.MAX_SAFE_INTEGER] },
};

/** The most swept fields a sensitivity study takes (the Saltelli design's 2k Sobol dimensions). */
export const SENSITIVITY_MAX_FIELDS = 32;

function isMapping(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * Reads `sweep.stages`: a list whose items are `{ evolve: { evaluations, population, seed } }` or
 * `{ refine: { starts, evaluations } }` (settings optional: the commands' defaults), or the bare name.
 * Pushes the first problem on `issues` (its path names the field) and returns what it read.
 */
export function readStages(input: unknown, issues: InputIssue[], size?: ProblemSize): StageSpec[] {
  const defaults = size ? stageDefaults(size) : STAGE_DEFAULTS;
  if (input === undefined || input === null) return [];
  const base = ['sweep', 'stages'];
  if (!Array.isArray(input)) {
    issues.push({
      path: base,
      message: `expected a list of stages ({ evolve: { ... } } or { refine: { ... } }), got ${describeValue(input)}`,
    });
    return [];
  }
  const stages: StageSpec[] = [];
  for (let i = 0; i < input.length; i++) {
    const stage = readStage(input[i], [...base, i], issues, defaults, size);
    if (stage === null) return [];
    stages.push(stage);
  }
  return stages;
}

/** One item of `sweep.stages` at `path`, its settings defaulted; null after pushing its problem. */
function readStage(
  item: unknown,
  path: (string | number)[],
  issues: InputIssue[],
  defaults: ReturnType<typeof stageDefaults>,
  size: ProblemSize | undefined,
): StageSpec | null {
  let name: string;
  let settings: unknown;
  if (typeof item === 'string') {
    name = item;
    settings = {};
  } else if (isMapping(item) && Object.keys(item).length === 1) {
    name = Object.keys(item)[0] as string;
    settings = item[name] ?? {};
  } else {
    issues.push({
      path,
      message: `expected one stage, { evolve: { ... } }, { refine: { ... } } or { sensitivity: { ... } }, got ${describeValue(item)}`,
    });
    return null;
  }
  if (!(STAGE_NAMES as string[]).includes(name)) {
    const guess = suggest(name, STAGE_NAMES);
    issues.push({
      path,
      message: `unknown stage '${name}'${guess ? ` (did you mean '${guess}'?)` : `; expected one of ${STAGE_NAMES.join(', ')}`}`,
    });
    return null;
  }
  const stage = name as StageName;
  const values = readStageSettings(settings, [...path, stage], stage, issues);
  if (values === null) return null;
  if (stage === 'evolve')
    return {
      stage,
      evaluations: values.evaluations ?? defaults.evolve.evaluations,
      population: values.population ?? defaults.evolve.population,
      ...(values.seed !== undefined ? { seed: values.seed } : {}),
    };
  if (stage === 'refine')
    return {
      stage,
      starts: values.starts ?? defaults.refine.starts,
      evaluations: values.evaluations ?? defaults.refine.evaluations,
    };
  if (size && (size.dimensions < 1 || size.dimensions > SENSITIVITY_MAX_FIELDS)) {
    issues.push({
      path,
      message: `sensitivity needs 1 to ${SENSITIVITY_MAX_FIELDS} swept fields, the file has ${size.dimensions}`,
    });
    return null;
  }
  return { stage, samples: values.samples ?? STAGE_DEFAULTS.sensitivity.samples };
}

/** The settings of one stage at `path` (whole numbers within their bounds); null after pushing a problem. */
function readStageSettings(
  settings: unknown,
  path: (string | number)[],
  stage: StageName,
  issues: InputIssue[],
): Record<string, number> | null {
  if (!isMapping(settings)) {
    issues.push({
      path,
      message: `expected a mapping of settings (${Object.keys(STAGE_SETTINGS[stage]).join(', ')}), got ${describeValue(settings)}`,
    });
    return null;
  }
  const known = STAGE_SETTINGS[stage];
  const values: Record<string, number> = {};
  for (const [key, value] of Object.entries(settings)) {
    const bounds = Object.hasOwn(known, key) ? known[key] : undefined;
    if (bounds === undefined) {
      const guess = suggest(key, Object.keys(known));
      issues.push({
        path: [...path, key],
        message: guess
          ? `unknown key '${key}' (did you mean '${guess}'?)`
          : `unknown key '${key}'; expected one of ${Object.keys(known).join(', ')}`,
      });
      return null;
    }
    const [least, most] = bounds;
    if (typeof value !== 'number' || !Number.isInteger(value) || value < least || value > most) {
      issues.push({
        path: [...path, key],
        message: `expected a whole number of at least ${least}${most < Number.MAX_SAFE_INTEGER ? ` and at most ${most}` : ''}, got ${describeValue(value)}`,
      });
      return null;
    }
    values[key] = value;
  }
  return values;
}

/** The command a stage stands for, as a user would type it after the sweep. */
export function stageCommand(stage: StageSpec, directory: string): string {
  if (stage.stage === 'sensitivity')
    return `npx coilfront sensitivity ${join(directory, RUN_FILES.spec)} --samples ${stage.samples} --out ${directory}`;
  if (stage.stage === 'evolve')
    return `npx coilfront evolve ${directory} --evaluations ${stage.evaluations} --population ${stage.population}${stage.seed !== undefined ? ` --seed ${stage.seed}` : ''}`;
  return `npx coilfront refine ${directory} --starts ${stage.starts} --evaluations ${stage.evaluations}`;
}

/** A stage in words, for `check`: `evolve (2000 evaluations, population 60)`. */
export function describeStage(stage: StageSpec): string {
  if (stage.stage === 'sensitivity') return `sensitivity (${stage.samples} base samples)`;
  if (stage.stage === 'evolve')
    return `evolve (${stage.evaluations} evaluations, population ${stage.population}${stage.seed !== undefined ? `, seed ${stage.seed}` : ''})`;
  return `refine (${stage.starts} starts, ${stage.evaluations} evaluations)`;
}

/** The JSON Schema of `sweep.stages`. */
export function stagesSchema(): Record<string, unknown> {
  const whole = (minimum: number, maximum?: number) => ({
    type: 'integer',
    minimum,
    ...(maximum !== undefined ? { maximum } : {}),
  });
  const form = (name: StageName, properties: Record<string, unknown>) => ({
    type: 'object',
    properties: {
      [name]: { oneOf: [{ type: 'null' }, { type: 'object', properties, additionalProperties: false }] },
    },
    required: [name],
    additionalProperties: false,
  });
  return {
    type: 'array',
    description:
      'stages run in order on the run directory after the sweep, as the evolve, refine and sensitivity commands',
    items: {
      oneOf: [
        { enum: [...STAGE_NAMES] },
        form('evolve', { evaluations: whole(1), population: whole(4), seed: whole(0, 4294967295) }),
        form('refine', { starts: whole(1), evaluations: whole(1) }),
        form('sensitivity', { samples: whole(2) }),
      ],
    },
  };
}
