/**
 * The working record of one evaluation. Stages (core/stages/) run in order; each reads what the
 * earlier ones left here and adds its metrics, warnings and intermediate results. A stage never
 * throws for a physically impossible design: it pushes a `DesignProblem` naming the field and the
 * reason, and the later stages see `problems.length > 0` and skip what they cannot compute.
 */
import type { Design } from './design.ts';
import type { Metrics } from './metrics.ts';
import type { DesignWarning } from './outcome/warnings.ts';

import type { DistributedWinding } from './resonator/design-resonator.ts';
import type { CoupledCircuit } from './dynamics/circuit.ts';
import type { SparkGapShot } from './dynamics/spark-gap.ts';
import type { BankLayout } from './tank/bank.ts';

/** A reason why a design cannot be built as given (an infeasible candidate, exit 2 in evaluate). */
export interface DesignProblem {
  /** Field path in the design file's own names, e.g. 'primary.inner_diameter'. */
  field: string;
  /** One-line reason, e.g. 'the innermost ring (110 mm) lies inside the secondary form (160 mm)'. */
  reason: string;
}

/** Geometry of the secondary winding, SI. */
export interface SecondaryGeometry {
  turns: number;
  /** Axial distance between turn centres, m. */
  pitch: number;
  /** turns × pitch, m (current-sheet length). */
  windingLength: number;
  /** Radius of the wire's centre line, m: (form diameter + overall wire diameter) / 2. */
  radius: number;
  /** Bare copper diameter, m. */
  bareDiameter: number;
  /** Insulated diameter, m. */
  overallDiameter: number;
  /** Height of the bottom of the winding above the floor, m. */
  bottomZ: number;
  /** Height of the top of the winding above the floor, m. */
  topZ: number;
  /** Low-frequency inductance, H. */
  inductance: number;
  /** DC resistance at the environment temperature, Ω. */
  dcResistance: number;
  /** Wire length, m. */
  wireLength: number;
}

/** One coaxial ring of the primary (or any grounded ring), SI; z above the floor. */
export interface Ring {
  r: number;
  z: number;
}

/** Geometry of the primary, SI. */
export interface PrimaryGeometry {
  /** Rings from the inner end outward; z above the floor. */
  rings: Ring[];
  /** Radius of the primary conductor (tube or wire), m. */
  conductorRadius: number;
  /** The tap used (turns from the inner end), possibly fractional. */
  tapTurns: number;
  /** Inductance at that tap, H. */
  inductance: number;
  /** Mutual inductance to the secondary at that tap, H (null without a secondary). */
  mutual: number | null;
  /** Conductor length of the tapped part, m. */
  conductorLength: number;
}

/** What the field solve leaves for later stages, SI. */
export interface ElectrostaticSolution {
  /** Energy-based capacitance at the top of the winding, F. */
  totalCapacitance: number;
  /** Topload charge per volt, F. */
  toploadCapacitance: number | null;
  /** Peak topload surface field per volt at the top, 1/m. */
  toploadFieldPerVolt: number | null;
  /** Corona-onset surface field, V/m. */
  onsetField: number | null;
  /** Breakout voltage at the top of the winding, V. */
  breakoutVoltage: number | null;
  /** Top voltage at which the breakout point fires, V (absent without one). */
  breakoutPointVoltage?: number | null;
  /** Largest field along the support per volt and its limit, V/m (absent without supports). */
  support?: { peakPerVolt: number; limit: number } | null;
}

export interface EvalContext {
  readonly design: Design;
  readonly metrics: Metrics;
  readonly warnings: DesignWarning[];
  readonly problems: DesignProblem[];
  secondary?: SecondaryGeometry;
  primary?: PrimaryGeometry;
  electrostatics?: ElectrostaticSolution;
  /** The distributed model of the winding, with the computed profile (core/resonator/design-resonator.ts). */
  resonator?: DistributedWinding;
  /** The lumped circuit the dynamics simulated (core/stages/dynamics-stage.ts). */
  circuit?: CoupledCircuit;
  /** The spark-gap shot and its charge voltage, V (spark-gap drivers). */
  sparkShot?: { shot: SparkGapShot; chargeVoltage: number };
  /** Peak tank voltage of a solid-state burst, V. */
  burstPeakTankVoltage?: number;
  /** Peak tank current of a solid-state burst, A, and ∫ i1² dt over it, A²·s. */
  burstPeakTankCurrent?: number;
  burstTankCurrentSquared?: number;
  /** The tank bank's layout, when the design builds its tank from parts (core/stages/tank-stage.ts). */
  tankBank?: BankLayout & { workingVoltage: number };
  /** A separate resonator and its line (three-coil systems, core/stages/resonator-stage.ts). */
  threeCoil?: ThreeCoilParts;
}

/** The resonator of a three-coil system and its line, SI. */
export interface ThreeCoilParts {
  /** The resonator's winding (as a secondary, on the floor beside the driver). */
  winding: SecondaryGeometry;
  /** Its distributed model (the computed profile), with the topload. */
  distributed: DistributedWinding | undefined;
  /** Effective inductance and capacitance of the resonator at its top, H and F. */
  inductance: number;
  capacitance: number;
  /** Its fundamental, Hz. */
  frequency: number;
  /** Steepest |dV/dz| along the resonator per volt at its top, 1/m. */
  gradientPerVolt: number;
  /** Line capacitance to the floor and series inductance, F and H. */
  lineCapacitance: number;
  lineInductance: number;
  /** The driver's own top capacitance (winding alone) and the junction total with the line, F. */
  driverCapacitance: number;
  junctionCapacitance: number;
  /** The axis distance the floor gives, m. */
  axisSpacing: number;
}
