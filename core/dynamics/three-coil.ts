/**
 * The lumped circuit of a three-coil system: the tank and primary, magnetically coupled to a driver
 * secondary whose top carries the junction capacitance, and from that junction through the line
 * into a separate resonator with its top capacitance.
 *
 *   tank:      L1 di1/dt + M di2/dt + R1 i1 + v1 = 0,          C1 dv1/dt = i1
 *   driver:    L2 di2/dt + M di1/dt + R2 i2 + v2 = 0,          C2 dv2/dt = i2 − i3
 *   resonator: L3 di3/dt + R3 i3 + v3 − v2 = 0,                 C3 dv3/dt = i3
 *
 * v1 the tank-capacitor voltage, v2 the junction (driver top, resonator base) voltage to ground, v3
 * the resonator's top; L3 includes the line's inductance and R3 its resistance. Kirchhoff's laws
 * (any circuit-theory text, e.g. [terman1943]); in loop charges L Q'' + R Q' + S Q = 0 with
 * L = [[L1, M, 0], [M, L2, 0], [0, 0, L3]] and S = diag(1/C1, 0, 0) + the shared C2 of loops 2 and
 * 3 (S22 = 1/C2, S23 = −1/C2, S33 = 1/C2 + 1/C3): the triple-resonance network of [bieniosek1990].
 * It is solved exactly by its normal modes (loop-modes.ts).
 */
import { LoopMarch, type LoopModes, type LoopNetwork, loopModes, loopStateAt } from './loop-modes.ts';

/** The lumped values, SI (H, F, Ω). */
export interface ThreeCoilCircuit {
  /** L1, C1, R1: primary inductance, tank capacitance, everything in series in the tank loop. */
  primaryInductance: number;
  primaryCapacitance: number;
  primaryResistance: number;
  /** L2, R2: the driver secondary. */
  driverInductance: number;
  driverResistance: number;
  /** M between primary and driver, H. */
  mutualInductance: number;
  /** C2: everything at the junction (driver top and the line), F. */
  junctionCapacitance: number;
  /** L3, R3: the resonator with the line in series. */
  resonatorInductance: number;
  resonatorResistance: number;
  /** C3: the resonator's top, F. */
  resonatorCapacitance: number;
}

/** The loop network of the three-coil circuit (loops: tank, driver, resonator). */
export function threeCoilNetwork(circuit: ThreeCoilCircuit): LoopNetwork {
  const c2 = 1 / circuit.junctionCapacitance;
  return {
    size: 3,
    inductance: Float64Array.from([
      circuit.primaryInductance,
      circuit.mutualInductance,
      0,
      circuit.mutualInductance,
      circuit.driverInductance,
      0,
      0,
      0,
      circuit.resonatorInductance,
    ]),
    resistance: Float64Array.from([circuit.primaryResistance, circuit.driverResistance, circuit.resonatorResistance]),
    elastance: Float64Array.from([
      1 / circuit.primaryCapacitance,
      0,
      0,
      0,
      c2,
      -c2,
      0,
      -c2,
      c2 + 1 / circuit.resonatorCapacitance,
    ]),
  };
}

/** The driver and the resonator alone (the tank's loop open, e.g. after the gap quenched). */
export function driverResonatorNetwork(circuit: ThreeCoilCircuit): LoopNetwork {
  const c2 = 1 / circuit.junctionCapacitance;
  return {
    size: 2,
    inductance: Float64Array.from([circuit.driverInductance, 0, 0, circuit.resonatorInductance]),
    resistance: Float64Array.from([circuit.driverResistance, circuit.resonatorResistance]),
    elastance: Float64Array.from([c2, -c2, -c2, c2 + 1 / circuit.resonatorCapacitance]),
  };
}

/** Capacitor voltages [v1, v2, v3] of a three-loop state [Q1, Q2, Q3, I1, I2, I3]. */
export function threeCoilVoltages(circuit: ThreeCoilCircuit, state: ArrayLike<number>): [number, number, number] {
  return [
    state[0] / circuit.primaryCapacitance,
    (state[1] - state[2]) / circuit.junctionCapacitance,
    state[2] / circuit.resonatorCapacitance,
  ];
}

/** The three-loop state of a charged tank at rest: Q1 = C1 V. */
export function chargedTankState(circuit: ThreeCoilCircuit, chargeVoltage: number): Float64Array {
  return Float64Array.from([circuit.primaryCapacitance * chargeVoltage, 0, 0, 0, 0, 0]);
}

/** Samples per period of the upper mode in the searches. */
const SAMPLES_PER_CYCLE = 64;
/** Upper bound on search samples. */
const MAX_SAMPLES = 400_000;

/** What one spark-gap shot of a three-coil system does, SI. */
export interface ThreeCoilShot {
  /** The three ringing frequencies of the coupled circuit (imaginary parts / 2π), ascending, Hz. */
  modeFrequencies: [number, number, number];
  /** First minimum of the tank's stored energy ½C1v1² + ½L1i1² (null when it only decays), s. */
  primaryTransferTime: number | null;
  /** When the gap opened (first i1 zero after primaryTransferTime), s; null without quench. */
  quenchTime: number | null;
  /**
   * The first full transfer to the resonator's top: the time of the largest |v3| before the
   * envelope of |v3|, sampled per period of the lowest mode, stops rising; s.
   */
  transferTime: number;
  /** |v3| there, V. */
  peakVoltage: number;
  /** Largest |v2| (the junction) up to transferTime, V. */
  junctionPeakVoltage: number;
  /** ½ C1 V², J. */
  energyPerShot: number;
}

/**
 * Simulates one spark-gap shot of the three-coil circuit: the tank charged to `chargeVoltage`, the
 * gap firing at t = 0 as a resistance (in R1), and with `quench` opening at the first tank-current
 * zero after the tank's first energy minimum (the rule of spark-gap.ts), after which the driver and
 * the resonator ring on as a two-loop network.
 * @returns null when the coupled circuit has no three ringing modes or cannot be decomposed
 */
export function threeCoilSparkGapShot(
  circuit: ThreeCoilCircuit,
  chargeVoltage: number,
  quench: boolean,
): ThreeCoilShot | null {
  const modes = loopModes(threeCoilNetwork(circuit), chargedTankState(circuit, chargeVoltage));
  if (modes === null) return null;
  const frequencies = ringingFrequencies(modes);
  if (frequencies === null) return null;
  const step = 1 / (frequencies[2] * SAMPLES_PER_CYCLE);
  const energyPerShot = 0.5 * circuit.primaryCapacitance * chargeVoltage * chargeVoltage;
  const primaryTransferTime = tankEnergyMinimum(circuit, modes, frequencies, step, energyPerShot);
  // Quench at the first tank-current zero after it (a zero up to ⅛ of a tank period before the
  // minimum counts, as in spark-gap.ts), and the driver with the resonator ringing on from there.
  let quenchTime: number | null = null;
  let after: LoopModes | null = null;
  if (quench && primaryTransferTime !== null) {
    const tankPeriod = 2 * Math.PI * Math.sqrt(circuit.primaryInductance * circuit.primaryCapacitance);
    quenchTime = firstCurrentZero(modes, Math.max(0, primaryTransferTime - tankPeriod / 8), step, 4 / frequencies[0]);
    if (quenchTime !== null) {
      const at = loopStateAt(modes, quenchTime, new Float64Array(6));
      after = loopModes(driverResonatorNetwork(circuit), [at[1], at[2], at[4], at[5]]);
      if (after === null) quenchTime = null; // a degenerate two-loop remainder: keep the gap conducting
    }
  }
  const peak = resonatorPeak(circuit, modes, frequencies, step, chargeVoltage, quenchTime, after);
  return { modeFrequencies: frequencies, primaryTransferTime, quenchTime, ...peak, energyPerShot };
}

/**
 * The tank's first energy minimum, as in spark-gap.ts: per period of the upper mode, its minimum;
 * the transfer is over when those minima rise again. Null when they never rise (it only decays).
 */
function tankEnergyMinimum(
  circuit: ThreeCoilCircuit,
  modes: LoopModes,
  frequencies: [number, number, number],
  step: number,
  energyPerShot: number,
): number | null {
  const [low, mid, high] = frequencies;
  const march = new LoopMarch(modes, 0, step);
  const tolerance = 1e-6 * energyPerShot;
  let bestIndex = 0;
  let bestEnergy = Infinity;
  let blockMinimum = Infinity;
  let previous = Infinity;
  let rose = false;
  const beatLimit = 1.5 / (mid - low) + 1.5 / (high - mid);
  const count = Math.min(MAX_SAMPLES, Math.ceil(Math.max(beatLimit, 8 / low) / step));
  for (let n = 0; n <= count; n++) {
    const energy = tankEnergy(circuit, march.state);
    if (energy < bestEnergy) {
      bestEnergy = energy;
      bestIndex = n;
    }
    blockMinimum = Math.min(blockMinimum, energy);
    if (n % SAMPLES_PER_CYCLE === SAMPLES_PER_CYCLE - 1) {
      if (blockMinimum > previous + tolerance) {
        rose = true;
        break;
      }
      previous = blockMinimum;
      blockMinimum = Infinity;
    }
    march.advance();
  }
  if (!rose || bestIndex === 0) return null;
  const scratch = new Float64Array(6);
  const tankEnergyAt = (time: number): number => tankEnergy(circuit, loopStateAt(modes, time, scratch));
  return goldenMinimum(tankEnergyAt, (bestIndex - 1) * step, (bestIndex + 1) * step);
}

/**
 * The envelope of |v3|, sampled per period of the lowest mode: the first full transfer is its
 * largest value before a period's maximum no longer rises (by 1e-9 of the lossless top voltage).
 * After a quench the two-loop remainder `after` carries on from `quenchTime`.
 */
function resonatorPeak(
  circuit: ThreeCoilCircuit,
  modes: LoopModes,
  [low, , high]: [number, number, number],
  step: number,
  chargeVoltage: number,
  quenchTime: number | null,
  after: LoopModes | null,
): { transferTime: number; peakVoltage: number; junctionPeakVoltage: number } {
  const scratch = new Float64Array(6);
  const afterState = new Float64Array(4);
  const resonatorTop = (time: number): [number, number] => {
    if (after !== null && quenchTime !== null && time > quenchTime) {
      loopStateAt(after, time - quenchTime, afterState);
      return [
        (afterState[0] - afterState[1]) / circuit.junctionCapacitance,
        afterState[1] / circuit.resonatorCapacitance,
      ];
    }
    loopStateAt(modes, time, scratch);
    const v = threeCoilVoltages(circuit, scratch);
    return [v[1], v[2]];
  };
  const block = Math.max(SAMPLES_PER_CYCLE, Math.ceil(high / low) * SAMPLES_PER_CYCLE);
  const tolerance = 1e-9 * chargeVoltage * Math.sqrt(circuit.primaryCapacitance / circuit.resonatorCapacitance);
  let bestIndex = 0;
  let best = -1;
  let runningJunction = 0;
  let junctionPeak = 0;
  let blockMaximum = -1;
  let previous = -1;
  const march = new LoopMarch(modes, 0, step);
  for (let n = 0; n < MAX_SAMPLES; n++) {
    const time = n * step;
    let v2: number;
    let v3: number;
    if (after !== null && quenchTime !== null && time > quenchTime) [v2, v3] = resonatorTop(time);
    else {
      v2 = (march.state[1] - march.state[2]) / circuit.junctionCapacitance;
      v3 = march.state[2] / circuit.resonatorCapacitance;
    }
    runningJunction = Math.max(runningJunction, Math.abs(v2));
    const magnitude = Math.abs(v3);
    // a later peak must be higher by more than rounding to count (the lossless tuned circuit
    // repeats its full transfer exactly)
    if (magnitude > best + tolerance) {
      best = magnitude;
      bestIndex = n;
      junctionPeak = runningJunction;
    }
    blockMaximum = Math.max(blockMaximum, magnitude);
    if (n % block === block - 1) {
      if (previous >= 0 && !(blockMaximum > previous + tolerance)) break;
      previous = blockMaximum;
      blockMaximum = -1;
    }
    march.advance();
  }
  const lower = Math.max(0, (bestIndex - 1) * step);
  const upper = (bestIndex + 1) * step;
  const transferTime = goldenMinimum((time) => -Math.abs(resonatorTop(time)[1]), lower, upper);
  const peakVoltage = Math.max(best, Math.abs(resonatorTop(transferTime)[1]));
  return { transferTime, peakVoltage, junctionPeakVoltage: junctionPeak };
}

/**
 * The three ringing frequencies of a three-loop modal solution, Hz, ascending (each conjugate pair
 * once), or null when a mode does not ring (overdamped) or two coincide.
 */
export function ringingFrequencies(modes: LoopModes): [number, number, number] | null {
  const positive = Array.from(modes.rateIm)
    .filter((omega) => omega > 0)
    .map((omega) => omega / (2 * Math.PI))
    .sort((a, b) => a - b);
  if (positive.length !== 3) return null;
  if (!(positive[0] > 0) || !(positive[1] > positive[0]) || !(positive[2] > positive[1])) return null;
  return [positive[0], positive[1], positive[2]];
}

/** ½C1v1² + ½L1i1², J, of a three-loop state. */
function tankEnergy(circuit: ThreeCoilCircuit, state: ArrayLike<number>): number {
  const v1 = state[0] / circuit.primaryCapacitance;
  return 0.5 * circuit.primaryCapacitance * v1 * v1 + 0.5 * circuit.primaryInductance * state[3] * state[3];
}

/** First zero of i1 at or after `start`, by sampling and bisection; null if none within `limit`. */
function firstCurrentZero(modes: LoopModes, start: number, step: number, limit: number): number | null {
  const march = new LoopMarch(modes, start, step);
  const scratch = new Float64Array(6);
  let previousTime = start;
  let previousCurrent = march.state[3];
  if (previousCurrent === 0) return start;
  for (let n = 0; n * step < limit; n++) {
    march.advance();
    const current = march.state[3];
    if (current === 0) return march.time;
    if (Math.sign(current) !== Math.sign(previousCurrent)) {
      let low = previousTime;
      let high = march.time;
      const lowSign = Math.sign(previousCurrent);
      for (let iteration = 0; iteration < 60; iteration++) {
        const middle = 0.5 * (low + high);
        if (Math.sign(loopStateAt(modes, middle, scratch)[3]) === lowSign) low = middle;
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
