/**
 * One shot of a spark-gap driver: the tank starts charged, the gap fires at t = 0 and conducts as
 * a fixed resistance (included in the circuit's primary resistance), and — when it quenches — opens
 * at the first primary current zero after the first energy transfer, leaving the secondary to ring
 * freely. The coupled part is the exact modal solution (coupled-modes.ts), the free ringing the
 * exact RLC solution (free-resonator.ts); only the search for minima and maxima is numerical.
 *
 * The quench rule follows the quenched-spark principle (M. Wien 1906, from memory [M]); the
 * resistive gap model is common practice (refs §8.4 [C]).
 */
import type { CoupledCircuit } from './circuit.ts';
import { circuitEnergy, primaryEnergy } from './circuit.ts';
import { coupledModes, coupledStateAt, ModalMarch, type CoupledModes } from './coupled-modes.ts';
import { freeResonatorState } from './free-resonator.ts';

/** Samples per period of the upper mode in the searches (the W1 ripple has twice that rate). */
const SAMPLES_PER_CYCLE = 64;
/** Upper bound on search samples, for extreme (very weak) couplings. */
const MAX_SAMPLES = 400_000;

/** What one spark-gap shot does, SI. */
export interface SparkGapShot {
  /** Lower and upper normal-mode ringing frequencies (imaginary parts of the eigenvalues / 2π), Hz. */
  modeFrequencyLow: number;
  modeFrequencyHigh: number;
  /**
   * First minimum of the primary's stored energy ½C1v1² + ½L1i1² (the mutual term left out), s:
   * the deepest dip before the per-cycle minima of that energy rise again; null when they never
   * rise within 1.5 beats (the primary's energy only decays: no transfer and return).
   */
  transferTime: number | null;
  /** Primary stored energy at transferTime, J (null with it). */
  primaryEnergyAtTransfer: number | null;
  /** When the gap opened (first i1 zero after transferTime), s; null without quench or without a zero. */
  quenchTime: number | null;
  /** Largest |v2| up to half a secondary period after transferTime, V. */
  peakVoltage: number;
  /** When |v2| is largest, s. */
  peakTime: number;
  /** ½ C1 V², J. */
  energyPerShot: number;
}

/**
 * Simulates one spark-gap shot of the coupled circuit.
 * @param circuit lumped values; primaryResistance includes the gap's conducting resistance
 * @param chargeVoltage tank voltage when the gap fires, V
 * @param quench true: the gap opens at the first primary current zero after the transfer time
 *        (a zero within ⅛ of a primary period before it counts as at it)
 * @returns the shot, or null when the circuit has no two oscillating modes (k = 0, k ≥ 1,
 *          overdamped, or degenerate)
 * Peak window: up to transferTime + ½/f2, f2 = 1/(2π√(L2C2)); without a transfer, up to where the
 * search stopped (1.5 beats, or when the stored energy was spent) + ½/f2.
 * Cost: O(1/k) samples of the modal solution, ≈ 20 ns each.
 */
export function sparkGapShot(circuit: CoupledCircuit, chargeVoltage: number, quench: boolean): SparkGapShot | null {
  const modes = coupledModes(circuit, chargeVoltage);
  if (modes === null) return null;
  const frequencies = Array.from(modes.rateIm, (omega) => Math.abs(omega) / (2 * Math.PI)).sort((a, b) => a - b);
  const modeFrequencyLow = frequencies[0];
  const modeFrequencyHigh = frequencies[3];
  if (!(modeFrequencyLow > 0) || !(modeFrequencyHigh > modeFrequencyLow)) return null;
  const step = 1 / (modeFrequencyHigh * SAMPLES_PER_CYCLE);
  const beat = 1 / (modeFrequencyHigh - modeFrequencyLow);
  // The first envelope null is near half a beat; the search stops at the first rise after it, so
  // its limit (1.5 beats, never under 4 periods of the upper mode) only matters when W1 only decays.
  const searchEnd = Math.min(Math.max(1.5 * beat, 4 * SAMPLES_PER_CYCLE * step), MAX_SAMPLES * step);

  const transfer = firstTransfer(circuit, modes, chargeVoltage, step, searchEnd);
  const quenchTime = quench ? quenchAfter(circuit, modes, transfer.transferTime, step, beat) : null;
  // 3. The peak secondary voltage, coupled before the quench and free ringing after it.
  const secondaryPeriod = 2 * Math.PI * Math.sqrt(circuit.secondaryInductance * circuit.secondaryCapacitance);
  const peakEnd = (transfer.transferTime ?? transfer.scanEnd) + secondaryPeriod / 2;
  const { peakVoltage, peakTime } = peakSecondaryVoltage(circuit, modes, step, peakEnd, quenchTime);

  return {
    modeFrequencyLow,
    modeFrequencyHigh,
    transferTime: transfer.transferTime,
    primaryEnergyAtTransfer: transfer.primaryEnergyAtTransfer,
    quenchTime,
    peakVoltage,
    peakTime,
    energyPerShot: 0.5 * circuit.primaryCapacitance * chargeVoltage * chargeVoltage,
  };
}

/** Step 1's answer: the transfer time and the primary's energy then (both null without a transfer), and where the scan stopped, s. */
interface Transfer {
  transferTime: number | null;
  primaryEnergyAtTransfer: number | null;
  scanEnd: number;
}

/**
 * 1. The first energy transfer: the first minimum of W1 = ½C1v1² + ½L1i1². W1 carries a ripple
 * at twice the carrier frequency (the mutual term is left out), so its minimum over each period
 * of the upper mode is followed: the transfer is over when those minima rise again (by more than
 * 1e-6 of the shot energy). When they never rise — the primary's energy simply decays, as with a
 * heavily damped primary — there is no transfer to report.
 */
function firstTransfer(
  circuit: CoupledCircuit,
  modes: CoupledModes,
  chargeVoltage: number,
  step: number,
  searchEnd: number,
): Transfer {
  const march = new ModalMarch(modes, 0, step);
  const initialEnergy = 0.5 * circuit.primaryCapacitance * chargeVoltage * chargeVoltage;
  const riseTolerance = 1e-6 * initialEnergy;
  let bestIndex = 0;
  let bestEnergy = Infinity;
  let blockMinimum = Infinity;
  let previousBlockMinimum = Infinity;
  let rose = false;
  let lastIndex = 0;
  const sampleCount = Math.ceil(searchEnd / step);
  for (let n = 0; n <= sampleCount; n++) {
    const energy = primaryEnergy(circuit, march.state[0], march.state[2]);
    if (energy < bestEnergy) {
      bestEnergy = energy;
      bestIndex = n;
    }
    blockMinimum = Math.min(blockMinimum, energy);
    lastIndex = n;
    if (n % SAMPLES_PER_CYCLE === SAMPLES_PER_CYCLE - 1) {
      if (blockMinimum > previousBlockMinimum + riseTolerance) {
        rose = true;
        break;
      }
      if (circuitEnergy(circuit, march.state) < 1e-12 * initialEnergy) break; // nothing left to transfer
      previousBlockMinimum = blockMinimum;
      blockMinimum = Infinity;
    }
    march.advance();
  }
  if (!rose && blockMinimum !== Infinity && blockMinimum > previousBlockMinimum + riseTolerance) rose = true; // a last partial period
  const scanEnd = lastIndex * step;
  if (!(rose && bestIndex > 0)) return { transferTime: null, primaryEnergyAtTransfer: null, scanEnd };
  const scratch = new Float64Array(4);
  const primaryEnergyAt = (time: number): number => {
    coupledStateAt(modes, time, scratch);
    return primaryEnergy(circuit, scratch[0], scratch[2]);
  };
  const transferTime = goldenMinimum(primaryEnergyAt, (bestIndex - 1) * step, (bestIndex + 1) * step);
  return { transferTime, primaryEnergyAtTransfer: primaryEnergyAt(transferTime), scanEnd };
}

/**
 * 2. Quench: the first primary current zero after the transfer (null without a transfer). Near a
 * full-transfer coupling the current zero and the energy minimum coincide, and round-off would decide
 * whether that zero counts; a zero up to ⅛ of a primary period before the minimum (at most one fits
 * there, and the primary holds next to no energy then) is therefore taken as the quench point.
 */
function quenchAfter(
  circuit: CoupledCircuit,
  modes: CoupledModes,
  transferTime: number | null,
  step: number,
  beat: number,
): number | null {
  if (transferTime === null) return null;
  const primaryPeriod = 2 * Math.PI * Math.sqrt(circuit.primaryInductance * circuit.primaryCapacitance);
  return firstCurrentZero(modes, Math.max(0, transferTime - primaryPeriod / 8), step, beat);
}

/**
 * 3. The largest |v2| on [0, peakEnd] and when it happens: the coupled solution up to the quench
 * (or throughout without one), the secondary's free ringing from the state at the quench after it;
 * sampled at `step`, then refined by golden section between the neighbours of the largest sample.
 */
function peakSecondaryVoltage(
  circuit: CoupledCircuit,
  modes: CoupledModes,
  step: number,
  peakEnd: number,
  quenchTime: number | null,
): { peakVoltage: number; peakTime: number } {
  const scratch = new Float64Array(4);
  const quenchState = new Float64Array(4);
  if (quenchTime !== null) coupledStateAt(modes, quenchTime, quenchState);
  const secondaryVoltageAt = (time: number): number => {
    if (quenchTime !== null && time > quenchTime) {
      return freeResonatorState(
        circuit.secondaryInductance,
        circuit.secondaryCapacitance,
        circuit.secondaryResistance,
        quenchState[1],
        quenchState[3],
        time - quenchTime,
      )[0];
    }
    return coupledStateAt(modes, time, scratch)[1];
  };
  let peakSample = 0;
  let peakMagnitude = -1;
  const coupledEnd = quenchTime === null ? peakEnd : Math.min(peakEnd, quenchTime);
  const peakMarch = new ModalMarch(modes, 0, step);
  let n = 0;
  for (; n * step <= coupledEnd; n++) {
    const magnitude = Math.abs(peakMarch.state[1]);
    if (magnitude > peakMagnitude) {
      peakMagnitude = magnitude;
      peakSample = n;
    }
    peakMarch.advance();
  }
  for (; n * step <= peakEnd; n++) {
    const magnitude = Math.abs(secondaryVoltageAt(n * step));
    if (magnitude > peakMagnitude) {
      peakMagnitude = magnitude;
      peakSample = n;
    }
  }
  const lower = Math.max(0, (peakSample - 1) * step);
  const upper = Math.min(peakEnd, (peakSample + 1) * step);
  const peakTime = goldenMinimum((time) => -Math.abs(secondaryVoltageAt(time)), lower, upper);
  return { peakTime, peakVoltage: Math.max(peakMagnitude, Math.abs(secondaryVoltageAt(peakTime))) };
}

/** First zero of i1 at or after `start`, by sampling and bisection; null if none within `limit`. */
function firstCurrentZero(modes: CoupledModes, start: number, step: number, limit: number): number | null {
  const march = new ModalMarch(modes, start, step);
  let previousTime = start;
  let previousCurrent = march.state[2];
  if (previousCurrent === 0) return start;
  for (let n = 0; n * step < limit; n++) {
    march.advance();
    const current = march.state[2];
    if (current === 0) return march.time;
    if (Math.sign(current) !== Math.sign(previousCurrent)) {
      const scratch = new Float64Array(4);
      let low = previousTime;
      let high = march.time;
      const lowSign = Math.sign(previousCurrent);
      for (let iteration = 0; iteration < 60; iteration++) {
        const middle = 0.5 * (low + high);
        if (Math.sign(coupledStateAt(modes, middle, scratch)[2]) === lowSign) low = middle;
        else high = middle;
      }
      return 0.5 * (low + high);
    }
    previousTime = march.time;
    previousCurrent = current;
  }
  return null;
}

/** Golden-section search for the minimum of a unimodal f on [a, b]; returns the abscissa. */
function goldenMinimum(f: (x: number) => number, a: number, b: number): number {
  const ratio = (Math.sqrt(5) - 1) / 2;
  let low = a;
  let high = b;
  let x1 = high - ratio * (high - low);
  let x2 = low + ratio * (high - low);
  let f1 = f(x1);
  let f2 = f(x2);
  for (let iteration = 0; iteration < 60 && high - low > 1e-13 * Math.max(1e-300, Math.abs(high)); iteration++) {
    if (f1 < f2) {
      high = x2;
      x2 = x1;
      f2 = f1;
      x1 = high - ratio * (high - low);
      f1 = f(x1);
    } else {
      low = x1;
      x1 = x2;
      f1 = f2;
      x2 = low + ratio * (high - low);
      f2 = f(x2);
    }
  }
  return f1 < f2 ? x1 : x2;
}
