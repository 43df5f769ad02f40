/**
 * One burst of a solid-state bridge driving a three-coil system (three-coil.ts): the square wave
 * e(t) = ±E in the tank loop, switched at each zero of the tank current so that e has the sign of
 * i1 (the rule of solid-state.ts, common practice [C]); the burst ends at the on-time, after the
 * given drive cycles, or when |i1| reaches the current limit. The loop equations
 * L Q'' + R Q' + S Q = e·(1, 0, 0) are integrated by the classical fourth-order Runge–Kutta method
 * (Butcher, Numerical Methods for Ordinary Differential Equations, 2008, §23) at 256 steps per
 * period of the upper mode; a step holding a switching or the current-limit instant is redone up
 * to that instant, found by bisection. The energy from the supply is exact per segment (e times
 * the charge through the tank, ∫ e i1 dt = e ΔQ1). As in solid-state.ts, a breakout voltage of the
 * drive does not cut the burst: the first time |v3| (the resonator's top) reaches it is reported.
 */
import type { BridgeDrive, BurstEnd } from './solid-state.ts';
import { type LoopNetwork, losslessLoopFrequencies, loopEnergy } from './loop-modes.ts';
import { type ThreeCoilCircuit, threeCoilNetwork } from './three-coil.ts';

/** What one burst of the three-coil system does, SI. */
export interface ThreeCoilBurst {
  endTime: number;
  endReason: BurstEnd;
  /** Completed drive cycles (switchings / 2). */
  cycles: number;
  /** Largest |v3| (the resonator's top), |v2| (the junction), |v1| and |i1| during the burst. */
  peakVoltage: number;
  peakJunctionVoltage: number;
  peakTankVoltage: number;
  peakPrimaryCurrent: number;
  /** ∫ e i1 dt, J. */
  energyFromSource: number;
  /** ∫ Σ R_k i_k² dt by the trapezoid rule on the steps, J. */
  energyDissipated: number;
  /** Stored energy at the end, J. */
  finalEnergy: number;
  /** First time |v3| reached drive.breakoutVoltage (at the end of that step), s, and the cycles completed by then; null if never. */
  breakoutTime: number | null;
  breakoutCycles: number | null;
}

const STEPS_PER_CYCLE = 256;
const MAX_STEPS = 1_000_000;

/** One RK4 step of the loop equations from y over dt with the bridge at e volts, into out. */
type Stepper = (y: Float64Array, e: number, dt: number, out: Float64Array) => void;

/**
 * One classical RK4 step (Butcher 2008, §23) of the three loop equations with the bridge voltage e
 * in the tank loop: L y'' = e·[1, 0, 0] − R y' − S y, the 2 × 2 inductance block inverted exactly.
 */
function rk4Stepper(circuit: ThreeCoilCircuit, network: LoopNetwork): Stepper {
  const { primaryInductance: l1, driverInductance: l2, mutualInductance: m, resonatorInductance: l3 } = circuit;
  const det = l1 * l2 - m * m;
  const s = network.elastance;
  const r = network.resistance;
  const derivative = (y: Float64Array, e: number, out: Float64Array): void => {
    const a1 = e - r[0] * y[3] - s[0] * y[0];
    const a2 = -r[1] * y[4] - s[4] * y[1] - s[5] * y[2];
    const a3 = -r[2] * y[5] - s[7] * y[1] - s[8] * y[2];
    out[0] = y[3];
    out[1] = y[4];
    out[2] = y[5];
    out[3] = (l2 * a1 - m * a2) / det;
    out[4] = (l1 * a2 - m * a1) / det;
    out[5] = a3 / l3;
  };
  const k1 = new Float64Array(6);
  const k2 = new Float64Array(6);
  const k3 = new Float64Array(6);
  const k4 = new Float64Array(6);
  const work = new Float64Array(6);
  const step = (y: Float64Array, e: number, dt: number, out: Float64Array): void => {
    derivative(y, e, k1);
    for (let c = 0; c < 6; c++) work[c] = y[c] + 0.5 * dt * k1[c];
    derivative(work, e, k2);
    for (let c = 0; c < 6; c++) work[c] = y[c] + 0.5 * dt * k2[c];
    derivative(work, e, k3);
    for (let c = 0; c < 6; c++) work[c] = y[c] + dt * k3[c];
    derivative(work, e, k4);
    for (let c = 0; c < 6; c++) out[c] = y[c] + (dt / 6) * (k1[c] + 2 * k2[c] + 2 * k3[c] + k4[c]);
  };
  return step;
}

/** Largest magnitudes over the burst: resonator top, junction and tank voltages, primary current. */
interface BurstPeaks {
  voltage: number;
  junction: number;
  tank: number;
  current: number;
}

function recordPeaks(peaks: BurstPeaks, state: Float64Array, circuit: ThreeCoilCircuit): void {
  peaks.voltage = Math.max(peaks.voltage, Math.abs(state[2] / circuit.resonatorCapacitance));
  peaks.junction = Math.max(peaks.junction, Math.abs((state[1] - state[2]) / circuit.junctionCapacitance));
  peaks.tank = Math.max(peaks.tank, Math.abs(state[0] / circuit.primaryCapacitance));
  peaks.current = Math.max(peaks.current, Math.abs(state[3]));
}

type StepEvent = 'switch' | 'limit' | 'on_time' | null;

/** The state a step of one drive polarity starts from, with the scratch it uses. */
interface StepFrom {
  step: Stepper;
  y: Float64Array;
  next: Float64Array;
  trial: Float64Array;
  /** The bridge's voltage with its polarity, V. */
  e: number;
  /** +1 or −1: the sign of the primary current the bridge drives. */
  polarity: number;
}

/** Fraction of the step at which `crossed` first holds, by bisection (redoing the step). */
function locateCrossing(from: StepFrom, crossed: (state: Float64Array) => boolean, dt: number): number {
  let low = 0;
  let high = dt;
  for (let iteration = 0; iteration < 40; iteration++) {
    const middle = 0.5 * (low + high);
    from.step(from.y, from.e, middle, from.trial);
    if (crossed(from.trial)) high = middle;
    else low = middle;
  }
  return high;
}

/**
 * One step of at most `h` from `from.y` into `from.next`, cut short at the drive's on time, at the
 * current limit or where the primary current reverses (the bridge switches): its length and event.
 */
function eventStep(
  from: StepFrom,
  h: number,
  time: number,
  drive: BridgeDrive,
  limit: number,
): { dt: number; event: StepEvent } {
  let dt = h;
  let event: StepEvent = null;
  if (drive.onTime !== undefined && time + dt >= drive.onTime) {
    dt = drive.onTime - time;
    event = 'on_time';
  }
  from.step(from.y, from.e, dt, from.next);
  const reversed = (state: Float64Array) => from.polarity * state[3] < 0;
  const overLimit = (state: Float64Array) => Math.abs(state[3]) >= limit;
  if (overLimit(from.next)) {
    dt = locateCrossing(from, overLimit, dt);
    event = 'limit';
  }
  if (reversed(from.next) && time > 0) {
    const at = locateCrossing(from, reversed, dt);
    if (at <= dt) {
      dt = at;
      event = 'switch';
    }
  }
  if (event !== null && event !== 'on_time') from.step(from.y, from.e, dt, from.next);
  return { dt, event };
}

/**
 * Simulates one burst from rest.
 * @returns null when the circuit has no modes (L or S not positive definite)
 */
export function threeCoilBurst(circuit: ThreeCoilCircuit, drive: BridgeDrive): ThreeCoilBurst | null {
  const network = threeCoilNetwork(circuit);
  const omega = losslessLoopFrequencies(network);
  if (!omega) return null;
  const h = (2 * Math.PI) / omega[2] / STEPS_PER_CYCLE;
  const step = rk4Stepper(circuit, network);
  const r = network.resistance;
  const dissipation = (y: Float64Array) => r[0] * y[3] ** 2 + r[1] * y[4] ** 2 + r[2] * y[5] ** 2;

  let y = new Float64Array(6);
  let next = new Float64Array(6);
  const trial = new Float64Array(6);
  let time = 0;
  let polarity = 1;
  let switchings = 0;
  let fromSource = 0;
  let dissipated = 0;
  const peaks: BurstPeaks = { voltage: 0, junction: 0, tank: 0, current: 0 };
  let endReason: BurstEnd = 'step_limit';
  const E = drive.driveVoltage;
  const limit = drive.currentLimit ?? Number.POSITIVE_INFINITY;
  const breakout = drive.breakoutVoltage ?? Number.POSITIVE_INFINITY;
  let breakoutTime: number | null = null;
  let breakoutCycles: number | null = null;
  for (let n = 0; n < MAX_STEPS; n++) {
    const { dt, event } = eventStep({ step, y, next, trial, e: polarity * E, polarity }, h, time, drive, limit);
    fromSource += polarity * E * (next[0] - y[0]);
    dissipated += 0.5 * dt * (dissipation(y) + dissipation(next));
    time += dt;
    [y, next] = [next, y];
    recordPeaks(peaks, y, circuit);
    if (breakoutTime === null && peaks.voltage >= breakout) [breakoutTime, breakoutCycles] = [time, switchings / 2];
    if (event === 'on_time') {
      endReason = 'on_time';
      break;
    }
    if (event === 'limit') {
      endReason = 'current_limit';
      break;
    }
    if (event === 'switch') {
      polarity = -polarity;
      switchings++;
      if (drive.cycles !== undefined && switchings >= 2 * drive.cycles) {
        endReason = 'cycles';
        break;
      }
    }
  }
  return {
    endTime: time,
    endReason,
    cycles: switchings / 2,
    peakVoltage: peaks.voltage,
    peakJunctionVoltage: peaks.junction,
    peakTankVoltage: peaks.tank,
    peakPrimaryCurrent: peaks.current,
    energyFromSource: fromSource,
    energyDissipated: dissipated,
    finalEnergy: loopEnergy(network, y),
    breakoutTime,
    breakoutCycles,
  };
}
