/**
 * Stage of the evaluation pipeline (see core/evaluate.ts): dynamics.
 *
 * Losses (secondary and primary AC resistance, the spark gap's resistance), the lumped coupled
 * circuit they make with the inductances, the tank and the total capacitance, and what one shot
 * (spark gap) or burst (solid state) of that circuit does. The circuit simulated is exactly the
 * one the metrics describe: R1 = primary_resistance, L1 = primary_inductance, C1 = the tank
 * capacitance, M = coupling·√(L1 L2), R2 = secondary_ac_resistance, L2 = effective_inductance,
 * C2 = total_capacitance; a spark-gap shot starts with v1 = charge_voltage and all else at rest.
 */
import type { EvalContext, ThreeCoilParts } from '../context.ts';
import type { SolidStateDriver, SparkGapDriver } from '../design.ts';
import { copperResistivity } from '../wire/copper.ts';
import { roundConductorAcResistance, solenoidAcResistance } from '../losses/resistance.ts';
import type { CoupledCircuit } from '../dynamics/circuit.ts';
import { coupledModes } from '../dynamics/coupled-modes.ts';
import { nearestFullTransferCoupling } from '../dynamics/full-transfer.ts';
import { sparkGapShot } from '../dynamics/spark-gap.ts';
import { solidStateBurst } from '../dynamics/solid-state.ts';
import { formatNumber, formatQuantity, SPARK_GAP_COUPLING_LIMIT, TANK_RATING_FACTOR } from '../outcome/warnings.ts';
import { loopModes } from '../dynamics/loop-modes.ts';
import { threeCoilBurst } from '../dynamics/three-coil-burst.ts';
import {
  chargedTankState,
  ringingFrequencies,
  type ThreeCoilCircuit,
  threeCoilNetwork,
  threeCoilSparkGapShot,
} from '../dynamics/three-coil.ts';
import { COMPLETE_TRANSFER, losslessTransferFraction, threeCoilRatioError } from '../three-coil/tuning.ts';
import { separationForCoupling } from '../three-coil/parallel-mutual.ts';
import { toploadOuterRadius } from '../three-coil/clearance.ts';

/** Equivalent resistance of a conducting spark gap when the design gives none, Ω (common practice, refs §8.4 [C]: of order 1 Ω). */
export const DEFAULT_GAP_RESISTANCE = 1;

/** Coupling of a three-coil system's driver above which the gap quenches poorly (common practice: 0.3–0.6 is usual for such drivers). */
const THREE_COIL_COUPLING_LIMIT = 0.6;

/** Longest burst simulated, in cycles of the upper mode (beyond it the burst is cut, with a warning). */
const MAX_BURST_CYCLES = 3000;

/**
 * Sets secondary_ac_resistance and secondary_q (with a secondary and its capacitance), then with a
 * primary and a tank primary_resistance (conductor + gap), primary_conductor_resistance,
 * gap_resistance, mode frequencies and full_transfer_coupling, and with a driver transfer_time,
 * energy_per_shot, input_power, peak_voltage and tank_voltage_margin; pushes the driver warnings.
 * What a design cannot have stays null.
 */
export function dynamicsStage(context: EvalContext): void {
  const { design, metrics } = context;
  const secondary = context.secondary;
  const electrostatics = context.electrostatics;
  if (!secondary || !electrostatics || !(electrostatics.totalCapacitance > 0)) return;

  // --- secondary losses ---
  // With the computed profile: the distributed model's effective values at the top (same frequency,
  // same stored energy for the same top voltage) and the resistance its current distribution sees.
  const resonator = context.resonator;
  const l2 = resonator?.effectiveInductance ?? secondary.inductance;
  const c2 = electrostatics.totalCapacitance;
  const f2 = positive(metrics.resonant_frequency) ?? 1 / (2 * Math.PI * Math.sqrt(l2 * c2));
  if (!(secondary.dcResistance > 0) || !(secondary.wireLength > 0) || !(secondary.bareDiameter > 0) || !(l2 > 0))
    return;
  const r2 =
    solenoidAcResistance(secondary.dcResistance, secondary.wireLength, secondary.bareDiameter, secondary.pitch, f2) *
    (resonator?.resistanceFactor ?? 1);
  if (!Number.isFinite(r2)) return;
  metrics.secondary_ac_resistance = r2;
  metrics.secondary_q = (2 * Math.PI * f2 * l2) / r2;

  // --- primary losses and the coupled circuit ---
  const primary = context.primary;
  const tank = design.tank;
  if (!primary || !tank || !design.primary) return;
  const l1 = primary.inductance;
  const c1 = tank.capacitance;
  if (!(l1 > 0) || !(c1 > 0) || !(primary.conductorLength > 0) || !(primary.conductorRadius > 0)) return;
  const f1 = 1 / (2 * Math.PI * Math.sqrt(l1 * c1));
  const resistivity = design.primary.resistivity ?? copperResistivity(design.environment.temperature);
  const conductorResistance = roundConductorAcResistance(
    primary.conductorLength,
    primary.conductorRadius,
    resistivity,
    f1,
  );
  const driver = design.driver;
  const gapResistance = driver?.kind === 'spark_gap' ? (driver.gapResistance ?? DEFAULT_GAP_RESISTANCE) : 0;
  const r1 = conductorResistance + gapResistance;
  metrics.primary_conductor_resistance = conductorResistance;
  metrics.gap_resistance = driver?.kind === 'spark_gap' ? gapResistance : null;
  metrics.primary_resistance = r1;

  const coupling =
    positive(metrics.coupling) ?? (primary.mutual !== null ? Math.abs(primary.mutual) / Math.sqrt(l1 * l2) : null);
  if (coupling === null || !(coupling < 1)) return;
  const circuit: CoupledCircuit = {
    primaryInductance: l1,
    primaryCapacitance: c1,
    primaryResistance: r1,
    secondaryInductance: l2,
    secondaryCapacitance: c2,
    secondaryResistance: r2,
    mutualInductance: coupling * Math.sqrt(l1 * l2),
  };
  if (context.threeCoil) {
    runThreeCoil(context, circuit, coupling);
    return;
  }
  metrics.full_transfer_coupling = nearestFullTransferCoupling(coupling).coupling;
  const modes = coupledModes(circuit, 1);
  if (modes !== null) {
    const frequencies = Array.from(modes.rateIm, (omega) => Math.abs(omega) / (2 * Math.PI)).sort((a, b) => a - b);
    if (frequencies[0] > 0) {
      metrics.mode_frequency_low = frequencies[0];
      metrics.mode_frequency_high = frequencies[3];
    }
  }
  context.circuit = circuit;
  if (!driver) return;
  if (driver.kind === 'spark_gap') runSparkGap(context, circuit, driver, coupling);
  else runSolidState(context, circuit, driver);
}

function runSparkGap(context: EvalContext, circuit: CoupledCircuit, driver: SparkGapDriver, coupling: number): void {
  const { metrics, warnings } = context;
  if (coupling > SPARK_GAP_COUPLING_LIMIT) {
    warnings.push({
      key: 'gap_coupling_high',
      message: `coupling ${formatNumber(coupling)} is high for a spark gap (common practice ≤ ${SPARK_GAP_COUPLING_LIMIT}): poor quenching and racing arcs likely`,
    });
  }
  const chargeVoltage = chargeForShot(context, circuit.primaryCapacitance, driver);
  if (chargeVoltage === null) return;
  const shot = sparkGapShot(circuit, chargeVoltage, driver.quench);
  if (shot === null) {
    warnings.push({
      key: 'no_ringing_modes',
      message: `the coupled circuit has no two ringing modes (coupling ${formatNumber(coupling)}, primary ${formatQuantity(circuit.primaryResistance, 'Ω')}): transfer time and peak voltage not computed`,
    });
    return;
  }
  context.sparkShot = { shot, chargeVoltage };
  metrics.transfer_time = shot.transferTime;
  metrics.peak_voltage = shot.peakVoltage;
  if (shot.transferTime === null) {
    warnings.push({
      key: 'no_transfer',
      message: `no energy transfer and return: the primary's energy only decays (primary ${formatQuantity(circuit.primaryResistance, 'Ω')}, coupling ${formatNumber(coupling)}); transfer time not computed, peak voltage over the whole ring-down`,
    });
  }
}

function runSolidState(context: EvalContext, circuit: CoupledCircuit, driver: SolidStateDriver): void {
  const { metrics } = context;
  const upperPeriod =
    1 /
    (metrics.mode_frequency_high ??
      1 / (2 * Math.PI * Math.sqrt(circuit.primaryInductance * circuit.primaryCapacitance)));
  const window = burstWindow(context, driver, upperPeriod);
  if (window === null) return;
  const driveVoltage = driver.bridge === 'full' ? driver.busVoltage : driver.busVoltage / 2;
  const breakoutVoltage = context.electrostatics?.breakoutVoltage ?? undefined;
  const burst = solidStateBurst(circuit, {
    driveVoltage,
    currentLimit: driver.currentLimit,
    ...window,
    breakoutVoltage: breakoutVoltage ?? undefined,
  });
  metrics.energy_per_shot = burst.energyFromSource;
  metrics.input_power = driver.repetitionRate >= 0 ? burst.energyFromSource * driver.repetitionRate : null;
  metrics.peak_voltage = burst.peakVoltage;
  metrics.transfer_time = null; // a driven burst has no single transfer
  currentLimitCheck(context, driver, burst);
  breakoutDuringBurst(context, breakoutVoltage, burst);
  context.burstPeakTankVoltage = burst.peakTankVoltage;
  context.burstPeakTankCurrent = burst.peakPrimaryCurrent;
  context.burstTankCurrentSquared = burst.primaryCurrentSquared;
  tankRatingCheck(context, burst.peakTankVoltage, 'the peak tank voltage in the burst');
}

/**
 * A three-coil system (resonator-stage.ts): the two-coil circuit's tank and driver with the junction
 * capacitance as C2, and the resonator (its effective L with the line's in series, its effective
 * C at the top, the AC resistance of its wire for its mode's current plus the line's conductor) as
 * the third loop. Sets the three mode frequencies, the ratio error and the lossless transfer, the
 * separation the resonator needs, and the shot (three-coil.ts) or burst (three-coil-burst.ts).
 */
function runThreeCoil(context: EvalContext, two: CoupledCircuit, coupling: number): void {
  const { design, metrics } = context;
  const parts = context.threeCoil;
  const spec = design.resonator;
  if (!parts || !spec || !resonatorClearsPrimary(context, parts, spec)) return;
  const circuit = threeCoilCircuit(context, two, parts, spec);
  const lossless = { ...circuit, primaryResistance: 0, driverResistance: 0, resonatorResistance: 0 };
  metrics.resonator_ac_resistance = circuit.resonatorResistance;
  metrics.three_coil_ratio_error = threeCoilRatioError(lossless);
  metrics.three_coil_lossless_transfer = losslessTransferFraction(lossless);
  metrics.three_coil_capacitance_ratio = circuit.resonatorCapacitance / circuit.junctionCapacitance;
  metrics.three_coil_coupling_ratio = coupling / Math.sqrt(COMPLETE_TRANSFER.couplingSquared);
  const modes = loopModes(threeCoilNetwork(circuit), chargedTankState(circuit, 1));
  const frequencies = modes ? ringingFrequencies(modes) : null;
  if (frequencies) {
    [
      metrics.three_coil_mode_frequency_low,
      metrics.three_coil_mode_frequency_mid,
      metrics.three_coil_mode_frequency_high,
    ] = frequencies;
    metrics.mode_frequency_low = frequencies[0];
    metrics.mode_frequency_high = frequencies[2];
  }
  resonatorSeparation(context, parts, coupling);
  const driver = design.driver;
  if (!driver) return;
  if (driver.kind !== 'spark_gap') runThreeCoilBurst(context, circuit, driver, frequencies ? frequencies[2] : null);
  else runThreeCoilShot(context, circuit, driver, coupling);
}

/** The resonator must stand clear of the primary as well as of the secondary: a design problem if not. */
function resonatorClearsPrimary(
  context: EvalContext,
  parts: ThreeCoilParts,
  spec: NonNullable<EvalContext['design']['resonator']>,
): boolean {
  const primary = context.primary;
  if (!primary) return true;
  const winding = parts.winding;
  const topload = context.design.topload;
  const resonatorOuter = Math.max(
    winding.radius + winding.overallDiameter / 2,
    topload ? toploadOuterRadius(topload) : 0,
  );
  let primaryOuter = 0;
  for (const ring of primary.rings) primaryOuter = Math.max(primaryOuter, ring.r + primary.conductorRadius);
  if (parts.axisSpacing > primaryOuter + resonatorOuter) return true;
  context.problems.push({
    field: spec.axisSpacing !== undefined ? 'resonator.axis_spacing' : 'resonator.line_length',
    reason: `the resonator (outer radius ${formatQuantity(resonatorOuter, 'm')}) at ${formatQuantity(parts.axisSpacing, 'm')} from the secondary's axis overlaps the primary (outer radius ${formatQuantity(primaryOuter, 'm')})`,
  });
  return false;
}

/** The lumped three-loop circuit of the design: the two-coil tank and driver, the junction, the resonator with the line. */
function threeCoilCircuit(
  context: EvalContext,
  two: CoupledCircuit,
  parts: ThreeCoilParts,
  spec: NonNullable<EvalContext['design']['resonator']>,
): ThreeCoilCircuit {
  const winding = parts.winding;
  const resistivity = copperResistivity(context.design.environment.temperature);
  const r3 =
    solenoidAcResistance(
      winding.dcResistance,
      winding.wireLength,
      winding.bareDiameter,
      winding.pitch,
      parts.frequency,
    ) *
      (parts.distributed?.resistanceFactor ?? 1) +
    roundConductorAcResistance(spec.line.length, spec.line.conductorDiameter / 2, resistivity, parts.frequency);
  return {
    primaryInductance: two.primaryInductance,
    primaryCapacitance: two.primaryCapacitance,
    primaryResistance: two.primaryResistance,
    driverInductance: two.secondaryInductance,
    driverResistance: two.secondaryResistance,
    mutualInductance: two.mutualInductance,
    junctionCapacitance: parts.junctionCapacitance,
    resonatorInductance: parts.inductance + parts.lineInductance,
    resonatorResistance: Number.isFinite(r3) ? r3 : 0,
    resonatorCapacitance: parts.capacitance,
  };
}

/** resonator_separation_needed: where the driver–resonator coupling falls below 1 % of the primary's; warns when nearer. */
function resonatorSeparation(context: EvalContext, parts: ThreeCoilParts, coupling: number): void {
  const secondary = context.secondary;
  if (!secondary) return;
  const needed = separationForCoupling({ x: 0, ...secondary }, { x: 0, ...parts.winding }, 0.01 * coupling);
  context.metrics.resonator_separation_needed = needed;
  if (needed !== null && parts.axisSpacing < needed) {
    context.warnings.push({
      key: 'resonator_too_close',
      message: `the resonator stands ${formatQuantity(parts.axisSpacing, 'm')} from the secondary's axis; its coupling to the secondary stays below 1 % of the primary coupling (${formatNumber(coupling)}) only beyond ${formatQuantity(needed, 'm')}: the separate-resonator model does not hold`,
    });
  }
}

/** A spark-gap shot of a three-coil system (three-coil.ts), with the two-coil shot's rules and warnings. */
function runThreeCoilShot(
  context: EvalContext,
  circuit: ThreeCoilCircuit,
  driver: SparkGapDriver,
  coupling: number,
): void {
  const { metrics, warnings } = context;
  if (coupling > THREE_COIL_COUPLING_LIMIT) {
    warnings.push({
      key: 'gap_coupling_high',
      message: `coupling ${formatNumber(coupling)} is high even for the driver of a three-coil system (common practice 0.3–${THREE_COIL_COUPLING_LIMIT}): poor quenching and flashover to the primary likely`,
    });
  }
  const chargeVoltage = chargeForShot(context, circuit.primaryCapacitance, driver);
  if (chargeVoltage === null) return;
  const shot = threeCoilSparkGapShot(circuit, chargeVoltage, driver.quench);
  if (shot === null) {
    warnings.push({
      key: 'no_ringing_modes',
      message: `the three-coil circuit has no three ringing modes (coupling ${formatNumber(coupling)}): transfer time and peak voltage not computed`,
    });
    return;
  }
  metrics.transfer_time = shot.primaryTransferTime;
  metrics.resonator_transfer_time = shot.transferTime;
  metrics.resonator_peak_voltage = shot.peakVoltage;
  metrics.peak_voltage = shot.peakVoltage;
  metrics.junction_peak_voltage = shot.junctionPeakVoltage;
  metrics.three_coil_transfer_fraction =
    (0.5 * circuit.resonatorCapacitance * shot.peakVoltage * shot.peakVoltage) / shot.energyPerShot;
}

/** A solid-state burst of a three-coil system (three-coil-burst.ts), with the two-coil burst's rules and warnings. */
function runThreeCoilBurst(
  context: EvalContext,
  circuit: ThreeCoilCircuit,
  driver: SolidStateDriver,
  upperFrequency: number | null,
): void {
  const { metrics, warnings } = context;
  const upperPeriod =
    1 / (upperFrequency ?? 1 / (2 * Math.PI * Math.sqrt(circuit.primaryInductance * circuit.primaryCapacitance)));
  const window = burstWindow(context, driver, upperPeriod);
  if (window === null) return;
  const driveVoltage = driver.bridge === 'full' ? driver.busVoltage : driver.busVoltage / 2;
  // the topload (on the resonator) breaks out at its own breakout voltage, as in a two-coil burst
  const breakoutVoltage = context.electrostatics?.breakoutVoltage ?? undefined;
  const burst = threeCoilBurst(circuit, {
    driveVoltage,
    currentLimit: driver.currentLimit,
    ...window,
    breakoutVoltage: breakoutVoltage ?? undefined,
  });
  if (!burst) return;
  if (burst.endReason === 'step_limit') {
    warnings.push({
      key: 'burst_truncated',
      message: `the burst was cut at the step limit after ${formatNumber(burst.cycles)} cycles (${formatQuantity(burst.endTime, 's')})`,
    });
  }
  metrics.energy_per_shot = burst.energyFromSource;
  metrics.input_power = driver.repetitionRate >= 0 ? burst.energyFromSource * driver.repetitionRate : null;
  metrics.peak_voltage = burst.peakVoltage;
  metrics.resonator_peak_voltage = burst.peakVoltage;
  metrics.junction_peak_voltage = burst.peakJunctionVoltage;
  metrics.transfer_time = null; // a driven burst has no single transfer
  currentLimitCheck(context, driver, burst);
  breakoutDuringBurst(context, breakoutVoltage, burst);
  tankRatingCheck(context, burst.peakTankVoltage, 'the peak tank voltage in the burst');
}

/** The breakout_during_burst warning of a burst whose top reached the topload's breakout voltage. */
function breakoutDuringBurst(
  context: EvalContext,
  breakoutVoltage: number | undefined,
  burst: { breakoutTime: number | null; breakoutCycles: number | null; endTime: number },
): void {
  if (burst.breakoutTime === null || !breakoutVoltage) return;
  context.warnings.push({
    key: 'breakout_during_burst',
    message: `the topload reaches its breakout voltage ${formatQuantity(breakoutVoltage, 'V')} after ${formatNumber(burst.breakoutCycles ?? 0)} cycles (${formatQuantity(burst.breakoutTime, 's')}) of the ${formatQuantity(burst.endTime, 's')} burst; the peak voltage assumes it held`,
  });
}

/**
 * The charge voltage of a spark-gap shot with energy_per_shot, input_power and the tank rating set,
 * or null (with the warning) when the design gives none.
 */
function chargeForShot(context: EvalContext, tankCapacitance: number, driver: SparkGapDriver): number | null {
  const chargeVoltage = context.design.tank?.chargeVoltage;
  if (chargeVoltage === undefined || !(chargeVoltage > 0)) {
    context.warnings.push({
      key: 'no_charge_voltage',
      message: 'no tank charge_voltage given: energy per shot, transfer time and peak voltage not computed',
    });
    return null;
  }
  const energy = 0.5 * tankCapacitance * chargeVoltage * chargeVoltage;
  context.metrics.energy_per_shot = energy;
  context.metrics.input_power = driver.breakRate >= 0 ? energy * driver.breakRate : null;
  tankRatingCheck(context, chargeVoltage, 'the charge voltage');
  return chargeVoltage;
}

/**
 * The burst's on time and cycle count, cut to MAX_BURST_CYCLES of the upper mode (with a warning),
 * or null (with a warning) when the driver gives neither.
 */
function burstWindow(
  context: EvalContext,
  driver: SolidStateDriver,
  upperPeriod: number,
): { onTime: number | undefined; cycles: number | undefined } | null {
  if (driver.onTime === undefined && driver.cycles === undefined) {
    context.warnings.push({
      key: 'burst_not_simulated',
      message: 'solid-state driver without on_time or cycles: the burst is not simulated',
    });
    return null;
  }
  if ((driver.onTime ?? Infinity) > MAX_BURST_CYCLES * upperPeriod && (driver.cycles ?? Infinity) > MAX_BURST_CYCLES) {
    context.warnings.push({
      key: 'burst_truncated',
      message: `burst longer than ${MAX_BURST_CYCLES} cycles: simulated for the first ${MAX_BURST_CYCLES} only`,
    });
    return { onTime: MAX_BURST_CYCLES * upperPeriod, cycles: undefined };
  }
  return { onTime: driver.onTime, cycles: driver.cycles };
}

/** The current_limit_reached warning of a burst that ended at the limit. */
function currentLimitCheck(
  context: EvalContext,
  driver: SolidStateDriver,
  burst: { endReason: string; cycles: number; endTime: number },
): void {
  if (burst.endReason !== 'current_limit') return;
  context.warnings.push({
    key: 'current_limit_reached',
    message: `primary current reached the ${formatQuantity(driver.currentLimit ?? 0, 'A')} limit after ${formatNumber(burst.cycles)} cycles (${formatQuantity(burst.endTime, 's')}): the burst ends there`,
  });
}

/** tank_voltage_margin and its warning. */
function tankRatingCheck(context: EvalContext, workingVoltage: number, what: string): void {
  const rating = context.design.tank?.voltageRating;
  if (rating === undefined || !(workingVoltage > 0)) return;
  const margin = rating / workingVoltage;
  context.metrics.tank_voltage_margin = margin;
  if (margin < 1) {
    context.warnings.push({
      key: 'tank_rating_exceeded',
      message: `tank capacitor rated ${formatQuantity(rating, 'V')} is below ${what} ${formatQuantity(workingVoltage, 'V')} (margin ${formatNumber(margin)}): it will fail`,
    });
  } else if (margin < TANK_RATING_FACTOR) {
    context.warnings.push({
      key: 'tank_rating_low',
      message: `tank capacitor rating ${formatQuantity(rating, 'V')} is only ${formatNumber(margin)}× ${what} ${formatQuantity(workingVoltage, 'V')} (common practice ≥ ${TANK_RATING_FACTOR}–2×)`,
    });
  }
}

function positive(value: number | null | undefined): number | null {
  return value !== null && value !== undefined && Number.isFinite(value) && value > 0 ? value : null;
}
