/**
 * Part of the electrostatics stage (electrostatics-stage.ts): the breakout point and the supports,
 * from the solved charges of the arrangement (per volt at the top).
 *
 * Breakout point (core/breakdown/breakout-point.ts): its base field is the topload's own surface
 * field where it stands (the top: a sphere's pole or a toroid's crown, angle π/2; the rim: the outer
 * equator, angle 0); its tip field that times the rod's enhancement; it fires when the tip reaches
 * Peek's onset for the tip radius. `fire_at_voltage` / `fire_at_fraction` (of the bare topload's
 * breakout voltage) solve for the length. Supports (core/electrostatics/supports.ts): the largest
 * field along the member and the topload's quietest band.
 */
import type { EvalContext } from '../context.ts';
import {
  POINT_MODEL_LENGTH_RATIO,
  pointEnhancement,
  pointFiringVoltage,
  sizePointLength,
  tipOnsetField,
} from '../breakdown/breakout-point.ts';
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
  const { design, metrics, problems, warnings } = context;
  const topload = arrangement.topload;
  const electrostatics = context.electrostatics;
  if (!topload || !electrostatics || topload.shape === 'disc') return;
  const { layout, density } = surface;
  const { first, count } = surface.toploadPanels;

  const point = design.breakoutPoint;
  if (point) {
    const tipRadius = point.tipRadius;
    if (!(tipRadius > 0)) {
      problems.push({
        field: 'breakout_point.tip_radius',
        reason: `the tip radius (${mm(tipRadius)}) must be positive`,
      });
      return;
    }
    const angle = point.position === 'rim' ? 0 : Math.PI / 2;
    const baseField = toploadFieldAtAngle(topload, layout, density, first, count, angle);
    if (baseField === null || !(baseField > 0)) {
      problems.push({ field: 'breakout_point.position', reason: 'no surface field where the point stands' });
      return;
    }
    const onset = tipOnsetField(tipRadius, airDensity, surfaceFactor);
    // Radius of the sphere with the surface's mean curvature where the point stands.
    const curvature =
      topload.shape === 'sphere'
        ? topload.radius
        : point.position === 'rim'
          ? 2 / (1 / topload.minorRadius + 1 / (topload.majorRadius + topload.minorRadius))
          : 2 * topload.minorRadius;
    let length = point.length;
    if (length === undefined) {
      const fraction = point.fireAtFraction;
      const field = fraction !== undefined ? 'breakout_point.fire_at_fraction' : 'breakout_point.fire_at_voltage';
      const target =
        fraction !== undefined ? (breakout !== null ? fraction * breakout : Number.NaN) : point.fireAtVoltage;
      if (target === undefined || !(target > 0)) {
        problems.push({
          field,
          reason: 'the firing voltage cannot be formed (no breakout voltage of the bare topload)',
        });
        return;
      }
      const sizing = sizePointLength(target, tipRadius, baseField, onset, curvature);
      if (!sizing.ok) {
        problems.push({
          field,
          reason:
            sizing.reason === 'too_high'
              ? `no rod fires as late as ${formatQuantity(target, 'V')}: even a bare hemisphere of ${mm(tipRadius)} radius fires at ${formatQuantity(sizing.limitVoltage, 'V')} (a smaller tip radius raises its onset field; the top sees less field than the rim)`
              : `no rod fires as early as ${formatQuantity(target, 'V')}: even one ${MAX_ROD_ASPECT} tip radii long fires at ${formatQuantity(sizing.limitVoltage, 'V')} (a larger tip radius allows a longer rod)`,
        });
        return;
      }
      length = sizing.length;
    }
    if (!(tipRadius < 0.5 * curvature)) {
      problems.push({
        field: 'breakout_point.tip_radius',
        reason: `the tip radius (${mm(tipRadius)}) is not below half the curvature radius it stands on (${mm(curvature)})`,
      });
      return;
    }
    const enhancement = pointEnhancement(length, tipRadius, curvature);
    if (!(enhancement > 0) || !(length <= MAX_ROD_ASPECT * tipRadius)) {
      problems.push({
        field: 'breakout_point.length',
        reason: `the rod (${mm(length)}) must be at least its tip radius (${mm(tipRadius)}) and at most ${MAX_ROD_ASPECT} tip radii long`,
      });
      return;
    }
    const firing = pointFiringVoltage(length, tipRadius, baseField, onset, curvature);
    metrics.breakout_point_length = length;
    metrics.breakout_point_enhancement = enhancement;
    metrics.breakout_point_base_field_per_volt = baseField;
    metrics.breakout_point_onset_field = onset;
    metrics.breakout_point_voltage = firing;
    electrostatics.breakoutPointVoltage = firing;
    if (topload.shape === 'toroid' && length > POINT_MODEL_LENGTH_RATIO * topload.minorRadius) {
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

  const support = design.support;
  if (support) {
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
}
