/**
 * A breakout point on the topload: when its tip reaches corona onset, and how long it must be to
 * fire at a chosen voltage.
 *
 * Model: the tip field per volt at the top is β times the topload's own surface field per volt
 * at the point's base (from the design's field solve), β the enhancement of the rod on a sphere
 * whose radius matches the mean curvature of the surface there (`pointEnhancement`): for a sphere
 * topload its own radius (the rod on the pole is then solved as an axisymmetric body, exact for a
 * lone sphere), for a toroid's tube the radius 1/H of its mean curvature H at the crown or the
 * outer equator. On a toroid the curvature-matched sphere stands in for the tube: first-order in
 * the rod's height, so beyond `POINT_MODEL_LENGTH_RATIO` of the tube radius a warning says the
 * estimate is rough.
 *
 * Onset at the tip: Peek's sphere form for the tip radius (peek.ts, refs §6.1 [peek1929]). Peek's
 * law rises without bound as the radius shrinks (like 1/√a); his sphere tests went down to radii of
 * a few millimetres (from memory), and below about a millimetre the onset of a sharp point is set
 * by the ionisation zone rather than by the surface curvature. Below `PEEK_SMALLEST_RADIUS` the
 * onset field is held at its value at that radius (our choice, stated in the README): the point
 * fires no later than Peek's extrapolation would say.
 */
import { peekSphereOnsetField } from './peek.ts';
import { MAX_ROD_ASPECT, rodEnhancement, rodOnSphereEnhancement } from '../electrostatics/breakout-rod.ts';

/** Smallest tip radius at which Peek's sphere form is used as it stands, m (from memory: 1 mm). */
export const PEEK_SMALLEST_RADIUS = 1e-3;

/** Rod length over the base's curvature radius beyond which the local model is out of its range (ours). */
export const POINT_MODEL_LENGTH_RATIO = 0.25;

/**
 * Corona-onset field at a hemispherical tip of radius a, V/m: Peek's sphere form at max(a,
 * PEEK_SMALLEST_RADIUS).
 */
export function tipOnsetField(tipRadius: number, airDensity: number, surfaceFactor: number): number {
  return peekSphereOnsetField(Math.max(tipRadius, PEEK_SMALLEST_RADIUS), airDensity, surfaceFactor);
}

/**
 * Enhancement of the tip field over the base field for a rod of height l, tip radius a, on a
 * surface of mean curvature H: the rod on a sphere of radius R = 1/H, solved
 * (`rodOnSphereEnhancement`). First-order matching: the normal field just off a conductor falls as
 * dE/ds = −2H·E (H the mean curvature of the surface; Gauss's law in a charge-free region, standard,
 * from memory; docs/references.md, breakout point), so a sphere of radius 1/H has the same falloff
 * over the rod's height. Exact (to discretisation) for a rod on a lone sphere's pole; for a sphere
 * in its arrangement the rest of the arrangement enters through the base field. R = ∞ (a plane)
 * gives the plane value.
 */
export function pointEnhancement(length: number, tipRadius: number, curvatureRadius: number): number {
  if (!Number.isFinite(curvatureRadius)) return rodEnhancement(length, tipRadius);
  return rodOnSphereEnhancement(length, tipRadius, curvatureRadius);
}

/**
 * Top voltage at which the tip reaches onset, V: onset / (β · base field per volt); NaN when the
 * rod is outside the model (l < a, l/a beyond MAX_ROD_ASPECT) or the base field is not positive.
 */
export function pointFiringVoltage(
  length: number,
  tipRadius: number,
  baseFieldPerVolt: number,
  onsetField: number,
  curvatureRadius = Number.POSITIVE_INFINITY,
): number {
  const beta = pointEnhancement(length, tipRadius, curvatureRadius);
  if (!(beta > 0) || !(baseFieldPerVolt > 0)) return Number.NaN;
  return onsetField / (beta * baseFieldPerVolt);
}

/** The outcome of sizing a point for a firing voltage. */
export type PointSizing =
  | { ok: true; length: number }
  | { ok: false; reason: 'too_high' | 'too_low'; limitVoltage: number };

/**
 * The rod length at which the point fires at `targetVoltage` (the firing voltage falls
 * monotonically with length; regula falsi with the Illinois step on ln V over ln l, which is nearly
 * straight, to 10⁻⁶ in ln V). 'too_high': even the shortest point (l = a, a bare hemisphere) fires
 * below the target; 'too_low': even the longest (l/a = MAX_ROD_ASPECT) fires above it.
 */
export function sizePointLength(
  targetVoltage: number,
  tipRadius: number,
  baseFieldPerVolt: number,
  onsetField: number,
  curvatureRadius = Number.POSITIVE_INFINITY,
): PointSizing {
  // (clamped: exp(ln a) may round just below a)
  const lengthOf = (u: number) => Math.min(tipRadius * MAX_ROD_ASPECT, Math.max(tipRadius, Math.exp(u)));
  const firing = (u: number) =>
    pointFiringVoltage(lengthOf(u), tipRadius, baseFieldPerVolt, onsetField, curvatureRadius);
  let low = Math.log(tipRadius);
  let high = Math.log(tipRadius * MAX_ROD_ASPECT);
  const shortest = firing(low);
  const longest = firing(high);
  if (!(targetVoltage <= shortest)) return { ok: false, reason: 'too_high', limitVoltage: shortest };
  if (!(targetVoltage >= longest)) return { ok: false, reason: 'too_low', limitVoltage: longest };
  const goal = Math.log(targetVoltage);
  let fLow = Math.log(shortest) - goal;
  let fHigh = Math.log(longest) - goal;
  let side = 0;
  let u = low;
  for (let iteration = 0; iteration < 60; iteration++) {
    u = fLow === fHigh ? 0.5 * (low + high) : (low * fHigh - high * fLow) / (fHigh - fLow);
    const f = Math.log(firing(u)) - goal;
    if (!Number.isFinite(f)) return { ok: false, reason: 'too_low', limitVoltage: longest };
    if (Math.abs(f) < 1e-6 || high - low < 1e-12) break;
    if (f > 0) {
      low = u;
      fLow = f;
      if (side === 1) fHigh /= 2;
      side = 1;
    } else {
      high = u;
      fHigh = f;
      if (side === -1) fLow /= 2;
      side = -1;
    }
  }
  return { ok: true, length: lengthOf(u) };
}
