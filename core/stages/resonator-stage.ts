/**
 * Stage of the evaluation pipeline (see core/evaluate.ts): the separate resonator of a three-coil
 * system (design.resonator), after the driver's electrostatics and before the primary.
 *
 * - The resonator's winding is a secondary of its own: its geometry, inductance and, with the
 *   topload over the floor, the field solve and the distributed model exactly as for a two-coil
 *   secondary (secondary-stage.ts, electrostatics-stage.ts, run on the resonator alone). The
 *   resonator is taken far enough from the driver and its primary that neither field disturbs the
 *   other (the separation that needs is reported by the dynamics stage).
 * - The driver's secondary is solved without the topload (electrostatics-stage.ts leaves it out when
 *   a resonator is given); its top capacitance plus the line's capacitance to the floor
 *   (three-coil/line.ts) make the junction capacitance C2.
 * - The resonator in the circuit: its effective inductance and capacitance at the top (same
 *   fundamental, same stored energy for the same top voltage) with the line's inductance in
 *   series. Lumped approximation: the distributed model is solved with its base grounded, while in
 *   the circuit the base follows the junction.
 * - The topload's metrics (capacitance, field per volt, onset field, breakout voltage) are those
 *   of the resonator's solve, so every margin and warning of the outcome applies to it.
 * - The breakout point and the supports (topload-parts.ts) stand on the resonator's topload: they
 *   are solved in the resonator's own solve, with its winding (a column from the winding top stands
 *   on the resonator's winding, a rod may not cross it), so the point's firing voltage caps the
 *   resonator's top voltage in the outcome stage exactly as a two-coil top voltage.
 */
import type { DesignProblem, EvalContext, ThreeCoilParts } from '../context.ts';
import type { Design } from '../design.ts';
import { emptyMetrics } from '../metrics.ts';
import { must } from '../must.ts';
import { lineCapacitance, lineInductance } from '../three-coil/line.ts';
import { toploadOuterRadius } from '../three-coil/clearance.ts';
import { electrostaticsStage } from './electrostatics-stage.ts';
import { secondaryStage } from './secondary-stage.ts';

/** The topload metrics taken from the resonator's own solve. */
const TOPLOAD_METRICS = [
  'topload_capacitance',
  'topload_field_per_volt',
  'topload_underside_field_per_volt',
  'topload_peak_field_angle',
  'topload_onset_field',
  'breakout_voltage',
  'breakout_point_length',
  'breakout_point_enhancement',
  'breakout_point_base_field_per_volt',
  'breakout_point_onset_field',
  'breakout_point_voltage',
  'support_peak_field_per_volt',
  'support_peak_field_position',
  'topload_low_field_angle',
  'topload_low_field_per_volt',
] as const;

function mm(metres: number): string {
  return `${Number((metres * 1e3).toPrecision(4))} mm`;
}

/**
 * The resonator's winding and topload evaluated alone (secondary and electrostatics stages on a
 * design of their own); its problems and warnings are the design's, named for the resonator.
 */
function resonatorAlone(context: EvalContext, spec: NonNullable<Design['resonator']>): EvalContext {
  const { design, problems } = context;
  const subDesign: Design = { secondary: spec.winding, environment: design.environment };
  if (design.topload) subDesign.topload = design.topload;
  if (design.breakoutPoint) subDesign.breakoutPoint = design.breakoutPoint;
  if (design.support) subDesign.support = design.support;
  const sub: EvalContext = { design: subDesign, metrics: emptyMetrics(), warnings: [], problems: [] };
  secondaryStage(sub);
  if (sub.problems.length === 0) electrostaticsStage(sub);
  for (const problem of sub.problems) {
    problems.push({ ...problem, field: problem.field.replace(/^secondary/, 'resonator') });
  }
  for (const warning of sub.warnings)
    context.warnings.push({ ...warning, message: `the resonator: ${warning.message}` });
  return sub;
}

/** The resonator stands beside the driver: their outlines (winding, topload) must not overlap. */
function overlapProblem(
  design: Design,
  spec: NonNullable<Design['resonator']>,
  driver: NonNullable<EvalContext['secondary']>,
  winding: NonNullable<EvalContext['secondary']>,
): { spacing: number; problem: DesignProblem | null } {
  const spacing = spec.axisSpacing ?? spec.line.length;
  const driverOuter = driver.radius + driver.overallDiameter / 2;
  const resonatorOuter = Math.max(
    winding.radius + winding.overallDiameter / 2,
    design.topload ? toploadOuterRadius(design.topload) : 0,
  );
  if (spacing > driverOuter + resonatorOuter) return { spacing, problem: null };
  return {
    spacing,
    problem: {
      field: spec.axisSpacing !== undefined ? 'resonator.axis_spacing' : 'resonator.line_length',
      reason: `the resonator (outer radius ${mm(resonatorOuter)}) at ${mm(spacing)} from the secondary's axis overlaps the secondary (outer radius ${mm(driverOuter)})`,
    },
  };
}

/** The three-coil metrics, and the driver's electrostatics as the primary stage sees them (see the header). */
function recordThreeCoil(context: EvalContext, sub: EvalContext, parts: ThreeCoilParts): void {
  const { metrics } = context;
  const solved = must(sub.electrostatics, "the resonator's electrostatics");
  for (const key of TOPLOAD_METRICS) metrics[key] = sub.metrics[key];
  // streamer loading (a given streamer length) acts on the resonator's top
  metrics.loaded_resonant_frequency = sub.metrics.loaded_resonant_frequency;
  metrics.line_capacitance = parts.lineCapacitance;
  metrics.line_inductance = parts.lineInductance;
  metrics.junction_capacitance = parts.junctionCapacitance;
  metrics.resonator_turns = parts.winding.turns;
  metrics.resonator_effective_inductance = parts.inductance;
  metrics.resonator_effective_capacitance = parts.capacitance;
  metrics.resonator_frequency = parts.frequency;
  // The primary tunes to the driver loaded with the junction (the two-coil rule, refined to the
  // three-coil ratios by the primary stage); the breakout is the resonator's topload's.
  context.electrostatics = {
    totalCapacitance: parts.junctionCapacitance,
    toploadCapacitance: solved.toploadCapacitance,
    toploadFieldPerVolt: solved.toploadFieldPerVolt,
    onsetField: solved.onsetField,
    breakoutVoltage: solved.breakoutVoltage,
  };
  if (solved.breakoutPointVoltage !== undefined)
    context.electrostatics.breakoutPointVoltage = solved.breakoutPointVoltage;
  if (solved.support !== undefined) context.electrostatics.support = solved.support;
}

export function resonatorStage(context: EvalContext): void {
  const { design, problems } = context;
  const spec = design.resonator;
  const driver = context.secondary;
  const electrostatics = context.electrostatics;
  if (!spec || !driver || !electrostatics) return;

  const sub = resonatorAlone(context, spec);
  const winding = sub.secondary;
  const solved = sub.electrostatics;
  if (problems.length > 0 || !winding || !solved) return;

  const { spacing, problem } = overlapProblem(design, spec, driver, winding);
  if (problem) {
    problems.push(problem);
    return;
  }
  const radius = spec.line.conductorDiameter / 2;
  const cLine = lineCapacitance(spec.line.length, radius, spec.line.height);
  const lLine = lineInductance(spec.line.length, radius, spec.line.height);
  if (cLine === null || lLine === null) {
    problems.push({
      field: 'resonator.line_height',
      reason: `the line (${mm(spec.line.conductorDiameter)} conductor) at ${mm(spec.line.height)} touches the floor`,
    });
    return;
  }
  const distributed = sub.resonator;
  const inductance = distributed?.effectiveInductance ?? winding.inductance;
  const capacitance = solved.totalCapacitance;
  const frequency = sub.metrics.resonant_frequency ?? 1 / (2 * Math.PI * Math.sqrt(inductance * capacitance));
  const parts: ThreeCoilParts = {
    winding,
    distributed,
    inductance,
    capacitance,
    frequency,
    gradientPerVolt: distributed?.peakGradientPerVolt ?? 1 / winding.windingLength,
    lineCapacitance: cLine,
    lineInductance: lLine,
    driverCapacitance: electrostatics.totalCapacitance,
    junctionCapacitance: electrostatics.totalCapacitance + cLine,
    axisSpacing: spacing,
  };
  context.threeCoil = parts;
  recordThreeCoil(context, sub, parts);
}
