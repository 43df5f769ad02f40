import type { Merit } from './merit.ts';
import { NelderMead } from './nelder-mead.ts';
import type { MinimizeResult, NelderMeadOptions } from './nelder-mead.ts';
import { refineRangeError } from './refine-errors.ts';

/** A synchronous objective: a value (feasible) or a Merit for one point. */
export type PointObjective = (point: Float64Array) => number | Merit;

/**
 * An asynchronous batch objective: one Merit (or value) per point, in order. This is the shape a
 * worker pool provides (DEVELOPERS.md: optimize depends on a BatchEvaluator, never on threads).
 */
export type BatchObjective = (points: Float64Array[]) => Promise<ReadonlyArray<Merit | number>>;

/**
 * Minimises a synchronous objective by Nelder–Mead (see nelder-mead.ts for the method, its
 * sources and where it differs from scipy). Returns the one result record.
 *
 * @example minimize((x) => (x[0] - 1) ** 2, [0], { lower: [-5], upper: [5] }).x // ≈ [1]
 */
export function minimize(
  objective: PointObjective,
  start: ArrayLike<number>,
  options: NelderMeadOptions = {},
): MinimizeResult {
  const machine = new NelderMead(start, options);
  while (!machine.done) machine.tell(machine.ask().map((point) => objective(point)));
  return machine.result();
}

/**
 * Minimises with an asynchronous batch objective: each step's points (n+1, 1, or n) go out in one
 * call. Same iterates and counts as `minimize` for the same values.
 */
export async function minimizeAsync(
  objective: BatchObjective,
  start: ArrayLike<number>,
  options: NelderMeadOptions = {},
): Promise<MinimizeResult> {
  const machine = new NelderMead(start, options);
  while (!machine.done) {
    const points = machine.ask();
    machine.tell(await checkedBatch(objective, points));
  }
  return machine.result();
}

/**
 * Runs many Nelder–Mead starts in lockstep: each round gathers the asked points of every start
 * that is not done into one batch call, so a pool sees batches of (starts × 1..n+1) points instead
 * of one point at a time. Each start's iterates are exactly those it would have alone.
 *
 * @param starts one starting point per run
 * @param options shared options, or one options object per start
 * @returns one result per start, in order
 */
export async function minimizeManyAsync(
  objective: BatchObjective,
  starts: ReadonlyArray<ArrayLike<number>>,
  options: NelderMeadOptions | ReadonlyArray<NelderMeadOptions> = {},
): Promise<MinimizeResult[]> {
  if (Array.isArray(options) && options.length !== starts.length) {
    throw refineRangeError('minimizeManyAsync', `one options object per start (${starts.length})`, options.length);
  }
  const machines = starts.map(
    (start, index) => new NelderMead(start, Array.isArray(options) ? options[index] : (options as NelderMeadOptions)),
  );
  for (;;) {
    const active = machines.filter((machine) => !machine.done);
    if (active.length === 0) break;
    const asked = active.map((machine) => machine.ask());
    const merits = await checkedBatch(objective, asked.flat());
    let offset = 0;
    active.forEach((machine, index) => {
      const count = asked[index].length;
      machine.tell(merits.slice(offset, offset + count));
      offset += count;
    });
  }
  return machines.map((machine) => machine.result());
}

async function checkedBatch(objective: BatchObjective, points: Float64Array[]): Promise<ReadonlyArray<Merit | number>> {
  const values = await objective(points);
  if (values.length !== points.length) {
    throw refineRangeError('a batch objective', `one value per point (${points.length})`, values.length);
  }
  return values;
}
