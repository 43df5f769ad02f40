import { refineRangeError } from './refine-errors.ts';

/**
 * Chebyshev (Tchebycheff) scalarisation of several objectives, for pushing a Pareto front outward
 * with single-objective Nelder–Mead runs, one weight vector per start. All objectives are to be
 * minimised (negate a maximised one before calling).
 *
 * Sources: R. E. Steuer and E.-U. Choo, "An interactive weighted Tchebycheff procedure for
 * multiple objective programming", Math. Programming 26 (1983) 326–344 (the augmented weighted
 * Tchebycheff metric); K. Miettinen, "Nonlinear Multiobjective Optimization", Kluwer 1999,
 * Part II, the chapter on weighted metrics (every Pareto optimum is the minimum of some weighted
 * Chebyshev problem with a utopian reference point, and the augmentation term keeps the minima
 * properly Pareto optimal rather than weakly). Bibliographic details and these statements are
 * cited from memory; no equation numbers are quoted. Miettinen writes the augmentation as
 * ρ·Σ (f_i − z_i), unweighted, which we follow (a weighted ρ·Σ w_i (f_i − z_i) was also proposed; either
 * serves, the weighted form only rescales ρ per objective).
 */

/** Options of the Chebyshev merit. */
export interface ChebyshevOptions {
  /**
   * Augmentation coefficient ρ ≥ 0 of the term ρ·Σ d_i (Steuer & Choo 1983); default 1e-4.
   * Common practice: a small positive number, 1e-6 to 1e-3.
   */
  augmentation?: number;
}

const DEFAULT_AUGMENTATION = 1e-4;

/**
 * The augmented weighted Chebyshev merit max_i w_i·d_i + ρ·Σ_i d_i with d_i = (f_i − z_i)/s_i,
 * z the reference point (ideal or utopian) and s_i = nadir_i − z_i when a nadir is given (so
 * objectives of different units are comparable), else s_i = 1.
 *
 * @param objectives f, the objective values of one point (any units, all minimised)
 * @param weights w_i ≥ 0, one per objective
 * @param reference z, the reference point (a utopian point just below the front's ideal point)
 * @param nadir optional worst point of the front, for normalisation; a zero range counts as 1
 * @returns the merit (dimensionless when normalised); NaN if an objective is NaN
 * @example chebyshevMerit([2, 3], [0.5, 0.5], [0, 0], undefined, { augmentation: 0 }) // 1.5
 */
export function chebyshevMerit(
  objectives: ArrayLike<number>,
  weights: ArrayLike<number>,
  reference: ArrayLike<number>,
  nadir?: ArrayLike<number>,
  options: ChebyshevOptions = {},
): number {
  const count = objectives.length;
  if (weights.length !== count || reference.length !== count || (nadir !== undefined && nadir.length !== count)) {
    throw refineRangeError(
      'chebyshevMerit',
      `weights, reference and nadir of length ${count}`,
      `${weights.length}, ${reference.length}, ${nadir?.length ?? '-'}`,
    );
  }
  const augmentation = options.augmentation ?? DEFAULT_AUGMENTATION;
  let largest = -Infinity;
  let total = 0;
  for (let i = 0; i < count; i++) {
    const distance = (objectives[i] - reference[i]) / objectiveScale(reference, nadir, i);
    largest = Math.max(largest, weights[i] * distance);
    if (Number.isNaN(distance)) return NaN;
    total += distance;
  }
  return largest + augmentation * total;
}

/**
 * The weight vector that aims a start's Chebyshev problem through the start itself:
 * w_i ∝ 1/(d_i + ε) with d_i the normalised distance of the start from the reference point,
 * normalised to Σ w_i = 1. Then every w_i·d_i is equal at the start (exactly when ε = 0), so the
 * start lies on the corner of its own level set and the minimum lies on the ray from the
 * reference point through the start: each start pushes its own part of the front.
 *
 * @param point the start's objective values
 * @param reference z (should lie strictly below every front point; see `utopianPoint`)
 * @param nadir the front's nadir point, for normalisation
 * @param epsilon guard against a zero distance; default 1e-9
 */
export function weightsForFrontPoint(
  point: ArrayLike<number>,
  reference: ArrayLike<number>,
  nadir?: ArrayLike<number>,
  epsilon = 1e-9,
): Float64Array {
  const count = point.length;
  if (count < 1) throw refineRangeError('weightsForFrontPoint', 'at least one objective', 0);
  const weights = new Float64Array(count);
  let total = 0;
  for (let i = 0; i < count; i++) {
    const distance = Math.max(0, (point[i] - reference[i]) / objectiveScale(reference, nadir, i));
    if (!Number.isFinite(distance)) throw refineRangeError('weightsForFrontPoint', 'finite objectives', point);
    weights[i] = 1 / (distance + epsilon);
    total += weights[i];
  }
  for (let i = 0; i < count; i++) weights[i] /= total;
  return weights;
}

/** The ideal (best in each objective) and nadir (worst in each objective) points of a front. */
export interface FrontExtent {
  ideal: Float64Array;
  nadir: Float64Array;
}

/**
 * Ideal and nadir points of a set of objective vectors (all minimised): the per-objective minimum
 * and maximum. Over a non-dominated set the maximum is that set's nadir point (Miettinen 1999,
 * Part I; from memory). Non-finite entries are skipped.
 */
export function frontExtent(front: ReadonlyArray<ArrayLike<number>>): FrontExtent {
  if (front.length === 0) throw refineRangeError('frontExtent', 'at least one point', 0);
  const count = front[0].length;
  const ideal = new Float64Array(count).fill(Infinity);
  const nadir = new Float64Array(count).fill(-Infinity);
  for (const point of front) {
    if (point.length !== count) throw refineRangeError('frontExtent', `points of ${count} objectives`, point.length);
    for (let i = 0; i < count; i++) {
      if (!Number.isFinite(point[i])) continue;
      ideal[i] = Math.min(ideal[i], point[i]);
      nadir[i] = Math.max(nadir[i], point[i]);
    }
  }
  return { ideal, nadir };
}

/**
 * A utopian reference point z_i = ideal_i − margin·(nadir_i − ideal_i) (margin·1 where the range
 * is 0), strictly better than every front point, as the Chebyshev method requires for proper
 * Pareto optima (Miettinen 1999, Part II). Default margin 1 (ours): a sweep's front can lie
 * well above the true front, and once a refined point passes below the reference point in some
 * objective the Chebyshev merit stops seeing that objective (only the augmentation term does); on
 * ZDT1 from a coarse sample, margin 1 gave more hypervolume than the customary small margin
 * 0.05 (test/optimize/refine/refine-chebyshev.test.ts pins both).
 */
export function utopianPoint(extent: FrontExtent, margin = 1): Float64Array {
  const count = extent.ideal.length;
  const reference = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const range = extent.nadir[i] - extent.ideal[i];
    reference[i] = extent.ideal[i] - margin * (range > 0 ? range : 1);
  }
  return reference;
}

/**
 * Picks `count` starts spread over a front, deterministically: first the best point in each
 * objective (ties to the lower index), then farthest-point sampling (T. F. Gonzalez, "Clustering
 * to minimize the maximum intercluster distance", Theor. Comput. Sci. 38 (1985) 293–306): each
 * next start is the point whose Euclidean distance to the nearest chosen start is largest, on
 * objectives normalised by the front's ideal and nadir points. Duplicated points are not chosen
 * twice, so fewer than `count` may come back.
 *
 * @returns indices into `front`, in the order chosen
 */
export function chooseStarts(front: ReadonlyArray<ArrayLike<number>>, count: number): number[] {
  if (!Number.isInteger(count) || count < 0) throw refineRangeError('chooseStarts', 'an integer count >= 0', count);
  if (front.length === 0 || count === 0) return [];
  const extent = frontExtent(front);
  const objectives = extent.ideal.length;
  const normalised = front.map((point) => {
    const scaled = new Float64Array(objectives);
    for (let i = 0; i < objectives; i++) {
      const range = extent.nadir[i] - extent.ideal[i];
      scaled[i] = Number.isFinite(point[i]) ? (point[i] - extent.ideal[i]) / (range > 0 ? range : 1) : Infinity;
    }
    return scaled;
  });
  // A point with a non-finite objective can never be a start: its nearest distance stays −1.
  const nearest = new Float64Array(front.length).fill(Infinity);
  normalised.forEach((point, j) => {
    if (!point.every(Number.isFinite)) nearest[j] = -1;
  });
  const chosen: number[] = [];
  const take = (index: number): void => {
    chosen.push(index);
    for (let j = 0; j < front.length; j++)
      if (nearest[j] >= 0) nearest[j] = Math.min(nearest[j], euclidean(normalised[j], normalised[index]));
  };
  for (let i = 0; i < objectives && chosen.length < count; i++) {
    let best = -1;
    for (let j = 0; j < front.length; j++) {
      if (nearest[j] > 0 && (best < 0 || normalised[j][i] < normalised[best][i])) best = j;
    }
    if (best >= 0) take(best);
  }
  while (chosen.length < count) {
    let farthest = -1;
    for (let j = 0; j < front.length; j++)
      if (nearest[j] > 0 && (farthest < 0 || nearest[j] > nearest[farthest])) farthest = j;
    if (farthest < 0) break;
    take(farthest);
  }
  return chosen;
}

/** One start of a multi-objective refinement: where it starts and its Chebyshev weights. */
export interface ChebyshevStart {
  /** Index of the start in the front given to `planChebyshevStarts`. */
  frontIndex: number;
  /** Weights aiming the scalarisation through the start. */
  weights: Float64Array;
}

/** Starts, reference and nadir points for a multi-objective refinement. */
export interface ChebyshevPlan {
  reference: Float64Array;
  nadir: Float64Array;
  ideal: Float64Array;
  starts: ChebyshevStart[];
}

/**
 * Plans a multi-objective refinement: `count` starts spread over the front (`chooseStarts`), a
 * utopian reference point below the front's ideal point (`utopianPoint`, `margin`), and for each start the weights of
 * `weightsForFrontPoint`. With one objective the weights are [1] and the merit is the objective
 * itself up to a positive affine map, so refinement is plain minimisation.
 */
export function planChebyshevStarts(front: ReadonlyArray<ArrayLike<number>>, count: number, margin = 1): ChebyshevPlan {
  const extent = frontExtent(front);
  const reference = utopianPoint(extent, margin);
  const starts = chooseStarts(front, count).map((frontIndex) => ({
    frontIndex,
    weights: weightsForFrontPoint(front[frontIndex], reference, extent.nadir),
  }));
  return { reference, nadir: extent.nadir, ideal: extent.ideal, starts };
}

function objectiveScale(reference: ArrayLike<number>, nadir: ArrayLike<number> | undefined, index: number): number {
  if (nadir === undefined) return 1;
  const range = nadir[index] - reference[index];
  return range > 0 && Number.isFinite(range) ? range : 1;
}

function euclidean(a: Float64Array, b: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < a.length; i++) sum += (a[i] - b[i]) ** 2;
  return Math.sqrt(sum);
}
