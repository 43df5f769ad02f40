/**
 * Stage of the evaluation pipeline (see core/evaluate.ts): outcome.
 *
 * What the peak voltage means for the builder: breakout margin, topload field, axial gradient,
 * strike clearance to the primary, overall height, the spark-length rule of thumb and the
 * streamer-loaded frequency, and the warnings.
 */
import type { WindingProfile } from '../electrostatics/field-solve.ts';
import type { EvalContext } from '../context.ts';
import { overallHeight } from '../outcome/overall-height.ts';
import { loadedResonantFrequency, sparkLengthEstimate } from '../outcome/spark-length.ts';
import { streamerCapacitance } from '../capacitance/streamer.ts';
import {
  LONG_GAP_WITHSTAND_GRADIENT,
  primaryStrikeMargin,
  toploadCentreHeight,
  toploadToRingDistance,
} from '../outcome/clearance.ts';
import { AXIAL_GRADIENT_LIMIT, formatNumber, formatQuantity, POINT_USEFUL_FRACTION } from '../outcome/warnings.ts';

/**
 * Sets overall_height, spark_length (common practice), loaded_resonant_frequency (from that spark
 * length when the design gives no streamer length), breakout_margin, topload_peak_field,
 * axial_gradient and primary_strike_margin, and pushes the builder's warnings, each with its number.
 */
export function outcomeStage(context: EvalContext): void {
  const sparkLength = heightAndSpark(context);
  const uncapped = context.metrics.peak_voltage;
  if (uncapped === null || !(uncapped > 0)) return;
  const { peak, pointVoltage } = capAtPoint(context, uncapped);
  breakoutChecks(context, peak, pointVoltage);
  fieldChecks(context, peak);
  gradientCheck(context, peak);
  strikeChecks(context, peak, sparkLength);
}

/**
 * Sets overall_height, spark_length, headroom_needed and loaded_resonant_frequency; returns the spark
 * length estimate (null without an input power).
 */
function heightAndSpark(context: EvalContext): number | null {
  const { design, metrics } = context;
  const secondary = context.secondary;
  const electrostatics = context.electrostatics;
  const pointLength = metrics.breakout_point_length;
  const threeCoil = context.threeCoil;
  const line = design.resonator?.line;
  if (threeCoil && secondary && line) {
    // The topload stands on the resonator; the driver's top or the feed line (its conductor's top)
    // may still be the highest conductor.
    const lineTop = line.height + line.conductorDiameter / 2;
    const resonatorTop = overallHeight(design, threeCoil.winding, pointLength) ?? 0;
    metrics.overall_height = Math.max(secondary.topZ, lineTop, resonatorTop);
  } else {
    metrics.overall_height = overallHeight(design, secondary, pointLength);
  }

  const power = metrics.input_power;
  const sparkLength = power !== null && Number.isFinite(power) ? sparkLengthEstimate(power) : null;
  metrics.spark_length = sparkLength;
  // Common practice: a discharge reaches about its own length in any direction from the topload,
  // so the ceiling must clear the overall height by the spark length estimate.
  if (sparkLength !== null && metrics.overall_height !== null)
    metrics.headroom_needed = metrics.overall_height + sparkLength;
  if (sparkLength !== null && secondary && electrostatics && design.environment.streamerLength === undefined) {
    const streamer = streamerCapacitance(sparkLength);
    metrics.loaded_resonant_frequency = context.resonator
      ? context.resonator.loadedFundamental(streamer)
      : loadedResonantFrequency(secondary.inductance, electrostatics.totalCapacitance, streamer);
    // three coils: the streamers load the resonator's top, not the secondary's
    const resonatorModel = context.threeCoil?.distributed;
    if (context.threeCoil) metrics.loaded_resonant_frequency = resonatorModel?.loadedFundamental(streamer) ?? null;
  }
  return sparkLength;
}

/**
 * A breakout point fires first and holds the top at its firing voltage: sets
 * peak_voltage_without_point and the capped peak_voltage (and resonator_peak_voltage, the same top,
 * in a three-coil system), with the point's warnings. Returns the peak
 * the rest of the stage uses and the point's firing voltage (null without a point).
 */
function capAtPoint(context: EvalContext, uncapped: number): { peak: number; pointVoltage: number | null } {
  const pointVoltage = context.electrostatics?.breakoutPointVoltage ?? null;
  if (pointVoltage === null || !(pointVoltage > 0)) return { peak: uncapped, pointVoltage };
  context.metrics.peak_voltage_without_point = uncapped;
  pointWarnings(context, uncapped, pointVoltage);
  const peak = Math.min(uncapped, pointVoltage);
  context.metrics.peak_voltage = peak;
  // three coils: the point stands on the resonator's topload, so it holds the resonator's top
  if (context.threeCoil) context.metrics.resonator_peak_voltage = peak;
  return { peak, pointVoltage };
}

/** Sets breakout_margin: the topload's breakout voltage over the (capped) peak, with its warnings. */
function breakoutChecks(context: EvalContext, peak: number, pointVoltage: number | null): void {
  const { metrics, warnings } = context;
  const breakout = context.electrostatics?.breakoutVoltage ?? null;
  if (breakout !== null && breakout > 0 && pointVoltage !== null && pointVoltage > 0) {
    // The topload's margin above the point: how far above the (capped) top voltage it holds.
    const margin = breakout / peak;
    metrics.breakout_margin = margin;
    if (margin < 1) {
      warnings.push({
        key: 'topload_breaks_out_early',
        message: `the topload breaks out at ${formatQuantity(breakout, 'V')}, below the ${formatQuantity(peak, 'V')} at which the breakout point holds the top (breakout margin ${formatNumber(margin)}): streamers start all round`,
      });
    }
  } else if (breakout !== null && breakout > 0) {
    const margin = breakout / peak;
    metrics.breakout_margin = margin;
    if (margin < 1) {
      warnings.push({
        key: 'topload_breaks_out_early',
        message: `the topload breaks out at ${formatQuantity(breakout, 'V')}, below the peak voltage ${formatQuantity(peak, 'V')} (breakout margin ${formatNumber(margin)}): streamers start all round before the peak`,
      });
    } else {
      warnings.push({
        key: 'topload_never_breaks_out',
        message: `the topload holds at the peak voltage ${formatQuantity(peak, 'V')} (breakout margin ${formatNumber(margin)}): without a breakout point it never breaks out, and racing arcs or strikes become likely`,
      });
    }
  }
}

/** Sets topload_peak_field, support_peak_field and support_field_margin at the peak, with the support's warning. */
function fieldChecks(context: EvalContext, peak: number): void {
  const { metrics, warnings } = context;
  const electrostatics = context.electrostatics;
  const fieldPerVolt = electrostatics?.toploadFieldPerVolt ?? null;
  if (fieldPerVolt !== null) metrics.topload_peak_field = fieldPerVolt * peak;
  const support = electrostatics?.support ?? null;
  if (support) {
    const supportPeak = support.peakPerVolt * peak;
    metrics.support_peak_field = supportPeak;
    metrics.support_field_margin = support.limit / supportPeak;
    if (supportPeak > support.limit) {
      warnings.push({
        key: 'support_field_high',
        message: `the field along the support reaches ${formatQuantity(supportPeak, 'V/m')} at the peak voltage ${formatQuantity(peak, 'V')}, above its ${formatQuantity(support.limit, 'V/m')} limit (common practice): tracking and flashover along it likely`,
      });
    }
  }
}

/** Sets axial_gradient along the winding that carries the top voltage, with its warning. */
function gradientCheck(context: EvalContext, peak: number): void {
  const secondary = context.secondary;
  if (!secondary) return;
  const threeCoil = context.threeCoil;
  // three coils: the resonator's winding carries the top voltage
  const gradient = threeCoil
    ? peak * threeCoil.gradientPerVolt
    : peak * gradientPerVolt(context, secondary.windingLength);
  context.metrics.axial_gradient = gradient;
  if (gradient > AXIAL_GRADIENT_LIMIT) {
    context.warnings.push({
      key: 'axial_gradient_high',
      message: `axial gradient ${formatQuantity(gradient, 'V/m')} along the winding exceeds ${formatQuantity(AXIAL_GRADIENT_LIMIT, 'V/m')} (common practice, from memory): racing arcs likely`,
    });
  }
}

/**
 * Sets primary_strike_margin between the outer primary ring and the winding, with its warning, and
 * warns when the spark length estimate reaches that ring from the topload without a strike rail.
 */
function strikeChecks(context: EvalContext, peak: number, sparkLength: number | null): void {
  const { design, metrics, warnings } = context;
  const secondary = context.secondary;
  const primary = context.primary;
  const threeCoil = context.threeCoil;
  if (!(secondary && primary && primary.rings.length > 0 && design.secondary)) return;
  const outerRing = primary.rings[primary.rings.length - 1];
  const driver = design.driver;
  const primaryVoltage = driver?.kind === 'solid_state' ? driver.busVoltage : (design.tank?.chargeVoltage ?? 0);
  const strike = primaryStrikeMargin(
    outerRing,
    primary.conductorRadius,
    secondary,
    windingProfile(context),
    threeCoil ? (metrics.junction_peak_voltage ?? peak) : peak,
    primaryVoltage,
  );
  metrics.primary_strike_margin = Number.isFinite(strike.margin) ? strike.margin : null;
  if (strike.margin < 1) {
    warnings.push({
      key: 'primary_strike_risk',
      message: `primary-to-secondary strike risk: ${formatQuantity(strike.voltage, 'V')} across ${formatQuantity(strike.gap, 'm')} of air between the outer primary ring and the winding at its height (strike margin ${formatNumber(strike.margin)} at ${formatQuantity(LONG_GAP_WITHSTAND_GRADIENT, 'V/m')}, common practice)`,
    });
  }
  if (design.topload && !threeCoil && !design.strikeRail && sparkLength !== null) {
    const centre = toploadCentreHeight(design.topload, secondary.topZ);
    if (centre !== null) {
      const reach = toploadToRingDistance(design.topload, centre, outerRing);
      if (sparkLength >= reach) {
        warnings.push({
          key: 'strike_rail_needed',
          message: `spark length estimate ${formatQuantity(sparkLength, 'm')} (common practice) reaches the outer primary ring ${formatQuantity(reach, 'm')} from the topload: fit a grounded strike rail`,
        });
      }
    }
  }
}

/** The voltage profile along the winding: the computed shape, or the design's assumed one. */
function windingProfile(context: EvalContext): WindingProfile {
  if (context.resonator) return context.resonator.shape;
  return context.design.secondary?.voltageProfile === 'quarter_wave' ? 'quarter_wave' : 'linear';
}

/**
 * The steepest |dV/dz| along the winding per volt at the top, 1/m: the computed profile's peak, the
 * quarter sine's π/(2ℓ) at the base, or the linear profile's 1/ℓ.
 */
function gradientPerVolt(context: EvalContext, windingLength: number): number {
  if (context.resonator) return context.resonator.peakGradientPerVolt;
  const quarterWave = context.design.secondary?.voltageProfile === 'quarter_wave';
  return (quarterWave ? Math.PI / 2 : 1) / windingLength;
}

/** The breakout point's warnings: it never fires, or it fires too low to leave useful sparks. */
function pointWarnings(context: EvalContext, peak: number, pointVoltage: number): void {
  if (peak < pointVoltage) {
    context.warnings.push({
      key: 'breakout_point_never_fires',
      message: `the peak voltage ${formatQuantity(peak, 'V')} stays below the breakout point's firing voltage ${formatQuantity(pointVoltage, 'V')}: the point never fires (lengthen it or sharpen its tip)`,
    });
  } else if (pointVoltage < POINT_USEFUL_FRACTION * peak) {
    context.warnings.push({
      key: 'breakout_point_fires_low',
      message: `the breakout point fires at ${formatQuantity(pointVoltage, 'V')}, below ${formatNumber(POINT_USEFUL_FRACTION)} of the ${formatQuantity(peak, 'V')} the coil would reach (common practice): it clips the swing to short sparks (shorten it or blunt its tip)`,
    });
  }
}
