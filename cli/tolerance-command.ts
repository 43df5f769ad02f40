/**
 * `coilfront tolerance RUN [--top 20] [--draws 256]` and `coilfront tolerance design.yaml --tolerances FILE`:
 * each candidate built `draws` times the way things are really built (optimize/tolerance: the same scrambled
 * Sobol draws for every candidate), evaluated in the sweep's worker pool; per candidate the yield (the
 * fraction of builds that would be feasible candidates of the sweep) with its 95 % Wilson interval, and the
 * 5 %, 50 % and 95 % quantiles of every objective and constrained metric.
 *
 * Writes tolerance.csv and tolerance.json beside the run (or into --out for a design), each written whole
 * then renamed. Every finished candidate is appended to tolerance-journal.log (CRC-framed, cli/durable), so
 * a stopped study resumes where it stopped and a rerun reuses what it has: the results are a pure function
 * of the inputs, so resumed and uninterrupted runs give the same files.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, statSync, unlinkSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { METRICS, METRIC_KEYS } from '../core/metrics.ts';
import { DesignSpace, type SpaceDefinition, spaceDefinitionOf } from '../optimize/design-space.ts';
import { type BatchEvaluator, inProcessEvaluator } from '../optimize/evaluate-batch.ts';
import {
  type CandidateTolerance,
  candidateTolerance,
  ToleranceSetupError,
  toleranceSpace,
  type ToleranceSettings,
} from '../optimize/tolerance/index.ts';
import { createWorkerPool, defaultWorkerCount } from '../workers/pool.ts';
import { type Cell, toCsv } from '../run/csv.ts';
import { METRIC_DISPLAY, formatNumber } from './display-units.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { openJournal } from '../run/durable/journal.ts';
import { lockRunOrRefuse } from '../run/sweep-setup.ts';
import { fieldError, InputError, type InputIssue, optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { loadDesignFile } from './load-design.ts';
import { readInputFile } from './read-file.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { SAFETY_LINE, safetyBlock } from './safety.ts';
import { readConstraints, readObjectives, loadRunSpec } from './sweep-spec.ts';
import type { ConstraintDefinition, ObjectiveDefinition } from '../optimize/sweep-state.ts';
import { isRobustMetric } from '../optimize/tolerance/robust-yield.ts';
import { suggest } from './suggest.ts';
import { readTolerances, type ToleranceSection } from './tolerance-spec.ts';
import { describeValue } from './units.ts';

export interface ToleranceCommandOptions {
  top?: number;
  draws?: number;
  tolerances?: string;
  workers?: number;
  out?: string;
}

export const TOLERANCE_FILES = { csv: 'tolerance.csv', json: 'tolerance.json', journal: 'tolerance-journal.log' };

/** What a `--tolerances FILE` holds: the section, and for a lone design what to check and report. */
interface ToleranceFile {
  tolerances: ToleranceSection;
  constraints: ConstraintDefinition[];
  objectives: ObjectiveDefinition[];
  metrics: string[];
}

const FILE_KEYS = ['tolerances', 'constraints', 'objectives', 'metrics'];

function readToleranceFile(file: string): ToleranceFile {
  const value = readInputFile(file);
  const issues: InputIssue[] = [];
  const fail = (): never => {
    throw fieldError(file, issues[0]);
  };
  if (typeof value !== 'object' || value === null || Array.isArray(value))
    throw new InputError(
      `${file}: expected a mapping with tolerances (and constraints, objectives, metrics), got ${describeValue(value)}`,
    );
  const input = value as Record<string, unknown>;
  for (const key of Object.keys(input)) {
    if (FILE_KEYS.includes(key)) continue;
    const guess = suggest(key, FILE_KEYS);
    issues.push({
      path: [key],
      message: guess
        ? `unknown key '${key}' (did you mean '${guess}'?)`
        : `unknown key '${key}'; expected one of ${FILE_KEYS.join(', ')}`,
    });
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
  const metrics: string[] = [];
  if (input.metrics !== undefined) {
    if (!Array.isArray(input.metrics)) {
      issues.push({
        path: ['metrics'],
        message: `expected a list of metric names, got ${describeValue(input.metrics)}`,
      });
      fail();
    }
    (input.metrics as unknown[]).forEach((name, i) => {
      if (typeof name !== 'string' || !METRIC_KEYS.includes(name)) {
        const guess = typeof name === 'string' ? suggest(name, [...METRIC_KEYS]) : null;
        issues.push({
          path: ['metrics', i],
          message: `unknown metric ${describeValue(name)}${guess ? ` (did you mean '${guess}'?)` : '; see the README for the list'}`,
        });
      } else metrics.push(name);
    });
    if (issues.length) fail();
  }
  return { tolerances: tolerances as ToleranceSection, constraints, objectives, metrics };
}

/** One candidate of the study: how the files name it, and its values in the sweep's space. */
interface StudyCandidate {
  rank: number | null;
  sampleIndex: number | null;
  values: number[];
}

function runCandidates(directory: string, top: number): StudyCandidate[] {
  const path = join(directory, RUN_FILES.candidates);
  if (!existsSync(path))
    throw new InputError(`${directory}: no ${RUN_FILES.candidates} (has the sweep finished or been stopped cleanly?)`);
  const rows = parseCsv(readFileSync(path, 'utf8'), { columns: true, skip_empty_lines: true }) as Record<
    string,
    string
  >[];
  if (rows.length === 0) throw new InputError(`${directory}: the sweep has no feasible candidates to study`);
  return rows
    .slice(0, top)
    .map((row) => ({ rank: Number(row.rank), sampleIndex: Number(row.sample_index), values: [] }));
}

function metricColumn(key: string, quantile: string): string {
  const display = METRIC_DISPLAY[key];
  if (display) return `${key}_${quantile}_${display.label}`;
  const unit = METRICS.find((m) => m.key === key)?.unit ?? '';
  return unit === '' || unit === 'count' ? `${key}_${quantile}` : `${key}_${quantile}_${unit.replace('/', '_per_')}`;
}

function displayValue(key: string, value: number | null): number | null {
  if (value === null) return null;
  return value / (METRIC_DISPLAY[key]?.divisor ?? 1);
}

function hashOf(value: unknown): string {
  return createHash('sha256').update(JSON.stringify(value)).digest('hex');
}

export async function toleranceCommand(target: string, options: ToleranceCommandOptions, io: CliIo): Promise<number> {
  const top = options.top ?? 20;
  if (!Number.isInteger(top) || top < 1)
    throw optionError('--top', `expected a whole number of at least 1, got ${top}`);
  if (
    options.draws !== undefined &&
    (!Number.isInteger(options.draws) || options.draws < 1 || options.draws > 1_000_000)
  )
    throw optionError('--draws', `expected a whole number from 1 to 1000000, got ${options.draws}`);
  if (!existsSync(target)) throw new InputError(`${target}: no such run directory or design file`);
  const isRun = statSync(target).isDirectory();
  const file = options.tolerances ? readToleranceFile(options.tolerances) : null;

  let base: SpaceDefinition;
  let section: ToleranceSection;
  let constraints: ConstraintDefinition[];
  let objectives: ObjectiveDefinition[];
  let candidates: StudyCandidate[];
  let identity: string;
  let sourceFile: string;
  let out: string;
  if (isRun) {
    const spec = loadRunSpec(target);
    const given = file?.tolerances ?? spec.tolerances ?? null;
    if (!given)
      throw new InputError(`${target}: the sweep file has no tolerances: section; add one, or give --tolerances FILE`);
    section = given;
    // build_yield is the sweep's own robust merit (a few draws per design): the study measures it afresh.
    constraints = [...spec.constraints, ...(file?.constraints ?? [])].filter((c) => !isRobustMetric(c.metric));
    objectives = [...spec.objectives, ...(file?.objectives ?? [])].filter((o) => !isRobustMetric(o.metric));
    base = spaceDefinitionOf(spec);
    const space = new DesignSpace(base);
    candidates = runCandidates(target, top).map((c) => {
      const values = new Float64Array(base.dimensions.length);
      space.valuesAt(c.sampleIndex as number, values);
      return { ...c, values: Array.from(values) };
    });
    identity = spec.hash;
    sourceFile = join(target, RUN_FILES.spec);
    out = target;
    base = { ...base, seed: section.seed ?? spec.seed };
  } else {
    if (!file) throw optionError('--tolerances', `required for a design file (${target}): the file of spreads`);
    section = file.tolerances;
    constraints = file.constraints;
    objectives = file.objectives;
    const loaded = loadDesignFile(target);
    base = {
      tree: loaded.tree,
      dimensions: [],
      method: 'random',
      samples: 1,
      seed: section.seed ?? 1,
      gridLevels: null,
    };
    candidates = [{ rank: null, sampleIndex: null, values: [] }];
    identity = hashOf(loaded.tree);
    sourceFile = target;
    out = options.out ?? '.';
  }
  const metrics = [
    ...new Set([...objectives.map((o) => o.metric), ...constraints.map((c) => c.metric), ...(file?.metrics ?? [])]),
  ];
  if (metrics.length === 0)
    throw new InputError(`${options.tolerances ?? target}: nothing to report: give constraints, objectives or metrics`);
  const draws = options.draws ?? section.draws ?? 256;
  let space: ReturnType<typeof toleranceSpace>;
  try {
    space = toleranceSpace(base, section.fields);
  } catch (error) {
    if (error instanceof ToleranceSetupError)
      throw fieldError(options.tolerances ?? sourceFile, {
        path: ['tolerances', ...error.path],
        message: error.message,
      });
    throw error;
  }
  const settings: ToleranceSettings = {
    draws,
    seed: base.seed,
    constraints,
    required: objectives.map((o) => o.metric),
    metrics,
  };
  mkdirSync(out, { recursive: true });
  // One study (or sweep, refine, evolve) at a time in a directory: the journal has one writer.
  const lock = lockRunOrRefuse(out);
  try {
    return await study();
  } finally {
    lock.release();
  }

  async function study(): Promise<number> {
    // The journal: a header naming everything that decides the results, then one record per finished candidate.
    const header = { format: 'coilfront-tolerance', identity, fields: section.fields, settings };
    const headerHash = hashOf(header);
    const journalPath = join(out, TOLERANCE_FILES.journal);
    let journal = openJournal(journalPath);
    const first = journal.recovered.records[0] as { header?: string } | undefined;
    if (first !== undefined && first.header !== headerHash) {
      io.err('tolerance: the journal belongs to other settings; starting afresh\n');
      journal.close();
      unlinkSync(journalPath);
      journal = openJournal(journalPath);
    }
    if (journal.recordCount === 0) {
      journal.append({ header: headerHash });
      journal.sync();
    }
    const done = new Map<string, CandidateTolerance>();
    for (const record of journal.recovered.records.slice(1) as { key: string; result: CandidateTolerance }[])
      done.set(record.key, record.result);

    const threads = options.workers ?? defaultWorkerCount();
    const evaluator: BatchEvaluator =
      threads === 0
        ? inProcessEvaluator(new DesignSpace(space.definition))
        : createWorkerPool(space.definition, { threads });
    settings.batchSize = Math.max(4, Math.min(64, Math.ceil(draws / Math.max(1, threads * 4))));
    const results: CandidateTolerance[] = [];
    let reused = 0;
    try {
      for (let c = 0; c < candidates.length; c++) {
        const candidate = candidates[c];
        const key = hashOf(candidate.values);
        let result = done.get(key);
        if (result) reused++;
        else {
          result = await candidateTolerance(space, evaluator, candidate.values, settings);
          journal.append({ key, result });
          journal.sync();
        }
        results.push(result);
        io.err(`tolerance: ${c + 1}/${candidates.length} candidates\n`);
      }
    } finally {
      await evaluator.close();
      journal.close();
    }
    if (reused > 0) io.err(`tolerance: ${reused} of ${candidates.length} candidates taken from the journal\n`);

    const head = ['rank', 'sample_index', 'draws', 'passing', 'impossible', 'yield', 'yield_low', 'yield_high'];
    for (const metric of metrics) head.push(...['p05', 'p50', 'p95'].map((q) => metricColumn(metric, q)));
    const rows: Cell[][] = results.map((result, c) => {
      const row: Cell[] = [candidates[c].rank ?? 'design', candidates[c].sampleIndex, result.draws, result.passing];
      row.push(result.impossible, result.yield.estimate, result.yield.low, result.yield.high);
      for (const q of result.quantiles)
        row.push(displayValue(q.metric, q.p05), displayValue(q.metric, q.p50), displayValue(q.metric, q.p95));
      return row;
    });
    writeFileAtomicSync(join(out, TOLERANCE_FILES.csv), toCsv(head, rows));
    const json = {
      safety: SAFETY_LINE,
      source: sourceFile,
      draws,
      seed: base.seed,
      units: 'SI',
      fields: section.fields.map((f) => ({ ...f, path: f.path.join('.') })),
      constraints,
      metrics,
      candidates: results.map((result, c) => ({
        rank: candidates[c].rank,
        sample_index: candidates[c].sampleIndex,
        ...result,
      })),
    };
    writeFileAtomicSync(join(out, TOLERANCE_FILES.json), `${JSON.stringify(json, null, 2)}\n`);

    io.out(
      `Tolerance study: ${draws} builds per candidate, ${section.fields.length} toleranced fields, yield with 95 % Wilson interval\n`,
    );
    const shown = metrics[0];
    for (let c = 0; c < results.length; c++) {
      const r = results[c];
      const name = candidates[c].rank === null ? 'design' : `rank ${candidates[c].rank}`;
      const q = r.quantiles[0];
      const spread =
        q.p05 === null
          ? ''
          : `   ${shown} 5/50/95 %: ${[q.p05, q.p50, q.p95].map((v) => formatNumber(displayValue(shown, v) as number)).join(' / ')} ${METRIC_DISPLAY[shown]?.label ?? ''}`;
      io.out(
        `${name.padEnd(9)} yield ${(100 * r.yield.estimate).toFixed(1).padStart(5)} % [${(100 * r.yield.low).toFixed(1)}, ${(100 * r.yield.high).toFixed(1)}]  ${r.passing}/${r.draws}${spread}\n`,
      );
    }
    io.out(`files: ${join(out, TOLERANCE_FILES.csv)}, ${join(out, TOLERANCE_FILES.json)}\n\n${safetyBlock()}\n`);
    return 0;
  }
}
