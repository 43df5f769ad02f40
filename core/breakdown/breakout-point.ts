/**
 * A breakout point on the topload: when its tip reaches corona onset, and how long it must be to
 * fire at a chosen voltage.
 *
 * Model (local enhancement): the tip field per volt at the top is β(l/a) times the topload's own
 * surface field per volt at the point's base, β the apex enhancement of a hemisphere-capped rod on
 * a plane in a uniform field (core/electrostatics/breakout-rod.ts). That holds while the rod is
 * short against the curvature radius of the surface it stands on (the field the rod stands in is
 * then uniform over its height); beyond `POINT_MODEL_LENGTH_RATIO` of that radius the field falls
 * off along the rod and the model overstates the tip field (fires early): a warning says so.
 *
 * Onset at the tip: Peek's sphere form for the tip radius (peek.ts, refs §6.1 [peek1929]). Peek's
 * law rises without bound as the radius shrinks (like 1/√a); his sphere tests went down to radii of
 * a few millimetres (from memory), and below about a millimetre the onset of a sharp point is set
 * by the ionisation zone rather than by the surface curvature. Below `PEEK_SMALLEST_RADIUS` the
 * onset field is held at its value at that radius (our choice, stated in the README): the point
 * fires no later than Peek's extrapolation would say.
 */
import { peekSphereOnsetField } from './peek.ts';
import { MAX_ROD_ASPECT, rodEnhancement } from '../electrostatics/breakout-rod.ts';

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
 * Top voltage at which the tip reaches onset, V: onset / (β · base field per volt); NaN when the
 * rod is outside the model (l < a, l/a beyond MAX_ROD_ASPECT) or the base field is not positive.
 */
export function pointFiringVoltage(
  length: number,
  tipRadius: number,
  baseFieldPerVolt: number,
  onsetField: number,
): number {
  const beta = rodEnhancement(length, tipRadius);
  if (!(beta > 0) || !(baseFieldPerVolt > 0)) return Number.NaN;
  return onsetField / (beta * baseFieldPerVolt);
}

/** The outcome of sizing a point for a firing voltage. */
export type PointSizing =
  | { ok: true; length: number }
  | { ok: false; reason: 'too_high' | 'too_low'; limitVoltage: number };

/**
 * The rod length at which the point fires at `targetVoltage` (bisection on ln l, the firing voltage
 * falls monotonically with length). 'too_high': even the shortest point (l = a, a bare hemisphere)
 * fires below the target; 'too_low': even the longest (l/a = MAX_ROD_ASPECT) fires above it.
 */
export function sizePointLength(
  targetVoltage: number,
  tipRadius: number,
  baseFieldPerVolt: number,
  onsetField: number,
): PointSizing {
  const firing = (length: number) => pointFiringVoltage(length, tipRadius, baseFieldPerVolt, onsetField);
  let low = Math.log(tipRadius);
  let high = Math.log(tipRadius * MAX_ROD_ASPECT);
  const shortest = firing(tipRadius);
  const longest = firing(Math.exp(high));
  if (!(targetVoltage <= shortest)) return { ok: false, reason: 'too_high', limitVoltage: shortest };
  if (!(targetVoltage >= longest)) return { ok: false, reason: 'too_low', limitVoltage: longest };
  for (let iteration = 0; iteration < 60 && high - low > 1e-10; iteration++) {
    const middle = 0.5 * (low + high);
    if (firing(Math.exp(middle)) > targetVoltage) low = middle;
    else high = middle;
  }
  return { ok: true, length: Math.exp(0.5 * (low + high)) };
}
