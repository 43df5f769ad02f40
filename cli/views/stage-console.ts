/**
 * What the stages print when they end: the improved designs with units, the hypervolume explained,
 * the files written (evolve, refine), and the words of a stage stopped by a signal, with the command
 * that resumes it.
 */
import { join } from 'node:path';
import type { EvolveOutcome } from '../../optimize/evolve-run.ts';
import type { RankedEntry } from '../../optimize/pareto/candidate-pool.ts';
import type { PackedRow } from '../../optimize/packed-row.ts';
import type { RefineOutcome } from '../../optimize/refine-run.ts';
import type { StopSignal } from '../../run/durable/stop-signal.ts';
import { RUN_FILES } from '../../run/run-directory.ts';
import { SAFETY_CAUTIONS } from '../safety.ts';
import { designLines, hypervolumeLines } from '../stage-outputs.ts';
import type { SweepSpec } from '../sweep-spec.ts';
import { stopReasonWords } from './sweep-lines.ts';

/** What evolve prints: the improved designs with units, the hypervolume explained, the files. */
export function evolveConsole(
  directory: string,
  spec: SweepSpec,
  seed: number,
  outcome: EvolveOutcome,
  improved: readonly RankedEntry<PackedRow>[],
  summaryPath: string,
  refinedEarlier: boolean,
): string[] {
  const lines = [
    `evolved ${outcome.generations} generations with ${outcome.evaluations} evaluations (seed ${seed}), starting from the sweep's kept candidates`,
  ];
  if (outcome.evolved.feasibleSize === 0) {
    lines.push(
      'no evolved design met every constraint: the front is unchanged (see the sweep for what rejects designs)',
    );
  } else if (improved.length === 0) {
    lines.push('no evolved design extends the front: the sweep front already dominates every one');
  } else {
    lines.push(`${improved.length} evolved designs extend the front (in ${RUN_FILES.evolved}, shown by their id):`);
    lines.push(...designLines(spec, improved, 'e', RUN_FILES.evolved));
  }
  lines.push(...hypervolumeLines(spec, outcome.hypervolumeBefore, outcome.hypervolumeAfter, outcome.referencePoint));
  lines.push(
    `files: ${join(directory, RUN_FILES.evolved)} (improved designs), ${join(directory, RUN_FILES.front)} (updated), ${summaryPath} (evolve section)`,
  );
  if (improved.length > 0) lines.push(`an evolved design: npx coilfront show ${directory} e1`);
  if (refinedEarlier)
    lines.push(
      `refined.csv predates this evolve and front.csv no longer lists it: npx coilfront refine ${directory} polishes the evolved front`,
    );
  else lines.push(`to polish the evolved front: npx coilfront refine ${directory}`);
  lines.push('', 'SAFETY', ...SAFETY_CAUTIONS, '');
  return lines;
}

/** What refine prints: the improved designs with units, the hypervolume explained, the files. */
export function refineConsole(
  directory: string,
  spec: SweepSpec,
  outcome: RefineOutcome,
  improved: readonly RankedEntry<PackedRow>[],
  improvedStarts: number,
  summaryPath: string,
): string[] {
  const lines = [
    `refined ${outcome.startResults.length} starts with ${outcome.evaluations} evaluations; ${improvedStarts} starts improved on their design`,
  ];
  if (outcome.refined.feasibleSize === 0) {
    lines.push(
      'no refined design met every constraint: the front is unchanged (see the sweep for what rejects designs)',
    );
  } else if (improved.length === 0) {
    lines.push('no refined design extends the front: the sweep front is already as good near every start');
  } else {
    lines.push(`${improved.length} refined designs extend the front (in refined.csv, shown by their id):`);
    lines.push(...designLines(spec, improved, 'r', RUN_FILES.refined));
  }
  lines.push(...hypervolumeLines(spec, outcome.hypervolumeBefore, outcome.hypervolumeAfter, outcome.referencePoint));
  lines.push(
    `files: ${join(directory, RUN_FILES.refined)} (improved designs), ${join(directory, RUN_FILES.refineTrials)} (every feasible trial), ${join(directory, RUN_FILES.front)} (updated), ${summaryPath} (refine section)`,
  );
  if (improved.length > 0) lines.push(`a refined design: npx coilfront show ${directory} r1`);
  lines.push('', 'SAFETY', ...SAFETY_CAUTIONS, '');
  return lines;
}

/**
 * The two lines of a stage run by its own command and stopped by a signal: what is kept, and the
 * command (`resume`) that carries it on to the files an unstopped run ends in.
 */
export function stageStoppedText(stop: StopSignal, kept: string, resume: string): string {
  return `stopped: ${stopReasonWords(stop)}; ${kept}\n  resume with: ${resume}\n`;
}
