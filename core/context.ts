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
}
