/**
 * Quantities with units, at the edge of the program: design and sweep files give every quantity as a
 * number in SI base units or as a string with a unit ("160 mm", "6.5 in", "30 nF", "14 kV"); this module
 * turns them into SI numbers, and turns SI numbers back into practical units for CSVs and reports.
 * Table-driven, never eval. Unknown or mismatched units are errors with the reason.
 */

/** The kinds of quantity a design file holds. */
export type QuantityKind =
  | 'length'
  | 'capacitance'
  | 'inductance'
  | 'voltage'
  | 'current'
  | 'frequency'
  | 'power'
  | 'angle'
  | 'temperature'
  | 'time'
  | 'resistance'
  | 'mass'
  | 'energy'
  | 'field'
  | 'inverse_length'
  | 'dimensionless';

interface UnitDefinition {
  /** SI value = scale × given + offset. */
  scale: number;
  offset?: number;
}

const MICRO = ['u', 'µ', 'μ'];

function withMicro(prefixless: string, scale: number): Record<string, UnitDefinition> {
  const table: Record<string, UnitDefinition> = {};
  for (const mark of MICRO) table[mark + prefixless] = { scale };
  return table;
}

/** Units accepted for each kind, by their exact spelling. SI base unit first. */
const UNITS: Record<QuantityKind, Record<string, UnitDefinition>> = {
  length: {
    m: { scale: 1 },
    mm: { scale: 1e-3 },
    cm: { scale: 1e-2 },
    km: { scale: 1e3 },
    ...withMicro('m', 1e-6),
    in: { scale: 0.0254 },
    inch: { scale: 0.0254 },
    inches: { scale: 0.0254 },
    ft: { scale: 0.3048 },
    foot: { scale: 0.3048 },
    feet: { scale: 0.3048 },
  },
  capacitance: {
    F: { scale: 1 },
    mF: { scale: 1e-3 },
    ...withMicro('F', 1e-6),
    nF: { scale: 1e-9 },
    pF: { scale: 1e-12 },
  },
  inductance: {
    H: { scale: 1 },
    mH: { scale: 1e-3 },
    ...withMicro('H', 1e-6),
    nH: { scale: 1e-9 },
  },
  voltage: { V: { scale: 1 }, mV: { scale: 1e-3 }, kV: { scale: 1e3 }, MV: { scale: 1e6 } },
  current: { A: { scale: 1 }, mA: { scale: 1e-3 }, kA: { scale: 1e3 } },
  frequency: { Hz: { scale: 1 }, kHz: { scale: 1e3 }, MHz: { scale: 1e6 }, bps: { scale: 1 } },
  power: { W: { scale: 1 }, kW: { scale: 1e3 }, MW: { scale: 1e6 } },
  angle: { rad: { scale: 1 }, deg: { scale: Math.PI / 180 }, '°': { scale: Math.PI / 180 } },
  temperature: {
    K: { scale: 1 },
    degC: { scale: 1, offset: 273.15 },
    '°C': { scale: 1, offset: 273.15 },
    degF: { scale: 5 / 9, offset: 273.15 - (32 * 5) / 9 },
    '°F': { scale: 5 / 9, offset: 273.15 - (32 * 5) / 9 },
  },
  time: {
    s: { scale: 1 },
    ms: { scale: 1e-3 },
    ...withMicro('s', 1e-6),
    ns: { scale: 1e-9 },
    min: { scale: 60 },
    h: { scale: 3600 },
  },
  resistance: {
    ohm: { scale: 1 },
    Ohm: { scale: 1 },
    Ω: { scale: 1 },
    mohm: { scale: 1e-3 },
    kohm: { scale: 1e3 },
    kΩ: { scale: 1e3 },
    mΩ: { scale: 1e-3 },
  },
  mass: { kg: { scale: 1 }, g: { scale: 1e-3 }, lb: { scale: 0.45359237 } },
  energy: { J: { scale: 1 }, kJ: { scale: 1e3 }, mJ: { scale: 1e-3 } },
  field: {
    'V/m': { scale: 1 },
    'kV/m': { scale: 1e3 },
    'MV/m': { scale: 1e6 },
    'kV/cm': { scale: 1e5 },
    'kV/mm': { scale: 1e6 },
  },
  inverse_length: { '1/m': { scale: 1 }, '/m': { scale: 1 }, '1/cm': { scale: 100 }, '/cm': { scale: 100 } },
  dimensionless: { '': { scale: 1 }, '%': { scale: 0.01 } },
};

/** Which kinds use each spelling: to say "14 kV is a voltage, not a length". */
const KIND_OF_UNIT = new Map<string, QuantityKind[]>();
for (const [kind, table] of Object.entries(UNITS) as [QuantityKind, Record<string, UnitDefinition>][]) {
  for (const unit of Object.keys(table)) {
    if (unit === '') continue;
    KIND_OF_UNIT.set(unit, [...(KIND_OF_UNIT.get(unit) ?? []), kind]);
  }
}

const ARTICLE: Record<QuantityKind, string> = {
  length: 'a length',
  capacitance: 'a capacitance',
  inductance: 'an inductance',
  voltage: 'a voltage',
  current: 'a current',
  frequency: 'a frequency',
  power: 'a power',
  angle: 'an angle',
  temperature: 'a temperature',
  time: 'a time',
  resistance: 'a resistance',
  mass: 'a mass',
  energy: 'an energy',
  field: 'an electric field',
  inverse_length: 'a field per volt',
  dimensionless: 'a plain number',
};

/** The phrase "a length", "an inductance" for messages. */
export function describeKind(kind: QuantityKind): string {
  return ARTICLE[kind];
}

/** Units accepted for a kind, for messages ("mm, cm, m, in, ft"). */
export function unitsOf(kind: QuantityKind): string[] {
  return Object.keys(UNITS[kind]).filter((u) => u !== '');
}

const QUANTITY_PATTERN = /^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/;

/** The result of reading a quantity: an SI value, or the reason it could not be read. */
export type QuantityResult = { ok: true; value: number } | { ok: false; reason: string };

/**
 * Reads a quantity of the given kind: a finite number (taken as SI base units) or a string "number
 * unit". Never throws; the reason names what was expected and what was given.
 */
export function readQuantity(input: unknown, kind: QuantityKind): QuantityResult {
  const expected = `expected ${ARTICLE[kind]}${kind === 'dimensionless' ? '' : ` (a number in SI units or a string like ${example(kind)})`}`;
  if (typeof input === 'number') {
    if (!Number.isFinite(input)) return { ok: false, reason: `${expected}, got ${String(input)}` };
    return { ok: true, value: input };
  }
  if (typeof input !== 'string') return { ok: false, reason: `${expected}, got ${describeValue(input)}` };
  const match = QUANTITY_PATTERN.exec(input);
  if (!match) return { ok: false, reason: `${expected}, got '${input}'` };
  const number = Number(match[1]);
  const unit = match[2] ?? '';
  if (!Number.isFinite(number)) return { ok: false, reason: `${expected}, got '${input}'` };
  const definition = UNITS[kind][unit];
  if (!definition) {
    if (unit === '') return { ok: true, value: number };
    const otherKinds = KIND_OF_UNIT.get(unit);
    if (otherKinds && otherKinds.length > 0) {
      return {
        ok: false,
        reason: `'${input}' is ${ARTICLE[otherKinds[0]]}, ${expected.replace(/^expected /, 'expected ')}`,
      };
    }
    return {
      ok: false,
      reason: `unknown unit '${unit}' in '${input}'; ${ARTICLE[kind]} takes ${unitsOf(kind).join(', ')}`,
    };
  }
  return { ok: true, value: number * definition.scale + (definition.offset ?? 0) };
}

function example(kind: QuantityKind): string {
  const examples: Record<QuantityKind, string> = {
    length: "'160 mm'",
    capacitance: "'30 nF'",
    inductance: "'25 uH'",
    voltage: "'14 kV'",
    current: "'400 A'",
    frequency: "'120 Hz'",
    power: "'1.5 kW'",
    angle: "'30 deg'",
    temperature: "'20 degC'",
    time: "'200 us'",
    resistance: "'1.2 ohm'",
    mass: "'2.5 kg'",
    energy: "'40 J'",
    field: "'25 kV/cm'",
    inverse_length: "'3 1/m'",
    dimensionless: "'0.9'",
  };
  return examples[kind];
}

/** A short description of a value for messages: 'a list', 'true', "'abc'", '-5'. */
export function describeValue(value: unknown): string {
  if (value === null || value === undefined) return 'nothing';
  if (Array.isArray(value)) return 'a list';
  if (typeof value === 'object') return 'a mapping';
  if (typeof value === 'string') return `'${value}'`;
  return String(value);
}

/** Display units for output columns and reports: the practical unit of each SI unit. */
export interface DisplayUnit {
  /** Unit label as written in column names and reports. */
  label: string;
  /** Display value = SI value / divisor. */
  divisor: number;
}

/** Units `show` may write a quantity in, most natural first (each must be a unit readQuantity takes). */
const WRITE_UNITS: Partial<Record<QuantityKind, readonly string[]>> = {
  length: ['mm', 'm'],
  capacitance: ['nF', 'pF', 'uF'],
  inductance: ['uH', 'mH', 'H'],
  voltage: ['kV', 'V'],
  current: ['A'],
  frequency: ['Hz', 'kHz'],
  power: ['W', 'kW'],
  angle: ['deg', 'rad'],
  temperature: ['degC', 'K'],
  time: ['us', 'ms', 's'],
  resistance: ['ohm'],
  mass: ['kg', 'g'],
  energy: ['J'],
};

/**
 * A quantity as text in a practical unit with the fewest digits that read back (by readQuantity)
 * to exactly the same SI number: 0.16 → '160 mm', 1.5e-8 → '15 nF', 293.15 → '20 degC'. Null when
 * no unit of the list reproduces it exactly (the caller then writes the SI number).
 */
export function exactQuantityText(value: number, kind: QuantityKind): string | null {
  if (!Number.isFinite(value)) return null;
  let best: string | null = null;
  for (const unit of WRITE_UNITS[kind] ?? []) {
    const definition = UNITS[kind][unit];
    if (!definition) continue;
    const offset = definition.offset ?? 0;
    for (let digits = 1; digits <= 17; digits++) {
      const number = Number(((value - offset) / definition.scale).toPrecision(digits));
      if (number * definition.scale + offset !== value) continue;
      const text = `${String(number)} ${unit}`;
      if (best === null || text.length < best.length - 1) best = text;
      break;
    }
  }
  return best;
}
