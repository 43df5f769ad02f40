/**
 * The design of one resonant transformer, in SI base units (m, F, H, V, Hz, W, K, rad, Ω).
 *
 * This is what the physics core receives. The CLI parses design files (strings with units) into
 * this shape; the core never sees a unit string. Geometry conventions (as the README states them):
 * the floor is the plane z = 0; `baseHeight` is the bottom of the winding above the floor; the
 * primary is a set of coaxial rings whose diameters are to the conductor's centre line.
 */

/** Enamel insulation build grades of IEC 60317-0-1 (grade 1 thin … grade 3 thick), or bare wire. */
export type InsulationGrade = 'none' | 'grade1' | 'grade2' | 'grade3';

export interface WireSpec {
  /** Bare copper diameter, m. */
  bareDiameter: number;
  /** The AWG number when the wire was given as a gauge (informational). */
  awg?: number;
  /** Insulation build grade; decides the overall diameter unless `overallDiameter` is given. */
  insulation: InsulationGrade;
  /** Overall (insulated) diameter, m, when the builder measured it. */
  overallDiameter?: number;
}

export interface SecondarySpec {
  /** Outside diameter of the coil form, m. The wire's centre line sits at (formDiameter + d)/2. */
  formDiameter: number;
  wire: WireSpec;
  /** Number of turns; with `windingLength` absent, the length follows from pitch × turns. */
  turns?: number;
  /** Axial length of the winding, m; with `turns` absent, turns = windingLength / pitch. */
  windingLength?: number;
  /** Axial distance between turn centres, m. Close-wound (pitch = overall wire diameter) when absent. */
  pitch?: number;
  /** Bottom of the winding above the floor, m. */
  baseHeight: number;
  /**
   * Voltage distribution along the winding: 'computed' (the distributed resonator's fundamental,
   * the default) or an assumed 'linear' or 'quarter_wave' shape with the lumped Thomson frequency.
   */
  voltageProfile: 'computed' | 'linear' | 'quarter_wave';
}

export interface ToroidSpec {
  shape: 'toroid';
  /** Overall outside diameter, m. */
  outerDiameter: number;
  /** Diameter of the tube (minor diameter), m. */
  tubeDiameter: number;
  /** Mid-plane above the top of the winding, m (with a secondary). */
  heightAboveWinding?: number;
  /** Mid-plane above the floor, m (topload alone). */
  centerHeight?: number;
  /** A flat conducting disc filling the hole at the toroid's potential (a breakout point on top stands on it, on the axis). */
  centerDisc?: boolean;
}

export interface SphereSpec {
  shape: 'sphere';
  /** Sphere diameter, m. */
  diameter: number;
  /** Centre above the top of the winding, m (with a secondary). */
  heightAboveWinding?: number;
  /** Centre above the floor, m (topload alone). */
  centerHeight?: number;
}

export type ToploadSpec = ToroidSpec | SphereSpec;

export interface PrimarySpec {
  shape: 'flat_spiral' | 'helix' | 'cone';
  /** Diameter of the innermost ring, to the conductor's centre line, m. */
  innerDiameter: number;
  /** Number of rings available (may be fractional: the last ring is partial). */
  turns: number;
  /** Conductor (tube or wire) diameter, m. */
  conductorDiameter: number;
  /** Gap between neighbouring conductors, m; pitch = conductorDiameter + turnSpacing. */
  turnSpacing: number;
  /** Height of the innermost ring above the secondary's bottom turn, m. */
  elevation: number;
  /** Cone angle above the horizontal, rad (cone only). */
  coneAngle?: number;
  /** A fixed tap (turns from the inner end); when absent the tap is chosen to tune. */
  tapTurns?: number;
  /** false keeps designs whose tank cannot tune to the secondary (a warning instead of infeasible). */
  requireTuning?: boolean;
  /** Conductor material resistivity at 20 °C, Ω·m (copper tube by default). */
  resistivity?: number;
}

export interface StrikeRailSpec {
  /** Diameter of the grounded ring's centre line, m. */
  diameter: number;
  /** Conductor diameter, m. */
  conductorDiameter: number;
  /** Height above the secondary's bottom turn, m (same datum as the primary's elevation). */
  elevation: number;
}

export interface TankSpec {
  /** Tank (primary) capacitance, F. */
  capacitance: number;
  /** Voltage the capacitor is charged to before each shot (spark gap), V. */
  chargeVoltage?: number;
  /** DC voltage rating of the capacitor bank, V (optional check). */
  voltageRating?: number;
}

export interface SparkGapDriver {
  kind: 'spark_gap';
  gap: 'static' | 'rotary';
  /** Firings per second, Hz. */
  breakRate: number;
  /** Equivalent resistance of the conducting gap, Ω (common practice ≈ 1 Ω). */
  gapResistance?: number;
  /** Whether the gap quenches at the first primary current zero after the first transfer. */
  quench: boolean;
}

export interface SolidStateDriver {
  kind: 'solid_state';
  bridge: 'full' | 'half';
  /** DC bus voltage, V. */
  busVoltage: number;
  /** Primary peak current limit, A. */
  currentLimit?: number;
  /** Length of one burst, s. */
  onTime?: number;
  /** Length of one burst in drive cycles (alternative to onTime). */
  cycles?: number;
  /** Bursts per second, Hz. */
  repetitionRate: number;
}

export type DriverSpec = SparkGapDriver | SolidStateDriver;

export interface EnvironmentSpec {
  /** Altitude above sea level, m (standard atmosphere for the air density). */
  altitude: number;
  /** Air temperature, K. */
  temperature: number;
  /** Peek's surface (irregularity) factor m, 1 for polished. */
  surfaceFactor?: number;
  /** Streamer length assumed for loading the topload, m (0: unloaded). */
  streamerLength?: number;
}

/** The supply transformer that charges the tank (spark-gap drivers), SI. */
export interface SupplySpec {
  /** current_limited: its rated current is its short-circuit current; ballasted: a stiff transformer behind a ballast. */
  kind: 'current_limited' | 'ballasted';
  /** Rated output voltage, V rms. */
  voltage: number;
  /** Rated output current, A rms (or give power). */
  current?: number;
  /** Rated output, VA (current = power / voltage when current is absent). */
  power?: number;
  /** Mains frequency, Hz. */
  frequency: number;
  /** Impedance of the ballast, Ω (ballasted only): short-circuit current = voltage / impedance. */
  ballastImpedance?: number;
}

/** A tank capacitor built from identical parts, SI. */
export interface TankBankSpec {
  partCapacitance: number;
  partVoltageRating: number;
  partRmsCurrentRating: number;
  partPeakCurrentRating?: number;
  /** Parts in series per string; chosen from the working voltage when absent. */
  series?: number;
  /** Strings in parallel; chosen from the target capacitance when absent. */
  parallel?: number;
  /** Part rating over its working voltage (default 2, common practice). */
  voltageMargin: number;
  /** Time in which the bleeders bring the bank below 50 V, s. */
  bleedTime: number;
}

/** A safety gap across the tank, set to fire at a multiple of the charge voltage, SI. */
export interface SafetyGapSpec {
  electrodes: 'sphere' | 'rounded';
  /** Sphere diameter, m (spheres). */
  sphereDiameter?: number;
  /** Firing voltage over the charge voltage. */
  fireAt: number;
}

/**
 * A separate resonator (a three-coil system): a second winding standing on the floor beside the
 * driven secondary, carrying the topload, fed at its base from the top of the driven secondary
 * through a connecting line.
 */
export interface ResonatorSpec {
  /** The resonator's winding, as a secondary (its own form, wire, turns or length, base height). */
  winding: SecondarySpec;
  /** The connecting line from the driver's top to the resonator's base. */
  line: {
    /** Length of the line, m. */
    length: number;
    /** Diameter of the line's round conductor, m. */
    conductorDiameter: number;
    /** Height of the line above the floor, m. */
    height: number;
  };
  /** Distance between the driver's and the resonator's axes that the floor space allows, m (the line length when absent). */
  axisSpacing?: number;
}

/**
 * A breakout point: a round rod with a hemispherical tip standing out of the topload, so that the
 * discharge starts there (core/electrostatics/breakout-rod.ts). Exactly one of `length`,
 * `fireAtVoltage` and `fireAtFraction` sizes it.
 */
export interface BreakoutPointSpec {
  /** 'top': the top of the topload (a sphere's pole, on the axis; a toroid's crown), pointing up;
   * 'rim': the outer equator, pointing outward. */
  position: 'top' | 'rim';
  /** Radius of the hemispherical tip (and of the rod), m. */
  tipRadius: number;
  /** Height of the rod from the topload's surface to its apex, m. */
  length?: number;
  /** Top voltage at which the point is to fire, V (the length is solved for). */
  fireAtVoltage?: number;
  /** The same as a fraction of the bare topload's breakout voltage (the length is solved for). */
  fireAtFraction?: number;
}

/**
 * Insulating supports of the topload (their permittivity ignored: the field along them is that of
 * the solved charges). A central column on the axis from the floor or from the top of the winding
 * up to the topload, or `count` straight rods, each in a meridian plane between two points.
 */
export type SupportSpec =
  | {
      kind: 'column';
      from: 'floor' | 'winding_top';
      /** Column diameter, m (the field is sampled on its surface). */
      diameter: number;
      /** Largest surface field allowed along the support, V/m (common practice default). */
      fieldLimit?: number;
    }
  | {
      kind: 'rods';
      /** Rods spaced evenly around the axis (each sees the same axisymmetric field). */
      count: number;
      diameter: number;
      /** First end: radius from the axis and height above the floor, m. */
      fromRadius: number;
      fromHeight: number;
      /** Second end, m. */
      toRadius: number;
      toHeight: number;
      fieldLimit?: number;
    };

export interface Design {
  supply?: SupplySpec;
  tankBank?: TankBankSpec;
  safetyGap?: SafetyGapSpec;
  secondary?: SecondarySpec;
  topload?: ToploadSpec;
  primary?: PrimarySpec;
  strikeRail?: StrikeRailSpec;
  tank?: TankSpec;
  driver?: DriverSpec;
  /** A separate resonator carrying the topload (three-coil system). */
  resonator?: ResonatorSpec;
  environment: EnvironmentSpec;
  breakoutPoint?: BreakoutPointSpec;
  support?: SupportSpec;
}

/** Standard environment when a design gives none: sea level, 20 °C (the stages choose their own
 * defaults for the surface factor and the streamer length when those are absent). */
export const DEFAULT_ENVIRONMENT: EnvironmentSpec = {
  altitude: 0,
  temperature: 293.15,
};
