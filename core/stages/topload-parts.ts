/**
 * Part of the electrostatics stage (electrostatics-stage.ts): the breakout point and the supports,
 * from the solved charges of the arrangement (per volt at the top).
 *
 * Breakout point (core/breakdown/breakout-point.ts): its base field is the topload's own surface
 * field where it stands (the top: a sphere's pole or a toroid's crown, angle π/2; the rim: the outer
 * equator, angle 0); its tip field that times the rod's enhancement; it fires when the tip reaches
 * Peek's onset for the tip radius. `fire_at_voltage` / `fire_at_fraction` (of the bare topload's
 * breakout voltage) solve for the length. A point at the top of a toroid with a centre disc stands
 * on the disc, on the axis, and is solved as a body of the design's field solve (axis-point.ts).
 * Supports (core/electrostatics/supports.ts): the largest field along the member and the topload's
 * quietest band.
 */
import type { EvalContext } from '../context.ts';
import type { BreakoutPointSpec } from '../design.ts';
import {
  POINT_MODEL_LENGTH_RATIO,
  pointEnhancement,
  pointFiringVoltage,
  sizePointLength,
  tipOnsetField,
} from '../breakdown/breakout-point.ts';
import type { ToploadBody } from '../electrostatics/bodies.ts';
import { MAX_ROD_ASPECT } from '../electrostatics/breakout-rod.ts';
import type { FieldArrangement, SurfaceFields } from '../electrostatics/field-solve.ts';
import {
  lowFieldBand,
  SUPPORT_FIELD_LIMIT,
  supportField,
  supportMember,
  toploadFieldAtAngle,
} from '../electrostatics/supports.ts';
import { formatNumber, formatQuantity } from '../outcome/warnings.ts';
import { axisPoint, standsOnCenterDisc } from './axis-point.ts';

/** A length in millimetres for messages. */
function mm(metres: number): string {
  return `${Number((metres * 1000).toFixed(1))} mm`;
}

/**
 * Sets the breakout point's and the supports' metrics and leaves breakoutPointVoltage and support
 * on context.electrostatics; pushes a problem for impossible geometry or sizing.
 */
export function toploadParts(
  context: EvalContext,
  arrangement: FieldArrangement,
  surface: SurfaceFields,
  airDensity: number,
  surfaceFactor: number,
  breakout: number | null,
): void {
  const topload = arrangement.topload;
  if (!topload || !context.electrostatics || topload.shape === 'disc') return;
  const point = context.design.breakoutPoint;
  if (point) {
    const placed = placePoint(
      context,
      arrangement,
      surface,
      point,
      tipOnsetField(point.tipRadius, airDensity, surfaceFactor),
      breakout,
    );
    if (!placed) return;
    recordPoint(context, topload, placed, breakout);
  }
  if (context.design.support) supportParts(context, arrangement, surface);
}

/** A placed breakout point: what the metrics report. */
interface PlacedPoint {
  length: number;
  enhancement: number;
  baseFieldPerVolt: number;
  onsetField: number;
  firingVoltage: number;
  /** Solved as a body of the design's field solve (no curvature model, no beyond-model warning). */
  solvedOnAxis: boolean;
}

/** The firing target of a point sized by `fire_at_voltage` / `fire_at_fraction`, or a problem. */
function firingTarget(
  context: EvalContext,
  point: BreakoutPointSpec,
  breakout: number | null,
): { field: string; voltage: number } | null {
  const fraction = point.fireAtFraction;
  const field = fraction !== undefined ? 'breakout_point.fire_at_fraction' : 'breakout_point.fire_at_voltage';
  const target = fraction !== undefined ? (breakout !== null ? fraction * breakout : Number.NaN) : point.fireAtVoltage;
  if (target === undefined || !(target > 0)) {
    context.problems.push({
      field,
      reason: 'the firing voltage cannot be formed (no breakout voltage of the bare topload)',
    });
    return null;
  }
  return { field, voltage: target };
}

/** Places and sizes the point: on the centre disc by the solve (axis-point.ts), else by the curvature model. */
function placePoint(
  context: EvalContext,
  arrangement: FieldArrangement,
  surface: SurfaceFields,
  point: BreakoutPointSpec,
  onset: number,
  breakout: number | null,
): PlacedPoint | null {
  const { problems } = context;
  const tipRadius = point.tipRadius;
  if (!(tipRadius > 0)) {
    problems.push({
      field: 'breakout_point.tip_radius',
      reason: `the tip radius (${mm(tipRadius)}) must be positive`,
    });
    return null;
  }
  if (standsOnCenterDisc(arrangement, point)) {
    const target = point.length === undefined ? firingTarget(context, point, breakout) : null;
    if (point.length === undefined && !target) return null;
    const solved = axisPoint(context, arrangement, surface, point, onset, target);
    if (!solved) return null;
    return {
      length: solved.length,
      enhancement: solved.tipFieldPerVolt / solved.baseFieldPerVolt,
      baseFieldPerVolt: solved.baseFieldPerVolt,
      onsetField: onset,
      firingVoltage: solved.firingVoltage,
      solvedOnAxis: true,
    };
  }
  return curvaturePoint(context, arrangement, surface, point, onset, breakout);
}

/** The point on a sphere or a toroid's tube: the rod on a sphere of the surface's mean curvature (breakout-point.ts). */
function curvaturePoint(
  context: EvalContext,
  arrangement: FieldArrangement,
  surface: SurfaceFields,
  point: BreakoutPointSpec,
  onset: number,
  breakout: number | null,
): PlacedPoint | null {
  const { problems } = context;
  const topload = arrangement.topload;
  if (!topload || topload.shape === 'disc') return null;
  const { layout, density } = surface;
  const { first, count } = surface.toploadPanels;
  const tipRadius = point.tipRadius;
  const angle = point.position === 'rim' ? 0 : Math.PI / 2;
  const baseField = toploadFieldAtAngle(topload, layout, density, first, count, angle);
  if (baseField === null || !(baseField > 0)) {
    problems.push({ field: 'breakout_point.position', reason: 'no surface field where the point stands' });
    return null;
  }
  // Radius of the sphere with the surface's mean curvature where the point stands.
  const curvature =
    topload.shape === 'sphere'
      ? topload.radius
      : point.position === 'rim'
        ? 2 / (1 / topload.minorRadius + 1 / (topload.majorRadius + topload.minorRadius))
        : 2 * topload.minorRadius;
  let length = point.length;
  if (length === undefined) {
    const target = firingTarget(context, point, breakout);
    if (!target) return null;
    const sizing = sizePointLength(target.voltage, tipRadius, baseField, onset, curvature);
    if (!sizing.ok) {
      problems.push({
        field: target.field,
        reason:
          sizing.reason === 'too_high'
            ? `no rod fires as late as ${formatQuantity(target.voltage, 'V')}: even a bare hemisphere of ${mm(tipRadius)} radius fires at ${formatQuantity(sizing.limitVoltage, 'V')} (a smaller tip radius raises its onset field; the top sees less field than the rim)`
            : `no rod fires as early as ${formatQuantity(target.voltage, 'V')}: even one ${MAX_ROD_ASPECT} tip radii long fires at ${formatQuantity(sizing.limitVoltage, 'V')} (a larger tip radius allows a longer rod)`,
      });
      return null;
    }
    length = sizing.length;
  }
  if (!(tipRadius < 0.5 * curvature)) {
    problems.push({
      field: 'breakout_point.tip_radius',
      reason: `the tip radius (${mm(tipRadius)}) is not below half the curvature radius it stands on (${mm(curvature)})`,
    });
    return null;
  }
  const enhancement = pointEnhancement(length, tipRadius, curvature);
  if (!(enhancement > 0) || !(length <= MAX_ROD_ASPECT * tipRadius)) {
    problems.push({
      field: 'breakout_point.length',
      reason: `the rod (${mm(length)}) must be at least its tip radius (${mm(tipRadius)}) and at most ${MAX_ROD_ASPECT} tip radii long`,
    });
    return null;
  }
  const firingVoltage = pointFiringVoltage(length, tipRadius, baseField, onset, curvature);
  return { length, enhancement, baseFieldPerVolt: baseField, onsetField: onset, firingVoltage, solvedOnAxis: false };
}

/** The point's metrics and warnings. */
function recordPoint(context: EvalContext, topload: ToploadBody, placed: PlacedPoint, breakout: number | null): void {
  const { metrics, warnings } = context;
  const electrostatics = context.electrostatics;
  if (!electrostatics) return;
  const { length, firingVoltage: firing } = placed;
  metrics.breakout_point_length = length;
  metrics.breakout_point_enhancement = placed.enhancement;
  metrics.breakout_point_base_field_per_volt = placed.baseFieldPerVolt;
  metrics.breakout_point_onset_field = placed.onsetField;
  metrics.breakout_point_voltage = firing;
  electrostatics.breakoutPointVoltage = firing;
  if (!placed.solvedOnAxis && topload.shape === 'toroid' && length > POINT_MODEL_LENGTH_RATIO * topload.minorRadius) {
    warnings.push({
      key: 'breakout_point_beyond_model',
      message: `the breakout point (${mm(length)}) is longer than ${formatNumber(POINT_MODEL_LENGTH_RATIO)} of the tube radius it stands on (${mm(topload.minorRadius)}): its tip field is modelled on a sphere of the tube's mean curvature, so the ${formatQuantity(firing, 'V')} is a rough estimate`,
    });
  }
  if (breakout !== null && firing >= breakout) {
    warnings.push({
      key: 'breakout_point_above_topload',
      message: `the breakout point fires at ${formatQuantity(firing, 'V')}, not below the topload's own breakout ${formatQuantity(breakout, 'V')}: the topload breaks out first (lengthen the point or sharpen its tip)`,
    });
  }
}

/** The supports' metrics: the largest field along the member and the topload's quietest band. */
function supportParts(context: EvalContext, arrangement: FieldArrangement, surface: SurfaceFields): void {
  const { design, metrics, problems } = context;
  const support = design.support;
  const topload = arrangement.topload;
  const electrostatics = context.electrostatics;
  if (!support || !topload || !electrostatics) return;
  const { layout, density } = surface;
  const { first, count } = surface.toploadPanels;
  const member = supportMember(support, topload, context.secondary, problems);
  if (!member) return;
  const along = supportField(member, topload, layout, density, arrangement.floor);
  if (along) {
    metrics.support_peak_field_per_volt = along.peakPerVolt;
    metrics.support_peak_field_position = along.position;
    electrostatics.support = { peakPerVolt: along.peakPerVolt, limit: support.fieldLimit ?? SUPPORT_FIELD_LIMIT };
  }
  const band = lowFieldBand(topload, layout, density, first, count);
  if (band) {
    metrics.topload_low_field_angle = band.angle;
    metrics.topload_low_field_per_volt = band.fieldPerVolt;
  }
}
