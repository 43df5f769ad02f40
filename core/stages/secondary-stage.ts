/**
 * Stage of the evaluation pipeline (see core/evaluate.ts): the secondary winding's geometry, wire
 * and inductance.
 *
 * Conventions (for the design-file reference):
 * - Insulated diameter: `wire.overallDiameter` when given, else the bare diameter plus the mean
 *   enamel increase of the IEC 60317-0-1 grade (wire/insulation.ts: midpoint between the minimum
 *   increase and the maximum overall diameter; 'none' = bare).
 * - Pitch: `pitch` when given, else close-wound (pitch = insulated diameter); a pitch below the
 *   insulated diameter is a problem ('secondary.pitch').
 * - Turns and length: winding length = turns × pitch. Given only `windingLength`, turns =
 *   windingLength / pitch and may be fractional (the last turn is partial). Given both without a
 *   pitch, pitch = windingLength / turns (must be ≥ the insulated diameter); given all three,
 *   turns × pitch must match windingLength within 0.1 %.
 * - Radius: the wire's centre line, (form diameter + insulated diameter) / 2; the current sheet,
 *   Rosa's corrections, the loop sum and the coupling all use this radius.
 * - Heights: bottomZ = baseHeight, topZ = baseHeight + winding length.
 * - Inductance: Nagaoka's current sheet with Rosa's low-frequency (uniform-current) corrections;
 *   `secondary_inductance_filament` is the exact sum over round-wire loops, self terms with the
 *   uniform-current form, as a cross-check.
 * - Wire length: helical, N √((2π r)² + p²); mass: copper only; DC resistance at the environment
 *   temperature (IEC 60028 copper).
 */
import type { DesignProblem, EvalContext, SecondaryGeometry } from '../context.ts';
import type { SecondarySpec } from '../design.ts';
import { insulatedDiameter, INSULATION_TABLE_RANGE } from '../wire/insulation.ts';
import { copperMass, wireDcResistance } from '../wire/copper.ts';
import { helicalWireLength } from '../wire/winding.ts';
import { roundWireSolenoidInductance } from '../inductance/rosa.ts';
import { loopSumSolenoidInductance } from '../inductance/filament-sum.ts';

/** The most turns a secondary may have here; real ones have a few hundred to a few thousand. */
export const MAX_SECONDARY_TURNS = 100_000;

/** Relative tolerance for turns × pitch against a given winding length. */
const LENGTH_TOLERANCE = 1e-3;

/** A length in millimetres for messages, e.g. "0.551 mm". */
function mm(metres: number): string {
  return `${Number((metres * 1e3).toPrecision(4))} mm`;
}

/** Turns, pitch and length from the spec, or the field and reason that make them impossible. */
function windingLayout(
  spec: SecondarySpec,
  overallDiameter: number,
): { turns: number; pitch: number; windingLength: number } | { field: string; reason: string } {
  const { turns: givenTurns, windingLength: givenLength, pitch: givenPitch } = spec;
  if (givenPitch !== undefined && !(givenPitch >= overallDiameter)) {
    return {
      field: 'secondary.pitch',
      reason: `the pitch (${mm(givenPitch)}) is smaller than the insulated wire (${mm(overallDiameter)}): turns would overlap`,
    };
  }
  if (givenTurns !== undefined && givenLength !== undefined) {
    if (givenPitch === undefined) {
      const pitch = givenLength / givenTurns;
      if (!(pitch >= overallDiameter)) {
        return {
          field: 'secondary.winding_length',
          reason: `${givenTurns} turns of ${mm(overallDiameter)} wire need at least ${mm(givenTurns * overallDiameter)}; the winding is ${mm(givenLength)}`,
        };
      }
      return { turns: givenTurns, pitch, windingLength: givenLength };
    }
    if (Math.abs(givenTurns * givenPitch - givenLength) > LENGTH_TOLERANCE * givenLength) {
      return {
        field: 'secondary.pitch',
        reason: `turns × pitch (${mm(givenTurns * givenPitch)}) differs from winding_length (${mm(givenLength)})`,
      };
    }
    return { turns: givenTurns, pitch: givenPitch, windingLength: givenLength };
  }
  const pitch = givenPitch ?? overallDiameter;
  if (givenTurns !== undefined) return { turns: givenTurns, pitch, windingLength: givenTurns * pitch };
  if (givenLength !== undefined) return { turns: givenLength / pitch, pitch, windingLength: givenLength };
  return { field: 'secondary.turns', reason: 'the secondary needs turns or winding_length' };
}

export function secondaryStage(context: EvalContext): void {
  const spec = context.design.secondary;
  if (!spec) return;
  const { metrics, problems } = context;
  const overallDiameter = checkedWire(context, spec);
  if (overallDiameter === null) return;
  const bareDiameter = spec.wire.bareDiameter;
  const layout = windingLayout(spec, overallDiameter);
  if ('field' in layout) {
    problems.push(layout);
    return;
  }
  const { turns, pitch, windingLength } = layout;
  const turnsWrong = turnsProblem(spec, turns);
  if (turnsWrong) {
    problems.push(turnsWrong);
    return;
  }
  const radius = (spec.formDiameter + overallDiameter) / 2;
  const wireLength = helicalWireLength(turns, radius, pitch);
  const temperature = context.design.environment.temperature;
  const dcResistance = wireDcResistance(wireLength, bareDiameter, temperature);
  const inductance = roundWireSolenoidInductance({ radius, turns, pitch, bareDiameter }, 'uniform');
  const filamentInductance = loopSumSolenoidInductance(radius, turns, pitch, bareDiameter / 2, 'uniform');

  const geometry: SecondaryGeometry = {
    turns,
    pitch,
    windingLength,
    radius,
    bareDiameter,
    overallDiameter,
    bottomZ: spec.baseHeight,
    topZ: spec.baseHeight + windingLength,
    inductance,
    dcResistance,
    wireLength,
  };
  context.secondary = geometry;
  metrics.secondary_turns = turns;
  metrics.winding_length = windingLength;
  metrics.winding_aspect_ratio = windingLength / spec.formDiameter;
  metrics.wire_length = wireLength;
  metrics.wire_mass = copperMass(wireLength, bareDiameter);
  metrics.secondary_dc_resistance = dcResistance;
  metrics.secondary_inductance = inductance;
  metrics.secondary_inductance_filament = filamentInductance;
}

/**
 * The insulated wire diameter, m, after the form and wire checks; null when one of them pushed a
 * problem. Warns when the enamel build comes from outside its table.
 */
function checkedWire(context: EvalContext, spec: SecondarySpec): number | null {
  const { problems, warnings } = context;
  const bareDiameter = spec.wire.bareDiameter;
  if (!(spec.formDiameter > 0)) {
    problems.push({
      field: 'secondary.form_diameter',
      reason: `the form diameter must be positive, got ${mm(spec.formDiameter)}`,
    });
    return null;
  }
  if (!(bareDiameter > 0)) {
    problems.push({ field: 'secondary.wire', reason: `the wire diameter must be positive, got ${mm(bareDiameter)}` });
    return null;
  }
  const overallDiameter = spec.wire.overallDiameter ?? insulatedDiameter(bareDiameter, spec.wire.insulation);
  if (!(overallDiameter >= bareDiameter)) {
    problems.push({
      field: 'secondary.wire_overall_diameter',
      reason: `the insulated diameter (${mm(overallDiameter)}) is smaller than the bare wire (${mm(bareDiameter)})`,
    });
    return null;
  }
  if (
    spec.wire.overallDiameter === undefined &&
    spec.wire.insulation !== 'none' &&
    (bareDiameter < INSULATION_TABLE_RANGE.minimum * (1 - 1e-9) ||
      bareDiameter > INSULATION_TABLE_RANGE.maximum * (1 + 1e-9))
  ) {
    warnings.push({
      key: 'wire_table_extrapolated',
      message: `the wire (${mm(bareDiameter)}) is outside the enamel build table (${mm(INSULATION_TABLE_RANGE.minimum)} to ${mm(INSULATION_TABLE_RANGE.maximum)}); its insulated diameter ${mm(overallDiameter)} is extrapolated`,
    });
  }
  return overallDiameter;
}

/** Fewer than one turn, or more than this model handles, as the problem of the field that set the turns. */
function turnsProblem(spec: SecondarySpec, turns: number): DesignProblem | null {
  const field = spec.turns !== undefined ? 'secondary.turns' : 'secondary.winding_length';
  if (!(turns >= 1)) {
    return { field, reason: `the winding needs at least one turn, got ${Number(turns.toPrecision(4))}` };
  }
  if (turns > MAX_SECONDARY_TURNS) {
    // The filament sum costs one mutual per turn: bound it (common practice: a few thousand turns).
    return {
      field,
      reason: `${Number(turns.toPrecision(4))} turns is beyond the ${MAX_SECONDARY_TURNS} this model handles`,
    };
  }
  return null;
}
