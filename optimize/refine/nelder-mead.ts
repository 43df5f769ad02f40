import { compareMerits, isBetterMerit, meritDistance, toMerit, WORST_MERIT } from './merit.ts';
import type { Merit } from './merit.ts';
import { refineRangeError, refineStateError } from './refine-errors.ts';
import { must } from '../../core/must.ts';

/**
 * Nelder–Mead downhill simplex minimiser as an ask/tell state machine, so that the points of each
 * step can be evaluated in a batch, asynchronously, in a worker pool, and many starts can run in
 * lockstep (see `minimizeManyAsync` in minimize.ts).
 *
 * Sources: J. A. Nelder and R. Mead, "A simplex method for function minimization", Computer J. 7
 * (1965) 308–313; the step rules as stated by J. C. Lagarias, J. A. Reeds, M. H. Wright and P. E.
 * Wright, "Convergence properties of the Nelder–Mead simplex method in low dimensions", SIAM J.
 * Optim. 9 (1998) 112–147, section 2 (from memory); adaptive coefficients from F. Gao and L. Han, "Implementing the
 * Nelder–Mead simplex algorithm with adaptive parameters", Comput. Optim. Appl. 51 (2012) 259–277.
 *
 * The contract follows scipy's `minimize(method='Nelder-Mead')` (scipy/optimize/_optimize.py):
 * the same coefficients and adaptive option, the same step sequence and acceptance tests, the same
 * initial simplex (5 % of each coordinate, 0.00025 at zero) when bounds are infinite, every trial
 * point clipped to the bounds, the initial simplex reflected inside the upper bound, the same
 * stopping rule (simplex size <= xatol AND value spread <= fatol) and default budgets (200·n
 * evaluations and iterations). With no bounds and no constraints it reproduces scipy's iterates
 * and evaluation counts (pinned in test/reference/nelder-mead-scipy.test.ts).
 *
 * Where we differ, and why:
 * - Vertices carry a Merit (violation, value) ordered by Deb's feasibility rules (merit.ts), so
 *   constraints are never ignored; for feasible points this is scipy's order.
 * - With finite bounds the default initial step is 5 % of the range of each coordinate, not 5 % of
 *   the coordinate: a start near 0 in the unit cube would otherwise get a tiny simplex.
 * - A simplex that has collapsed onto a bound face (every vertex on the same bound in some
 *   coordinate: clipping can do this, and then the simplex can never leave the face) is restarted
 *   around its best vertex with the initial steps; scipy has no such restart. The idea of
 *   re-initialising at a bound follows M. Luersen, R. Le Riche and F. Guyon, "A constrained,
 *   globalized, and bounded Nelder–Mead method for engineering optimization", Struct. Multidisc.
 *   Optim. 27 (2004) 43–54. Restarts are counted and capped (`maxRestarts`), and a further
 *   restart is made only if the last one moved the best point or improved its merit.
 * - `iterations` counts completed iterations; scipy's `nit` is that plus one (it starts at 1),
 *   and scipy runs at most maxiter − 1 iterations where we run at most maxIterations.
 * - When the budget runs out inside an iteration, a reflected point already evaluated is kept if
 *   it beats the worst vertex (scipy discards it), and a shrink is done on as many vertices as the
 *   budget allows (scipy moves the rest without evaluating them). `evaluations` never exceeds
 *   `maxEvaluations`, also for the initial simplex (scipy can overrun it there; [scipy-nm]).
 * - A start outside the bounds is clipped into them, as scipy does (scipy warns).
 */

/** Options of the Nelder–Mead minimiser; every field is optional. */
export interface NelderMeadOptions {
  /** Lower bound of each coordinate; default 0 (the unit cube). −Infinity for none. */
  lower?: ArrayLike<number>;
  /** Upper bound of each coordinate; default 1 (the unit cube). +Infinity for none. */
  upper?: ArrayLike<number>;
  /**
   * Step of the initial simplex along each coordinate, in the coordinate's units (one number for
   * all, or one per coordinate; nonzero), or 'relative' for scipy's rule everywhere (vertex
   * coordinate (1 + 0.05)·x0, or 0.00025 where x0 is 0). Default: 5 % of (upper − lower) where
   * both bounds are finite, else scipy's rule.
   */
  initialStep?: number | ArrayLike<number> | 'relative';
  /** Use Gao & Han's dimension-dependent coefficients (default false). */
  adaptive?: boolean;
  /** Reflection coefficient ρ > 0 (default 1, or the adaptive value). */
  reflection?: number;
  /** Expansion coefficient χ > max(1, ρ) (default 2, or 1 + 2/n adaptive). */
  expansion?: number;
  /** Contraction coefficient 0 < γ < 1 (default 0.5, or 0.75 − 1/(2n) adaptive). */
  contraction?: number;
  /** Shrink coefficient 0 < σ < 1 (default 0.5, or 1 − 1/n adaptive). */
  shrink?: number;
  /** Absolute tolerance on the simplex size, max |x_j − x_0| over vertices and coordinates (default 1e-4). */
  xatol?: number;
  /** Absolute tolerance on the merit spread, max |Δviolation| + |Δvalue| over vertices (default 1e-4). */
  fatol?: number;
  /** Evaluation budget (default 200·n; Infinity allowed if maxIterations is finite). */
  maxEvaluations?: number;
  /** Iteration budget (default 200·n; Infinity allowed if maxEvaluations is finite). */
  maxIterations?: number;
  /** Most restarts after a collapse onto a bound face (default 3; 0 turns restarts off). */
  maxRestarts?: number;
}

/** The four step coefficients of Nelder–Mead. */
export interface NelderMeadCoefficients {
  reflection: number;
  expansion: number;
  contraction: number;
  shrink: number;
}

/** Why a run stopped. */
export type MinimizeStatus = 'converged' | 'max_evaluations' | 'max_iterations';

/** The one result record of a minimisation (scipy's OptimizeResult, in our words). */
export interface MinimizeResult {
  /** Best point found (a fresh copy). */
  x: Float64Array;
  /** Objective value at x (+Infinity if it could not be evaluated). */
  value: number;
  /** Total constraint violation at x (0 when feasible). */
  violation: number;
  /** violation === 0. */
  feasible: boolean;
  /** Completed iterations (scipy's nit − 1). */
  iterations: number;
  /** Points evaluated (values told), never more than maxEvaluations. */
  evaluations: number;
  /** Restarts made after a collapse onto a bound face. */
  restarts: number;
  /** Why the run stopped. */
  status: MinimizeStatus;
  /** One sentence saying why, with the figures. */
  message: string;
  /** Final simplex size max |x_j − x_0| (NaN if the simplex was never complete). */
  simplexSize: number;
  /** Final merit spread max |Δviolation| + |Δvalue|. */
  meritSpread: number;
}

type Phase = 'initial' | 'reflect' | 'expand' | 'contract-outside' | 'contract-inside' | 'shrink' | 'restart' | 'done';

const RELATIVE_STEP = 0.05; // scipy's nonzdelt
const STEP_AT_ZERO = 0.00025; // scipy's zdelt
const RANGE_STEP_FRACTION = 0.05;
const BOUND_TOUCH_TOLERANCE = 1e-12; // relative; a coordinate this close to a bound is on it

/**
 * The Nelder–Mead coefficients for dimension n. Standard (Nelder & Mead 1965): ρ = 1, χ = 2,
 * γ = 0.5, σ = 0.5. Adaptive (Gao & Han 2012; as scipy implements them): ρ = 1, χ = 1 + 2/n, γ = 0.75 − 1/(2n),
 * σ = 1 − 1/n, which equal the standard ones at n = 2.
 */
export function nelderMeadCoefficients(dimension: number, adaptive: boolean): NelderMeadCoefficients {
  if (!Number.isInteger(dimension) || dimension < 1) {
    throw refineRangeError('nelderMeadCoefficients', 'an integer dimension >= 1', dimension);
  }
  if (!adaptive) return { reflection: 1, expansion: 2, contraction: 0.5, shrink: 0.5 };
  return {
    reflection: 1,
    expansion: 1 + 2 / dimension,
    contraction: 0.75 - 1 / (2 * dimension),
    shrink: 1 - 1 / dimension,
  };
}

/**
 * One Nelder–Mead run as an ask/tell machine. Usage:
 *
 * ```ts
 * const machine = new NelderMead(Float64Array.of(0.2, 0.7), { xatol: 1e-6 });
 * while (!machine.done) {
 *   const points = machine.ask();               // n+1 at first, then 1 per step, n for a shrink
 *   machine.tell(await evaluateBatch(points));  // one Merit (or number) per point, same order
 * }
 * const { x, value, evaluations, status } = machine.result();
 * ```
 *
 * Deterministic: the same start, options and told values give the same points.
 */
export class NelderMead {
  /** Number of coordinates n. */
  readonly dimension: number;
  /** The coefficients in use. */
  readonly coefficients: Readonly<NelderMeadCoefficients>;

  private readonly lower: Float64Array;
  private readonly upper: Float64Array;
  private readonly absoluteSteps: Float64Array | null;
  private readonly xatol: number;
  private readonly fatol: number;
  private readonly maxEvaluations: number;
  private readonly maxIterations: number;
  private readonly maxRestarts: number;

  private readonly simplex: Float64Array[];
  private readonly merits: Merit[];
  private readonly centroid: Float64Array;
  private phase: Phase = 'initial';
  private pending: Float64Array[] = [];
  private pendingIndices: number[] = [];
  private reflectedPoint: Float64Array | null = null;
  private reflectedMerit: Merit = WORST_MERIT;
  private evaluationCount = 0;
  private iterationCount = 0;
  private restartCount = 0;
  private lastRestartPoint: Float64Array | null = null;
  private lastRestartMerit: Merit = WORST_MERIT;
  private finalStatus: MinimizeStatus = 'max_evaluations';
  private finalMessage = '';
  private simplexComplete = false;

  /**
   * @param start starting point x0 (length n >= 1, finite; clipped into the bounds)
   * @param options see NelderMeadOptions
   */
  constructor(start: ArrayLike<number>, options: NelderMeadOptions = {}) {
    const dimension = start.length;
    if (dimension < 1) throw refineRangeError('NelderMead', 'a start with at least one coordinate', '[]');
    for (let k = 0; k < dimension; k++) {
      if (!Number.isFinite(start[k])) throw refineRangeError('NelderMead', 'a finite start', start);
    }
    this.dimension = dimension;
    this.lower = boundArray(options.lower, dimension, 0, 'lower');
    this.upper = boundArray(options.upper, dimension, 1, 'upper');
    for (let k = 0; k < dimension; k++) {
      if (!(this.lower[k] <= this.upper[k])) {
        throw refineRangeError(
          'NelderMead',
          `lower <= upper in coordinate ${k}`,
          `${this.lower[k]} > ${this.upper[k]}`,
        );
      }
    }
    this.coefficients = resolveCoefficients(dimension, options);
    this.xatol = nonNegative(options.xatol, 1e-4, 'xatol');
    this.fatol = nonNegative(options.fatol, 1e-4, 'fatol');
    [this.maxEvaluations, this.maxIterations] = resolveBudgets(dimension, options);
    this.maxRestarts = options.maxRestarts ?? 3;
    if (!Number.isInteger(this.maxRestarts) || this.maxRestarts < 0) {
      throw refineRangeError('NelderMead', 'an integer maxRestarts >= 0', options.maxRestarts);
    }
    this.absoluteSteps = resolveSteps(options.initialStep, this.lower, this.upper);

    const first = new Float64Array(dimension);
    for (let k = 0; k < dimension; k++) first[k] = this.clip(start[k], k);
    this.simplex = this.simplexAround(first);
    this.merits = this.simplex.map(() => WORST_MERIT);
    this.centroid = new Float64Array(dimension);

    const affordable = Math.min(dimension + 1, this.maxEvaluations);
    this.pendingIndices = Array.from({ length: affordable }, (_, index) => index);
    this.pending = this.pendingIndices.map((index) => this.simplex[index]);
    if (affordable === 0) this.advance();
  }

  /** True once the run has stopped; `ask()` then returns no points. */
  get done(): boolean {
    return this.phase === 'done';
  }

  /** Points evaluated so far. */
  get evaluations(): number {
    return this.evaluationCount;
  }

  /** Completed iterations so far. */
  get iterations(): number {
    return this.iterationCount;
  }

  /** Restarts so far. */
  get restarts(): number {
    return this.restartCount;
  }

  /**
   * The points to evaluate next (fresh copies, safe to transfer): n+1 at the start (fewer if the
   * budget is smaller), then 1 per reflection, expansion or contraction, n for a shrink or a
   * restart, none when done. Asking again before telling returns the same points.
   */
  ask(): Float64Array[] {
    return this.pending.map((point) => Float64Array.from(point));
  }

  /**
   * Gives the merits of the points of the last `ask()`, in the same order; a bare number is a
   * feasible value. NaN is read as +Infinity (worst). Throws if the count does not match.
   */
  tell(values: ReadonlyArray<Merit | number>): void {
    if (this.phase === 'done') throw refineStateError('NelderMead.tell', 'a run that is not done', 'a finished run');
    if (values.length !== this.pending.length) {
      throw refineRangeError('NelderMead.tell', `${this.pending.length} values (one per asked point)`, values.length);
    }
    const merits = values.map(toMerit);
    this.evaluationCount += merits.length;
    const worst = this.dimension;
    switch (this.phase) {
      case 'initial':
      case 'restart':
      case 'shrink': {
        for (let i = 0; i < merits.length; i++) this.merits[this.pendingIndices[i]] = merits[i];
        if (this.phase === 'initial') this.simplexComplete = merits.length === this.dimension + 1;
        if (this.phase === 'restart') this.restartCount++;
        if (this.phase === 'shrink' && merits.length === this.dimension) this.iterationCount++;
        this.sortSimplex();
        this.advance();
        return;
      }
      case 'reflect': {
        const reflected = merits[0];
        this.reflectedMerit = reflected;
        const best = this.merits[0];
        const secondWorst = this.merits[worst - 1];
        const worstMerit = this.merits[worst];
        const budgetLeft = this.evaluationCount < this.maxEvaluations;
        if (isBetterMerit(reflected, best)) {
          if (budgetLeft) {
            this.request('expand', this.stepPoint('expand'));
            return;
          }
          this.replaceWorst(must(this.reflectedPoint), reflected, false);
        } else if (isBetterMerit(reflected, secondWorst)) {
          this.replaceWorst(must(this.reflectedPoint), reflected, true);
        } else if (isBetterMerit(reflected, worstMerit)) {
          if (budgetLeft) {
            this.request('contract-outside', this.stepPoint('contract-outside'));
            return;
          }
          this.replaceWorst(must(this.reflectedPoint), reflected, false);
        } else {
          if (budgetLeft) {
            this.request('contract-inside', this.stepPoint('contract-inside'));
            return;
          }
          this.sortSimplex();
          this.advance();
        }
        return;
      }
      case 'expand': {
        const expanded = merits[0];
        if (isBetterMerit(expanded, this.reflectedMerit)) this.replaceWorst(this.pending[0], expanded, true);
        else this.replaceWorst(must(this.reflectedPoint), this.reflectedMerit, true);
        return;
      }
      case 'contract-outside': {
        // scipy: accept if f(xc) <= f(xr), else shrink.
        const contracted = merits[0];
        if (!isBetterMerit(this.reflectedMerit, contracted)) this.replaceWorst(this.pending[0], contracted, true);
        else this.startShrink();
        return;
      }
      case 'contract-inside': {
        // scipy: accept if f(xcc) < f(worst), else shrink.
        const contracted = merits[0];
        if (isBetterMerit(contracted, this.merits[worst])) this.replaceWorst(this.pending[0], contracted, true);
        else this.startShrink();
        return;
      }
      default:
        throw refineStateError('NelderMead.tell', 'a pending request', this.phase);
    }
  }

  /**
   * Stops the run now (a caller's budget is spent): status 'max_evaluations'; the result is the
   * best vertex so far. Points asked and not told are dropped.
   */
  stop(reason = 'stopped by the caller'): void {
    if (this.phase !== 'done') this.finish('max_evaluations', reason);
  }

  /** The result record; before the run is done it describes the best vertex so far. */
  result(): MinimizeResult {
    const merit = this.merits[0];
    return {
      x: Float64Array.from(this.simplex[0]),
      value: merit.value,
      violation: merit.violation,
      feasible: merit.violation === 0,
      iterations: this.iterationCount,
      evaluations: this.evaluationCount,
      restarts: this.restartCount,
      status: this.phase === 'done' ? this.finalStatus : 'max_evaluations',
      message: this.phase === 'done' ? this.finalMessage : 'running: not done yet',
      simplexSize: this.simplexComplete ? this.simplexSize() : NaN,
      meritSpread: this.simplexComplete ? this.meritSpread() : NaN,
    };
  }

  // --- the loop top: budgets, stopping rule, restart, next reflection ---

  private advance(): void {
    if (this.evaluationCount >= this.maxEvaluations) {
      this.finish('max_evaluations', `stopped: evaluation budget of ${this.maxEvaluations} used`);
      return;
    }
    if (this.iterationCount >= this.maxIterations) {
      this.finish('max_iterations', `stopped: iteration budget of ${this.maxIterations} used`);
      return;
    }
    const size = this.simplexSize();
    const spread = this.meritSpread();
    if (this.isCollapsedOnBound() && this.mayRestart()) {
      this.startRestart();
      return;
    }
    if (size <= this.xatol && spread <= this.fatol) {
      this.finish(
        'converged',
        `converged: simplex size ${size.toExponential(2)} <= xatol ${this.xatol} and merit spread ${spread.toExponential(2)} <= fatol ${this.fatol}`,
      );
      return;
    }
    // Centroid of the best n vertices (scipy: np.add.reduce(sim[:-1], 0) / N, summed in order).
    const n = this.dimension;
    this.centroid.fill(0);
    for (let j = 0; j < n; j++) {
      const vertex = this.simplex[j];
      for (let k = 0; k < n; k++) this.centroid[k] += vertex[k];
    }
    for (let k = 0; k < n; k++) this.centroid[k] /= n;
    this.reflectedPoint = this.stepPoint('reflect');
    this.request('reflect', this.reflectedPoint);
  }

  /**
   * The trial point a·x̄ − b·x_worst (or a·x̄ + b·x_worst for the inside contraction), clipped,
   * written with scipy's exact coefficients so that iterates match it bit for bit:
   * reflection (1+ρ)x̄ − ρx_w; expansion (1+ρχ)x̄ − ρχx_w; outside contraction (1+γρ)x̄ − γρx_w;
   * inside contraction (1−γ)x̄ + γx_w.
   */
  private stepPoint(kind: 'reflect' | 'expand' | 'contract-outside' | 'contract-inside'): Float64Array {
    const { reflection, expansion, contraction } = this.coefficients;
    let centroidWeight: number;
    let worstWeight: number;
    if (kind === 'reflect') [centroidWeight, worstWeight] = [1 + reflection, -reflection];
    else if (kind === 'expand') [centroidWeight, worstWeight] = [1 + reflection * expansion, -(reflection * expansion)];
    else if (kind === 'contract-outside')
      [centroidWeight, worstWeight] = [1 + contraction * reflection, -(contraction * reflection)];
    else [centroidWeight, worstWeight] = [1 - contraction, contraction];
    const n = this.dimension;
    const worst = this.simplex[n];
    const point = new Float64Array(n);
    for (let k = 0; k < n; k++) point[k] = this.clip(centroidWeight * this.centroid[k] + worstWeight * worst[k], k);
    return point;
  }

  private request(phase: Phase, point: Float64Array): void {
    this.phase = phase;
    this.pending = [point];
    this.pendingIndices = [this.dimension];
  }

  private replaceWorst(point: Float64Array, merit: Merit, completesIteration: boolean): void {
    this.simplex[this.dimension] = Float64Array.from(point);
    this.merits[this.dimension] = merit;
    if (completesIteration) this.iterationCount++;
    this.sortSimplex();
    this.advance();
  }

  private startShrink(): void {
    const n = this.dimension;
    const best = this.simplex[0];
    const sigma = this.coefficients.shrink;
    const affordable = Math.min(n, this.maxEvaluations - this.evaluationCount);
    if (affordable <= 0) {
      this.sortSimplex();
      this.advance();
      return;
    }
    const indices: number[] = [];
    for (let j = 1; j <= affordable; j++) {
      const vertex = this.simplex[j];
      for (let k = 0; k < n; k++) vertex[k] = this.clip(best[k] + sigma * (vertex[k] - best[k]), k);
      indices.push(j);
    }
    this.phase = 'shrink';
    this.pendingIndices = indices;
    this.pending = indices.map((index) => this.simplex[index]);
  }

  private mayRestart(): boolean {
    if (this.restartCount >= this.maxRestarts) return false;
    if (this.maxEvaluations - this.evaluationCount < this.dimension) return false;
    if (this.lastRestartPoint === null) return true;
    const best = this.simplex[0];
    let moved = 0;
    for (let k = 0; k < this.dimension; k++) moved = Math.max(moved, Math.abs(best[k] - this.lastRestartPoint[k]));
    const improvedBy = isBetterMerit(this.merits[0], this.lastRestartMerit)
      ? meritDistance(this.merits[0], this.lastRestartMerit)
      : 0;
    return moved > this.xatol || improvedBy > this.fatol;
  }

  private startRestart(): void {
    const best = this.simplex[0];
    this.lastRestartPoint = Float64Array.from(best);
    this.lastRestartMerit = this.merits[0];
    // Luersen et al. 2004's "small test": the new simplex is no larger than the collapsed one was
    // (twice its size, at least 10·xatol), and never larger than the initial one.
    const fresh = this.simplexAround(best, Math.max(2 * this.simplexSize(), 10 * this.xatol));
    const indices: number[] = [];
    for (let j = 1; j <= this.dimension; j++) {
      this.simplex[j] = fresh[j];
      this.merits[j] = WORST_MERIT;
      indices.push(j);
    }
    this.phase = 'restart';
    this.pendingIndices = indices;
    this.pending = indices.map((index) => this.simplex[index]);
  }

  private finish(status: MinimizeStatus, message: string): void {
    this.phase = 'done';
    this.pending = [];
    this.pendingIndices = [];
    this.finalStatus = status;
    this.finalMessage = message;
  }

  // --- geometry ---

  /**
   * Initial simplex around a point: vertex k+1 steps coordinate k; reflected inside the bounds.
   * `largestStep` caps each step's size (for restarts).
   */
  private simplexAround(center: Float64Array, largestStep = Infinity): Float64Array[] {
    const n = this.dimension;
    const vertices: Float64Array[] = [Float64Array.from(center)];
    for (let k = 0; k < n; k++) {
      const vertex = Float64Array.from(center);
      let moved: number;
      if (this.absoluteSteps !== null && Number.isFinite(this.absoluteSteps[k]))
        moved = center[k] + this.absoluteSteps[k];
      else moved = center[k] !== 0 ? (1 + RELATIVE_STEP) * center[k] : STEP_AT_ZERO;
      if (Math.abs(moved - center[k]) > largestStep) moved = center[k] + Math.sign(moved - center[k]) * largestStep;
      // As scipy does since 1.13 ([scipy-nm]): a vertex past the upper bound is reflected inside it, then
      // clipped; we also reflect one past the lower bound (a negative step could put it there).
      if (moved > this.upper[k]) moved = 2 * this.upper[k] - moved;
      else if (moved < this.lower[k]) moved = 2 * this.lower[k] - moved;
      vertex[k] = this.clip(moved, k);
      vertices.push(vertex);
    }
    return vertices;
  }

  private clip(value: number, coordinate: number): number {
    return Math.min(this.upper[coordinate], Math.max(this.lower[coordinate], value));
  }

  private sortSimplex(): void {
    const order = this.simplex.map((_, index) => index);
    order.sort((a, b) => compareMerits(this.merits[a], this.merits[b]) || a - b);
    const vertices = order.map((index) => this.simplex[index]);
    const merits = order.map((index) => this.merits[index]);
    for (let j = 0; j < vertices.length; j++) {
      this.simplex[j] = vertices[j];
      this.merits[j] = merits[j];
    }
  }

  private simplexSize(): number {
    let size = 0;
    const best = this.simplex[0];
    for (let j = 1; j <= this.dimension; j++) {
      const vertex = this.simplex[j];
      for (let k = 0; k < this.dimension; k++) size = Math.max(size, Math.abs(vertex[k] - best[k]));
    }
    return size;
  }

  private meritSpread(): number {
    let spread = 0;
    for (let j = 1; j <= this.dimension; j++) {
      const distance = meritDistance(this.merits[0], this.merits[j]);
      spread = Number.isNaN(distance) ? Infinity : Math.max(spread, distance);
    }
    return spread;
  }

  /**
   * True when, in some coordinate, every vertex lies on the same (finite) bound. A coordinate
   * whose bounds coincide is fixed, not collapsed, and is skipped.
   */
  private isCollapsedOnBound(): boolean {
    if (!this.simplexComplete) return false;
    for (let k = 0; k < this.dimension; k++) {
      if (this.lower[k] === this.upper[k]) continue;
      if (this.allOnBound(k, this.lower[k]) || this.allOnBound(k, this.upper[k])) return true;
    }
    return false;
  }

  private allOnBound(coordinate: number, bound: number): boolean {
    if (!Number.isFinite(bound)) return false;
    const tolerance = BOUND_TOUCH_TOLERANCE * Math.max(1, Math.abs(bound));
    for (const vertex of this.simplex) if (Math.abs(vertex[coordinate] - bound) > tolerance) return false;
    return true;
  }
}

function boundArray(
  values: ArrayLike<number> | undefined,
  dimension: number,
  fallback: number,
  name: string,
): Float64Array {
  const bounds = new Float64Array(dimension).fill(fallback);
  if (values === undefined) return bounds;
  if (values.length !== dimension)
    throw refineRangeError('NelderMead', `${name} bounds of length ${dimension}`, values.length);
  for (let k = 0; k < dimension; k++) {
    if (Number.isNaN(values[k])) throw refineRangeError('NelderMead', `${name} bounds that are not NaN`, values);
    bounds[k] = values[k];
  }
  return bounds;
}

function resolveCoefficients(dimension: number, options: NelderMeadOptions): NelderMeadCoefficients {
  const base = nelderMeadCoefficients(dimension, options.adaptive ?? false);
  const coefficients = {
    reflection: options.reflection ?? base.reflection,
    expansion: options.expansion ?? base.expansion,
    contraction: options.contraction ?? base.contraction,
    shrink: options.shrink ?? base.shrink,
  };
  // Lagarias et al. 1998 (conditions recalled from memory): ρ > 0, χ > 1, χ > ρ, 0 < γ < 1, 0 < σ < 1. At n = 1 the
  // adaptive shrink is 0; we keep it legal by falling back to the standard 0.5 there.
  if (coefficients.shrink === 0 && options.shrink === undefined) coefficients.shrink = 0.5;
  const { reflection, expansion, contraction, shrink } = coefficients;
  if (!(reflection > 0)) throw refineRangeError('NelderMead', 'a reflection coefficient > 0', reflection);
  if (!(expansion > 1 && expansion > reflection))
    throw refineRangeError('NelderMead', 'an expansion coefficient > max(1, reflection)', expansion);
  if (!(contraction > 0 && contraction < 1))
    throw refineRangeError('NelderMead', 'a contraction coefficient in (0, 1)', contraction);
  if (!(shrink > 0 && shrink < 1)) throw refineRangeError('NelderMead', 'a shrink coefficient in (0, 1)', shrink);
  return coefficients;
}

function nonNegative(value: number | undefined, fallback: number, name: string): number {
  if (value === undefined) return fallback;
  if (!(value >= 0)) throw refineRangeError('NelderMead', `${name} >= 0`, value);
  return value;
}

/** scipy's budget defaults: both 200·n if neither is given; one given leaves the other unbounded
 * unless the given one is Infinity. */
function resolveBudgets(dimension: number, options: NelderMeadOptions): [number, number] {
  const fallback = 200 * dimension;
  let evaluations = options.maxEvaluations;
  let iterations = options.maxIterations;
  if (evaluations === undefined && iterations === undefined) {
    evaluations = fallback;
    iterations = fallback;
  } else if (iterations === undefined) {
    iterations = evaluations === Infinity ? fallback : Infinity;
  } else if (evaluations === undefined) {
    evaluations = iterations === Infinity ? fallback : Infinity;
  }
  for (const [name, budget] of [
    ['maxEvaluations', evaluations],
    ['maxIterations', iterations],
  ] as const) {
    if (!(must(budget) >= 0) || (Number.isFinite(budget) && !Number.isInteger(budget))) {
      throw refineRangeError('NelderMead', `an integer ${name} >= 0 or Infinity`, budget);
    }
  }
  if (evaluations === Infinity && iterations === Infinity) {
    throw refineRangeError(
      'NelderMead',
      'at least one finite budget (maxEvaluations or maxIterations)',
      'both Infinity',
    );
  }
  return [must(evaluations), must(iterations)];
}

function resolveSteps(
  step: number | ArrayLike<number> | 'relative' | undefined,
  lower: Float64Array,
  upper: Float64Array,
): Float64Array | null {
  const dimension = lower.length;
  if (step === 'relative') return null;
  const steps = new Float64Array(dimension);
  let anyAbsolute = false;
  for (let k = 0; k < dimension; k++) {
    let value: number;
    if (step === undefined) {
      const range = upper[k] - lower[k];
      value = Number.isFinite(range) && range > 0 ? RANGE_STEP_FRACTION * range : NaN;
    } else {
      value = typeof step === 'number' ? step : step[k];
      if (typeof step !== 'number' && step.length !== dimension)
        throw refineRangeError('NelderMead', `initialStep of length ${dimension}`, step.length);
      if (!Number.isFinite(value) || value === 0)
        throw refineRangeError('NelderMead', 'a finite nonzero initialStep', value);
    }
    steps[k] = value;
    if (!Number.isNaN(value)) anyAbsolute = true;
  }
  return anyAbsolute ? steps : null;
}
