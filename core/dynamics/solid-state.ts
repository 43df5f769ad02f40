/**
 * One burst of a solid-state bridge driving the tank circuit (a double-resonant drive).
 *
 * The bridge puts a square wave e(t) = ±E in series with the primary loop (E = bus voltage for a
 * full bridge, half of it for a half bridge) and switches at each zero of the primary current, so
 * e always has the sign of i1: the drive follows the circuit's own resonance, as current-feedback
 * drivers do (common practice [C]). The burst ends at the on-time, after the given number of drive
 * cycles, or when |i1| reaches the current limit, whichever comes first; the bridge then stops.
 *
 * Between switchings the circuit (circuit.ts) is linear with a constant source, so a full step of
 * length h = 1/256 of the upper mode's period is taken exactly: y ← Φ y + e Γ with Φ = exp(A h/2)
 * and Γ = ∫₀^{h/2} exp(Aτ) dτ · b applied twice (matrix exponential by its Taylor series in
 * energy-scaled coordinates, where ‖A h/2‖ ≈ 0.013, to degree 14: Moler & Van Loan, "Nineteen
 * dubious ways to compute the exponential of a matrix", SIAM Review 45(1), 2003, method 1). The
 * step that contains a switching instant or the current-limit instant is redone by the classical
 * fourth-order Runge–Kutta method (Butcher, Numerical Methods for Ordinary Differential
 * Equations, 2008, §23) up to the event, located by regula falsi, so that no step straddles a
 * change of e. The dissipated energy is integrated by Simpson's rule on the half steps.
 */
import type { CoupledCircuit } from './circuit.ts';
import { losslessModeFrequencies } from './circuit.ts';

/** The bridge, SI. */
export interface BridgeDrive {
  /** Amplitude E of the square wave across the primary loop, V. */
  driveVoltage: number;
  /** Peak primary current at which the burst is cut, A (none: unlimited). */
  currentLimit?: number;
  /** Burst length, s. */
  onTime?: number;
  /** Burst length in drive cycles (two switchings each). */
  cycles?: number;
  /**
   * Secondary voltage at which the topload breaks out, V: the burst is not cut there (the peak is
   * what the secondary would reach if the topload held), but the first time it is reached is reported.
   */
  breakoutVoltage?: number;
}

export type BurstEnd = 'on_time' | 'cycles' | 'current_limit' | 'step_limit';

/** What one burst does, SI. */
export interface SolidStateBurst {
  /** When the burst ended, s, and why. */
  endTime: number;
  endReason: BurstEnd;
  /** Completed drive cycles (switchings / 2). */
  cycles: number;
  /** Largest |v2| during the burst, V. */
  peakVoltage: number;
  /** Largest |i1| and |v1| during the burst, A and V. */
  peakPrimaryCurrent: number;
  peakTankVoltage: number;
  /** Energy drawn from the supply, ∫ e·i1 dt, J. */
  energyFromSource: number;
  /** ∫ i1² dt over the burst, A²·s (trapezoidal rule over the steps), for the rms tank current. */
  primaryCurrentSquared: number;
  /** Energy dissipated in R1 and R2, ∫ (R1 i1² + R2 i2²) dt, J. */
  energyDissipated: number;
  /** State [v1, v2, i1, i2] at the end. */
  finalState: Float64Array;
  /** First time |v2| reached drive.breakoutVoltage (to within one step), s, and the cycles completed by then; null if never. */
  breakoutTime: number | null;
  breakoutCycles: number | null;
}

/** Steps per period of the upper normal mode. */
export const STEPS_PER_CYCLE = 256;
/** Upper bound on integration steps (≈ 4000 cycles). */
const MAX_STEPS = 1_000_000;

/**
 * One accepted step of the burst, for an observer of the computed waveform: the state
 * [v1, v2, i1, i2, W_R] at its start and end, its length, s, and the source e across the primary loop, V.
 * The arrays are the integrator's own: copy what is kept.
 */
export type BurstStepObserver = (from: Float64Array, to: Float64Array, length: number, source: number) => void;

/** The running sums and extremes of a burst (SolidStateBurst's fields, as they build up). */
interface BurstTally {
  time: number;
  switchings: number;
  energyFromSource: number;
  currentSquared: number;
  peakVoltage: number;
  peakPrimaryCurrent: number;
  peakTankVoltage: number;
  breakoutTime: number | null;
  breakoutCycles: number | null;
}

function emptyTally(): BurstTally {
  return {
    time: 0,
    switchings: 0,
    energyFromSource: 0,
    currentSquared: 0,
    peakVoltage: 0,
    peakPrimaryCurrent: 0,
    peakTankVoltage: 0,
    breakoutTime: null,
    breakoutCycles: null,
  };
}

/** The burst as reported, from its tally, why it ended and the final state (with W_R). */
function burstOutcome(tally: BurstTally, endReason: BurstEnd, state: Float64Array): SolidStateBurst {
  return {
    endTime: tally.time,
    endReason,
    cycles: tally.switchings / 2,
    peakVoltage: tally.peakVoltage,
    peakPrimaryCurrent: tally.peakPrimaryCurrent,
    peakTankVoltage: tally.peakTankVoltage,
    energyFromSource: tally.energyFromSource,
    primaryCurrentSquared: tally.currentSquared,
    energyDissipated: state[4],
    finalState: state.slice(0, 4),
    breakoutTime: tally.breakoutTime,
    breakoutCycles: tally.breakoutCycles,
  };
}

/**
 * Simulates one burst from rest (all voltages and currents zero).
 * @param circuit lumped values, SI (C1 is the tank capacitor in series with the bridge)
 * @param drive the bridge
 * @param observe called with every accepted step (the computed waveform); it changes nothing
 * Needs onTime or cycles (else the burst runs to the step limit). Cost: 256 RK4 steps per cycle.
 */
export function solidStateBurst(
  circuit: CoupledCircuit,
  drive: BridgeDrive,
  observe?: BurstStepObserver,
): SolidStateBurst {
  const [, omegaHigh] = losslessModeFrequencies(circuit);
  const step = (2 * Math.PI) / omegaHigh / STEPS_PER_CYCLE;
  const constants = stepConstants(circuit);
  const propagator = halfStepPropagator(circuit, constants, step / 2);
  const middle = new Float64Array(5);
  const state = new Float64Array(5); // v1, v2, i1, i2, dissipated energy
  const trial = new Float64Array(5);
  const onTime = drive.onTime ?? Infinity;
  const switchLimit = drive.cycles === undefined ? Infinity : 2 * drive.cycles;
  const currentLimit = drive.currentLimit ?? Infinity;
  const tally = emptyTally();
  const accept = (fraction: number, length: number, source: number, midpoint: Float64Array | null): void =>
    acceptStep(
      tally,
      circuit.primaryCapacitance,
      drive.breakoutVoltage ?? Infinity,
      state,
      trial,
      fraction,
      length,
      source,
      midpoint,
      observe,
    );
  let polarity = 1;
  let endReason: BurstEnd = 'step_limit';

  for (let n = 0; n < MAX_STEPS; n++) {
    const remaining = onTime - tally.time;
    if (remaining <= 0) {
      endReason = 'on_time';
      break;
    }
    const source = polarity * drive.driveVoltage;
    const full = remaining >= step;
    const length = full ? step : remaining;
    if (full) exactStep(propagator, constants, source, state, middle, trial);
    else rungeKuttaStep(constants, source, state, trial, length);
    const overLimit = Math.abs(trial[2]) >= currentLimit;
    const reversed = n > 0 && polarity * trial[2] < 0;
    if (!overLimit && !reversed) {
      // the common case: no event inside the step
      accept(1, length, source, full ? middle : null);
      if (!full) {
        endReason = 'on_time';
        break;
      }
      continue;
    }
    // An event inside the step: redo it by RK4 up to the earlier of the two.
    const advance = (from: Float64Array, to: Float64Array, part: number): void =>
      rungeKuttaStep(constants, source, from, to, part);
    if (!full) rungeKuttaStep(constants, source, state, trial, length);
    const limitFraction = overLimit
      ? locate(state, trial, length, (x) => Math.abs(x[2]) - currentLimit, advance)
      : Infinity;
    const reverseFraction = reversed ? locate(state, trial, length, (x) => polarity * x[2], advance) : Infinity;
    const fraction = Math.min(limitFraction, reverseFraction);
    advance(state, trial, fraction * length);
    accept(fraction, length, source, null);
    if (limitFraction <= reverseFraction) {
      endReason = 'current_limit';
      break;
    }
    polarity = -polarity;
    tally.switchings++;
    if (tally.switchings >= switchLimit) {
      endReason = 'cycles';
      break;
    }
  }
  return burstOutcome(tally, endReason, state);
}

/**
 * Takes the step from `state` to `trial` (fraction × length long): the source's energy
 * e·C1·Δv1, ∫ i1² dt by the trapezoidal rule, the extremes (|v2| also at the midpoint of an exact
 * step), the time and the first breakout; then `state` becomes `trial`.
 */
function acceptStep(
  tally: BurstTally,
  tankCapacitance: number,
  breakoutVoltage: number,
  state: Float64Array,
  trial: Float64Array,
  fraction: number,
  length: number,
  source: number,
  midpoint: Float64Array | null,
  observe: BurstStepObserver | undefined,
): void {
  tally.energyFromSource += source * tankCapacitance * (trial[0] - state[0]);
  tally.currentSquared += 0.5 * (state[2] * state[2] + trial[2] * trial[2]) * fraction * length;
  if (midpoint) tally.peakVoltage = Math.max(tally.peakVoltage, Math.abs(midpoint[1]));
  observe?.(state, trial, fraction * length, source);
  state.set(trial);
  tally.peakVoltage = Math.max(tally.peakVoltage, Math.abs(state[1]));
  tally.peakPrimaryCurrent = Math.max(tally.peakPrimaryCurrent, Math.abs(state[2]));
  tally.peakTankVoltage = Math.max(tally.peakTankVoltage, Math.abs(state[0]));
  tally.time += fraction * length;
  if (tally.breakoutTime === null && tally.peakVoltage >= breakoutVoltage) {
    tally.breakoutTime = tally.time;
    tally.breakoutCycles = tally.switchings / 2;
  }
}

/**
 * Fraction θ ∈ (0, 1] of a step at which g(state) reaches zero, by secant iteration on θ
 * (g(start) has the opposite sign of g(end)); refines to ~1e-12 of the step.
 */
function locate(
  start: Float64Array,
  end: Float64Array,
  length: number,
  g: (s: Float64Array) => number,
  advance: (from: Float64Array, to: Float64Array, length: number) => void,
): number {
  const probe = new Float64Array(5);
  let lowFraction = 0;
  let lowValue = g(start);
  let highFraction = 1;
  let highValue = g(end);
  if (lowValue === 0) return 0;
  let fraction = 1;
  for (let iteration = 0; iteration < 30; iteration++) {
    // regula falsi with the Illinois modification
    fraction = lowFraction - (lowValue * (highFraction - lowFraction)) / (highValue - lowValue);
    advance(start, probe, fraction * length);
    const value = g(probe);
    if (Math.abs(value) === 0 || highFraction - lowFraction < 1e-12) break;
    if (Math.sign(value) === Math.sign(lowValue)) {
      lowFraction = fraction;
      lowValue = value;
      highValue /= 2;
    } else {
      highFraction = fraction;
      highValue = value;
      lowValue /= 2;
    }
    if (Math.abs(value) < 1e-13 * (Math.abs(g(start)) + Math.abs(g(end)))) break;
  }
  return fraction;
}

/** Φ = exp(A τ) (row-major 4×4) and Γ = ∫₀^τ exp(A s) ds · b for a unit source, in circuit units. */
interface Propagator {
  transition: Float64Array;
  forcing: Float64Array;
  length: number;
}

/**
 * The exact propagator of the source-driven loop equations over a time τ, dy/dt = A y + b e:
 * Taylor series of exp(Aτ) and of its integral, in coordinates scaled by √C and √L (energy
 * units), where every entry of Aτ is about ω τ or smaller.
 */
function halfStepPropagator(circuit: CoupledCircuit, k: StepConstants, length: number): Propagator {
  const scale = [
    Math.sqrt(circuit.primaryCapacitance),
    Math.sqrt(circuit.secondaryCapacitance),
    Math.sqrt(circuit.primaryInductance),
    Math.sqrt(circuit.secondaryInductance),
  ];
  // A in circuit units, row-major: y = [v1, v2, i1, i2]
  const a = [
    0,
    0,
    k.inverseC1,
    0,
    0,
    0,
    0,
    k.inverseC2,
    -k.g11,
    -k.g12,
    -k.g11 * k.r1,
    -k.g12 * k.r2,
    -k.g12,
    -k.g22,
    -k.g12 * k.r1,
    -k.g22 * k.r2,
  ];
  const b = [0, 0, k.g11, k.g12];
  // scaled: A' = S A S⁻¹ τ, b' = S b τ
  const scaled = new Float64Array(16);
  for (let r = 0; r < 4; r++)
    for (let c = 0; c < 4; c++) scaled[r * 4 + c] = (scale[r] * a[r * 4 + c] * length) / scale[c];
  const scaledForcing = b.map((value, r) => scale[r] * value * length);
  // exp(A') = Σ A'^n/n!, Γ' = Σ A'^n b'/(n+1)!
  const transition = new Float64Array(16);
  const forcing = new Float64Array(4);
  let power: Float64Array = new Float64Array(16);
  for (let d = 0; d < 4; d++) power[d * 5] = 1;
  let vector: Float64Array = Float64Array.from(scaledForcing);
  let factorial = 1;
  for (let n = 0; n <= 14; n++) {
    if (n > 0) factorial *= n;
    for (let e = 0; e < 16; e++) transition[e] += power[e] / factorial;
    for (let r = 0; r < 4; r++) forcing[r] += vector[r] / (factorial * (n + 1));
    power = multiply(scaled, power);
    vector = multiplyVector(scaled, vector);
  }
  // back to circuit units: Φ = S⁻¹ Φ' S, Γ = S⁻¹ Γ'
  for (let r = 0; r < 4; r++) {
    for (let c = 0; c < 4; c++) transition[r * 4 + c] = (transition[r * 4 + c] * scale[c]) / scale[r];
    forcing[r] /= scale[r];
  }
  return { transition, forcing, length };
}

function multiply(left: Float64Array, right: Float64Array): Float64Array {
  const out = new Float64Array(16);
  for (let r = 0; r < 4; r++)
    for (let c = 0; c < 4; c++) {
      let sum = 0;
      for (let m = 0; m < 4; m++) sum += left[r * 4 + m] * right[m * 4 + c];
      out[r * 4 + c] = sum;
    }
  return out;
}

function multiplyVector(matrix: Float64Array, vector: Float64Array): Float64Array {
  const out = new Float64Array(4);
  for (let r = 0; r < 4; r++)
    out[r] =
      matrix[r * 4] * vector[0] +
      matrix[r * 4 + 1] * vector[1] +
      matrix[r * 4 + 2] * vector[2] +
      matrix[r * 4 + 3] * vector[3];
  return out;
}

/** Two exact half steps with source e; the dissipated energy by Simpson's rule on the three points. */
function exactStep(
  p: Propagator,
  k: StepConstants,
  source: number,
  from: Float64Array,
  middle: Float64Array,
  to: Float64Array,
): void {
  applyPropagator(p, source, from, middle);
  applyPropagator(p, source, middle, to);
  const powerStart = k.r1 * from[2] * from[2] + k.r2 * from[3] * from[3];
  const powerMiddle = k.r1 * middle[2] * middle[2] + k.r2 * middle[3] * middle[3];
  const powerEnd = k.r1 * to[2] * to[2] + k.r2 * to[3] * to[3];
  middle[4] = from[4];
  to[4] = from[4] + ((2 * p.length) / 6) * (powerStart + 4 * powerMiddle + powerEnd);
}

function applyPropagator(p: Propagator, source: number, from: Float64Array, to: Float64Array): void {
  const t = p.transition;
  const v1 = from[0],
    v2 = from[1],
    i1 = from[2],
    i2 = from[3];
  to[0] = t[0] * v1 + t[1] * v2 + t[2] * i1 + t[3] * i2 + source * p.forcing[0];
  to[1] = t[4] * v1 + t[5] * v2 + t[6] * i1 + t[7] * i2 + source * p.forcing[1];
  to[2] = t[8] * v1 + t[9] * v2 + t[10] * i1 + t[11] * i2 + source * p.forcing[2];
  to[3] = t[12] * v1 + t[13] * v2 + t[14] * i1 + t[15] * i2 + source * p.forcing[3];
}

/** The circuit's constants in the form the integrator uses: 1/C and the inverse inductance matrix. */
interface StepConstants {
  inverseC1: number;
  inverseC2: number;
  r1: number;
  r2: number;
  /** (L⁻¹) entries: [[g11, g12], [g12, g22]] = [[L2, −M], [−M, L1]] / (L1L2 − M²) */
  g11: number;
  g12: number;
  g22: number;
}

function stepConstants(circuit: CoupledCircuit): StepConstants {
  const determinant = circuit.primaryInductance * circuit.secondaryInductance - circuit.mutualInductance ** 2;
  return {
    inverseC1: 1 / circuit.primaryCapacitance,
    inverseC2: 1 / circuit.secondaryCapacitance,
    r1: circuit.primaryResistance,
    r2: circuit.secondaryResistance,
    g11: circuit.secondaryInductance / determinant,
    g12: -circuit.mutualInductance / determinant,
    g22: circuit.primaryInductance / determinant,
  };
}

/**
 * One classical RK4 step (Butcher 2008, §23) of the loop equations (circuit.ts) with a constant
 * source e in the primary loop; state [v1, v2, i1, i2, W_R], W_R = ∫(R1 i1² + R2 i2²) dt.
 */
function rungeKuttaStep(k: StepConstants, source: number, from: Float64Array, to: Float64Array, h: number): void {
  const { inverseC1, inverseC2, r1, r2, g11, g12, g22 } = k;
  const v1 = from[0],
    v2 = from[1],
    i1 = from[2],
    i2 = from[3];
  // stage 1
  let a1 = source - r1 * i1 - v1;
  let a2 = -r2 * i2 - v2;
  const dv1a = i1 * inverseC1,
    dv2a = i2 * inverseC2;
  const di1a = g11 * a1 + g12 * a2,
    di2a = g12 * a1 + g22 * a2;
  const pa = r1 * i1 * i1 + r2 * i2 * i2;
  // stage 2
  let sv1 = v1 + 0.5 * h * dv1a,
    sv2 = v2 + 0.5 * h * dv2a,
    si1 = i1 + 0.5 * h * di1a,
    si2 = i2 + 0.5 * h * di2a;
  a1 = source - r1 * si1 - sv1;
  a2 = -r2 * si2 - sv2;
  const dv1b = si1 * inverseC1,
    dv2b = si2 * inverseC2;
  const di1b = g11 * a1 + g12 * a2,
    di2b = g12 * a1 + g22 * a2;
  const pb = r1 * si1 * si1 + r2 * si2 * si2;
  // stage 3
  sv1 = v1 + 0.5 * h * dv1b;
  sv2 = v2 + 0.5 * h * dv2b;
  si1 = i1 + 0.5 * h * di1b;
  si2 = i2 + 0.5 * h * di2b;
  a1 = source - r1 * si1 - sv1;
  a2 = -r2 * si2 - sv2;
  const dv1c = si1 * inverseC1,
    dv2c = si2 * inverseC2;
  const di1c = g11 * a1 + g12 * a2,
    di2c = g12 * a1 + g22 * a2;
  const pc = r1 * si1 * si1 + r2 * si2 * si2;
  // stage 4
  sv1 = v1 + h * dv1c;
  sv2 = v2 + h * dv2c;
  si1 = i1 + h * di1c;
  si2 = i2 + h * di2c;
  a1 = source - r1 * si1 - sv1;
  a2 = -r2 * si2 - sv2;
  const dv1d = si1 * inverseC1,
    dv2d = si2 * inverseC2;
  const di1d = g11 * a1 + g12 * a2,
    di2d = g12 * a1 + g22 * a2;
  const pd = r1 * si1 * si1 + r2 * si2 * si2;
  const sixth = h / 6;
  to[0] = v1 + sixth * (dv1a + 2 * dv1b + 2 * dv1c + dv1d);
  to[1] = v2 + sixth * (dv2a + 2 * dv2b + 2 * dv2c + dv2d);
  to[2] = i1 + sixth * (di1a + 2 * di1b + 2 * di1c + di1d);
  to[3] = i2 + sixth * (di2a + 2 * di2b + 2 * di2c + di2d);
  to[4] = from[4] + sixth * (pa + 2 * pb + 2 * pc + pd);
}
