/**
 * Stage of the evaluation pipeline (see core/evaluate.ts): the supply, the tank bank and the
 * safety gap.
 *
 * Before the other stages, `prepareTank` turns the design's tank into the one that is built: with
 * a `tankBank` its capacitance is the bank's (n_p·C_part/n_s, core/tank/bank.ts) and its rating the
 * string's (n_s·V_part); with a `supply` and a rotary gap the charge voltage is the charge reached
 * from the supply's current at the break rate, and with a static gap the break rate is the one the
 * supply's current gives at the gap's setting (staticBreakRateEstimate, an estimate, common practice
 * [supply-charging]), so energy per shot and input power follow from the supply
 * (core/supply/supply.ts). The dynamics then simulate
 * that tank. After them, `tankStage` takes the computed tank waveform (the spark-gap shot) for the
 * currents each part carries, checks the parts' ratings (a bank that cannot meet them makes the
 * design infeasible), sizes the bleeders, compares the shots with the supply's rating and sets the
 * safety gap.
 */
import type { DesignProblem, EvalContext } from '../context.ts';
import type {
  Design,
  DriverSpec,
  SolidStateDriver,
  SparkGapDriver,
  SupplySpec,
  TankBankSpec,
  TankSpec,
} from '../design.ts';
import { must } from '../must.ts';
import type { Metrics } from '../metrics.ts';
import type { DesignWarning } from '../outcome/warnings.ts';
import { formatNumber, formatQuantity } from '../outcome/warnings.ts';
import {
  RESONANT_BAND,
  resonantCapacitance,
  rotaryChargeVoltage,
  staticBreakRateEstimate,
  type SupplySource,
  unloadedChargePeak,
} from '../supply/supply.ts';
import { type BankLayout, bankLayout, bleederResistance, primaryCurrentSquaredIntegral } from '../tank/bank.ts';
import { coupledModes, ModalMarch } from '../dynamics/coupled-modes.ts';
import { electrodeGapSpacing, sphereGapAirDensity, sphereGapSpacing } from '../breakdown/sphere-gap.ts';

/** The supply as a source behind its reactance: rated voltage, short-circuit current, frequency. */
export function supplySource(supply: SupplySpec): SupplySource {
  const rated = supply.current ?? (supply.power !== undefined ? supply.power / supply.voltage : Number.NaN);
  const current =
    supply.kind === 'ballasted' && supply.ballastImpedance !== undefined
      ? supply.voltage / supply.ballastImpedance
      : rated;
  return { voltage: supply.voltage, current, frequency: supply.frequency };
}

/** The supply's rated output, VA. */
export function supplyRating(supply: SupplySpec): number {
  return supply.power ?? supply.voltage * (supply.current ?? Number.NaN);
}

/**
 * The design with the tank as built (bank capacitance and rating, the charge the supply reaches);
 * sets the supply and bank metrics known before the dynamics, pushes their problems and warnings.
 */
export function prepareTank(
  design: Design,
  metrics: Metrics,
  warnings: DesignWarning[],
  problems: DesignProblem[],
): { design: Design; layout?: EvalContext['tankBank'] } {
  const tank = design.tank;
  if (!tank) return { design };
  const driver = design.driver;
  const spark = driver?.kind === 'spark_gap' ? driver : undefined;
  const supply = spark ? design.supply : undefined;
  const source = supply ? supplySource(supply) : undefined;
  if (supply && source && !(source.current > 0)) {
    problems.push({ field: 'supply.current', reason: 'give the rated current or power of the supply' });
    return { design };
  }
  const rotary = spark?.gap === 'rotary';
  const chargeAt = (capacitance: number): number | undefined => {
    if (source && spark && rotary) {
      const reached = rotaryChargeVoltage(source, capacitance, spark.breakRate);
      return tank.chargeVoltage !== undefined ? Math.min(reached, tank.chargeVoltage) : reached;
    }
    return tank.chargeVoltage;
  };

  let capacitance = tank.capacitance;
  let rating = tank.voltageRating;
  let layout: EvalContext['tankBank'];
  const bank = design.tankBank;
  const solidAuto = bank !== undefined && driver?.kind === 'solid_state' && bank.series === undefined;
  if (solidAuto && bank.parallel !== undefined) {
    problems.push({
      field: 'tank.bank.parallel',
      reason:
        'with a solid-state driver and an automatic series count, leave the parallel count automatic too (the burst is simulated at the target capacitance, which only an automatic parallel count keeps)',
    });
    return { design };
  }
  // A solid-state bank with an automatic series count is laid out after the burst (layoutAfterBurst).
  if (bank && !solidAuto) {
    const laid = layoutBank(design, bank, chargeAt, metrics, problems);
    if (laid === null) return { design };
    ({ capacitance, rating, layout } = laid);
  }

  let chargeVoltage = chargeAt(capacitance);
  /** A static gap fires as often as the supply charges the tank to its setting (the estimate is the break rate). */
  let staticRate: number | undefined;
  if (supply && source && spark) {
    const checked = supplyChecks(source, capacitance, rotary, chargeVoltage, metrics, warnings, problems);
    if (checked === null) return { design };
    staticRate = checked.staticRate;
  }
  if (bank && layout) {
    metrics.tank_bank_stored_energy =
      chargeVoltage !== undefined ? 0.5 * capacitance * chargeVoltage * chargeVoltage : null;
    if (chargeVoltage !== undefined) layout.workingVoltage = chargeVoltage;
  }
  if (chargeVoltage === undefined) chargeVoltage = tank.chargeVoltage;
  const built = { ...tank, capacitance };
  if (chargeVoltage !== undefined) built.chargeVoltage = chargeVoltage;
  if (rating !== undefined) built.voltageRating = rating;
  const firing =
    spark && staticRate !== undefined && Number.isFinite(staticRate) ? { ...spark, breakRate: staticRate } : driver;
  return { design: { ...design, tank: built, driver: firing }, layout };
}

/**
 * The bank's layout before the dynamics (a spark gap's charge, or a given series count): the
 * smallest series count whose parts hold margin × the charge the bank as built reaches, the
 * parallel count for the target; null after pushing the problem when no layout holds.
 */
function layoutBank(
  design: Design,
  bank: TankBankSpec,
  chargeAt: (capacitance: number) => number | undefined,
  metrics: Metrics,
  problems: DesignProblem[],
): { capacitance: number; rating: number; layout: NonNullable<EvalContext['tankBank']> } | null {
  const tank = must(design.tank, 'the tank');
  const driver = design.driver;
  const part = {
    capacitance: bank.partCapacitance,
    voltageRating: bank.partVoltageRating,
    rmsCurrentRating: bank.partRmsCurrentRating,
    peakCurrentRating: bank.partPeakCurrentRating,
  };
  const solid = driver?.kind === 'solid_state';
  const working = solid ? undefined : chargeAt(tank.capacitance);
  if (working === undefined && bank.series === undefined) {
    problems.push({
      field: 'tank.bank.series',
      reason: 'give the series count, or a charge voltage to choose it from',
    });
    return null;
  }
  // The smallest series count whose parts hold margin × the charge the bank as built reaches (a
  // rotary gap's charge depends on the bank's capacitance, so each count is tried in turn).
  let first: BankLayout | null = null;
  if (bank.series !== undefined) {
    first = bankLayout(part, tank.capacitance, 0, bank.voltageMargin, bank.series, bank.parallel);
  } else {
    for (let series = 1; series <= MAX_AUTO_SERIES && first === null; series++) {
      const trial = bankLayout(part, tank.capacitance, 0, bank.voltageMargin, series, bank.parallel);
      const charge = chargeAt(trial.capacitance) ?? 0;
      if (bank.voltageMargin * charge <= series * part.voltageRating * (1 + 1e-12)) first = trial;
    }
    if (first === null) {
      problems.push({
        field: 'tank.bank.part.voltage_rating',
        reason: `no series count up to ${MAX_AUTO_SERIES} holds ${formatNumber(bank.voltageMargin)}× the charge voltage with ${formatQuantity(part.voltageRating, 'V')} parts`,
      });
      return null;
    }
  }
  const finalWorking = solid ? 0 : (chargeAt(first.capacitance) ?? 0);
  metrics.tank_bank_series = first.series;
  metrics.tank_bank_parallel = first.parallel;
  metrics.tank_bank_part_count = first.partCount;
  metrics.tank_bank_capacitance = first.capacitance;
  return {
    capacitance: first.capacitance,
    rating: first.series * part.voltageRating,
    layout: { ...first, workingVoltage: finalWorking },
  };
}

/**
 * The supply against the tank: its resonant size, the ratio, the charge it can reach, the warning
 * inside the resonant band; a static gap set above that charge is a problem (null); else the
 * static gap's break rate (the supply's refill rate at the setting).
 */
function supplyChecks(
  source: SupplySource,
  capacitance: number,
  rotary: boolean,
  chargeVoltage: number | undefined,
  metrics: Metrics,
  warnings: DesignWarning[],
  problems: DesignProblem[],
): { staticRate: number | undefined } | null {
  let staticRate: number | undefined;
  const resonant = resonantCapacitance(source);
  const ratio = capacitance / resonant;
  const limit = unloadedChargePeak(source, capacitance);
  metrics.supply_resonant_capacitance = resonant;
  metrics.supply_capacitance_ratio = ratio;
  metrics.supply_charge_limit = Number.isFinite(limit) ? limit : null;
  if (ratio >= RESONANT_BAND[0] && ratio <= RESONANT_BAND[1]) {
    warnings.push({
      key: 'supply_resonant_rise',
      message: `the tank (${formatQuantity(capacitance, 'F')}) is ${formatNumber(ratio)}× the supply's resonant size ${formatQuantity(resonant, 'F')}: resonant rise can drive the tank and the supply far beyond their ratings (common practice: stay outside ${RESONANT_BAND[0]}–${RESONANT_BAND[1]}×)`,
    });
  }
  if (!rotary && chargeVoltage !== undefined) {
    if (Number.isFinite(limit) && chargeVoltage > limit) {
      problems.push({
        field: 'tank.charge_voltage',
        reason: `the supply charges the tank to at most ${formatQuantity(limit, 'V')} (√2·V/|1 − C/C_res|), below the static gap's firing voltage ${formatQuantity(chargeVoltage, 'V')}: the gap never fires`,
      });
      return null;
    }
    staticRate = staticBreakRateEstimate(source, capacitance, chargeVoltage);
    metrics.supply_break_rate_estimate = staticRate;
  }
  if (chargeVoltage !== undefined) {
    metrics.supply_charge_voltage = chargeVoltage;
    metrics.supply_charge_ratio = Number.isFinite(limit) ? chargeVoltage / limit : null;
  }
  return { staticRate };
}

/**
 * The layout of a solid-state bank whose series count is automatic, from the burst's peak tank
 * voltage (simulated at the target capacitance; the automatic parallel count keeps the bank within
 * half a part's share of it): n_s = ⌈margin · V_peak / V_part⌉ (core/tank/bank.ts).
 */
function layoutAfterBurst(context: EvalContext): void {
  const { design, metrics } = context;
  const bank = design.tankBank;
  const tank = design.tank;
  const working = context.burstPeakTankVoltage;
  if (!bank || !tank || working === undefined || !(working > 0)) return;
  const part = {
    capacitance: bank.partCapacitance,
    voltageRating: bank.partVoltageRating,
    rmsCurrentRating: bank.partRmsCurrentRating,
    peakCurrentRating: bank.partPeakCurrentRating,
  };
  const layout = bankLayout(part, tank.capacitance, working, bank.voltageMargin);
  context.tankBank = { ...layout, workingVoltage: working };
  metrics.tank_bank_series = layout.series;
  metrics.tank_bank_parallel = layout.parallel;
  metrics.tank_bank_part_count = layout.partCount;
  metrics.tank_bank_capacitance = layout.capacitance;
}

/** Largest series count the automatic layout tries. */
const MAX_AUTO_SERIES = 1000;

/** Samples per upper-mode period in the scan for the peak current and the voltage reversal. */
const SCAN_SAMPLES_PER_CYCLE = 256;
const SCAN_MAX_SAMPLES = 200_000;

/**
 * After the dynamics: the tank's peak and rms current, the voltage reversal, the bank's per-part
 * currents and bleeders against the part's ratings, the supply's load and the safety gap.
 */
export function tankStage(context: EvalContext): void {
  const { design } = context;
  const driver = design.driver;
  const tank = design.tank;
  if (!tank || !driver) return;
  const currents = driver.kind === 'spark_gap' ? shotCurrents(context, driver) : burstCurrents(context, driver);
  bankParts(context, driver, currents);
  supplyLoad(context, driver);
  safetyGap(context, driver, tank);
}

/** The tank current of one spark-gap shot (peak, rms over the shots) and its largest voltage of either polarity. */
interface TankCurrents {
  peakCurrent: number | null;
  rmsCurrent: number | null;
  largestVoltage: number | null;
}

function shotCurrents(context: EvalContext, driver: SparkGapDriver): TankCurrents {
  const { metrics } = context;
  let peakCurrent: number | null = null;
  let rmsCurrent: number | null = null;
  let largestVoltage: number | null = null;
  if (context.circuit && context.sparkShot) {
    const { shot, chargeVoltage } = context.sparkShot;
    const modes = coupledModes(context.circuit, chargeVoltage);
    if (modes !== null) {
      const end = shot.quenchTime ?? Number.POSITIVE_INFINITY;
      const squared = primaryCurrentSquaredIntegral(modes, end);
      if (Number.isFinite(squared) && squared >= 0) rmsCurrent = Math.sqrt(squared * driver.breakRate);
      const step = 1 / (shot.modeFrequencyHigh * SCAN_SAMPLES_PER_CYCLE);
      const beat = 1 / (shot.modeFrequencyHigh - shot.modeFrequencyLow);
      const scanEnd = Math.min(shot.quenchTime ?? 2 * beat, SCAN_MAX_SAMPLES * step);
      const march = new ModalMarch(modes, 0, step);
      let current = 0;
      let lowest = chargeVoltage;
      let highest = chargeVoltage;
      for (let n = 0; n * step <= scanEnd; n++) {
        current = Math.max(current, Math.abs(march.state[2]));
        lowest = Math.min(lowest, march.state[0]);
        highest = Math.max(highest, march.state[0]);
        march.advance();
      }
      peakCurrent = current;
      largestVoltage = Math.max(highest, -lowest);
      metrics.tank_peak_current = current;
      metrics.tank_rms_current = rmsCurrent;
      metrics.tank_voltage_reversal = chargeVoltage > 0 ? Math.max(0, -lowest) / chargeVoltage : null;
    }
  }

  return { peakCurrent, rmsCurrent, largestVoltage };
}

/** The tank current of a solid-state burst: its peak, and its rms over the bursts. */
function burstCurrents(context: EvalContext, driver: SolidStateDriver): TankCurrents {
  const { metrics } = context;
  if (context.burstPeakTankCurrent === undefined) return { peakCurrent: null, rmsCurrent: null, largestVoltage: null };
  const peakCurrent = context.burstPeakTankCurrent;
  const squared = context.burstTankCurrentSquared ?? Number.NaN;
  // rms over the bursts: √(rate · ∫ i1² dt) (rms of a repetitive pulse, exact)
  const rmsCurrent = Number.isFinite(squared) && squared >= 0 ? Math.sqrt(squared * driver.repetitionRate) : null;
  metrics.tank_peak_current = peakCurrent;
  metrics.tank_rms_current = rmsCurrent;
  return { peakCurrent, rmsCurrent, largestVoltage: null };
}

/** The bank's per-part voltage, currents and bleeders against the part's ratings. */
function bankParts(context: EvalContext, driver: DriverSpec, currents: TankCurrents): void {
  const { design, metrics, problems } = context;
  const { peakCurrent, rmsCurrent, largestVoltage } = currents;
  const bank = design.tankBank;
  if (bank && driver.kind === 'solid_state' && !context.tankBank) layoutAfterBurst(context);
  const layout = context.tankBank;
  if (bank && layout) {
    const working =
      driver.kind === 'solid_state'
        ? (context.burstPeakTankVoltage ?? 0)
        : Math.max(largestVoltage ?? 0, layout.workingVoltage);
    const perPart = working / layout.series;
    metrics.tank_bank_part_voltage = working > 0 ? perPart : null;
    if (driver.kind === 'solid_state' && working > 0) {
      metrics.tank_bank_stored_energy = 0.5 * layout.capacitance * working * working;
    }
    if (working > 0 && perPart * bank.voltageMargin > bank.partVoltageRating * (1 + 1e-12)) {
      problems.push({
        field: 'tank.bank.series',
        reason: `each of the ${layout.series} parts in series sees ${formatQuantity(perPart, 'V')}; ${formatNumber(bank.voltageMargin)}× that exceeds its ${formatQuantity(bank.partVoltageRating, 'V')} rating`,
      });
    }
    if (rmsCurrent !== null) {
      const partRms = rmsCurrent / layout.parallel;
      metrics.tank_bank_part_rms_current = partRms;
      if (partRms > bank.partRmsCurrentRating) {
        problems.push({
          field: 'tank.bank.part.rms_current_rating',
          reason: `each part carries ${formatQuantity(partRms, 'A')} rms (${layout.parallel} strings share ${formatQuantity(rmsCurrent, 'A')}), above its ${formatQuantity(bank.partRmsCurrentRating, 'A')} rating`,
        });
      }
    }
    if (peakCurrent !== null) {
      const partPeak = peakCurrent / layout.parallel;
      metrics.tank_bank_part_peak_current = partPeak;
      if (bank.partPeakCurrentRating !== undefined && partPeak > bank.partPeakCurrentRating) {
        problems.push({
          field: 'tank.bank.part.peak_current_rating',
          reason: `each part carries ${formatQuantity(partPeak, 'A')} peak (${layout.parallel} strings share ${formatQuantity(peakCurrent, 'A')}), above its ${formatQuantity(bank.partPeakCurrentRating, 'A')} rating`,
        });
      }
    }
    const bleeder = bleederResistance(bank.partCapacitance, working, bank.bleedTime);
    metrics.tank_bank_bleeder_resistance = bleeder;
    metrics.tank_bank_bleeder_power = bleeder !== null ? (perPart * perPart) / bleeder : null;
  }
}

/** The shots' input power against the supply's rating. */
function supplyLoad(context: EvalContext, driver: DriverSpec): void {
  const { design, metrics, warnings } = context;
  if (design.supply && driver.kind === 'spark_gap' && metrics.input_power !== null) {
    const rating = supplyRating(design.supply);
    if (rating > 0) {
      const load = metrics.input_power / rating;
      metrics.supply_load_fraction = load;
      if (load > 1) {
        warnings.push({
          key: 'supply_overloaded',
          message: `the shots take ${formatQuantity(metrics.input_power, 'W')}, ${formatNumber(load)}× the supply's ${formatQuantity(rating, 'VA')} rating`,
        });
      }
    }
  }
}

/** The safety gap's firing voltage and spacing. */
function safetyGap(context: EvalContext, driver: DriverSpec, tank: TankSpec): void {
  const { design, metrics, warnings } = context;
  const gap = design.safetyGap;
  const charge = driver.kind === 'spark_gap' ? tank.chargeVoltage : context.burstPeakTankVoltage;
  if (gap && charge !== undefined && charge > 0) {
    const firing = gap.fireAt * charge;
    const density = sphereGapAirDensity(design.environment.altitude, design.environment.temperature);
    const spacing =
      gap.electrodes === 'sphere' && gap.sphereDiameter !== undefined
        ? sphereGapSpacing(gap.sphereDiameter, firing, density)
        : electrodeGapSpacing(firing, density);
    metrics.safety_gap_voltage = firing;
    metrics.safety_gap_spacing = spacing;
    if (spacing === null) {
      warnings.push({
        key: 'safety_gap_outside_table',
        message: `no spacing for ${formatQuantity(firing, 'V')} with ${formatQuantity(gap.sphereDiameter ?? 0, 'm')} spheres within the sphere-gap table: choose other spheres`,
      });
    }
  }
}
