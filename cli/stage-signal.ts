/**
 * The stop request of a stage (evolve, refine). Under the sweep's stages the caller passes its own
 * `shouldStop` and reports a stop itself (cli/stage-runner.ts). Run by its own command, the stage
 * watches Ctrl-C and SIGTERM itself: it stops between batches with nothing half-written (evolve's
 * journal kept, refine a pure function of the run), prints what is kept and the one command that
 * resumes it, and ends with 130 or 143.
 */
import { StageStopped, type ShouldStop } from '../optimize/stage-stop.ts';
import { installStopSignal } from '../run/durable/stop-signal.ts';
import type { CliIo } from './io.ts';
import { stageStoppedText } from './views/stage-console.ts';

/** A stage's stop request, polled by the stage, and the way a stop ends its command. */
export interface StageStop {
  shouldStop: ShouldStop;
  /**
   * For an error out of the stage: when it is the stage's own stop, prints the stop and its resume
   * command and returns the exit code (128 + the signal's number); otherwise null (rethrow it).
   */
  stopped(error: unknown, kept: string, resume: string): number | null;
  /** Removes the signal handlers (the caller's stop is left alone). */
  dispose(): void;
}

/** The caller's `shouldStop` when given; else a stop on SIGINT or SIGTERM of this command's own. */
export function stageStop(given: ShouldStop | undefined, io: CliIo): StageStop {
  if (given !== undefined) return { shouldStop: given, stopped: () => null, dispose: () => undefined };
  const own = installStopSignal({ log: (line) => io.err(`${line}\n`) });
  return {
    shouldStop: () => own.stopRequested,
    stopped(error, kept, resume) {
      if (!(error instanceof StageStopped) || !own.stopRequested) return null;
      io.err(stageStoppedText(own, kept, resume));
      return own.exitCode();
    },
    dispose: () => own.dispose(),
  };
}
