/**
 * Runs the stages of a sweep file (`sweep.stages`) on a finished run directory, each through the
 * function of its command (evolveCommand, refineCommand), exactly as if the user had typed them.
 *
 * Progress: stages.json in the run directory lists the stages finished so far (written atomically
 * after the sweep's outputs and after each stage). `sweep --resume DIR` of a run with stages.json skips
 * the finished sweep and continues at the first stage not listed there; a stage cut off mid-way
 * continues from its own journal (evolve) or runs again from the sweep's checkpoint (refine, which is
 * a pure function of the run), so the files end byte-identical to an uninterrupted run.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { evolveCommand } from './evolve-command.ts';
import type { CliIo } from './io.ts';
import { refineCommand } from './refine-command.ts';
import { type StageSpec, stageCommand } from './sweep-stages.ts';

/** What stages.json holds: the stages finished so far, in order, as the sweep file gave them. */
interface StagesProgress {
  format: 'coilfront-stages';
  version: 1;
  finished: StageSpec[];
}

/** Whether the run has begun its stages (the sweep's outputs are then written and must stay). */
export function stagesStarted(directory: string): boolean {
  return existsSync(join(directory, RUN_FILES.stages));
}

function readProgress(directory: string): StageSpec[] {
  const path = join(directory, RUN_FILES.stages);
  if (!existsSync(path)) return [];
  try {
    const data = JSON.parse(readFileSync(path, 'utf8')) as StagesProgress;
    return Array.isArray(data.finished) ? data.finished : [];
  } catch {
    // A damaged progress file: every stage runs again (each is a pure function of the run).
    return [];
  }
}

/** Records the stages finished so far (atomically). */
export function writeStagesProgress(directory: string, finished: readonly StageSpec[]): void {
  const data: StagesProgress = { format: 'coilfront-stages', version: 1, finished: [...finished] };
  writeFileAtomicSync(join(directory, RUN_FILES.stages), `${JSON.stringify(data, null, 2)}\n`);
}

/**
 * Runs the stages not yet finished, in order, each through its command's own function, recording
 * each in stages.json as it ends. A stage finished under other settings (the list was edited) and all
 * after it run again. Returns the first non-zero exit code of a stage, or 0.
 */
export async function runStages(
  directory: string,
  stages: readonly StageSpec[],
  workers: number | undefined,
  io: CliIo,
  log: (line: string) => void,
): Promise<number> {
  const finished = readProgress(directory);
  let done = 0;
  while (
    done < stages.length &&
    done < finished.length &&
    JSON.stringify(finished[done]) === JSON.stringify(stages[done])
  )
    done++;
  const kept = stages.slice(0, done);
  if (done > 0 && done < stages.length)
    log(`resuming the stages of ${directory}: ${done} of ${stages.length} finished`);
  for (let i = done; i < stages.length; i++) {
    const stage = stages[i] as StageSpec;
    log(`stage ${i + 1} of ${stages.length}: ${stageCommand(stage, directory)}`);
    const code =
      stage.stage === 'evolve'
        ? await evolveCommand(
            directory,
            {
              evaluations: stage.evaluations,
              population: stage.population,
              ...(stage.seed !== undefined ? { seed: stage.seed } : {}),
              ...(workers !== undefined ? { workers } : {}),
            },
            io,
          )
        : await refineCommand(
            directory,
            { starts: stage.starts, evaluations: stage.evaluations, ...(workers !== undefined ? { workers } : {}) },
            io,
          );
    if (code !== 0) return code;
    kept.push(stage);
    writeStagesProgress(directory, kept);
  }
  return 0;
}
