/**
 * Runs the stages of a sweep file (`sweep.stages`) on a finished run directory, each through the
 * function of its command (evolveCommand, refineCommand; sensitivityStage, the sensitivity command's study
 * with its outputs also in summary.json), exactly as if the user had typed them.
 *
 * Progress: stages.json in the run directory lists the stages finished so far (written atomically
 * after the sweep's outputs and after each stage). `sweep --resume DIR` of a run with stages.json skips
 * the finished sweep and continues at the first stage not listed there; a stage cut off mid-way
 * continues from its own journal (evolve) or runs again from the sweep's checkpoint (refine, which is
 * a pure function of the run; sensitivity from its journal), so the files end byte-identical to an
 * uninterrupted run.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { StageStopped, type ShouldStop } from '../optimize/stage-stop.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { installStopSignal, type StopSignal } from '../run/durable/stop-signal.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { evolveCommand } from './evolve-command.ts';
import type { CliIo } from './io.ts';
import { refineCommand } from './refine-command.ts';
import { sensitivityStage } from './sensitivity-study.ts';
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
  /** Where the stop line and its resume hint go (printed even when the stages are quiet); io.err unless given. */
  notify: (text: string) => void = io.err,
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
  // Ctrl-C or SIGTERM in a stage: it stops between batches, its journal (evolve) kept, and the run resumes.
  const stop = installStopSignal({ log });
  const shouldStop = () => stop.stopRequested;
  try {
    for (let i = done; i < stages.length; i++) {
      const stage = stages[i] as StageSpec;
      if (stop.stopRequested) return stoppedIn(stop, i, stages.length, directory, notify);
      log(`stage ${i + 1} of ${stages.length}: ${stageCommand(stage, directory)}`);
      let code: number;
      try {
        code = await runStage(stage, directory, workers, shouldStop, io);
      } catch (error) {
        if (error instanceof StageStopped) return stoppedIn(stop, i, stages.length, directory, notify);
        throw error;
      }
      if (code !== 0) return code;
      kept.push(stage);
      writeStagesProgress(directory, kept);
    }
  } finally {
    stop.dispose();
  }
  return 0;
}

/** One stage through its command's own function. */
function runStage(
  stage: StageSpec,
  directory: string,
  workers: number | undefined,
  shouldStop: ShouldStop,
  io: CliIo,
): Promise<number> {
  const pool = workers !== undefined ? { workers } : {};
  if (stage.stage === 'sensitivity')
    return sensitivityStage(directory, { samples: stage.samples, ...pool, shouldStop }, io);
  if (stage.stage === 'evolve')
    return evolveCommand(
      directory,
      {
        evaluations: stage.evaluations,
        population: stage.population,
        ...(stage.seed !== undefined ? { seed: stage.seed } : {}),
        ...pool,
        shouldStop,
      },
      io,
    );
  return refineCommand(directory, { starts: stage.starts, evaluations: stage.evaluations, ...pool, shouldStop }, io);
}

/** The stop of a stage in words, with the sweep's resume hint; the exit code of the stop. */
function stoppedIn(
  stop: StopSignal,
  index: number,
  count: number,
  directory: string,
  notify: (text: string) => void,
): number {
  const why = stop.reason === 'time-limit' ? 'the time limit was reached' : `${stop.signal ?? 'a signal'} was received`;
  notify(
    `stopped: ${why} in stage ${index + 1} of ${count}; the sweep's outputs are in ${directory}\n  resume with: npx coilfront sweep --resume ${directory}\n`,
  );
  return stop.exitCode();
}
