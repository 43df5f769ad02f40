/**
 * The design file's vocabulary: every section and field, its kind of quantity, its limits, its
 * default and its meaning. This table is the single source from which the zod schemas of design and
 * sweep files (cli/design-schema.ts), the JSON Schema (`coilfront schema`) and the README's
 * reference are made, so a field is described once.
 */
import type { QuantityKind } from './units.ts';

export type FieldSpec =
  | {
      type: 'quantity';
      kind: QuantityKind;
      /** 'positive' > 0, 'nonnegative' ≥ 0, 'fraction' in (0, 1], 'any'. */
      range: 'positive' | 'nonnegative' | 'fraction' | 'any';
      integer?: boolean;
      optional?: boolean;
      default?: number;
      /**
       * Plausible SI magnitudes [low, high] for a bare number (one without a unit): outside them
       * the number is refused with the unit it probably meant. Defaults by kind (PLAUSIBLE_BY_KIND).
       */
      plausible?: readonly [number, number];
      /** The word `auto` may stand for the field left out (the core chooses it). */
      auto?: boolean;
      description: string;
    }
  | { type: 'enum'; values: readonly string[]; optional?: boolean; default?: string; description: string }
  | { type: 'boolean'; optional?: boolean; default?: boolean; description: string }
  | { type: 'wire'; optional?: boolean; description: string };

export interface SectionSpec {
  description: string;
  optional: boolean;
  fields: Record<string, FieldSpec>;
  /** Sections with several forms (topload shape, driver kind): the key and the form's own fields. */
  variants?: { key: string; forms: Record<string, Record<string, FieldSpec>> };
  /**
   * Sections nested inside this one (`tank: { bank: { part: { … } } }`), read after the fields. In the
   * normal tree their fields sit in this section under dotted keys ('bank.part.capacitance').
   */
  subsections?: Record<string, SectionSpec>;
}

const length = (description: string, extra: Partial<FieldSpec & { type: 'quantity' }> = {}): FieldSpec => ({
  type: 'quantity',
  kind: 'length',
  range: 'positive',
  description,
  ...extra,
});

/** The fields of one capacitor part of a tank bank (`tank.bank.part`). */
const BANK_PART_FIELDS: Record<string, FieldSpec> = {
  capacitance: { type: 'quantity', kind: 'capacitance', range: 'positive', description: 'capacitance of one part' },
  voltage_rating: {
    type: 'quantity',
    kind: 'voltage',
    range: 'positive',
    plausible: [50, 1e6],
    description: 'DC voltage rating of one part',
  },
  rms_current_rating: {
    type: 'quantity',
    kind: 'current',
    range: 'positive',
    description: 'rms current rating of one part',
  },
  peak_current_rating: {
    type: 'quantity',
    kind: 'current',
    range: 'positive',
    optional: true,
    description: 'peak current rating of one part',
  },
};

/** The layout fields of a tank bank, shared by `tank.bank` and its older spelling `tank_bank`. */
const BANK_LAYOUT_FIELDS: Record<string, FieldSpec> = {
  series: {
    type: 'quantity',
    kind: 'dimensionless',
    range: 'positive',
    integer: true,
    optional: true,
    auto: true,
    description:
      'parts in series per string, or auto (the default): the fewest that hold the working voltage × voltage_margin',
  },
  parallel: {
    type: 'quantity',
    kind: 'dimensionless',
    range: 'positive',
    integer: true,
    optional: true,
    auto: true,
    description: "strings in parallel, or auto (the default): the nearest to the tank's capacitance",
  },
  voltage_margin: {
    type: 'quantity',
    kind: 'dimensionless',
    range: 'positive',
    optional: true,
    default: 2,
    description: 'part rating over the largest voltage across it (default 2, common practice)',
  },
  bleed_time: {
    type: 'quantity',
    kind: 'time',
    range: 'positive',
    optional: true,
    default: 60,
    description: 'time in which the bleeders bring the bank below 50 V (default 60 s, common practice)',
  },
};

/** `tank.bank`: the tank capacitor built from identical parts; its `part` is a section of its own. */
const TANK_BANK_SECTION: SectionSpec = {
  description: 'the tank capacitor built from identical capacitor parts, series × parallel',
  optional: true,
  fields: BANK_LAYOUT_FIELDS,
  subsections: {
    part: { description: 'one capacitor part, as its maker rates it', optional: false, fields: BANK_PART_FIELDS },
  },
};

export const DESIGN_SECTIONS: Record<string, SectionSpec> = {
  secondary: {
    description: 'the tall single-layer secondary winding',
    optional: true,
    fields: {
      form_diameter: length('outside diameter of the coil form', { plausible: [5e-3, 5] }),
      wire: { type: 'wire', description: "wire size: 'AWG n' (ASTM B258) or a bare copper diameter such as '0.6 mm'" },
      insulation: {
        type: 'enum',
        values: ['grade_1', 'grade_2', 'grade_3', 'none'],
        optional: true,
        default: 'grade_2',
        description: 'enamel build grade of IEC 60317-0-1 (grade_2 ≈ heavy build), or none for bare wire',
      },
      wire_overall_diameter: length('measured insulated wire diameter; overrides the grade', { optional: true }),
      turns: {
        type: 'quantity',
        kind: 'dimensionless',
        range: 'positive',
        optional: true,
        description: 'number of turns (give turns or winding_length)',
      },
      winding_length: length('axial length of the winding (give turns or winding_length)', { optional: true }),
      pitch: length('axial distance between turn centres; close-wound (the insulated diameter) when absent', {
        optional: true,
      }),
      base_height: length('bottom of the winding above the floor', {
        range: 'nonnegative',
        optional: true,
        default: 0,
      }),
      voltage_profile: {
        type: 'enum',
        values: ['computed', 'linear', 'quarter_wave'],
        optional: true,
        default: 'computed',
        description:
          'voltage distribution along the winding: computed by the distributed model of the winding (default), or an assumed linear or quarter-wave shape with the lumped frequency',
      },
    },
  },
  topload: {
    description: 'the top terminal',
    optional: true,
    fields: {
      height_above_winding: length('mid-plane (sphere: centre) above the top of the winding', {
        range: 'any',
        optional: true,
      }),
      center_height: length('mid-plane (sphere: centre) above the floor, for a topload without a secondary', {
        optional: true,
      }),
    },
    variants: {
      key: 'shape',
      forms: {
        toroid: {
          outer_diameter: length('overall outside diameter of the toroid'),
          tube_diameter: length('diameter of the tube (minor diameter)'),
          center_disc: {
            type: 'boolean',
            optional: true,
            default: false,
            description:
              "a flat metal disc filling the hole in the mid-plane, at the toroid's potential; a breakout point at the top then stands on its centre, on the axis",
          },
        },
        sphere: { diameter: length('diameter of the sphere') },
      },
    },
  },
  primary: {
    description: 'the primary winding, modelled as coaxial rings',
    optional: true,
    fields: {
      inner_diameter: length("diameter of the innermost ring, to the conductor's centre line"),
      turns: {
        type: 'quantity',
        kind: 'dimensionless',
        range: 'positive',
        description: 'number of rings (a fraction makes the last ring partial)',
      },
      conductor_diameter: length('diameter of the conductor (tube or wire)', { plausible: [1e-4, 0.1] }),
      turn_spacing: length('gap between neighbouring conductors; pitch = conductor diameter + spacing', {
        range: 'nonnegative',
      }),
      elevation: length("height of the innermost ring above the secondary's bottom turn", {
        range: 'any',
        optional: true,
        default: 0,
      }),
      tap_turns: {
        type: 'quantity',
        kind: 'dimensionless',
        range: 'positive',
        optional: true,
        description: 'fixed tap, turns from the inner end; chosen to tune the tank to the secondary when absent',
      },
      require_tuning: {
        type: 'boolean',
        optional: true,
        default: true,
        description:
          "a design whose tank cannot come within 3 % of the secondary's frequency is infeasible; false keeps it with a warning",
      },
    },
    variants: {
      key: 'shape',
      forms: {
        flat_spiral: {},
        helix: {},
        cone: {
          cone_angle: {
            type: 'quantity',
            kind: 'angle',
            range: 'positive',
            description: 'rise of the cone above the horizontal',
          },
        },
      },
    },
  },
  strike_rail: {
    description: 'a grounded ring above the primary that catches strikes',
    optional: true,
    fields: {
      diameter: length("diameter of the ring's centre line"),
      conductor_diameter: length('diameter of the rail conductor', { plausible: [1e-4, 0.1] }),
      elevation: length("height above the secondary's bottom turn", { range: 'any', optional: true, default: 0 }),
    },
  },
  tank: {
    description: 'the tank capacitor',
    optional: true,
    fields: {
      capacitance: { type: 'quantity', kind: 'capacitance', range: 'positive', description: 'tank capacitance' },
      charge_voltage: {
        type: 'quantity',
        kind: 'voltage',
        range: 'positive',
        optional: true,
        plausible: [300, 1e6],
        description: 'voltage the capacitor is charged to before each shot (spark-gap driver)',
      },
      voltage_rating: {
        type: 'quantity',
        kind: 'voltage',
        range: 'positive',
        optional: true,
        plausible: [300, 1e6],
        description: 'DC rating of the capacitor bank, for the rating check',
      },
    },
    subsections: { bank: TANK_BANK_SECTION },
  },
  driver: {
    description: 'what drives the primary',
    optional: true,
    fields: {},
    variants: {
      key: 'kind',
      forms: {
        spark_gap: {
          gap: {
            type: 'enum',
            values: ['static', 'rotary'],
            optional: true,
            default: 'static',
            description: 'kind of gap',
          },
          break_rate: { type: 'quantity', kind: 'frequency', range: 'positive', description: 'firings per second' },
          gap_resistance: {
            type: 'quantity',
            kind: 'resistance',
            range: 'nonnegative',
            optional: true,
            description: 'equivalent resistance of the conducting gap (common practice about 1 ohm)',
          },
          quench: {
            type: 'boolean',
            optional: true,
            default: true,
            description: 'the gap opens at the first primary current zero after the first energy transfer',
          },
        },
        solid_state: {
          bridge: {
            type: 'enum',
            values: ['full', 'half'],
            optional: true,
            default: 'full',
            description: 'bridge topology',
          },
          bus_voltage: { type: 'quantity', kind: 'voltage', range: 'positive', description: 'DC bus voltage' },
          current_limit: {
            type: 'quantity',
            kind: 'current',
            range: 'positive',
            optional: true,
            description: 'primary peak current at which the burst is cut short',
          },
          on_time: {
            type: 'quantity',
            kind: 'time',
            range: 'positive',
            optional: true,
            description: 'length of one burst',
          },
          cycles: {
            type: 'quantity',
            kind: 'dimensionless',
            range: 'positive',
            integer: true,
            optional: true,
            description: 'length of one burst in drive cycles (instead of on_time)',
          },
          repetition_rate: { type: 'quantity', kind: 'frequency', range: 'positive', description: 'bursts per second' },
        },
      },
    },
  },
  environment: {
    description: 'the air around the coil',
    optional: true,
    fields: {
      altitude: length('altitude above sea level (standard atmosphere)', {
        range: 'any',
        optional: true,
        default: 0,
        plausible: [0, 9000],
      }),
      temperature: {
        type: 'quantity',
        kind: 'temperature',
        range: 'positive',
        optional: true,
        default: 293.15,
        description: 'air temperature',
      },
      surface_factor: {
        type: 'quantity',
        kind: 'dimensionless',
        range: 'fraction',
        optional: true,
        description: "Peek's surface factor of the topload, 1 for polished (default: see the physics notes)",
      },
      streamer_length: length('streamer length assumed for loading the topload; estimated from power when absent', {
        range: 'nonnegative',
        optional: true,
      }),
    },
  },
  // --- appended: the supply, a tank built from capacitor parts, the safety gap ---
  supply: {
    description: 'the supply transformer that charges the tank (spark-gap drivers)',
    optional: true,
    fields: {
      kind: {
        type: 'enum',
        values: ['current_limited', 'ballasted'],
        optional: true,
        default: 'current_limited',
        description:
          'current_limited: the rated current is the short-circuit current; ballasted: a stiff transformer behind a ballast of ballast_impedance',
      },
      voltage: {
        type: 'quantity',
        kind: 'voltage',
        range: 'positive',
        plausible: [50, 1e6],
        description: 'rated output voltage, rms',
      },
      current: {
        type: 'quantity',
        kind: 'current',
        range: 'positive',
        optional: true,
        description: 'rated output current, rms (give current or power)',
      },
      power: {
        type: 'quantity',
        kind: 'power',
        range: 'positive',
        optional: true,
        description: 'rated output in VA (give current or power)',
      },
      frequency: { type: 'quantity', kind: 'frequency', range: 'positive', description: 'mains frequency' },
      ballast_impedance: {
        type: 'quantity',
        kind: 'resistance',
        range: 'positive',
        optional: true,
        description: 'impedance of the ballast (kind: ballasted): short-circuit current = voltage / impedance',
      },
    },
  },
  tank_bank: {
    description:
      'the older spelling of tank.bank, read as it: part_capacitance for part.capacitance and so on (tank.bank is the canonical form)',
    optional: true,
    fields: {
      ...Object.fromEntries(Object.entries(BANK_PART_FIELDS).map(([key, field]) => [`part_${key}`, field])),
      ...BANK_LAYOUT_FIELDS,
    },
  },
  safety_gap: {
    description: 'a safety gap across the tank, set to fire at a multiple of the charge voltage',
    optional: true,
    fields: {
      electrodes: {
        type: 'enum',
        values: ['sphere', 'rounded'],
        optional: true,
        default: 'sphere',
        description: 'sphere: from the sphere-gap table of IEC 60052; rounded: about 3 kV/mm (common practice)',
      },
      sphere_diameter: length('diameter of the spheres (electrodes: sphere)', { optional: true }),
      fire_at: {
        type: 'quantity',
        kind: 'dimensionless',
        range: 'positive',
        optional: true,
        default: 1.3,
        description: 'firing voltage over the charge voltage (common practice 1.2–1.5)',
      },
    },
  },
  resonator: {
    description:
      'a separate resonator (three-coil system): a second winding on the floor that carries the topload, fed at its base from the top of the secondary (then the driver) through a line; height_above_winding of the topload is then above this winding',
    optional: true,
    fields: {
      form_diameter: length("outside diameter of the resonator's form", { plausible: [5e-3, 5] }),
      wire: { type: 'wire', description: "the resonator's wire: 'AWG n' (ASTM B258) or a bare copper diameter" },
      insulation: {
        type: 'enum',
        values: ['grade_1', 'grade_2', 'grade_3', 'none'],
        optional: true,
        default: 'grade_2',
        description: 'enamel build grade of IEC 60317-0-1, or none for bare wire',
      },
      wire_overall_diameter: length('measured insulated wire diameter; overrides the grade', { optional: true }),
      turns: {
        type: 'quantity',
        kind: 'dimensionless',
        range: 'positive',
        optional: true,
        description: 'turns of the resonator (give turns or winding_length)',
      },
      winding_length: length('axial length of the resonator winding (give turns or winding_length)', {
        optional: true,
      }),
      pitch: length('axial distance between turn centres; close-wound when absent', { optional: true }),
      base_height: length('bottom of the resonator winding above the floor', {
        range: 'nonnegative',
        optional: true,
        default: 0,
      }),
      line_length: length("length of the line from the secondary's top to the resonator's base"),
      line_conductor_diameter: length("diameter of the line's round conductor", { plausible: [1e-4, 0.1] }),
      line_height: length('height of the line above the floor'),
      axis_spacing: length(
        "distance between the secondary's and the resonator's axes that the floor space allows (the line length when absent)",
        { optional: true },
      ),
    },
  },
  breakout_point: {
    description:
      'a rod with a hemispherical tip standing out of the topload (on the resonator in a three-coil design), sized so that the discharge starts there (give one of length, fire_at_voltage, fire_at_fraction)',
    optional: true,
    fields: {
      position: {
        type: 'enum',
        values: ['top', 'rim'],
        optional: true,
        default: 'top',
        description:
          "where it stands: top (a sphere's pole, on the axis; a toroid's crown, or with center_disc the disc's centre, on the axis), pointing up, or rim (the outer equator), pointing outward",
      },
      tip_radius: length('radius of the hemispherical tip (and of the rod)', { plausible: [1e-4, 0.1] }),
      length: length("height of the rod from the topload's surface to the tip's apex (at least the tip radius)", {
        optional: true,
      }),
      fire_at_voltage: {
        type: 'quantity',
        kind: 'voltage',
        range: 'positive',
        optional: true,
        description: 'top voltage at which the point is to fire; the rod length is solved for',
      },
      fire_at_fraction: {
        type: 'quantity',
        kind: 'dimensionless',
        range: 'fraction',
        optional: true,
        description:
          "the same as a fraction of the bare topload's breakout voltage (such as 0.85); the rod length is solved for",
      },
    },
  },
  supports: {
    description:
      'insulating supports of the topload (on the resonator in a three-coil design): a central column or a set of straight rods; the field along them is reported (their permittivity ignored)',
    optional: true,
    fields: {
      diameter: length('diameter of the column or of each rod', { plausible: [1e-3, 1] }),
      field_limit: {
        type: 'quantity',
        kind: 'field',
        range: 'positive',
        optional: true,
        description: 'largest surface field allowed along a support (common practice 1 MV/m = 10 kV/cm when absent)',
      },
    },
    variants: {
      key: 'kind',
      forms: {
        column: {
          from: {
            type: 'enum',
            values: ['floor', 'winding_top'],
            optional: true,
            default: 'winding_top',
            description:
              "where the column on the axis starts: the floor (inside the coil form) or the top of the winding (the resonator's in a three-coil design); it ends at the topload (a sphere's underside, a toroid's mid-plane)",
          },
        },
        rods: {
          count: {
            type: 'quantity',
            kind: 'dimensionless',
            range: 'positive',
            integer: true,
            optional: true,
            default: 3,
            description: 'rods spaced evenly around the axis',
          },
          from_radius: length('first end of a rod: distance from the axis', { range: 'nonnegative' }),
          from_height: length('first end of a rod: height above the floor', { range: 'any' }),
          to_radius: length('second end of a rod: distance from the axis', { range: 'nonnegative' }),
          to_height: length('second end of a rod: height above the floor', { range: 'any' }),
        },
      },
    },
  },
};

/** The fields of a section in a given form (variant), the variant key excluded. */
export function sectionFields(section: SectionSpec, form: string | undefined): Record<string, FieldSpec> {
  if (!section.variants || form === undefined) return section.fields;
  return { ...section.fields, ...(section.variants.forms[form] ?? {}) };
}

/**
 * Every leaf field of a section by its dotted key in the normal tree ('capacitance',
 * 'bank.part.capacitance'), in the forms that `values` (a normal section) names.
 */
export function flatFields(
  section: SectionSpec,
  values: Record<string, unknown> = {},
  prefix = '',
): Record<string, FieldSpec> {
  const key = section.variants?.key;
  const form = key !== undefined ? values[`${prefix}${key}`] : undefined;
  const out: Record<string, FieldSpec> = {};
  for (const [name, field] of Object.entries(sectionFields(section, typeof form === 'string' ? form : undefined)))
    out[`${prefix}${name}`] = field;
  for (const [name, sub] of Object.entries(section.subsections ?? {}))
    Object.assign(out, flatFields(sub, values, `${prefix}${name}.`));
  return out;
}

/** The spec of a section nested at a dotted path below `section` ('bank.part'), or undefined. */
export function subsectionAt(section: SectionSpec, path: string): SectionSpec | undefined {
  let at: SectionSpec | undefined = section;
  for (const name of path.split('.')) at = at?.subsections?.[name];
  return at;
}
