/**
 * From a normal tree (SI numbers, field names of the file) to the physics core's `Design`, with the
 * checks that involve more than one field. Every problem is an FieldIssue naming the field.
 */
import type { Design, DriverSpec, InsulationGrade, PrimarySpec, ToploadSpec, WireSpec } from '../core/design.ts';
import { DEFAULT_ENVIRONMENT } from '../core/design.ts';
import { awgDiameter } from '../core/wire/awg.ts';
import {
  isSlot,
  type DimensionSlot,
  type LeafValue,
  type NormalSection,
  type NormalTree,
  type WireValue,
} from './design-tree.ts';
import { must } from '../core/must.ts';

/** One problem with a design's fields: the path in the file's names and a one-line reason. */
export interface FieldIssue {
  path: ReadonlyArray<string | number>;
  message: string;
  /** True when the problem depends on the values (a sweep marks that design infeasible), false when
   * the fields given cannot make a design at all (the sweep file is refused). */
  byValue?: boolean;
}

const GRADES: Record<string, InsulationGrade> = {
  grade_1: 'grade1',
  grade_2: 'grade2',
  grade_3: 'grade3',
  none: 'none',
};

function num(section: NormalSection, key: string): number | undefined {
  const value = section[key];
  return typeof value === 'number' ? value : undefined;
}

function text(section: NormalSection, key: string): string | undefined {
  const value = section[key];
  return typeof value === 'string' ? value : undefined;
}

function section(tree: NormalTree, name: string): NormalSection | undefined {
  const value = tree[name];
  if (value === undefined) return undefined;
  if (isSlot(value)) throw new Error(`section ${name} still holds a sweep slot`);
  for (const leaf of Object.values(value)) {
    if (isSlot(leaf)) throw new Error(`section ${name} still holds a sweep slot`);
  }
  return value;
}

function wireSpec(value: LeafValue | DimensionSlot | undefined, secondary: NormalSection): WireSpec {
  const wire = value as WireValue;
  const insulation = GRADES[text(secondary, 'insulation') ?? 'grade_2'];
  const overall = num(secondary, 'wire_overall_diameter');
  const spec: WireSpec =
    'awg' in wire
      ? { bareDiameter: awgDiameter(wire.awg), awg: wire.awg, insulation }
      : { bareDiameter: wire.bareDiameter, insulation };
  if (overall !== undefined) spec.overallDiameter = overall;
  return spec;
}

export interface DesignBuild {
  design: Design | null;
  issues: FieldIssue[];
}

/**
 * Builds the SI design from a normal tree without sweep slots.
 * @param basePath prefix of field paths in messages (['design'] for sweep files)
 */
export function buildDesign(tree: NormalTree, basePath: string[] = []): DesignBuild {
  const issues: FieldIssue[] = [];
  const at = (...path: string[]) => [...basePath, ...path];
  const design: Design = { environment: { ...DEFAULT_ENVIRONMENT } };

  const secondary = section(tree, 'secondary');
  if (secondary) {
    const turns = num(secondary, 'turns');
    const windingLength = num(secondary, 'winding_length');
    const pitch = num(secondary, 'pitch');
    if (turns === undefined && windingLength === undefined) {
      issues.push({ path: at('secondary', 'turns'), message: 'required: give turns or winding_length' });
    } else if (turns !== undefined && windingLength !== undefined && pitch !== undefined) {
      issues.push({
        path: at('secondary', 'pitch'),
        message: 'give two of turns, winding_length and pitch, not all three',
      });
    }
    const wire = wireSpec(secondary.wire, secondary);
    const spec: Design['secondary'] = {
      formDiameter: must(num(secondary, 'form_diameter')),
      wire,
      baseHeight: num(secondary, 'base_height') ?? 0,
      voltageProfile: (text(secondary, 'voltage_profile') ?? 'computed') as 'computed' | 'linear' | 'quarter_wave',
    };
    if (turns !== undefined) spec.turns = turns;
    if (windingLength !== undefined) spec.windingLength = windingLength;
    // With turns and winding_length both given, the secondary stage derives the pitch.
    if (pitch !== undefined) spec.pitch = pitch;
    if (wire.overallDiameter !== undefined && wire.overallDiameter < wire.bareDiameter) {
      issues.push({
        path: at('secondary', 'wire_overall_diameter'),
        message: 'the insulated diameter is smaller than the bare wire',
        byValue: true,
      });
    }
    design.secondary = spec;
  }

  const topload = section(tree, 'topload');
  if (topload) {
    const shape = text(topload, 'shape');
    const heightAbove = num(topload, 'height_above_winding');
    const centerHeight = num(topload, 'center_height');
    let spec: ToploadSpec;
    if (shape === 'toroid') {
      spec = {
        shape,
        outerDiameter: must(num(topload, 'outer_diameter')),
        tubeDiameter: must(num(topload, 'tube_diameter')),
      };
      if (spec.tubeDiameter >= spec.outerDiameter) {
        issues.push({
          path: at('topload', 'tube_diameter'),
          message: `the tube (${mm(spec.tubeDiameter)}) must be smaller than the outer diameter (${mm(spec.outerDiameter)})`,
          byValue: true,
        });
      }
    } else {
      spec = { shape: 'sphere', diameter: must(num(topload, 'diameter')) };
    }
    if (secondary) {
      if (heightAbove === undefined) {
        issues.push({
          path: at('topload', 'height_above_winding'),
          message: 'required with a secondary: the mid-plane above the top of the winding',
        });
      }
      if (centerHeight !== undefined) {
        issues.push({
          path: at('topload', 'center_height'),
          message: 'with a secondary, give height_above_winding instead',
        });
      }
    } else if (centerHeight === undefined) {
      issues.push({
        path: at('topload', 'center_height'),
        message: 'required for a topload without a secondary: its mid-plane above the floor',
      });
    }
    if (heightAbove !== undefined) spec.heightAboveWinding = heightAbove;
    if (centerHeight !== undefined) spec.centerHeight = centerHeight;
    design.topload = spec;
  }

  const primary = section(tree, 'primary');
  if (primary) {
    if (!secondary) issues.push({ path: at('primary'), message: 'a primary needs a secondary to couple to' });
    const spec: PrimarySpec = {
      shape: text(primary, 'shape') as PrimarySpec['shape'],
      innerDiameter: must(num(primary, 'inner_diameter')),
      turns: must(num(primary, 'turns')),
      conductorDiameter: must(num(primary, 'conductor_diameter')),
      turnSpacing: must(num(primary, 'turn_spacing')),
      elevation: num(primary, 'elevation') ?? 0,
    };
    const coneAngle = num(primary, 'cone_angle');
    if (coneAngle !== undefined) {
      if (coneAngle >= Math.PI / 2)
        issues.push({
          path: at('primary', 'cone_angle'),
          message: 'a cone angle must be below 90 deg (use shape: helix)',
          byValue: true,
        });
      spec.coneAngle = coneAngle;
    }
    const tap = num(primary, 'tap_turns');
    if (tap !== undefined) {
      if (tap > spec.turns)
        issues.push({
          path: at('primary', 'tap_turns'),
          message: `the tap (${tap}) lies beyond the last turn (${spec.turns})`,
          byValue: true,
        });
      spec.tapTurns = tap;
    }
    if (primary.require_tuning === false) spec.requireTuning = false;
    design.primary = spec;
  }

  const rail = section(tree, 'strike_rail');
  if (rail) {
    if (!secondary) issues.push({ path: at('strike_rail'), message: 'a strike rail needs a secondary' });
    design.strikeRail = {
      diameter: must(num(rail, 'diameter')),
      conductorDiameter: must(num(rail, 'conductor_diameter')),
      elevation: num(rail, 'elevation') ?? 0,
    };
  }

  const tank = section(tree, 'tank');
  if (tank) {
    if (!primary) issues.push({ path: at('tank'), message: 'a tank capacitor needs a primary' });
    design.tank = { capacitance: must(num(tank, 'capacitance')) };
    const charge = num(tank, 'charge_voltage');
    const rating = num(tank, 'voltage_rating');
    if (charge !== undefined) design.tank.chargeVoltage = charge;
    if (rating !== undefined) design.tank.voltageRating = rating;
  }

  const driver = section(tree, 'driver');
  if (driver) {
    let spec: DriverSpec;
    if (text(driver, 'kind') === 'spark_gap') {
      spec = {
        kind: 'spark_gap',
        gap: (text(driver, 'gap') ?? 'static') as 'static' | 'rotary',
        breakRate: must(num(driver, 'break_rate')),
        quench: driver.quench === undefined ? true : driver.quench === true,
      };
      const gapResistance = num(driver, 'gap_resistance');
      if (gapResistance !== undefined) spec.gapResistance = gapResistance;
      if (!tank) issues.push({ path: at('tank'), message: 'required by the spark-gap driver' });
      else if (num(tank, 'charge_voltage') === undefined) {
        issues.push({ path: at('tank', 'charge_voltage'), message: 'required by the spark-gap driver' });
      }
    } else {
      spec = {
        kind: 'solid_state',
        bridge: (text(driver, 'bridge') ?? 'full') as 'full' | 'half',
        busVoltage: must(num(driver, 'bus_voltage')),
        repetitionRate: must(num(driver, 'repetition_rate')),
      };
      const limit = num(driver, 'current_limit');
      const onTime = num(driver, 'on_time');
      const cycles = num(driver, 'cycles');
      if (limit !== undefined) spec.currentLimit = limit;
      if (onTime !== undefined) spec.onTime = onTime;
      if (cycles !== undefined) spec.cycles = cycles;
      if (onTime === undefined && cycles === undefined) {
        issues.push({ path: at('driver', 'on_time'), message: 'required: give on_time or cycles' });
      } else if (onTime !== undefined && cycles !== undefined) {
        issues.push({ path: at('driver', 'cycles'), message: 'give on_time or cycles, not both' });
      }
      if (!primary) issues.push({ path: at('primary'), message: 'required by the solid-state driver' });
    }
    if (!primary) issues.push({ path: at('driver'), message: 'a driver needs a primary' });
    design.driver = spec;
  }

  const environment = section(tree, 'environment');
  if (environment) {
    design.environment = {
      altitude: num(environment, 'altitude') ?? DEFAULT_ENVIRONMENT.altitude,
      temperature: num(environment, 'temperature') ?? DEFAULT_ENVIRONMENT.temperature,
    };
    const surface = num(environment, 'surface_factor');
    const streamer = num(environment, 'streamer_length');
    if (surface !== undefined) design.environment.surfaceFactor = surface;
    if (streamer !== undefined) design.environment.streamerLength = streamer;
  }
  return { design: issues.length === 0 ? design : null, issues };
}

/** A length in millimetres for messages: '152.4 mm'. */
export function mm(metres: number): string {
  return `${Number((metres * 1000).toPrecision(6))} mm`;
}
