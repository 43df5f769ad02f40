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
import { ringToSheetMutualInductance } from '../inductance/sheet-mutual.ts';
import { segmentMutuals } from '../resonator/design-resonator.ts';
import { effectiveMutualInductance } from '../resonator/resonator.ts';
import { bestLineLength, losslessTransferFraction, threeCoilRatioError, threeCoilTap } from '../three-coil/tuning.ts';
import type { Ring } from '../context.ts';

/** A length in millimetres for messages. */
function mm(metres: number): string {
  return `${Number((metres * 1e3).toPrecision(4))} mm`;
}

/** An inductance in microhenries for messages. */
function microhenries(henries: number): string {
  return `${Number((henries * 1e6).toPrecision(4))} µH`;
}

export function primaryStage(context: EvalContext): void {
  const spec = context.design.primary;
  if (!spec) return;
  const { metrics, problems, design } = context;
  const secondary = context.secondary;
  const conductorRadius = spec.conductorDiameter / 2;
  if (!(spec.turns >= 1)) {
    problems.push({ field: 'primary.turns', reason: `the primary needs at least one turn, got ${spec.turns}` });
    return;
  }
  if (spec.turns > MAX_PRIMARY_TURNS) {
    problems.push({
      field: 'primary.turns',
      reason: `${Number(spec.turns.toPrecision(4))} turns is beyond the ${MAX_PRIMARY_TURNS} rings this model handles`,
    });
    return;
  }
  if (!(spec.conductorDiameter > 0)) {
    problems.push({
      field: 'primary.conductor_diameter',
      reason: `the conductor diameter must be positive, got ${mm(spec.conductorDiameter)}`,
    });
    return;
  }
  if (!(spec.turnSpacing >= 0)) {
    problems.push({
      field: 'primary.turn_spacing',
      reason: `neighbouring turns would overlap: turn spacing ${mm(spec.turnSpacing)}`,
    });
    return;
  }
  if (!(spec.innerDiameter / 2 > conductorRadius)) {
    problems.push({
      field: 'primary.inner_diameter',
      reason: `the innermost ring (${mm(spec.innerDiameter)}) is no wider than its conductor (${mm(spec.conductorDiameter)})`,
    });
    return;
  }
  if (secondary) {
    const windingOuterRadius = secondary.radius + secondary.overallDiameter / 2;
    const innerEdge = spec.innerDiameter / 2 - conductorRadius;
    if (innerEdge <= windingOuterRadius) {
      problems.push({
        field: 'primary.inner_diameter',
        reason: `the innermost ring's inner edge (radius ${mm(innerEdge)}) touches or lies inside the secondary winding (outer radius ${mm(windingOuterRadius)})`,
      });
      return;
    }
  }
  if (spec.tapTurns !== undefined && !(spec.tapTurns > 0 && spec.tapTurns <= spec.turns)) {
    problems.push({
      field: 'primary.tap_turns',
      reason: `the tap (${spec.tapTurns} turns) must lie within the primary's ${spec.turns} turns`,
    });
    return;
  }

  const rings = primaryRings(spec, secondary?.bottomZ ?? 0);
  const table = primaryInductanceTable(rings, conductorRadius);
  const fullInductance = primaryInductanceAtTap(table, spec.turns);
  const tankCapacitance = design.tank?.capacitance;
  const totalCapacitance = context.electrostatics?.totalCapacitance;

  // The secondary as the tank sees it: the distributed model's effective inductance at the top when
  // computed (with the effective capacitance it gives the fundamental), else the winding's own.
  const secondaryInductance = context.resonator?.effectiveInductance ?? secondary?.inductance ?? 0;
  let tapTurns = spec.turns;
  let reportedTap: number | null = null;
  let untunedRange: string | null = null;
  if (spec.tapTurns !== undefined) {
    tapTurns = spec.tapTurns;
    reportedTap = tapTurns;
  } else if (secondary && tankCapacitance !== undefined && totalCapacitance !== undefined && totalCapacitance > 0) {
    const tuning = tuneTap(table, secondaryInductance, totalCapacitance, tankCapacitance, spec.turns);
    tapTurns = tuning.tapTurns;
    reportedTap = tapTurns;
    if (tuning.status !== 'tuned') {
      const lowest = primaryInductanceAtTap(table, Math.min(1, spec.turns));
      untunedRange = `needs ${microhenries(tuning.requiredInductance)}, has ${microhenries(lowest)}–${microhenries(fullInductance)}`;
    }
  }
  // A three-coil system: the tap that comes nearest complete transfer (three-coil/tuning.ts).
  const threeCoil = context.threeCoil;
  const line = design.resonator?.line;
  if (threeCoil && line && secondary && tankCapacitance !== undefined) {
    const perRing = ringEffectiveMutuals(context, rings);
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
    if (spec.tapTurns === undefined) {
      const best = threeCoilTap(lowest, spec.turns, (tap) => circuitAt(tap, line.length));
      if (best) {
        tapTurns = best.tapTurns;
        reportedTap = tapTurns;
        untunedRange = null;
      }
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
    metrics.line_length_for_ratios = lineBest?.length ?? null;
    metrics.three_coil_ratio_error_at_that_length =
      lineBest && bestTap !== null ? threeCoilRatioError(circuitAt(bestTap, lineBest.length)) : null;
    metrics.three_coil_lossless_transfer_at_that_length = lineBest?.transferFraction ?? null;
  }
  const inductance = primaryInductanceAtTap(table, tapTurns);

  let mutual: number | null = null;
  if (secondary) {
    const ringMutuals = ringMutualInductances(rings, {
      radius: secondary.radius,
      bottomZ: secondary.bottomZ,
      topZ: secondary.topZ,
      turns: secondary.turns,
    });
    mutual = tappedMutualInductance(ringMutuals, tapTurns);
    const resonator = context.resonator;
    if (resonator) {
      // The mode's own current distribution links the primary: M_eff = |Σ m_k i_k| / I_eff.
      const weights = rings.map((ring, i) => ({
        weight: Math.min(1, Math.max(0, tapTurns - i)),
        mutual: (bottomZ: number, topZ: number, turns: number) =>
          ringToSheetMutualInductance(ring.r, ring.z, { radius: secondary.radius, bottomZ, topZ, turns }),
      }));
      mutual = effectiveMutualInductance(resonator.solution, segmentMutuals(resonator.fractions, secondary, weights));
    }
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
  metrics.primary_full_inductance = fullInductance;
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
 * Each whole ring's mutual inductance to the secondary, H: the mode's (M_eff of one ring) with the
 * computed profile, else the ring against the current sheet; a tap's mutual is Σ w_i M_i.
 */
function ringEffectiveMutuals(context: EvalContext, rings: readonly Ring[]): number[] {
  const secondary = context.secondary;
  if (!secondary) return rings.map(() => 0);
  const sheet = { radius: secondary.radius, bottomZ: secondary.bottomZ, topZ: secondary.topZ, turns: secondary.turns };
  const resonator = context.resonator;
  if (!resonator) return Array.from(ringMutualInductances(rings, sheet));
  return rings.map((ring) =>
    effectiveMutualInductance(
      resonator.solution,
      segmentMutuals(resonator.fractions, secondary, [
        {
          weight: 1,
          mutual: (bottomZ: number, topZ: number, turns: number) =>
            ringToSheetMutualInductance(ring.r, ring.z, { radius: secondary.radius, bottomZ, topZ, turns }),
        },
      ]),
    ),
  );
}
