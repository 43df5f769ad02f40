/**
 * Stage of the evaluation pipeline (see core/evaluate.ts): electrostatics.
 *
 * Solves the field of the arrangement (core/electrostatics/field-solve.ts) for 1 V at the top of
 * the winding: the topload, the winding with its voltage distribution, the grounded primary rings
 * and strike rail, the floor. With the computed profile (the default) the winding is also solved as
 * a distributed resonator (core/resonator/design-resonator.ts): the resonant frequency is its
 * fundamental, the fields are those of the fundamental's voltage shape (by superposition), and the capacitance
 * at the top is the mode's energy capacitance; with an assumed profile the resonant frequency is
 * Thomson's 1/(2π√(L·C_total)). Either way the lumped value with the linear (or given) profile is
 * kept as a cross-check. Sets the streamer-loaded frequency (common practice, 1 pF per foot), the surface
 * fields per volt, Peek's onset field for the topload's curvature (cylinder form with the tube
 * radius for a toroid, sphere form for a sphere) with the relative air density from altitude and
 * temperature, and the breakout voltage = onset field / peak field per volt (a corona-onset
 * estimate). Medhurst's empirical self-capacitance is reported beside the field-based one as a
 * cross-check. A topload alone (no secondary) is solved over the floor at its centre height.
 */
import type { EvalContext, SecondaryGeometry } from '../context.ts';
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
import { linearProfileCapacitance, shapedSurfaceFields } from '../electrostatics/capacitance-matrix.ts';
import { type FieldArrangement, solveField, type SurfaceFields } from '../electrostatics/field-solve.ts';
import { distributedWinding } from '../resonator/design-resonator.ts';
import { formatNumber } from '../outcome/warnings.ts';
import { toploadParts } from './topload-parts.ts';

/** Runs the field solve for the design in `context` and sets its electrostatics metrics (see above). */
export function electrostaticsStage(context: EvalContext): void {
  const { design, metrics, problems } = context;
  if (!design.topload && !design.secondary) return;
  // A secondary in the design whose geometry an earlier stage could not give: nothing to solve.
  if (design.secondary && !context.secondary) return;
  const secondary = context.secondary;
  const environment = design.environment;

  const surfaceFactor = environment.surfaceFactor ?? DEFAULT_SURFACE_FACTOR;
  const environmentProblem = environmentProblemOf(environment, surfaceFactor);
  if (environmentProblem) {
    problems.push(environmentProblem);
    return;
  }

  // A three-coil system: the topload sits on the separate resonator (resonator-stage.ts), the
  // driver's winding is solved alone.
  const driverDesign = design.resonator && secondary ? { ...design, topload: undefined } : design;
  const arrangement = arrangementFromDesign(driverDesign, secondary, problems);
  if (!arrangement) return;
  const computed = Boolean(secondary && arrangement.winding && design.secondary?.voltageProfile === 'computed');
  const solved = computed && secondary ? distributedSolve(context, arrangement, secondary) : assumedSolve(arrangement);
  if (!solved) {
    if (problems.length === 0) {
      problems.push({
        field: design.topload ? 'topload' : 'secondary',
        reason: 'the field solve found no solution for this geometry (singular system)',
      });
    }
    return;
  }
  const { surface, lumped } = solved;
  const resonator = context.resonator;

  const airDensity = relativeAirDensity(environment.altitude, environment.temperature);
  metrics.air_density_factor = airDensity;
  // The capacitance seen at the top: the resonator's energy capacitance when computed (equal to the
  // shaped field solve's to discretisation accuracy), else the field solve's for the given profile.
  const totalCapacitance = resonator ? resonator.effectiveCapacitance : lumped.totalCapacitance;
  metrics.total_capacitance = totalCapacitance;

  const { onsetField, breakout } = toploadBreakout(context, arrangement, surface, airDensity, surfaceFactor);

  if (secondary && arrangement.winding) {
    metrics.secondary_self_capacitance = lumped.selfCapacitance;
    metrics.secondary_self_capacitance_medhurst = medhurstSelfCapacitance(
      2 * secondary.radius,
      secondary.topZ - secondary.bottomZ,
    );
    metrics.winding_top_field_per_volt = surface.windingTopFieldPerVolt;
    if (secondary.inductance > 0) frequencyMetrics(context, secondary, lumped.totalCapacitance, totalCapacitance);
  }

  context.electrostatics = {
    totalCapacitance,
    toploadCapacitance: surface.toploadCapacitance,
    toploadFieldPerVolt: surface.toploadPeakFieldPerVolt,
    onsetField,
    breakoutVoltage: breakout,
  };
  if (design.breakoutPoint || design.support)
    toploadParts(context, arrangement, surface, airDensity, surfaceFactor, breakout);
}

/**
 * Sets the topload's capacitance, surface-field metrics, Peek onset field and breakout voltage; returns
 * the onset field and the breakout voltage (null without a toroid or sphere topload in the solve).
 */
function toploadBreakout(
  context: EvalContext,
  arrangement: FieldArrangement,
  surface: SurfaceFields,
  airDensity: number,
  surfaceFactor: number,
): { onsetField: number | null; breakout: number | null } {
  const metrics = context.metrics;
  let onsetField: number | null = null;
  let breakout: number | null = null;
  const topload = arrangement.topload;
  if (topload && surface.toploadCapacitance !== null && surface.toploadPeakFieldPerVolt !== null) {
    metrics.topload_capacitance = surface.toploadCapacitance;
    metrics.topload_field_per_volt = surface.toploadPeakFieldPerVolt;
    metrics.topload_underside_field_per_volt = surface.toploadUndersideFieldPerVolt;
    metrics.topload_peak_field_angle = surface.toploadPeakAngle;
    onsetField =
      topload.shape === 'toroid'
        ? peekCylinderOnsetField(topload.minorRadius, airDensity, surfaceFactor)
        : topload.shape === 'sphere'
          ? peekSphereOnsetField(topload.radius, airDensity, surfaceFactor)
          : null;
    if (onsetField !== null) {
      metrics.topload_onset_field = onsetField;
      breakout = breakoutVoltage(onsetField, surface.toploadPeakFieldPerVolt);
      metrics.breakout_voltage = breakout;
    }
  }
  return { onsetField, breakout };
}

/** What the stage needs from either solve: the fields of the profile and the lumped cross-check. */
interface SolvedFields {
  surface: SurfaceFields;
  lumped: { totalCapacitance: number; selfCapacitance: number | null };
}

/** An assumed profile: one field solve gives everything. */
function assumedSolve(arrangement: FieldArrangement): SolvedFields | null {
  const solution = solveField(arrangement);
  return solution ? { surface: solution, lumped: solution } : null;
}

/**
 * The computed profile: the distributed resonator's node capacitance matrix gives the fields of the
 * fundamental's profile (by superposition) and the linear-profile capacitances of the lumped
 * cross-check (Vᵀ C V; the winding alone from the leading block), without a second field solve.
 */
function distributedSolve(
  context: EvalContext,
  arrangement: FieldArrangement,
  secondary: SecondaryGeometry,
): SolvedFields | null {
  const resonator = distributedWinding(arrangement, {
    radius: secondary.radius,
    turns: secondary.turns,
    pitch: secondary.pitch,
    wireRadius: secondary.bareDiameter / 2,
  });
  if (!resonator) {
    context.problems.push({
      field: 'secondary',
      reason:
        'the distributed model of the winding found no resonance (its inductance or capacitance matrix is not positive definite)',
    });
    return null;
  }
  context.resonator = resonator;
  if (!resonator.converged) {
    const change =
      resonator.lastChange === null ? '' : ` (its estimated error is ${formatNumber(100 * resonator.lastChange)} %)`;
    context.warnings.push({
      key: 'resonator_unconverged',
      message: `the distributed model of the winding stopped at ${resonator.solution.segments} segments before its fundamental converged to 0.1 %${change}`,
    });
  }
  const matrix = resonator.capacitance;
  const linear = linearProfileCapacitance(matrix);
  return {
    surface: shapedSurfaceFields(arrangement, matrix, resonator.shape),
    lumped: { totalCapacitance: linear, selfCapacitance: arrangement.topload ? matrix.selfCapacitance : linear },
  };
}

/** The environment a field solve needs: inside the standard troposphere, above absolute zero, a surface factor in (0, 1]. */
function environmentProblemOf(
  environment: EvalContext['design']['environment'],
  surfaceFactor: number,
): { field: string; reason: string } | null {
  if (!(environment.altitude >= -500 && environment.altitude <= TROPOPAUSE_ALTITUDE)) {
    return {
      field: 'environment.altitude',
      reason: `the altitude (${environment.altitude} m) is outside the standard troposphere (−500 m to 11 000 m)`,
    };
  }
  if (!(environment.temperature > 0)) {
    return {
      field: 'environment.temperature',
      reason: `the temperature (${environment.temperature} K) must be above absolute zero`,
    };
  }
  if (!(surfaceFactor > 0 && surfaceFactor <= 1)) {
    return {
      field: 'environment.surface_factor',
      reason: `the surface factor (${surfaceFactor}) must be in (0, 1]`,
    };
  }
  return null;
}

/** The winding's frequencies and effective values: from the distributed resonator when computed, else Thomson's. */
function frequencyMetrics(
  context: EvalContext,
  secondary: NonNullable<EvalContext['secondary']>,
  lumpedCapacitance: number,
  totalCapacitance: number,
): void {
  const { design, metrics } = context;
  const resonator = context.resonator;
  const environment = design.environment;
  metrics.resonant_frequency_lumped = lcResonantFrequency(secondary.inductance, lumpedCapacitance);
  const streamerLength = environment.streamerLength ?? 0;
  const streamer = streamerLength > 0 ? streamerCapacitance(streamerLength) : 0;
  if (resonator) {
    metrics.resonant_frequency = resonator.fundamental;
    metrics.overtone_frequency = resonator.overtone;
    metrics.overtone_ratio = resonator.overtone !== null ? resonator.overtone / resonator.fundamental : null;
    metrics.effective_inductance = resonator.effectiveInductance;
    metrics.effective_capacitance = resonator.effectiveCapacitance;
    metrics.axial_gradient_position = resonator.peakGradientFraction;
    metrics.resonator_segments = resonator.solution.segments;
    if (streamer > 0) metrics.loaded_resonant_frequency = resonator.loadedFundamental(streamer);
  } else {
    metrics.resonant_frequency = lcResonantFrequency(secondary.inductance, totalCapacitance);
    metrics.effective_inductance = secondary.inductance;
    metrics.effective_capacitance = totalCapacitance;
    metrics.axial_gradient_position = design.secondary?.voltageProfile === 'quarter_wave' ? 0 : null;
    if (streamer > 0) {
      metrics.loaded_resonant_frequency = lcResonantFrequency(secondary.inductance, totalCapacitance + streamer);
    }
  }
}
