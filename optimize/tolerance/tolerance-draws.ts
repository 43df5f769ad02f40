/**
 * Build tolerances as random draws with common random numbers: draw j is the same point of one scrambled
 * Sobol sequence (Joe & Kuo 2008 directions, Owen-scrambled by hashing, optimize/sampling) for every
 * candidate, so two candidates are compared on the same builds, and the draws are a pure function of the
 * seed and j (reproducible, shardable, resumable).
 *
 * Each toleranced field maps its coordinate u ∈ (0, 1) to a standardised deviation z, then to a value:
 * relative: nominal·(1 + spread·z); absolute: nominal + spread·z; interval: centre + spread·z.
 * - uniform: z = 2u − 1, uniform on [−1, 1];
 * - normal: z = Φ⁻¹(u)/k, so the spread is k standard deviations (unbounded);
 * - truncated normal: z = Φ⁻¹(Φ(−k) + u·(Φ(k) − Φ(−k)))/k, the normal cut at ±spread (inverse-CDF method,
 *   Devroye 1986 ch. II.2 [devroye1986]).
 */
import { hash32 } from '../random.ts';
import { createSobolSampler, type SobolSampler } from '../sampling/index.ts';
import { JOE_KUO_MAX_DIMENSIONS } from '../sampling/index.ts';
import { normalCdf, normalQuantile, normalTail } from './normal.ts';

export type ToleranceDistribution = 'uniform' | 'normal' | 'truncated_normal';

/** One toleranced field: plain data (travels to workers and into JSON as it is). */
export interface ToleranceField {
  /** [section, field] in the design file's names. */
  path: [string, string];
  /** relative: a fraction of the nominal; absolute: SI about the nominal; interval: SI about `centre`. */
  mode: 'relative' | 'absolute' | 'interval';
  /** Half-width of the spread (a fraction for relative, SI otherwise), > 0 (0 allowed: no spread). */
  spread: number;
  /** Middle of an interval (interval mode), else 0. */
  centre: number;
  distribution: ToleranceDistribution;
  /** Normal and truncated normal: the spread is this many standard deviations (> 0). */
  sigmas: number;
  /** The nominal to use where the design leaves the field out (its documented default), or null. */
  fallback: number | null;
  /** Whether a missing section may be created to hold the field (every field of the section optional). */
  createSection: boolean;
}

/** Half a unit of the 32-bit Sobol coordinates: coordinates are taken at the centres of their cells. */
const HALF_CELL = 2 ** -33;

/** The standardised deviation z of a field at unit coordinate u (0 < u < 1). */
export function standardDeviate(field: Pick<ToleranceField, 'distribution' | 'sigmas'>, u: number): number {
  switch (field.distribution) {
    case 'uniform':
      return 2 * u - 1;
    case 'normal':
      return normalQuantile(u) / field.sigmas;
    case 'truncated_normal': {
      const k = field.sigmas;
      // Symmetric cut: Φ(−k) + u(Φ(k) − Φ(−k)), from the lower tail so small probabilities keep their digits.
      const low = normalTail(k);
      const p = low + u * (1 - 2 * low);
      const x = p < 0.5 ? normalQuantile(p) : -normalQuantile(Math.max(0, low + (1 - u) * (1 - 2 * low)));
      return Math.max(-1, Math.min(1, x / k));
    }
  }
}

/** The value of a field with nominal `nominal` at deviation z. */
export function deviatedValue(field: ToleranceField, nominal: number, z: number): number {
  if (field.mode === 'relative') return nominal * (1 + field.spread * z);
  if (field.mode === 'absolute') return nominal + field.spread * z;
  return field.centre + field.spread * z;
}

/** Exact probability that a field's deviation z is at most `z` (for checks): the distribution function of z. */
export function deviateCdf(field: Pick<ToleranceField, 'distribution' | 'sigmas'>, z: number): number {
  if (field.distribution === 'uniform') return Math.max(0, Math.min(1, (z + 1) / 2));
  if (field.distribution === 'normal') return normalCdf(z * field.sigmas);
  if (z <= -1) return 0;
  if (z >= 1) return 1;
  const low = normalCdf(-field.sigmas);
  return (normalCdf(z * field.sigmas) - low) / (1 - 2 * low);
}

/** The common random numbers: the standardised deviations of every field at every draw. */
export class ToleranceDraws {
  private readonly sampler: SobolSampler;
  private readonly unit: Float64Array;

  /** @param fields the toleranced fields (1 to 64). @param seed unsigned 32-bit. */
  constructor(
    readonly fields: readonly ToleranceField[],
    readonly seed: number,
  ) {
    if (fields.length < 1 || fields.length > JOE_KUO_MAX_DIMENSIONS) {
      throw new RangeError(`ToleranceDraws: 1 to ${JOE_KUO_MAX_DIMENSIONS} fields, got ${fields.length}`);
    }
    // Its own scrambling stream, so the draws are not the sweep's own sample points.
    this.sampler = createSobolSampler(fields.length, hash32(seed, 0x701e5, fields.length));
    this.unit = new Float64Array(fields.length);
  }

  /** The deviations z of draw j (0 ≤ j < 2³²), one per field, written into `out`. */
  deviatesAt(draw: number, out: Float64Array): void {
    this.sampler.pointAt(draw, this.unit);
    for (let t = 0; t < this.fields.length; t++) out[t] = standardDeviate(this.fields[t], this.unit[t] + HALF_CELL);
  }
}
