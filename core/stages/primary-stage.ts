/**
 * Stage of the evaluation pipeline (see core/evaluate.ts): the primary's inductance, its tuning
 * to the secondary, the mutual inductance and the coupling.
 *
 * Conventions (for the design-file reference):
 * - Rings: ceil(turns) coaxial rings at the positions of primary/rings.ts; a fractional `turns`
 *   makes the last ring partial. A ring counts with weight w (1 whole, the fraction for the ring a
 *   tap lands on): L1(t) = Σ w_i w_j M_ij and M(t) = Σ w_i M_i, exact at whole turns and smooth
 *   between them.
 * - Ring self-inductance: current on the conductor's surface (the primary runs at RF),
 *   μ0 r (ln(8r/ρ) − 2) with ρ the conductor's radius; mutuals by Maxwell at the centre lines.
 * - Mutual inductance to the secondary: each ring against the winding as a uniform current sheet at
 *   the wire's centre-line radius over [bottomZ, topZ].
 * - Tap: `tapTurns` when given (0 < tap ≤ turns); otherwise, with a tank and the electrostatic
 *   solution, the tap in [1, turns] with 1/(2π √(L1 C1)) = 1/(2π √(L2 C2)), C2 the total
 *   capacitance at the top of the winding; if the target is out of reach the nearer end is used
 *   and a warning says so. Without a tank or without the electrostatic solution: the whole primary,
 *   and `primary_tap_turns` is null.
 * - With the computed profile the secondary is the distributed model's effective inductance at the
 *   top, and the mutual is the mode's: M_eff = |Σ m_k i_k| / I_eff with m_k each segment's mutual
 *   to the tapped primary (core/resonator/resonator.ts).
 * - `primary_inductance`, `mutual_inductance`, `coupling`: of the primary as tapped.
 *   `primary_outer_diameter`: twice the centre-line radius of the outermost ring.
 * - Clearance: the innermost ring's inner edge (inner_diameter/2 − conductor radius) must lie
 *   outside the winding's outer radius (form radius + insulated wire diameter), whatever its height.
 */
import type { EvalContext, PrimaryGeometry } from '../context.ts';
import { MAX_PRIMARY_TURNS, primaryRings } from '../primary/rings.ts';
import { primaryConductorLength, primaryInductanceAtTap, primaryInductanceTable } from '../primary/inductance.ts';
import { tuneTap } from '../primary/tuning.ts';
import { formatNumber, formatQuantity, TUNING_TOLERANCE } from '../outcome/warnings.ts';
import { lcResonantFrequency } from '../capacitance/resonance.ts';
import { couplingCoefficient, ringMutualInductances, tappedMutualInductance } from '../coupling.ts';
import { ringToSheetSegmentMutuals, type WindingSheet } from '../inductance/sheet-mutual.ts';
import { effectiveMutualInductance } from '../resonator/resonator.ts';
import { bestLineLength, losslessTransferFraction, threeCoilRatioError, threeCoilTap } from '../three-coil/tuning.ts';
import type { DesignProblem, Ring } from '../context.ts';
import type { PrimarySpec } from '../design.ts';
import type { PrimaryInductanceTable } from '../primary/inductance.ts';
import { must } from '../must.ts';

/** A length in millimetres for messages. */
function mm(metres: number): string {
  return `${Number((metres * 1e3).toPrecision(4))} mm`;
}

/** An inductance in microhenries for messages. */
function microhenries(henries: number): string {
  return `${Number((henries * 1e6).toPrecision(4))} µH`;
}

/** The first thing wrong with the primary as given (its turns, conductor, clearance, tap), or null. */
function primaryInputProblem(context: EvalContext, spec: PrimarySpec): DesignProblem | null {
  const secondary = context.secondary;
  const conductorRadius = spec.conductorDiameter / 2;
  if (!(spec.turns >= 1)) {
    return { field: 'primary.turns', reason: `the primary needs at least one turn, got ${spec.turns}` };
  }
  if (spec.turns > MAX_PRIMARY_TURNS) {
    return {
      field: 'primary.turns',
      reason: `${Number(spec.turns.toPrecision(4))} turns is beyond the ${MAX_PRIMARY_TURNS} rings this model handles`,
    };
  }
  if (!(spec.conductorDiameter > 0)) {
    return {
      field: 'primary.conductor_diameter',
      reason: `the conductor diameter must be positive, got ${mm(spec.conductorDiameter)}`,
    };
  }
  if (!(spec.turnSpacing >= 0)) {
    return {
      field: 'primary.turn_spacing',
      reason: `neighbouring turns would overlap: turn spacing ${mm(spec.turnSpacing)}`,
    };
  }
  if (!(spec.innerDiameter / 2 > conductorRadius)) {
    return {
      field: 'primary.inner_diameter',
      reason: `the innermost ring (${mm(spec.innerDiameter)}) is no wider than its conductor (${mm(spec.conductorDiameter)})`,
    };
  }
  if (secondary) {
    const windingOuterRadius = secondary.radius + secondary.overallDiameter / 2;
    const innerEdge = spec.innerDiameter / 2 - conductorRadius;
    if (innerEdge <= windingOuterRadius) {
      return {
        field: 'primary.inner_diameter',
        reason: `the innermost ring's inner edge (radius ${mm(innerEdge)}) touches or lies inside the secondary winding (outer radius ${mm(windingOuterRadius)})`,
      };
    }
  }
  if (spec.tapTurns !== undefined && !(spec.tapTurns > 0 && spec.tapTurns <= spec.turns)) {
    return {
      field: 'primary.tap_turns',
      reason: `the tap (${spec.tapTurns} turns) must lie within the primary's ${spec.turns} turns`,
    };
  }
  return null;
}

/** Where the tap landed: the turns, the tap reported (null for the whole primary), why it is untuned. */
interface TapChoice {
  tapTurns: number;
  reportedTap: number | null;
  untunedRange: string | null;
}

/** The fixed tap, or the tap that tunes the tank to the secondary (see the header). */
function twoCoilTap(
  context: EvalContext,
  spec: PrimarySpec,
  table: PrimaryInductanceTable,
  secondaryInductance: number,
): TapChoice {
  if (spec.tapTurns !== undefined) return { tapTurns: spec.tapTurns, reportedTap: spec.tapTurns, untunedRange: null };
  const tankCapacitance = context.design.tank?.capacitance;
  const totalCapacitance = context.electrostatics?.totalCapacitance;
  if (!context.secondary || tankCapacitance === undefined || totalCapacitance === undefined || !(totalCapacitance > 0))
    return { tapTurns: spec.turns, reportedTap: null, untunedRange: null };
  const tuning = tuneTap(table, secondaryInductance, totalCapacitance, tankCapacitance, spec.turns);
  let untunedRange: string | null = null;
  if (tuning.status !== 'tuned') {
    const lowest = primaryInductanceAtTap(table, Math.min(1, spec.turns));
    const full = primaryInductanceAtTap(table, spec.turns);
    untunedRange = `needs ${microhenries(tuning.requiredInductance)}, has ${microhenries(lowest)}–${microhenries(full)}`;
  }
  return { tapTurns: tuning.tapTurns, reportedTap: tuning.tapTurns, untunedRange };
}

/**
 * A three-coil system: the tap that brings the three modes nearest 1:2:3 (three-coil/tuning.ts),
 * and the line length (0.1 to 4 times the given one) that, with its own best tap, comes nearest.
 * Returns the tap chosen (the given choice when the tap is fixed or no tap is found).
 */
function threeCoilTapAndLine(
  context: EvalContext,
  spec: PrimarySpec,
  table: PrimaryInductanceTable,
  secondaryInductance: number,
  perRing: readonly number[],
  choice: TapChoice,
): TapChoice {
  const threeCoil = context.threeCoil;
  const line = context.design.resonator?.line;
  const tankCapacitance = context.design.tank?.capacitance;
  if (!threeCoil || !line || !context.secondary || tankCapacitance === undefined) return choice;
  const lowest = Math.min(1, spec.turns);
  // The lossless circuit at a tap, with the line scaled to a length (per-length values fixed).
  const circuitAt = (tap: number, length: number) => ({
    primaryInductance: primaryInductanceAtTap(table, tap),
    primaryCapacitance: tankCapacitance,
    primaryResistance: 0,
    driverInductance: secondaryInductance,
    driverResistance: 0,
    mutualInductance: perRing.reduce((sum, m, i) => sum + Math.min(1, Math.max(0, tap - i)) * m, 0),
    junctionCapacitance: threeCoil.driverCapacitance + (threeCoil.lineCapacitance * length) / line.length,
    resonatorInductance: threeCoil.inductance + (threeCoil.lineInductance * length) / line.length,
    resonatorResistance: 0,
    resonatorCapacitance: threeCoil.capacitance,
  });
  let chosen = choice;
  if (spec.tapTurns === undefined) {
    const best = threeCoilTap(lowest, spec.turns, (tap) => circuitAt(tap, line.length));
    if (best) chosen = { tapTurns: best.tapTurns, reportedTap: best.tapTurns, untunedRange: null };
  }
  // The line length (0.1 to 4 times the given one) that, with its own best tap, comes nearest
  // complete transfer; its tap, ratio error and lossless transfer reported beside it.
  const fixedTap = spec.tapTurns;
  const tapFor = (length: number): number | null =>
    fixedTap ?? threeCoilTap(lowest, spec.turns, (tap) => circuitAt(tap, length))?.tapTurns ?? null;
  const lineBest = bestLineLength(0.1 * line.length, 4 * line.length, (length) => {
    const tap = tapFor(length);
    return tap === null ? null : losslessTransferFraction(circuitAt(tap, length));
  });
  const bestTap = lineBest ? tapFor(lineBest.length) : null;
  context.metrics.line_length_for_ratios = lineBest?.length ?? null;
  context.metrics.three_coil_ratio_error_at_that_length =
    lineBest && bestTap !== null ? threeCoilRatioError(circuitAt(bestTap, lineBest.length)) : null;
  context.metrics.three_coil_lossless_transfer_at_that_length = lineBest?.transferFraction ?? null;
  return chosen;
}

export function primaryStage(context: EvalContext): void {
  const spec = context.design.primary;
  if (!spec) return;
  const { metrics, problems, design } = context;
  const secondary = context.secondary;
  const problem = primaryInputProblem(context, spec);
  if (problem) {
    problems.push(problem);
    return;
  }
  const conductorRadius = spec.conductorDiameter / 2;
  const rings = primaryRings(spec, secondary?.bottomZ ?? 0);
  const table = primaryInductanceTable(rings, conductorRadius);
  const tankCapacitance = design.tank?.capacitance;
  const totalCapacitance = context.electrostatics?.totalCapacitance;

  // The secondary as the tank sees it: the distributed model's effective inductance at the top when
  // computed (with the effective capacitance it gives the fundamental), else the winding's own.
  const secondaryInductance = context.resonator?.effectiveInductance ?? secondary?.inductance ?? 0;
  // Each ring's mutuals to the winding: per segment of the distributed model, or to the whole sheet.
  const mutuals = secondary ? ringMutuals(context, rings, secondary) : null;
  let tap = twoCoilTap(context, spec, table, secondaryInductance);
  if (context.threeCoil && mutuals) {
    const perRing = mutuals.perSegment
      ? mutuals.perSegment.map((m) => effectiveMutualOf(context, m))
      : Array.from(mutuals.whole);
    tap = threeCoilTapAndLine(context, spec, table, secondaryInductance, perRing, tap);
  }
  const { tapTurns, reportedTap, untunedRange } = tap;
  const inductance = primaryInductanceAtTap(table, tapTurns);

  let mutual: number | null = null;
  if (secondary && mutuals) {
    mutual = mutuals.perSegment
      ? effectiveMutualOf(context, tappedSegmentMutuals(mutuals.perSegment, tapTurns))
      : tappedMutualInductance(mutuals.whole, tapTurns);
    metrics.mutual_inductance = mutual;
    metrics.coupling = couplingCoefficient(mutual, inductance, secondaryInductance);
  }
  let outerRadius = 0;
  for (const ring of rings) outerRadius = Math.max(outerRadius, ring.r);

  const geometry: PrimaryGeometry = {
    rings,
    conductorRadius,
    tapTurns,
    inductance,
    mutual,
    conductorLength: primaryConductorLength(rings, tapTurns),
  };
  context.primary = geometry;
  metrics.primary_inductance = inductance;
  metrics.primary_tap_turns = reportedTap;
  metrics.primary_full_inductance = primaryInductanceAtTap(table, spec.turns);
  metrics.primary_frequency = tankCapacitance !== undefined ? lcResonantFrequency(inductance, tankCapacitance) : null;
  metrics.primary_outer_diameter = 2 * outerRadius;
  if (reportedTap !== null) {
    metrics.primary_tap_margin = Math.max(0, Math.min(reportedTap - Math.min(1, spec.turns), spec.turns - reportedTap));
  }
  const secondaryFrequency =
    secondary && totalCapacitance !== undefined && totalCapacitance > 0
      ? lcResonantFrequency(secondaryInductance, totalCapacitance)
      : null;
  tuningRequirement(context, secondaryFrequency, untunedRange);
}

/**
 * tuning_error, and the requirement that the tank tunes to the secondary: beyond ±TUNING_TOLERANCE
 * the design is infeasible ("primary cannot tune: …") unless primary.require_tuning is false, in
 * which case it keeps a warning.
 */
function tuningRequirement(context: EvalContext, secondaryFrequency: number | null, untunedRange: string | null): void {
  const { metrics, design, problems, warnings } = context;
  const spec = design.primary;
  const primaryFrequency = metrics.primary_frequency;
  if (!spec || primaryFrequency === null || secondaryFrequency === null) return;
  if (!(primaryFrequency > 0) || !(secondaryFrequency > 0)) return;
  const error = primaryFrequency / secondaryFrequency - 1;
  metrics.tuning_error = error;
  if (Math.abs(error) <= TUNING_TOLERANCE) return;
  if (context.threeCoil) return; // three coils tune by the mode ratios (three_coil_ratio_error), not to the driver
  const offset = `tank ${formatQuantity(primaryFrequency, 'Hz')} against the secondary's ${formatQuantity(secondaryFrequency, 'Hz')} (${error > 0 ? '+' : ''}${formatNumber(100 * error)} %, tolerance ±${formatNumber(100 * TUNING_TOLERANCE)} %)`;
  const fixed = spec.tapTurns !== undefined;
  const what = fixed
    ? `at the fixed tap (${formatNumber(spec.tapTurns ?? 0)} turns) the ${offset}`
    : `${untunedRange ?? 'out of range'}; at the nearer end the ${offset}`;
  if (spec.requireTuning !== false) {
    problems.push({
      field: fixed ? 'primary.tap_turns' : 'primary.turns',
      reason: `primary cannot tune: ${what} (set primary.require_tuning: false to keep such designs)`,
    });
    return;
  }
  warnings.push(
    fixed
      ? { key: 'fixed_tap_mistuned', message: `the primary is off tune ${what}` }
      : { key: 'primary_untuned', message: `the primary cannot be tuned: ${what}` },
  );
}

/**
 * Each ring's mutual inductance to the winding's segments, H, one array per ring (row i: ring i,
 * unit weight): the current-sheet integral cut at the nodes (inductance/sheet-mutual.ts). A tap's
 * segment mutuals are Σ w_i m_i (linear in the rings), and each ring's mutual to the whole winding
 * is the sum over its segments.
 * @param rings the primary's rings, m
 * @param winding the winding as a sheet over [bottomZ, topZ]
 * @param fractions the distributed model's node fractions
 */
export function ringSegmentMutuals(
  rings: readonly Ring[],
  winding: WindingSheet,
  fractions: ArrayLike<number>,
): Float64Array[] {
  const sheet = { radius: winding.radius, bottomZ: winding.bottomZ, topZ: winding.topZ, turns: winding.turns };
  return rings.map((ring) => ringToSheetSegmentMutuals(ring.r, ring.z, sheet, fractions));
}

/** The rings' mutuals: per segment with the computed profile, else each to the whole sheet. */
function ringMutuals(
  context: EvalContext,
  rings: readonly Ring[],
  secondary: WindingSheet,
): { perSegment: Float64Array[] | null; whole: Float64Array } {
  const resonator = context.resonator;
  if (!resonator) {
    const sheet = {
      radius: secondary.radius,
      bottomZ: secondary.bottomZ,
      topZ: secondary.topZ,
      turns: secondary.turns,
    };
    return { perSegment: null, whole: ringMutualInductances(rings, sheet) };
  }
  const perSegment = ringSegmentMutuals(rings, secondary, resonator.fractions);
  const whole = new Float64Array(rings.length);
  for (let i = 0; i < rings.length; i++) for (const value of perSegment[i]) whole[i] += value;
  return { perSegment, whole };
}

/** The segment mutuals of the primary tapped at `tapTurns`: Σ w_i m_i with the tap weights of primary/rings.ts. */
function tappedSegmentMutuals(perSegment: readonly Float64Array[], tapTurns: number): Float64Array {
  const tapped = new Float64Array(perSegment[0]?.length ?? 0);
  for (let i = 0; i < perSegment.length; i++) {
    const weight = Math.min(1, Math.max(0, tapTurns - i));
    if (weight === 0) continue;
    const row = perSegment[i];
    for (let k = 0; k < tapped.length; k++) tapped[k] += weight * row[k];
  }
  return tapped;
}

/** The mode's mutual M_eff = |Σ m_k i_k| / I_eff for segment mutuals m_k (core/resonator/resonator.ts). */
function effectiveMutualOf(context: EvalContext, segmentMutuals: Float64Array): number {
  return effectiveMutualInductance(must(context.resonator, 'the distributed winding').solution, segmentMutuals);
}
