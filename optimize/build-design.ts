/**
 * From a normal tree (SI numbers, field names of the file) to the physics core's `Design`, with the
 * checks that involve more than one field. Every problem is an FieldIssue naming the field.
 */
import type {
  BreakoutPointSpec,
  Design,
  DriverSpec,
  InsulationGrade,
  PrimarySpec,
  SupportSpec,
  ToploadSpec,
  WireSpec,
} from '../core/design.ts';
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
/** What every section builder works on: the tree, the design being built, the issues found, field paths. */
interface SectionBuild {
  tree: NormalTree;
  design: Design;
  issues: FieldIssue[];
  at: (...path: string[]) => string[];
}

export function buildDesign(tree: NormalTree, basePath: string[] = []): DesignBuild {
  const issues: FieldIssue[] = [];
  const at = (...path: string[]) => [...basePath, ...path];
  const design: Design = { environment: { ...DEFAULT_ENVIRONMENT } };

  const b: SectionBuild = { tree, design, issues, at };
  for (const [name, build] of SECTION_BUILDERS) {
    const found = section(tree, name);
    if (found) build(found, b);
  }
  return { design: issues.length === 0 ? design : null, issues };
}

/** The `secondary:` section. */
function buildSecondary(s: NormalSection, b: SectionBuild): void {
  const { design, issues, at } = b;
  const turns = num(s, 'turns');
  const windingLength = num(s, 'winding_length');
  const pitch = num(s, 'pitch');
  if (turns === undefined && windingLength === undefined) {
    issues.push({ path: at('secondary', 'turns'), message: 'required: give turns or winding_length' });
  } else if (turns !== undefined && windingLength !== undefined && pitch !== undefined) {
    issues.push({
      path: at('secondary', 'pitch'),
      message: 'give two of turns, winding_length and pitch, not all three',
    });
  }
  const wire = wireSpec(s.wire, s);
  const spec: Design['secondary'] = {
    formDiameter: must(num(s, 'form_diameter')),
    wire,
    baseHeight: num(s, 'base_height') ?? 0,
    voltageProfile: (text(s, 'voltage_profile') ?? 'computed') as 'computed' | 'linear' | 'quarter_wave',
  };
  if (turns !== undefined) spec.turns = turns;
  if (windingLength !== undefined) spec.windingLength = windingLength;
  // With turns and winding_length both given, the s stage derives the pitch.
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

/** The `topload:` section. */
function buildTopload(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  const shape = text(s, 'shape');
  const heightAbove = num(s, 'height_above_winding');
  const centerHeight = num(s, 'center_height');
  let spec: ToploadSpec;
  if (shape === 'toroid') {
    spec = {
      shape,
      outerDiameter: must(num(s, 'outer_diameter')),
      tubeDiameter: must(num(s, 'tube_diameter')),
    };
    if (spec.tubeDiameter >= spec.outerDiameter) {
      issues.push({
        path: at('topload', 'tube_diameter'),
        message: `the tube (${mm(spec.tubeDiameter)}) must be smaller than the outer diameter (${mm(spec.outerDiameter)})`,
        byValue: true,
      });
    }
  } else {
    spec = { shape: 'sphere', diameter: must(num(s, 'diameter')) };
  }
  if (section(tree, 'secondary')) {
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

/** The `primary:` section. */
function buildPrimary(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  if (!section(tree, 'secondary'))
    issues.push({ path: at('primary'), message: 'a primary needs a secondary to couple to' });
  const spec: PrimarySpec = {
    shape: text(s, 'shape') as PrimarySpec['shape'],
    innerDiameter: must(num(s, 'inner_diameter')),
    turns: must(num(s, 'turns')),
    conductorDiameter: must(num(s, 'conductor_diameter')),
    turnSpacing: must(num(s, 'turn_spacing')),
    elevation: num(s, 'elevation') ?? 0,
  };
  const coneAngle = num(s, 'cone_angle');
  if (coneAngle !== undefined) {
    if (coneAngle >= Math.PI / 2)
      issues.push({
        path: at('primary', 'cone_angle'),
        message: 'a cone angle must be below 90 deg (use shape: helix)',
        byValue: true,
      });
    spec.coneAngle = coneAngle;
  }
  const tap = num(s, 'tap_turns');
  if (tap !== undefined) {
    if (tap > spec.turns)
      issues.push({
        path: at('primary', 'tap_turns'),
        message: `the tap (${tap}) lies beyond the last turn (${spec.turns})`,
        byValue: true,
      });
    spec.tapTurns = tap;
  }
  if (s.require_tuning === false) spec.requireTuning = false;
  design.primary = spec;
}

/** The `strike_rail:` section. */
function buildStrikeRail(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  if (!section(tree, 'secondary')) issues.push({ path: at('strike_rail'), message: 'a strike rail needs a secondary' });
  design.strikeRail = {
    diameter: must(num(s, 'diameter')),
    conductorDiameter: must(num(s, 'conductor_diameter')),
    elevation: num(s, 'elevation') ?? 0,
  };
}

/** The `tank:` section. */
function buildTank(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  if (!section(tree, 'primary')) issues.push({ path: at('tank'), message: 'a tank capacitor needs a primary' });
  design.tank = { capacitance: must(num(s, 'capacitance')) };
  const charge = num(s, 'charge_voltage');
  const rating = num(s, 'voltage_rating');
  if (charge !== undefined) design.tank.chargeVoltage = charge;
  if (rating !== undefined) design.tank.voltageRating = rating;
  if (num(s, 'bank.part.capacitance') !== undefined) design.tankBank = tankBankSpec(s, 'bank.part.', 'bank.');
}

/** The `driver:` section. */
function buildDriver(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  let spec: DriverSpec;
  if (text(s, 'kind') === 'spark_gap') {
    spec = {
      kind: 'spark_gap',
      gap: (text(s, 'gap') ?? 'static') as 'static' | 'rotary',
      breakRate: must(num(s, 'break_rate')),
      quench: s.quench === undefined ? true : s.quench === true,
    };
    const gapResistance = num(s, 'gap_resistance');
    if (gapResistance !== undefined) spec.gapResistance = gapResistance;
    const tank = section(tree, 'tank');
    if (!tank) issues.push({ path: at('tank'), message: 'required by the spark-gap driver' });
    else if (num(tank, 'charge_voltage') === undefined && !(spec.gap === 'rotary' && tree.supply !== undefined)) {
      issues.push({ path: at('tank', 'charge_voltage'), message: 'required by the spark-gap driver' });
    }
  } else {
    spec = {
      kind: 'solid_state',
      bridge: (text(s, 'bridge') ?? 'full') as 'full' | 'half',
      busVoltage: must(num(s, 'bus_voltage')),
      repetitionRate: must(num(s, 'repetition_rate')),
    };
    const limit = num(s, 'current_limit');
    const onTime = num(s, 'on_time');
    const cycles = num(s, 'cycles');
    if (limit !== undefined) spec.currentLimit = limit;
    if (onTime !== undefined) spec.onTime = onTime;
    if (cycles !== undefined) spec.cycles = cycles;
    if (onTime === undefined && cycles === undefined) {
      issues.push({ path: at('driver', 'on_time'), message: 'required: give on_time or cycles' });
    } else if (onTime !== undefined && cycles !== undefined) {
      issues.push({ path: at('driver', 'cycles'), message: 'give on_time or cycles, not both' });
    }
    if (!section(tree, 'primary')) issues.push({ path: at('primary'), message: 'required by the solid-state driver' });
  }
  if (!section(tree, 'primary')) issues.push({ path: at('driver'), message: 'a driver needs a primary' });
  design.driver = spec;
}

/** The `resonator:` section. */
function buildResonator(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  if (!section(tree, 'secondary'))
    issues.push({ path: at('resonator'), message: 'a resonator needs a secondary to drive it' });
  const turns = num(s, 'turns');
  const windingLength = num(s, 'winding_length');
  const pitch = num(s, 'pitch');
  if (turns === undefined && windingLength === undefined) {
    issues.push({ path: at('resonator', 'turns'), message: 'required: give turns or winding_length' });
  } else if (turns !== undefined && windingLength !== undefined && pitch !== undefined) {
    issues.push({
      path: at('resonator', 'pitch'),
      message: 'give two of turns, winding_length and pitch, not all three',
    });
  }
  const wire = wireSpec(s.wire, s);
  const winding: NonNullable<Design['secondary']> = {
    formDiameter: num(s, 'form_diameter') ?? 0,
    wire,
    baseHeight: num(s, 'base_height') ?? 0,
    voltageProfile: 'computed',
  };
  if (turns !== undefined) winding.turns = turns;
  if (windingLength !== undefined) winding.windingLength = windingLength;
  if (pitch !== undefined) winding.pitch = pitch;
  const conductor = num(s, 'line_conductor_diameter') ?? 0;
  const lineHeight = num(s, 'line_height') ?? 0;
  if (lineHeight <= conductor / 2) {
    issues.push({
      path: at('resonator', 'line_height'),
      message: `the line (${mm(conductor)} conductor) at ${mm(lineHeight)} touches the floor`,
      byValue: true,
    });
  }
  design.resonator = {
    winding,
    line: { length: num(s, 'line_length') ?? 0, conductorDiameter: conductor, height: lineHeight },
  };
  const spacing = num(s, 'axis_spacing');
  if (spacing !== undefined) design.resonator.axisSpacing = spacing;
}

/** The `environment:` section. */
function buildEnvironment(s: NormalSection, b: SectionBuild): void {
  const { design } = b;
  design.environment = {
    altitude: num(s, 'altitude') ?? DEFAULT_ENVIRONMENT.altitude,
    temperature: num(s, 'temperature') ?? DEFAULT_ENVIRONMENT.temperature,
  };
  const surface = num(s, 'surface_factor');
  const streamer = num(s, 'streamer_length');
  if (surface !== undefined) design.environment.surfaceFactor = surface;
  if (streamer !== undefined) design.environment.streamerLength = streamer;
}

/** The `supply:` section. */
function buildSupply(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  const kind = (text(s, 'kind') ?? 'current_limited') as 'current_limited' | 'ballasted';
  const spec: Design['supply'] = {
    kind,
    voltage: num(s, 'voltage') ?? Number.NaN,
    frequency: num(s, 'frequency') ?? Number.NaN,
  };
  const current = num(s, 'current');
  const power = num(s, 'power');
  const impedance = num(s, 'ballast_impedance');
  if (current !== undefined) spec.current = current;
  if (power !== undefined) spec.power = power;
  if (impedance !== undefined) spec.ballastImpedance = impedance;
  if (current === undefined && power === undefined) {
    issues.push({ path: at('supply', 'current'), message: 'required: give current or power' });
  } else if (current !== undefined && power !== undefined) {
    issues.push({ path: at('supply', 'power'), message: 'give current or power, not both' });
  }
  if (kind === 'ballasted' && impedance === undefined) {
    issues.push({ path: at('supply', 'ballast_impedance'), message: 'required with kind: ballasted' });
  }
  if (kind !== 'ballasted' && impedance !== undefined) {
    issues.push({ path: at('supply', 'ballast_impedance'), message: 'only with kind: ballasted' });
  }
  if (!section(tree, 'tank')) issues.push({ path: at('supply'), message: 'a supply needs a tank to charge' });
  if (tree.driver !== undefined && text(section(tree, 'driver') ?? {}, 'kind') !== 'spark_gap') {
    issues.push({ path: at('supply'), message: 'a supply charges the tank of a spark-gap driver only' });
  }
  design.supply = spec;
}

/**
 * The `tank_bank:` section: the older spelling of `tank.bank` (part_capacitance for
 * part.capacitance, …), read into the same bank.
 */
function buildTankBank(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  if (!section(tree, 'tank'))
    issues.push({ path: at('tank_bank'), message: 'a tank bank needs a tank section (its target capacitance)' });
  if (design.tankBank !== undefined)
    issues.push({
      path: at('tank_bank'),
      message: 'give the bank once: as tank.bank (canonical) or as tank_bank, not both',
    });
  design.tankBank = tankBankSpec(s, 'part_', '');
}

/** A tank bank from its fields: the part's under `part` (e.g. 'bank.part.' or 'part_'), the layout's under `layout`. */
function tankBankSpec(s: NormalSection, part: string, layout: string): NonNullable<Design['tankBank']> {
  const spec: NonNullable<Design['tankBank']> = {
    partCapacitance: num(s, `${part}capacitance`) ?? Number.NaN,
    partVoltageRating: num(s, `${part}voltage_rating`) ?? Number.NaN,
    partRmsCurrentRating: num(s, `${part}rms_current_rating`) ?? Number.NaN,
    voltageMargin: num(s, `${layout}voltage_margin`) ?? 2,
    bleedTime: num(s, `${layout}bleed_time`) ?? 60,
  };
  const peak = num(s, `${part}peak_current_rating`);
  const series = num(s, `${layout}series`);
  const parallel = num(s, `${layout}parallel`);
  if (peak !== undefined) spec.partPeakCurrentRating = peak;
  if (series !== undefined) spec.series = series;
  if (parallel !== undefined) spec.parallel = parallel;
  return spec;
}

/** The `safety_gap:` section. */
function buildSafetyGap(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  const electrodes = (text(s, 'electrodes') ?? 'sphere') as 'sphere' | 'rounded';
  const spec: Design['safetyGap'] = { electrodes, fireAt: num(s, 'fire_at') ?? 1.3 };
  const diameter = num(s, 'sphere_diameter');
  if (diameter !== undefined) spec.sphereDiameter = diameter;
  if (!(spec.fireAt > 1)) {
    issues.push({
      path: at('safety_gap', 'fire_at'),
      message: 'must exceed 1 (common practice 1.2 to 1.5)',
      byValue: true,
    });
  }
  if (electrodes === 'sphere' && diameter === undefined) {
    issues.push({ path: at('safety_gap', 'sphere_diameter'), message: 'required with electrodes: sphere' });
  }
  if (!section(tree, 'tank')) issues.push({ path: at('safety_gap'), message: 'a safety gap needs a tank' });
  design.safetyGap = spec;
}

/** The `breakout_point:` section. */
function buildBreakoutPoint(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  if (!section(tree, 'topload'))
    issues.push({ path: at('breakout_point'), message: 'a breakout point needs a topload to stand on' });
  const spec: BreakoutPointSpec = {
    position: (text(s, 'position') ?? 'top') as BreakoutPointSpec['position'],
    tipRadius: required(s, 'tip_radius'),
  };
  const sizes = (['length', 'fire_at_voltage', 'fire_at_fraction'] as const).filter((key) => num(s, key) !== undefined);
  if (sizes.length !== 1) {
    issues.push({
      path: at('breakout_point', sizes.length === 0 ? 'length' : sizes[1]),
      message:
        sizes.length === 0
          ? 'required: give length, fire_at_voltage or fire_at_fraction'
          : 'give one of length, fire_at_voltage and fire_at_fraction, not several',
    });
  }
  const pointLength = num(s, 'length');
  const fireVoltage = num(s, 'fire_at_voltage');
  const fireFraction = num(s, 'fire_at_fraction');
  if (pointLength !== undefined) spec.length = pointLength;
  if (fireVoltage !== undefined) spec.fireAtVoltage = fireVoltage;
  if (fireFraction !== undefined) spec.fireAtFraction = fireFraction;
  design.breakoutPoint = spec;
}

/** The `supports:` section. */
function buildSupports(s: NormalSection, b: SectionBuild): void {
  const { tree, design, issues, at } = b;
  if (!section(tree, 'topload')) issues.push({ path: at('supports'), message: 'supports need a topload to carry' });
  const diameter = required(s, 'diameter');
  const limit = num(s, 'field_limit');
  let spec: SupportSpec;
  if (text(s, 'kind') === 'rods') {
    spec = {
      kind: 'rods',
      count: num(s, 'count') ?? 3,
      diameter,
      fromRadius: required(s, 'from_radius'),
      fromHeight: required(s, 'from_height'),
      toRadius: required(s, 'to_radius'),
      toHeight: required(s, 'to_height'),
    };
  } else {
    const from = (text(s, 'from') ?? 'winding_top') as 'floor' | 'winding_top';
    if (from === 'winding_top' && !section(tree, 'secondary')) {
      issues.push({ path: at('supports', 'from'), message: 'a column from the winding top needs a secondary' });
    }
    spec = { kind: 'column', from, diameter };
  }
  if (limit !== undefined) spec.fieldLimit = limit;
  design.support = spec;
}

/** The section builders, in the order the sections are built (a later one may read an earlier one's result). */
const SECTION_BUILDERS: ReadonlyArray<[string, (s: NormalSection, b: SectionBuild) => void]> = [
  ['secondary', buildSecondary],
  ['topload', buildTopload],
  ['primary', buildPrimary],
  ['strike_rail', buildStrikeRail],
  ['tank', buildTank],
  ['driver', buildDriver],
  ['resonator', buildResonator],
  ['environment', buildEnvironment],
  ['supply', buildSupply],
  ['tank_bank', buildTankBank],
  ['safety_gap', buildSafetyGap],
  ['breakout_point', buildBreakoutPoint],
  ['supports', buildSupports],
];

/** A field the schema requires (NaN if it were missing: the core then names it as a problem). */
function required(section: NormalSection, key: string): number {
  return num(section, key) ?? Number.NaN;
}

/** A length in millimetres for messages: '152.4 mm'. */
export function mm(metres: number): string {
  return `${Number((metres * 1000).toPrecision(6))} mm`;
}
