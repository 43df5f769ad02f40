/**
 * The build sheet of one design: what to buy, cut, wind and set, each figure with where it comes
 * from (a metric of the evaluation, a field of the design, or a named rule), then the predicted
 * tuning and the safety cautions. `buildSheet` makes the figures; `sheetMarkdown` and `partsCsv`
 * write them. The rules of the workshop (margins, spare wire, leads) are common practice, with our
 * own numbers, and say so where they are used.
 */
import type { Design } from '../core/design.ts';
import type { Evaluation } from '../core/evaluate.ts';
import { evaluateDesign } from '../core/evaluate.ts';
import { METRICS } from '../core/metrics.ts';
import { primaryInductanceAtTap, primaryInductanceTable, primaryConductorLength } from '../core/primary/inductance.ts';
import { primaryPitch, primaryRings } from '../core/primary/rings.ts';
import { tapForInductance } from '../core/primary/tuning.ts';
import { COPPER_DENSITY, copperMass } from '../core/wire/copper.ts';
import { insulatedDiameter } from '../core/wire/insulation.ts';
import { sphereGapAirDensity } from '../core/breakdown/sphere-gap.ts';
import { BLEED_SAFE_VOLTAGE } from '../core/tank/bank.ts';
import { RESONANT_BAND } from '../core/supply/supply.ts';
import { toCsv } from '../run/csv.ts';
import { METRIC_DISPLAY, formatNumber, humanUnit, lengthText } from './display-units.ts';
import { SAFETY_CAUTIONS } from './safety.ts';

/** Bare form beyond each end of the winding: the larger of 30 mm and 5 % of the winding (common practice, our numbers). */
export const FORM_END_MARGIN = { minimum: 0.03, fraction: 0.05 };
/** Spare wire and tubing bought beyond the computed length (common practice, our number). */
export const SPARE_FRACTION = 0.1;
/** Lead left at each end of the secondary winding and of the primary, m (common practice, our number). */
export const LEAD_LENGTH = 0.5;
/** Mass of copper on one reel of magnet wire when the builder gives none, kg (a common reel size). */
export const DEFAULT_REEL_MASS = 1;

/** One figure of the sheet: a label, the value as shown, its SI value, and where it comes from. */
export interface SheetFigure {
  label: string;
  text: string;
  /** SI value, when the figure is a number. */
  value?: number;
  /** 'metric NAME', 'design FIELD', 'rule: …' or 'computed: …'. */
  source: string;
  /** The metric a figure repeats, for the check against the evaluation. */
  metric?: string;
}

export interface SheetSection {
  title: string;
  figures: SheetFigure[];
  notes: string[];
}

export interface PartRow {
  item: string;
  specification: string;
  quantity: number;
  unit: string;
  source: string;
}

export interface BuildSheet {
  title: string;
  sections: SheetSection[];
  parts: PartRow[];
  warnings: string[];
}

export interface SheetOptions {
  /** Copper on one reel, kg. */
  reelMass?: number;
}

const metres = (value: number) => `${formatNumber(value)} m`;

/** A figure repeating a metric, shown in the metric's display unit. */
function metricFigure(evaluation: Evaluation, key: string, label?: string): SheetFigure | null {
  const value = evaluation.metrics[key];
  if (value === null || value === undefined) return null;
  const info = METRICS.find((m) => m.key === key);
  const display = METRIC_DISPLAY[key];
  const unit = display ? humanUnit(display.label) : info?.unit && info.unit !== 'count' ? info.unit : '';
  const scaled = display ? value / display.divisor : value;
  return {
    label: label ?? info?.description ?? key,
    text: `${formatNumber(scaled)}${unit ? ` ${unit}` : ''}`,
    value,
    source: `metric ${key}`,
    metric: key,
  };
}

function push(figures: SheetFigure[], figure: SheetFigure | null): void {
  if (figure) figures.push(figure);
}

/** What the section builders of a sheet share: the design, its evaluation, and the lists they fill. */
interface SheetContext {
  design: Design;
  evaluation: Evaluation;
  m: Evaluation['metrics'];
  sections: SheetSection[];
  parts: PartRow[];
  reelMass: number;
  /** The streamer-loaded frequency (null when neither given nor estimable). */
  loaded: ReturnType<typeof loadedFrequency>;
  /** Set by the primary section, read by the tuning section. */
  tuning: { loadedTap: number | null; beyondPrimary: string | null };
}

/**
 * The sheet of a design and its evaluation (a feasible one: the caller refuses the others).
 * @param title what the design is (a file, or a candidate of a run)
 */
export function buildSheet(
  design: Design,
  evaluation: Evaluation,
  title: string,
  options: SheetOptions = {},
): BuildSheet {
  const m = evaluation.metrics;
  const sections: SheetSection[] = [];
  const parts: PartRow[] = [];
  const reelMass = options.reelMass ?? DEFAULT_REEL_MASS;

  const ctx: SheetContext = {
    design,
    evaluation,
    m,
    sections,
    parts,
    reelMass,
    // evaluated once: the primary's streamer tap and the tuning section both need it
    loaded: loadedFrequency(design, evaluation),
    tuning: { loadedTap: null, beyondPrimary: null },
  };
  secondarySection(ctx);
  primarySection(ctx);
  toploadSection(ctx);
  strikeRailSection(ctx);
  tankSection(ctx);
  supplySection(ctx);
  safetyGapSection(ctx);
  predictedTuningSection(ctx);

  return { title, sections, parts, warnings: evaluation.warnings.map((w) => `${w.message} [${w.key}]`) };
}

/** The sheet's secondary section. */
function secondarySection(ctx: SheetContext): void {
  const { design, evaluation, m, sections, parts, reelMass } = ctx;
  const secondary = design.secondary;
  if (secondary) {
    const figures: SheetFigure[] = [];
    const notes: string[] = [];
    const winding = m.winding_length ?? 0;
    const margin = Math.max(FORM_END_MARGIN.minimum, FORM_END_MARGIN.fraction * winding);
    const formLength = winding + 2 * margin;
    figures.push({
      label: 'form outside diameter',
      text: lengthText(secondary.formDiameter),
      value: secondary.formDiameter,
      source: 'design secondary.form_diameter',
    });
    push(figures, metricFigure(evaluation, 'winding_length', 'winding length'));
    figures.push({
      label: 'bare form beyond each end of the winding',
      text: lengthText(margin),
      value: margin,
      source: `rule: the larger of ${lengthText(FORM_END_MARGIN.minimum)} and ${FORM_END_MARGIN.fraction * 100} % of the winding (common practice, our numbers)`,
    });
    figures.push({
      label: 'form length to cut',
      text: lengthText(formLength),
      value: formLength,
      source: 'computed: winding_length + 2 × margin',
    });
    figures.push({
      label: 'winding starts above the floor',
      text: lengthText(secondary.baseHeight),
      value: secondary.baseHeight,
      source: 'design secondary.base_height',
    });
    figures.push({
      label: 'winding ends above the floor',
      text: lengthText(secondary.baseHeight + winding),
      value: secondary.baseHeight + winding,
      source: 'computed: base_height + winding_length',
    });
    push(figures, metricFigure(evaluation, 'secondary_turns', 'turns'));
    const wire =
      secondary.wire.awg !== undefined ? `AWG ${secondary.wire.awg}` : lengthText(secondary.wire.bareDiameter);
    const overall =
      secondary.wire.overallDiameter ?? insulatedDiameter(secondary.wire.bareDiameter, secondary.wire.insulation);
    figures.push({
      label: 'wire',
      text: `${wire} (bare ${lengthText(secondary.wire.bareDiameter)}, insulated about ${lengthText(overall)})`,
      value: secondary.wire.bareDiameter,
      source: 'design secondary.wire, IEC 60317-0-1 grade for the insulation',
    });
    push(figures, metricFigure(evaluation, 'wire_length', 'wire on the winding'));
    const wireLength = m.wire_length ?? 0;
    const buy = wireLength * (1 + SPARE_FRACTION) + 2 * LEAD_LENGTH;
    figures.push({
      label: 'wire to buy',
      text: metres(buy),
      value: buy,
      source: `rule: wire_length × ${1 + SPARE_FRACTION} + 2 leads of ${metres(LEAD_LENGTH)} (common practice, our numbers)`,
    });
    push(figures, metricFigure(evaluation, 'wire_mass', 'copper on the winding'));
    const buyMass = copperMass(buy, secondary.wire.bareDiameter);
    figures.push({
      label: 'copper to buy',
      text: `${formatNumber(buyMass)} kg`,
      value: buyMass,
      source: `computed: the length to buy × π d²/4 × ${COPPER_DENSITY} kg/m³ (copper; the enamel adds a little)`,
    });
    const reels = Math.max(1, Math.ceil(buyMass / reelMass - 1e-9));
    figures.push({
      label: `reels of ${formatNumber(reelMass)} kg`,
      text: String(reels),
      value: reels,
      source: 'computed: copper to buy over the reel mass, rounded up (--reel-mass)',
    });
    notes.push('Wind close and even; lacquer the winding; keep the first and last turns clear of the form ends.');
    sections.push({ title: 'Secondary', figures, notes });
    parts.push({
      item: 'magnet wire',
      specification: `${wire}, ${secondary.wire.insulation}`,
      quantity: buy,
      unit: 'm',
      source: 'rule: wire to buy',
    });
    parts.push({
      item: 'coil form',
      specification: `outside diameter ${lengthText(secondary.formDiameter)}`,
      quantity: formLength,
      unit: 'm',
      source: 'computed: form length to cut',
    });
  }
}

/** The sheet's primary section. */
function primarySection(ctx: SheetContext): void {
  const { design, evaluation, m, sections, parts, tuning } = ctx;
  const secondary = design.secondary;
  const primary = design.primary;
  if (primary && secondary) {
    const figures: SheetFigure[] = [];
    const notes: string[] = [];
    const rings = primaryRings(primary, secondary.baseHeight);
    const whole = primaryConductorLength(rings, primary.turns);
    const tap = m.primary_tap_turns ?? primary.tapTurns ?? primary.turns;
    const tapped = primaryConductorLength(rings, tap);
    figures.push({ label: 'shape', text: primary.shape.replace('_', ' '), source: 'design primary.shape' });
    figures.push({
      label: 'conductor (tube or wire) diameter',
      text: lengthText(primary.conductorDiameter),
      value: primary.conductorDiameter,
      source: 'design primary.conductor_diameter',
    });
    figures.push({
      label: 'centre-line pitch',
      text: lengthText(primaryPitch(primary)),
      value: primaryPitch(primary),
      source: 'computed: conductor_diameter + turn_spacing',
    });
    figures.push({
      label: 'turns',
      text: formatNumber(primary.turns),
      value: primary.turns,
      source: 'design primary.turns',
    });
    figures.push({
      label: 'conductor along all the rings',
      text: metres(whole),
      value: whole,
      source: 'computed: Σ 2π rᵢ over the rings (the model’s rings; the spiral’s pitch adds < 0.1 %)',
    });
    const tubing = whole * (1 + SPARE_FRACTION) + 2 * LEAD_LENGTH;
    figures.push({
      label: 'conductor to buy',
      text: metres(tubing),
      value: tubing,
      source: `rule: × ${1 + SPARE_FRACTION} + 2 leads of ${metres(LEAD_LENGTH)} (common practice, our numbers)`,
    });
    figures.push({
      label: 'conductor from the inner end to the tap',
      text: metres(tapped),
      value: tapped,
      source: 'computed: Σ wᵢ 2π rᵢ up to primary_tap_turns',
    });
    push(figures, metricFigure(evaluation, 'primary_tap_turns', 'tap, turns from the inner end'));
    const ring = Math.min(Math.floor(tap), rings.length - 1);
    const fraction = tap - ring;
    figures.push({
      label: 'tap position',
      text: `ring ${ring + 1} (of ${rings.length}), ${formatNumber(fraction * 360)}° past the inner end's angle`,
      value: tap,
      source: 'computed: from primary_tap_turns',
    });
    push(figures, metricFigure(evaluation, 'primary_outer_diameter', 'outermost ring diameter'));
    push(figures, metricFigure(evaluation, 'primary_tap_margin', 'turns left beyond the tap'));
    sections.push({ title: 'Primary', figures, notes });
    const ringTable: string[] = ['| ring | centre-line diameter | height above the floor |', '| ---: | ---: | ---: |'];
    rings.forEach((r, i) => {
      ringTable.push(
        `| ${i + 1}${i + 1 === rings.length && primary.turns % 1 > 1e-9 ? ` (${formatNumber(primary.turns % 1)} of a turn)` : ''} | ${lengthText(2 * r.r)} | ${lengthText(r.z)} |`,
      );
    });
    notes.push(
      'Ring diameters and heights (design primary.*, computed by the core’s ring layout; the floor is z = 0):',
      '',
      ...ringTable,
    );
    parts.push({
      item: 'primary conductor',
      specification: `diameter ${lengthText(primary.conductorDiameter)}`,
      quantity: tubing,
      unit: 'm',
      source: 'rule: conductor to buy',
    });

    // the tap with streamer loading: the same inductance table, tuned to the loaded frequency
    // the tank as built: the bank's capacitance when the design has one
    const tankCapacitance = m.tank_bank_capacitance ?? design.tank?.capacitance;
    // (three coils: the tap is set for the 1:2:3 modes, not to one frequency, so no single loaded tap)
    const loaded = design.resonator ? null : ctx.loaded;
    if (tankCapacitance !== undefined && loaded !== null) {
      const table = primaryInductanceTable(rings, primary.conductorDiameter / 2);
      const required = 1 / ((2 * Math.PI * loaded.frequency) ** 2 * tankCapacitance);
      const tuned = tapForInductance(table, required, Math.min(1, primary.turns), primary.turns);
      tuning.loadedTap = tuned.status === 'tuned' ? tuned.tapTurns : null;
      if (tuned.status === 'above_range') {
        tuning.beyondPrimary = `the streamer-loaded frequency ${formatNumber(loaded.frequency / 1e3)} kHz needs ${formatNumber(required * 1e6)} µH, more than the whole primary's ${formatNumber(primaryInductanceAtTap(table, primary.turns) * 1e6)} µH: the tap would run off the outer end, so add a turn or two (or a larger tank) before the sparks grow`;
      }
    }
  }
}

/** The sheet's topload section. */
function toploadSection(ctx: SheetContext): void {
  const { design, evaluation, m, sections, parts } = ctx;
  const secondary = design.secondary;
  const topload = design.topload;
  if (topload) {
    const figures: SheetFigure[] = [];
    const centre =
      topload.centerHeight ??
      (secondary ? secondary.baseHeight + (m.winding_length ?? 0) + (topload.heightAboveWinding ?? 0) : 0);
    if (topload.shape === 'toroid') {
      figures.push({
        label: 'toroid outside diameter',
        text: lengthText(topload.outerDiameter),
        value: topload.outerDiameter,
        source: 'design topload.outer_diameter',
      });
      figures.push({
        label: 'tube diameter',
        text: lengthText(topload.tubeDiameter),
        value: topload.tubeDiameter,
        source: 'design topload.tube_diameter',
      });
      figures.push({
        label: 'hole (inside) diameter',
        text: lengthText(topload.outerDiameter - 2 * topload.tubeDiameter),
        value: topload.outerDiameter - 2 * topload.tubeDiameter,
        source: 'computed: outer − 2 × tube',
      });
      parts.push({
        item: 'topload toroid',
        specification: `${lengthText(topload.outerDiameter)} × ${lengthText(topload.tubeDiameter)} tube`,
        quantity: 1,
        unit: 'piece',
        source: 'design topload',
      });
    } else {
      figures.push({
        label: 'sphere diameter',
        text: lengthText(topload.diameter),
        value: topload.diameter,
        source: 'design topload.diameter',
      });
      parts.push({
        item: 'topload sphere',
        specification: lengthText(topload.diameter),
        quantity: 1,
        unit: 'piece',
        source: 'design topload',
      });
    }
    figures.push({
      label: 'mid-plane (centre) above the floor',
      text: lengthText(centre),
      value: centre,
      source: 'computed: base_height + winding_length + height_above_winding',
    });
    push(figures, metricFigure(evaluation, 'overall_height', 'highest point above the floor'));
    push(figures, metricFigure(evaluation, 'topload_capacitance', 'topload capacitance in place'));
    push(figures, metricFigure(evaluation, 'breakout_voltage', 'breakout voltage (corona-onset estimate)'));
    sections.push({
      title: 'Topload',
      figures,
      notes: ['Smooth, polished surfaces; no sharp edges except a breakout point if you want one.'],
    });
  }
}

/** The sheet's strike rail section. */
function strikeRailSection(ctx: SheetContext): void {
  const { design, sections, parts } = ctx;
  const secondary = design.secondary;
  const rail = design.strikeRail;
  if (rail && secondary) {
    const figures: SheetFigure[] = [];
    const length = Math.PI * rail.diameter;
    figures.push({
      label: 'ring centre-line diameter',
      text: lengthText(rail.diameter),
      value: rail.diameter,
      source: 'design strike_rail.diameter',
    });
    figures.push({
      label: 'conductor diameter',
      text: lengthText(rail.conductorDiameter),
      value: rail.conductorDiameter,
      source: 'design strike_rail.conductor_diameter',
    });
    figures.push({
      label: 'height above the floor',
      text: lengthText(secondary.baseHeight + rail.elevation),
      value: secondary.baseHeight + rail.elevation,
      source: 'computed: base_height + strike_rail.elevation',
    });
    figures.push({ label: 'conductor length', text: metres(length), value: length, source: 'computed: π × diameter' });
    sections.push({
      title: 'Strike rail',
      figures,
      notes: [
        'Leave a gap in the ring so that it is not a shorted turn, and connect it to the RF ground (common practice).',
      ],
    });
    parts.push({
      item: 'strike-rail conductor',
      specification: `diameter ${lengthText(rail.conductorDiameter)}`,
      quantity: length,
      unit: 'm',
      source: 'computed: π × diameter',
    });
  }
}

/** The sheet's tank section. */
function tankSection(ctx: SheetContext): void {
  const { design, evaluation, m, sections, parts } = ctx;
  const tank = design.tank;
  if (tank) {
    const figures: SheetFigure[] = [];
    const notes: string[] = [];
    const bank = design.tankBank;
    if (bank && m.tank_bank_series !== null && m.tank_bank_parallel !== null) {
      figures.push({
        label: 'part',
        text: `${formatNumber(bank.partCapacitance * 1e9)} nF, ${formatNumber(bank.partVoltageRating / 1e3)} kV DC, ${formatNumber(bank.partRmsCurrentRating)} A rms${bank.partPeakCurrentRating !== undefined ? `, ${formatNumber(bank.partPeakCurrentRating)} A peak` : ''}`,
        source: 'design tank.bank.part',
      });
      figures.push({
        label: 'layout',
        text: `${m.tank_bank_series} in series × ${m.tank_bank_parallel} strings in parallel`,
        value: m.tank_bank_series,
        source: 'metric tank_bank_series, tank_bank_parallel',
      });
      push(figures, metricFigure(evaluation, 'tank_bank_part_count', 'parts'));
      push(figures, metricFigure(evaluation, 'tank_bank_capacitance', 'bank capacitance (the tank)'));
      figures.push({
        label: 'target capacitance',
        text: `${formatNumber(tank.capacitance * 1e9)} nF`,
        value: tank.capacitance,
        source: 'design tank.capacitance',
      });
      push(figures, metricFigure(evaluation, 'tank_bank_part_voltage', 'largest voltage across one part'));
      push(figures, metricFigure(evaluation, 'tank_bank_part_rms_current', 'rms current of one part'));
      push(figures, metricFigure(evaluation, 'tank_bank_part_peak_current', 'peak current of one part'));
      push(figures, metricFigure(evaluation, 'tank_bank_stored_energy', 'energy stored in the bank'));
      push(
        figures,
        metricFigure(
          evaluation,
          'tank_bank_bleeder_resistance',
          `bleeder per part, at most (below ${BLEED_SAFE_VOLTAGE} V in ${formatNumber(bank.bleedTime)} s)`,
        ),
      );
      push(figures, metricFigure(evaluation, 'tank_bank_bleeder_power', 'bleeder dissipation at the working voltage'));
      notes.push(
        'One bleeder across every part; rate each for the part’s voltage (or use several in series) and at least twice its dissipation (common practice).',
      );
      parts.push({
        item: 'tank capacitor part',
        specification: `${formatNumber(bank.partCapacitance * 1e9)} nF ${formatNumber(bank.partVoltageRating / 1e3)} kV`,
        quantity: m.tank_bank_part_count ?? 0,
        unit: 'piece',
        source: 'metric tank_bank_part_count',
      });
      if (m.tank_bank_bleeder_resistance !== null) {
        parts.push({
          item: 'bleeder resistor',
          specification: `≤ ${formatNumber(m.tank_bank_bleeder_resistance / 1e6)} MΩ, ≥ ${formatNumber(2 * (m.tank_bank_bleeder_power ?? 0))} W`,
          quantity: m.tank_bank_part_count ?? 0,
          unit: 'piece',
          source: 'metric tank_bank_bleeder_resistance, tank_bank_bleeder_power',
        });
      }
    } else {
      figures.push({
        label: 'tank capacitance',
        text: `${formatNumber(tank.capacitance * 1e9)} nF`,
        value: tank.capacitance,
        source: 'design tank.capacitance',
      });
      parts.push({
        item: 'tank capacitor',
        specification: `${formatNumber(tank.capacitance * 1e9)} nF${tank.voltageRating !== undefined ? `, ${formatNumber(tank.voltageRating / 1e3)} kV` : ''}`,
        quantity: 1,
        unit: 'piece',
        source: 'design tank',
      });
    }
    if (tank.chargeVoltage !== undefined && design.supply === undefined) {
      figures.push({
        label: 'charge voltage',
        text: `${formatNumber(tank.chargeVoltage / 1e3)} kV`,
        value: tank.chargeVoltage,
        source: 'design tank.charge_voltage',
      });
    }
    push(figures, metricFigure(evaluation, 'tank_voltage_margin', 'rating over the working voltage'));
    push(figures, metricFigure(evaluation, 'tank_peak_current', 'peak tank current'));
    push(figures, metricFigure(evaluation, 'tank_rms_current', 'rms tank current'));
    push(figures, metricFigure(evaluation, 'tank_voltage_reversal', 'voltage reversal (of the charge)'));
    push(figures, metricFigure(evaluation, 'energy_per_shot'));
    push(figures, metricFigure(evaluation, 'input_power'));
    sections.push({ title: 'Tank capacitor', figures, notes });
  }
}

/** The sheet's supply section. */
function supplySection(ctx: SheetContext): void {
  const { design, evaluation, sections, parts } = ctx;
  const supply = design.supply;
  if (supply) {
    const figures: SheetFigure[] = [];
    const current = supply.current ?? (supply.power ?? 0) / supply.voltage;
    figures.push({
      label: 'supply',
      text: `${formatNumber(supply.voltage / 1e3)} kV rms, ${formatNumber(current * 1e3)} mA, ${formatNumber(supply.frequency)} Hz, ${supply.kind.replace('_', ' ')}`,
      source: 'design supply',
    });
    push(figures, metricFigure(evaluation, 'supply_resonant_capacitance', 'resonant tank size'));
    push(
      figures,
      metricFigure(
        evaluation,
        'supply_capacitance_ratio',
        `tank over resonant size (stay outside ${RESONANT_BAND[0]}–${RESONANT_BAND[1]}, common practice)`,
      ),
    );
    push(figures, metricFigure(evaluation, 'supply_charge_limit', 'most the supply can charge the tank to'));
    push(figures, metricFigure(evaluation, 'supply_charge_voltage', 'tank voltage at firing'));
    push(figures, metricFigure(evaluation, 'supply_break_rate_estimate', 'static gap: firings per second (estimate)'));
    push(figures, metricFigure(evaluation, 'supply_load_fraction', 'input power over the rated VA'));
    sections.push({
      title: 'Supply match',
      figures,
      notes: ['Fit a mains filter and an interlocked, lockable disconnect ahead of the supply (common practice).'],
    });
    parts.push({
      item: 'supply transformer',
      specification: `${formatNumber(supply.voltage / 1e3)} kV ${formatNumber(current * 1e3)} mA ${formatNumber(supply.frequency)} Hz`,
      quantity: 1,
      unit: 'piece',
      source: 'design supply',
    });
  }
}

/** The sheet's safety gap section. */
function safetyGapSection(ctx: SheetContext): void {
  const { design, evaluation, sections, parts } = ctx;
  const gap = design.safetyGap;
  if (gap) {
    const figures: SheetFigure[] = [];
    const density = sphereGapAirDensity(design.environment.altitude, design.environment.temperature);
    figures.push({
      label: 'electrodes',
      text: gap.electrodes === 'sphere' ? `spheres of ${lengthText(gap.sphereDiameter ?? 0)}` : 'rounded electrodes',
      source: 'design safety_gap.electrodes, sphere_diameter',
    });
    figures.push({
      label: 'fires at, times the charge voltage',
      text: formatNumber(gap.fireAt),
      value: gap.fireAt,
      source: 'design safety_gap.fire_at (common practice 1.2–1.5)',
    });
    push(figures, metricFigure(evaluation, 'safety_gap_voltage', 'firing voltage'));
    figures.push({
      label: 'relative air density',
      text: formatNumber(density),
      value: density,
      source: 'computed: IEC 60052 (p/101.3 kPa)(293 K/T), standard atmosphere',
    });
    const spacing = metricFigure(evaluation, 'safety_gap_spacing', 'spacing');
    if (spacing) spacing.text = lengthText(spacing.value ?? 0);
    push(figures, spacing);
    sections.push({
      title: 'Safety gap',
      figures,
      notes: [
        gap.electrodes === 'sphere'
          ? 'The sphere-gap table points behind this spacing are typed from memory of IEC 60052 (docs/references.md [iec60052]): check the spacing against the standard, then confirm by slowly raising the supply with the main gap opened.'
          : 'Rounded electrodes at about 3 kV/mm (common practice): a rough guide; confirm by test.',
      ],
    });
    if (gap.electrodes === 'sphere') {
      parts.push({
        item: 'safety-gap sphere',
        specification: lengthText(gap.sphereDiameter ?? 0),
        quantity: 2,
        unit: 'piece',
        source: 'design safety_gap.sphere_diameter',
      });
    }
  }
}

/** The sheet's predicted tuning section. */
function predictedTuningSection(ctx: SheetContext): void {
  const { design, evaluation, m, sections, tuning } = ctx;
  const figures: SheetFigure[] = [];
  const notes: string[] = [];
  push(figures, metricFigure(evaluation, 'resonant_frequency', 'secondary with topload, bare'));
  const loaded = ctx.loaded;
  if (loaded) {
    figures.push({
      label: `with streamer loading (${formatNumber(loaded.streamerLength)} m of streamer)`,
      text: `${formatNumber(loaded.frequency / 1e3)} kHz`,
      value: loaded.frequency,
      source: loaded.source,
      ...(loaded.source === 'metric loaded_resonant_frequency' ? { metric: 'loaded_resonant_frequency' } : {}),
    });
  }
  push(figures, metricFigure(evaluation, 'primary_frequency', 'tank at the tap'));
  push(figures, metricFigure(evaluation, 'coupling', 'coupling coefficient k'));
  push(figures, metricFigure(evaluation, 'mode_frequency_low'));
  push(figures, metricFigure(evaluation, 'mode_frequency_high'));
  const tap = m.primary_tap_turns;
  if (tap !== null) {
    push(figures, metricFigure(evaluation, 'primary_tap_turns', 'start the tap at (turns from the inner end)'));
    if (tuning.loadedTap !== null) {
      figures.push({
        label: 'tap for the streamer-loaded frequency',
        text: `${formatNumber(tuning.loadedTap)} turns`,
        value: tuning.loadedTap,
        source: 'computed: the primary’s inductance table tuned to the loaded frequency',
      });
      notes.push(
        `Start at ${formatNumber(tap)} turns, the bare tuning. As the sparks lengthen the secondary's frequency falls: move the tap outward, towards ${formatNumber(tuning.loadedTap)} turns, a quarter turn at a time, and keep the position that gives the longest sparks${design.driver?.kind === 'spark_gap' ? ' (common practice: run the tank a few per cent below the bare secondary)' : ''}.`,
      );
    } else if (design.resonator) {
      notes.push(
        `Start at ${formatNumber(tap)} turns: with three coils the tap is the one that brings the three modes nearest 1:2:3 (three_coil_ratio_error), not the tuning to one frequency. Streamers load the resonator's top and pull its mode down; retune with the line length or the tap while watching the spark, a quarter turn at a time.`,
      );
    } else {
      if (tuning.beyondPrimary !== null) notes.push(`Note: ${tuning.beyondPrimary}.`, '');
      notes.push(
        `Start at ${formatNumber(tap)} turns, the bare tuning; streamers lower the secondary's frequency, so move the tap outward (more turns) a quarter turn at a time (common practice).`,
      );
    }
  }
  if (figures.length > 0) sections.push({ title: 'Predicted tuning', figures, notes });
}

/**
 * The streamer-loaded frequency: the metric when the design gives a streamer length, otherwise a
 * second evaluation with streamer_length = spark_length (the common-practice spark estimate).
 */
function loadedFrequency(
  design: Design,
  evaluation: Evaluation,
): { frequency: number; streamerLength: number; source: string } | null {
  const given = evaluation.metrics.loaded_resonant_frequency;
  if (given !== null && design.environment.streamerLength !== undefined) {
    return {
      frequency: given,
      streamerLength: design.environment.streamerLength,
      source: 'metric loaded_resonant_frequency',
    };
  }
  const spark = evaluation.metrics.spark_length;
  if (spark === null || !(spark > 0)) return null;
  const again = evaluateDesign({ ...design, environment: { ...design.environment, streamerLength: spark } });
  const frequency = again.metrics.loaded_resonant_frequency;
  if (frequency === null || again.problems.length > 0) return null;
  return {
    frequency,
    streamerLength: spark,
    source: 'metric loaded_resonant_frequency of the design with streamer_length = spark_length (rule of thumb)',
  };
}

/** The sheet as Markdown. */
export function sheetMarkdown(sheet: BuildSheet): string {
  const out: string[] = [`# Build sheet: ${sheet.title}`, ''];
  out.push(
    '> **DANGER.** Read the safety cautions at the end before building. Every figure below is a model estimate;',
    '> the column "from" says which metric, design field or rule it comes from.',
    '',
  );
  for (const section of sheet.sections) {
    out.push(`## ${section.title}`, '', '| what | value | from |', '| --- | ---: | --- |');
    for (const figure of section.figures)
      out.push(`| ${cell(figure.label)} | ${cell(figure.text)} | ${cell(figure.source)} |`);
    out.push('');
    for (const note of section.notes) out.push(note);
    if (section.notes.length > 0) out.push('');
  }
  out.push('## Parts', '', '| item | specification | quantity | unit | from |', '| --- | --- | ---: | --- | --- |');
  for (const part of sheet.parts) {
    out.push(
      `| ${cell(part.item)} | ${cell(part.specification)} | ${formatNumber(part.quantity)} | ${part.unit} | ${cell(part.source)} |`,
    );
  }
  out.push('');
  out.push('## Warnings', '');
  if (sheet.warnings.length === 0) out.push('None.');
  for (const warning of sheet.warnings) out.push(`- ${cell(warning)}`);
  out.push('', '## Safety', '');
  // one bullet per caution: a line of SAFETY_CAUTIONS that does not start with spaces begins one
  const bullets: string[] = [];
  for (const line of SAFETY_CAUTIONS) {
    if (line.startsWith(' ') && bullets.length > 0) bullets[bullets.length - 1] += ` ${line.trim()}`;
    else bullets.push(line.trim());
  }
  for (const bullet of bullets) out.push(`- ${bullet}`);
  out.push('');
  return `${out.join('\n')}\n`;
}

function cell(text: string): string {
  return text.replace(/\|/g, '\\|').replace(/\n/g, ' ');
}

/** The parts list as CSV: item, specification, quantity, unit, source. */
export function partsCsv(sheet: BuildSheet): string {
  return toCsv(
    ['item', 'specification', 'quantity', 'unit', 'from'],
    sheet.parts.map((part) => [part.item, part.specification, part.quantity, part.unit, part.source]),
  );
}
