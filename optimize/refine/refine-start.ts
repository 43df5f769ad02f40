import type { EvaluationCache } from './evaluation-cache.ts';
import { isBetterMerit, meritDistance } from './merit.ts';
import type { Merit } from './merit.ts';
import { copyMixedPoint, mixedPoint } from './mixed-point.ts';
import type { MixedPoint } from './mixed-point.ts';
import { NelderMead } from './nelder-mead.ts';
import type { MinimizeResult, NelderMeadOptions } from './nelder-mead.ts';
import { neighbourPass } from './neighbour-pass.ts';
import { refineRangeError } from './refine-errors.ts';
import { StartLedger } from './start-ledger.ts';
import type { MeritOf } from './start-ledger.ts';

/** Options of one refinement start. */
export interface RefineStartOptions {
  /** Number of ordered levels of each discrete parameter (empty or absent: none). */
  levelCounts?: ReadonlyArray<number>;
  /** Distinct designs this start may evaluate, the start itself included (default 200·(n+1)). */
  maxEvaluations?: number;
  /** Most Nelder–Mead + neighbour-pass rounds (default 8). */
  maxRounds?: number;
  /**
   * Most Nelder–Mead runs in a row within a round (default 4): a converged run is started again
   * from its result with a fresh simplex while the last run improved the merit by more than its
   * fatol, the simple remedy for a stagnating simplex (C. T. Kelley, "Detection and remediation of
   * stagnation in the Nelder–Mead algorithm using a sufficient decrease condition", SIAM J.
   * Optim. 10 (1999) 43–55, restarts with a new simplex at the best point).
   */
  maxNelderMeadRuns?: number;
  /**
   * Options of each Nelder–Mead run on the continuous coordinates (default bounds: the unit cube;
   * its maxEvaluations is capped by what is left of the start's budget).
   */
  nelderMead?: NelderMeadOptions;
}

/** One step of a start's course, for the refine report. */
export interface RefineTraceEntry {
  phase: 'start' | 'nelder-mead' | 'neighbour-pass';
  /** Distinct designs used by the start after this step. */
  evaluationsUsed: number;
  /** Incumbent merit after this step. */
  merit: Merit;
  /** Whether this step improved the incumbent. */
  improved: boolean;
}

/** Why a start stopped. */
export type RefineStartStatus = 'converged' | 'max_evaluations' | 'max_rounds';

/** Result of one refinement start. */
export interface RefineStartResult {
  /** Best design found (the start's own design if nothing was better). */
  point: MixedPoint;
  merit: Merit;
  /** Merit of the start's design. */
  startMerit: Merit;
  /** True when the result is strictly better than the start by Deb's rules. */
  improved: boolean;
  /** Distinct designs this start evaluated (cache hits from other starts included). */
  evaluations: number;
  rounds: number;
  /** Level moves accepted by neighbour passes. */
  neighbourMoves: number;
  /** The result record of each Nelder–Mead run, in order. */
  nelderMeadRuns: MinimizeResult[];
  status: RefineStartStatus;
  trace: RefineTraceEntry[];
}

/**
 * Refines one start end to end: evaluates it, runs Nelder–Mead on the continuous coordinates with
 * the discrete levels held, then a neighbour pass on the discrete levels with the continuous ones
 * held, and alternates while the neighbour pass moves (a new level can move the continuous
 * optimum). Stops when a neighbour pass finds nothing better, when the budget is spent, or after
 * `maxRounds`. Deterministic for the same inputs, whatever else shares the cache.
 *
 * @param start continuous coordinates in the unit cube (or the NM bounds) and discrete levels
 * @param cache the shared evaluation cache (records of every design evaluated stay in it)
 * @param meritOf scores a record for this start (the start's own Chebyshev weights, say)
 */
export async function refineStart<R>(
  start: { continuous: ArrayLike<number>; levels?: ArrayLike<number> },
  cache: EvaluationCache<R>,
  meritOf: MeritOf<R>,
  options: RefineStartOptions = {},
): Promise<RefineStartResult> {
  const { startPoint, levelCounts, budget, maxRounds, maxNelderMeadRuns, nelderMeadOptions } = checkedStart(
    start,
    options,
  );
  const dimension = startPoint.continuous.length;
  const ledger = new StartLedger(cache, meritOf, budget);
  const [startMerit] = await ledger.merits([startPoint]);
  let incumbent = { point: copyMixedPoint(startPoint), merit: startMerit };
  const trace: RefineTraceEntry[] = [
    { phase: 'start', evaluationsUsed: ledger.used, merit: startMerit, improved: false },
  ];
  const nelderMeadRuns: MinimizeResult[] = [];
  let neighbourMoves = 0;
  let rounds = 0;
  let status: RefineStartStatus = 'max_rounds';

  while (rounds < maxRounds) {
    if (ledger.remaining === 0) {
      status = 'max_evaluations';
      break;
    }
    rounds++;
    if (dimension > 0) {
      incumbent = await nelderMeadPhase(incumbent, ledger, maxNelderMeadRuns, nelderMeadOptions, nelderMeadRuns, trace);
    }
    if (levelCounts.length === 0) {
      status = ledger.remaining === 0 ? 'max_evaluations' : 'converged';
      break;
    }
    const pass = await neighbourPass(incumbent, levelCounts, ledger);
    neighbourMoves += pass.moves;
    const moved = pass.moves > 0;
    if (moved) incumbent = { point: pass.point, merit: pass.merit };
    trace.push({ phase: 'neighbour-pass', evaluationsUsed: ledger.used, merit: incumbent.merit, improved: moved });
    if (pass.outOfBudget) {
      status = 'max_evaluations';
      break;
    }
    if (!moved || dimension === 0) {
      status = 'converged';
      break;
    }
  }
  return {
    point: incumbent.point,
    merit: incumbent.merit,
    startMerit,
    improved: isBetterMerit(incumbent.merit, startMerit),
    evaluations: ledger.used,
    rounds,
    neighbourMoves,
    nelderMeadRuns,
    status,
    trace,
  };
}

/** The start as a mixed point and the options with their defaults, checked: a RangeError names the first one out of range. */
function checkedStart(
  start: { continuous: ArrayLike<number>; levels?: ArrayLike<number> },
  options: RefineStartOptions,
): {
  startPoint: MixedPoint;
  levelCounts: readonly number[];
  budget: number;
  maxRounds: number;
  maxNelderMeadRuns: number;
  nelderMeadOptions: NelderMeadOptions;
} {
  const levelCounts = options.levelCounts ?? [];
  const startPoint = mixedPoint(start.continuous, start.levels ?? []);
  if (startPoint.levels.length !== levelCounts.length) {
    throw refineRangeError(
      'refineStart',
      `one level per discrete parameter (${levelCounts.length})`,
      startPoint.levels.length,
    );
  }
  levelCounts.forEach((count, d) => {
    if (!Number.isInteger(count) || count < 1 || startPoint.levels[d] < 0 || startPoint.levels[d] >= count) {
      throw refineRangeError('refineStart', `level ${d} in 0..${count - 1}`, startPoint.levels[d]);
    }
  });
  const dimension = startPoint.continuous.length;
  const budget = options.maxEvaluations ?? 200 * (dimension + 1);
  if (!Number.isInteger(budget) || budget < 1)
    throw refineRangeError('refineStart', 'an integer maxEvaluations >= 1', budget);
  const maxRounds = options.maxRounds ?? 8;
  const maxNelderMeadRuns = options.maxNelderMeadRuns ?? 4;
  if (!Number.isInteger(maxNelderMeadRuns) || maxNelderMeadRuns < 1)
    throw refineRangeError('refineStart', 'an integer maxNelderMeadRuns >= 1', maxNelderMeadRuns);
  const nelderMeadOptions = options.nelderMead ?? {};
  if (!Number.isInteger(maxRounds) || maxRounds < 1)
    throw refineRangeError('refineStart', 'an integer maxRounds >= 1', maxRounds);
  return { startPoint, levelCounts, budget, maxRounds, maxNelderMeadRuns, nelderMeadOptions };
}

/**
 * One round's continuous phase: Nelder–Mead runs with the levels held, restarted from the incumbent while
 * a run converges and gains more than fatol, up to `maxRuns` and the budget. Appends each run's result and
 * trace entry; returns the incumbent after them.
 */
async function nelderMeadPhase<R>(
  start: { point: MixedPoint; merit: Merit },
  ledger: StartLedger<R>,
  maxRuns: number,
  options: NelderMeadOptions,
  runs: MinimizeResult[],
  trace: RefineTraceEntry[],
): Promise<{ point: MixedPoint; merit: Merit }> {
  let incumbent = start;
  for (let run = 0; run < maxRuns && ledger.remaining > 0; run++) {
    const outcome = await nelderMeadWithLevels(incumbent, ledger, options);
    runs.push(outcome.result);
    const improved = isBetterMerit(outcome.merit, incumbent.merit);
    const gain = improved ? meritDistance(outcome.merit, incumbent.merit) : 0;
    if (improved) incumbent = { point: outcome.point, merit: outcome.merit };
    trace.push({ phase: 'nelder-mead', evaluationsUsed: ledger.used, merit: incumbent.merit, improved });
    if (outcome.result.status !== 'converged' || gain <= (options.fatol ?? 1e-4)) break;
  }
  return incumbent;
}

async function nelderMeadWithLevels<R>(
  incumbent: { point: MixedPoint; merit: Merit },
  ledger: StartLedger<R>,
  options: NelderMeadOptions,
): Promise<{ point: MixedPoint; merit: Merit; result: MinimizeResult }> {
  const levels = incumbent.point.levels;
  const capped = Math.min(options.maxEvaluations ?? Infinity, ledger.remaining + 1); // +1: the start vertex is cached
  const machine = new NelderMead(incumbent.point.continuous, {
    ...options,
    maxEvaluations: capped,
    maxIterations: options.maxIterations ?? 200 * incumbent.point.continuous.length,
  });
  while (!machine.done) {
    const points = machine.ask().map((continuous) => ({ continuous, levels: Int32Array.from(levels) }));
    if (ledger.cost(points) > ledger.remaining) {
      // The machine's count includes cached repeats, so it can ask for more than is left.
      machine.stop(`stopped: the start's budget of ${ledger.budget} designs is used`);
      break;
    }
    machine.tell(await ledger.merits(points));
  }
  const result = machine.result();
  return {
    point: { continuous: result.x, levels: Int32Array.from(levels) },
    merit: { violation: result.violation, value: result.value },
    result,
  };
}

/**
 * Refines many starts concurrently over one shared cache (so no design is evaluated twice across
 * starts), each with its own merit function (its own Chebyshev weights, say). Put
 * `coalesceBatches` in front of the pool's batch function when making the cache, so that the
 * starts' steps travel to the pool together.
 */
export function refineStarts<R>(
  starts: ReadonlyArray<{ continuous: ArrayLike<number>; levels?: ArrayLike<number> }>,
  cache: EvaluationCache<R>,
  meritOfStart: (startIndex: number) => MeritOf<R>,
  options: RefineStartOptions = {},
): Promise<RefineStartResult[]> {
  return Promise.all(starts.map((start, index) => refineStart(start, cache, meritOfStart(index), options)));
}
