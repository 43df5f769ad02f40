/**
 * The candidates of a tolerance study of a run, by the ids the run's other files use: the first `top`
 * ranks of candidates.csv (`3`, rebuilt from its sample index), or of refined.json (`r3`) or evolved.json
 * (`e3`), rebuilt from their full-precision values, never from the rounded CSV cells.
 */
import { fileError } from './input-errors.ts';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { isRobustMetric } from '../optimize/tolerance/robust-yield.ts';
import { optionError } from '../run/input-error.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import type { StudyCandidate } from '../run/tolerance-run.ts';
import { loadRunSpec } from './sweep-spec.ts';
import type { StudySetup } from './tolerance-setup.ts';
import type { ToleranceFile } from './tolerance-file.ts';
import type { StudySource } from './tolerance-outputs.ts';

const SOURCES: readonly StudySource[] = ['candidates', 'refined', 'evolved'];

function rankedCandidates(directory: string, space: DesignSpace, top: number): StudyCandidate[] {
  const path = join(directory, RUN_FILES.candidates);
  if (!existsSync(path))
    throw fileError(directory, `no ${RUN_FILES.candidates} (has the sweep finished or been stopped cleanly?)`);
  const rows = parseCsv(readFileSync(path, 'utf8'), { columns: true, skip_empty_lines: true }) as Record<
    string,
    string
  >[];
  if (rows.length === 0) throw fileError(directory, `the sweep has no feasible candidates to study`);
  const values = new Float64Array(space.dimensionCount);
  return rows.slice(0, top).map((row) => {
    const sampleIndex = Number(row.sample_index);
    space.valuesAt(sampleIndex, values);
    return { id: String(Number(row.rank)), sampleIndex, values: Array.from(values) };
  });
}

function stageCandidates(directory: string, source: 'refined' | 'evolved', top: number): StudyCandidate[] {
  const stage =
    source === 'refined'
      ? { file: RUN_FILES.refinedDesigns, prefix: 'r', command: 'refine' }
      : { file: RUN_FILES.evolvedDesigns, prefix: 'e', command: 'evolve' };
  const path = join(directory, stage.file);
  if (!existsSync(path))
    throw fileError(directory, `no ${source} designs yet (run npx coilfront ${stage.command} ${directory})`);
  const designs = JSON.parse(readFileSync(path, 'utf8')) as { rank: number | null; values: number[] }[];
  // Designs without a rank (evolved ones near an improved one) are there for later stages only.
  const ranked = designs.filter((d): d is { rank: number; values: number[] } => d.rank !== null);
  ranked.sort((a, b) => a.rank - b.rank);
  if (ranked.length === 0) throw fileError(path, `no ranked ${source} designs to study`);
  return ranked.slice(0, top).map((d) => ({ id: `${stage.prefix}${d.rank}`, sampleIndex: null, values: d.values }));
}

/** The setup of a study of a run directory. */
export function runStudySetup(
  target: string,
  file: ToleranceFile | null,
  top: number,
  from: string | undefined,
): StudySetup {
  const source = (from ?? 'candidates') as StudySource;
  if (!SOURCES.includes(source)) throw optionError('--from', `expected one of ${SOURCES.join(', ')}, got '${from}'`);
  const spec = loadRunSpec(target);
  const section = file?.tolerances ?? spec.tolerances ?? null;
  if (!section)
    throw fileError(target, `the sweep file has no tolerances: section; add one, or give --tolerances FILE`);
  const definition = spaceDefinitionOf(spec);
  const space = new DesignSpace(definition);
  return {
    // The robust merits are the sweep's own (a few draws per design): the study measures them afresh.
    constraints: [...spec.constraints, ...(file?.constraints ?? [])].filter((c) => !isRobustMetric(c.metric)),
    objectives: [...spec.objectives, ...(file?.objectives ?? [])].filter((o) => !isRobustMetric(o.metric)),
    // The metrics of the sweep's quantile merits are reported with the rest.
    extraMetrics: [...(spec.robust?.quantiles ?? []).map((q) => q.metric), ...(file?.metrics ?? [])],
    candidates: source === 'candidates' ? rankedCandidates(target, space, top) : stageCandidates(target, source, top),
    base: { ...definition, seed: section.seed ?? spec.seed },
    section,
    identity: spec.hash,
    sourceFile: join(target, RUN_FILES.spec),
    out: target,
    source,
  };
}
