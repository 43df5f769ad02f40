/**
 * The files a finished stage writes into its run directory: evolve's evolved.csv and .json, refine's
 * refined.csv and .json and refine-trials.csv, the merged front.csv, and the stage's section of
 * summary.json. Each is written whole (atomically), after the stage's last evaluation.
 */
import { join } from 'node:path';
import type { EvolveOutcome } from '../optimize/evolve-run.ts';
import type { RefineOutcome } from '../optimize/refine-run.ts';
import { toCsv } from '../run/csv.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { RUN_FILES, type RunRecord, runDigits } from '../run/run-directory.ts';
import { columnSet } from './sweep-columns.ts';
import { type candidateNumbering, rankedRows, sortedFront } from './sweep-outputs.ts';
import type { SweepSpec } from './sweep-spec.ts';
import {
  improvedDesigns,
  type readStageDesigns,
  writeMergedFront,
  writeStageDesigns,
  writeSummarySection,
} from './stage-outputs.ts';

/** The sweep's candidates.csv numbering, which the merged front keeps for the sweep's designs. */
type Numbering = ReturnType<typeof candidateNumbering>;

/** evolved.csv and .json, the merged front and the summary's evolve section. */
export async function writeEvolveOutputs(
  directory: string,
  spec: SweepSpec,
  record: RunRecord,
  outcome: EvolveOutcome,
  run: {
    seed: number;
    population: number;
    evaluationBudget: number;
    candidates: Numbering;
    wallSeconds: number;
    threads: number;
  },
) {
  const { seed, candidates } = run;
  const front = sortedFront(outcome.merged);
  const improved = improvedDesigns(front, spec.samples);
  const kept = new Set(improved);
  const near = front.filter((entry) => entry.item.index >= spec.samples && !kept.has(entry));
  const digits = runDigits(record);
  const files = { csv: RUN_FILES.evolved, json: RUN_FILES.evolvedDesigns, digits };
  writeStageDesigns(directory, spec, improved, 'e', files, near);
  const ids = new Map(improved.map((entry, i) => [entry.item.index, `e${i + 1}`]));
  await writeMergedFront(directory, spec, front, { candidates, ids, stageOf: () => 'evolved', digits }, improved);
  const summaryPath = writeSummarySection(directory, 'evolve', {
    seed,
    population: run.population,
    generations: outcome.generations,
    evaluations: outcome.evaluations,
    evaluation_budget: run.evaluationBudget,
    improved_designs: improved.length,
    evolved_feasible: outcome.evolved.feasibleSize,
    front_size: front.length,
    hypervolume_before: outcome.hypervolumeBefore,
    hypervolume_after: outcome.hypervolumeAfter,
    reference_point: outcome.referencePoint,
    timing: { wall_seconds: run.wallSeconds, workers: run.threads },
  });
  return { improved, summaryPath };
}

/** refine-trials.csv, refined.csv and .json, the merged front and the summary's refine section. */
export async function writeRefineOutputs(
  directory: string,
  spec: SweepSpec,
  record: RunRecord,
  outcome: RefineOutcome,
  run: {
    /** The evolved designs of evolved.json, numbered from spec.samples. */
    evolved: ReturnType<typeof readStageDesigns>;
    /** The index of the first refined design (after the samples and the evolved designs). */
    firstRefined: number;
    evaluationBudget: number;
    candidates: Numbering;
    /** performance.now() when the stage began (the summary's wall time runs to its writing). */
    started: number;
    threads: number;
  },
) {
  const { evolved, firstRefined, candidates } = run;
  const columns = columnSet(spec.dimensions);
  const indexColumn = columns.header.indexOf('sample_index');
  // Every feasible trial point, ranked, goes to refine-trials.csv; refined.csv holds only the
  // improved designs: the refined ones on the merged front, one per distinct objective vector.
  const trials = outcome.refined.ranked(record.keep);
  const trialRows = rankedRows(spec.dimensions, trials);
  for (const row of trialRows) row[indexColumn] = null;
  writeFileAtomicSync(join(directory, RUN_FILES.refineTrials), toCsv(columns.header, trialRows));
  const front = sortedFront(outcome.merged);
  const improved = improvedDesigns(front, firstRefined);
  const digits = runDigits(record);
  writeStageDesigns(directory, spec, improved, 'r', { csv: RUN_FILES.refined, json: RUN_FILES.refinedDesigns, digits });
  // A refined design is known by its id in refined.csv (`show RUN r3`), an evolved one by its e-id.
  const ids = new Map<number, string>([
    ...evolved.flatMap((design, k): [number, string][] => (design.id ? [[spec.samples + k, design.id]] : [])),
    ...improved.map((entry, i): [number, string] => [entry.item.index, `r${i + 1}`]),
  ]);
  const stageOf = (index: number) => (index < firstRefined ? 'evolved' : 'refined');
  await writeMergedFront(directory, spec, front, { candidates, ids, stageOf, digits }, improved);
  const improvedStarts = outcome.startResults.filter((r) => r.improved).length;
  const summaryPath = writeSummarySection(directory, 'refine', {
    starts: outcome.startResults.length,
    improved_starts: improvedStarts,
    improved_designs: improved.length,
    evaluations: outcome.evaluations,
    evaluation_budget: run.evaluationBudget,
    refined_feasible: outcome.refined.feasibleSize,
    front_size: front.length,
    hypervolume_before: outcome.hypervolumeBefore,
    hypervolume_after: outcome.hypervolumeAfter,
    reference_point: outcome.referencePoint,
    timing: { wall_seconds: (performance.now() - run.started) / 1000, workers: run.threads },
  });
  return { improved, improvedStarts, summaryPath };
}
