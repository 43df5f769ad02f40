/**
 * A stop asked of a stage (evolve, refine) while it runs: the stage polls `shouldStop` between its
 * batches and, when asked, throws StageStopped with nothing half-written. An evolve keeps its journal
 * (every finished generation is in it) and a refine is a pure function of the run, so the same stage
 * started again ends in the same files as a run that was never stopped.
 */

/** Asks whether the stage should stop now; polled between batches. */
export type ShouldStop = () => boolean;

/** Thrown by a stage that stopped because it was asked to (never for a failure). */
export class StageStopped extends Error {
  constructor(stage: string) {
    super(`${stage} stopped on request`);
    this.name = 'StageStopped';
  }
}

/** Throws StageStopped when `shouldStop` says so. */
export function stopIfAsked(shouldStop: ShouldStop | undefined, stage: string): void {
  if (shouldStop?.()) throw new StageStopped(stage);
}
