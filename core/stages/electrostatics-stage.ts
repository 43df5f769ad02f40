/**
 * Stage of the evaluation pipeline (see core/evaluate.ts): electrostatics.
 *
 * Solves the field of the arrangement (core/electrostatics/field-solve.ts) for 1 V at the top of
 * the winding: the topload, the winding with its voltage distribution, the grounded primary rings
 * and strike rail, the floor. Sets the capacitances, the resonant frequency (Thomson,
 * 1/(2π√(L·C_total))) and its streamer-loaded value (common practice, 1 pF per foot), the surface
 * fields per volt, Peek's onset field for the topload's curvature (cylinder form with the tube
 * radius for a toroid, sphere form for a sphere) with the relative air density from altitude and
 * temperature, and the breakout voltage = onset field / peak field per volt (a corona-onset
 * estimate). Medhurst's empirical self-capacitance is reported beside the field-based one as a
 * cross-check. A topload alone (no secondary) is solved over the floor at its centre height.
 */
import type { EvalContext } from '../context.ts';
import { relativeAirDensity, TROPOPAUSE_ALTITUDE } from '../breakdown/air-density.ts';
import {
  breakoutVoltage,
  DEFAULT_SURFACE_FACTOR,
  peekCylinderOnsetField,
  peekSphereOnsetField,
} from '../breakdown/peek.ts';
import { medhurstSelfCapacitance } from '../capacitance/medhurst.ts';
import { lcResonantFrequency } from '../capacitance/resonance.ts';
import { streamerCapacitance } from '../capacitance/streamer.ts';
import { arrangementFromDesign } from '../electrostatics/arrangement.ts';
import { solveField } from '../electrostatics/field-solve.ts';

/** Runs the field solve for the design in `context` and sets its electrostatics metrics (see above). */
export function electrostaticsStage(context: EvalContext): void {
  const { design, metrics, problems } = context;
  if (!design.topload && !design.secondary) return;
  // A secondary in the design whose geometry an earlier stage could not give: nothing to solve.
  if (design.secondary && !context.secondary) return;
  const secondary = context.secondary;
  const environment = design.environment;

  if (!(environment.altitude >= -500 && environment.altitude <= TROPOPAUSE_ALTITUDE)) {
    problems.push({
      field: 'environment.altitude',
      reason: `the altitude (${environment.altitude} m) is outside the standard troposphere (−500 m to 11 000 m)`,
    });
    return;
  }
  if (!(environment.temperature > 0)) {
    problems.push({
      field: 'environment.temperature',
      reason: `the temperature (${environment.temperature} K) must be above absolute zero`,
    });
    return;
  }
  const surfaceFactor = environment.surfaceFactor ?? DEFAULT_SURFACE_FACTOR;
  if (!(surfaceFactor > 0 && surfaceFactor <= 1)) {
    problems.push({
      field: 'environment.surface_factor',
      reason: `the surface factor (${surfaceFactor}) must be in (0, 1]`,
    });
    return;
  }

  const arrangement = arrangementFromDesign(design, secondary, problems);
  if (!arrangement) return;
  const solution = solveField(arrangement);
  if (!solution) {
    problems.push({
      field: design.topload ? 'topload' : 'secondary',
      reason: 'the field solve found no solution for this geometry (singular system)',
    });
    return;
  }

  const airDensity = relativeAirDensity(environment.altitude, environment.temperature);
  metrics.air_density_factor = airDensity;
  metrics.total_capacitance = solution.totalCapacitance;

  let onsetField: number | null = null;
  let breakout: number | null = null;
  const topload = arrangement.topload;
  if (topload && solution.toploadCapacitance !== null && solution.toploadPeakFieldPerVolt !== null) {
    metrics.topload_capacitance = solution.toploadCapacitance;
    metrics.topload_field_per_volt = solution.toploadPeakFieldPerVolt;
    metrics.topload_underside_field_per_volt = solution.toploadUndersideFieldPerVolt;
    metrics.topload_peak_field_angle = solution.toploadPeakAngle;
    onsetField =
      topload.shape === 'toroid'
        ? peekCylinderOnsetField(topload.minorRadius, airDensity, surfaceFactor)
        : topload.shape === 'sphere'
          ? peekSphereOnsetField(topload.radius, airDensity, surfaceFactor)
          : null;
    if (onsetField !== null) {
      metrics.topload_onset_field = onsetField;
      breakout = breakoutVoltage(onsetField, solution.toploadPeakFieldPerVolt);
      metrics.breakout_voltage = breakout;
    }
  }

  if (secondary && arrangement.winding) {
    metrics.secondary_self_capacitance = solution.selfCapacitance;
    metrics.secondary_self_capacitance_medhurst = medhurstSelfCapacitance(
      2 * secondary.radius,
      secondary.topZ - secondary.bottomZ,
    );
    metrics.winding_top_field_per_volt = solution.windingTopFieldPerVolt;
    if (secondary.inductance > 0) {
      metrics.resonant_frequency = lcResonantFrequency(secondary.inductance, solution.totalCapacitance);
      const streamerLength = environment.streamerLength ?? 0;
      if (streamerLength > 0) {
        metrics.loaded_resonant_frequency = lcResonantFrequency(
          secondary.inductance,
          solution.totalCapacitance + streamerCapacitance(streamerLength),
        );
      }
    }
  }

  context.electrostatics = {
    totalCapacitance: solution.totalCapacitance,
    toploadCapacitance: solution.toploadCapacitance,
    toploadFieldPerVolt: solution.toploadPeakFieldPerVolt,
    onsetField,
    breakoutVoltage: breakout,
  };
}
