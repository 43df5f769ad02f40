/**
 * Reading the design tree of design files and sweep files, validated with zod leaf schemas made from
 * the field table (cli/design-fields.ts).
 *
 * A design file's tree becomes a *normal tree*: the same sections and field names, every quantity an
 * SI number, every wire a `WireValue`. In a sweep file any leaf may instead be a range (`{ from, to,
 * integer, scale, step }`) or a set (`{ choose: [...] }`), and a whole section may be a set of
 * sections (toroids on hand); those places become `Dimension`s of the design space, and the normal
 * tree holds a `DimensionSlot` there, to be filled from a sample point.
 */
import * as z from 'zod';
import { stringify as yamlStringify } from 'yaml';
import { DESIGN_SECTIONS, flatFields, sectionFields, type FieldSpec, type SectionSpec } from './design-fields.ts';
import { describeValue, readQuantity, describeKind, type QuantityKind, unitsOf } from './units.ts';
import type { InputIssue } from '../run/input-error.ts';
import {
  isSlot,
  type Dimension,
  type DimensionSlot,
  type LeafValue,
  type NormalSection,
  type NormalTree,
  type WireValue,
} from '../optimize/design-tree.ts';
import { suggest } from './suggest.ts';
import { must } from '../core/must.ts';
import { awgDiameter } from '../core/wire/awg.ts';
import { STOCK_CATALOGUES, stockBetween, stockNames } from './stock/catalogues.ts';

export type {
  Dimension,
  DimensionSlot,
  LeafValue,
  NormalSection,
  NormalTree,
  WireValue,
} from '../optimize/design-tree.ts';

type Mode = 'design' | 'sweep';

interface WalkState {
  mode: Mode;
  issues: InputIssue[];
  dimensions: Dimension[];
}

function isMapping(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function unknownKeyMessage(key: string, known: string[]): string {
  const guess = suggest(key, known);
  return guess
    ? `unknown key '${key}' (did you mean '${guess}'?)`
    : `unknown key '${key}'; expected one of ${known.join(', ')}`;
}

// ---------------------------------------------------------------- leaf schemas (zod)

const AWG_PATTERN = /^\s*(?:AWG\s*#?\s*(\d{1,2}|0{1,4}|[1-4]\/0)|#?\s*(\d{1,2}|0{1,4}|[1-4]\/0)\s*AWG)\s*$/i;

/** The AWG number of '0000' (−3), '4/0' (−3), '00' (−1), '26' (26). */
function awgNumber(text: string): number {
  if (/^[1-4]\/0$/.test(text)) return 1 - Number(text[0]);
  if (/^0+$/.test(text)) return 1 - text.length;
  return Number(text);
}

function wireSchema() {
  return z.unknown().transform((input, context): WireValue => {
    if (typeof input === 'string') {
      const gauge = AWG_PATTERN.exec(input);
      if (gauge) {
        const n = awgNumber(gauge[1] ?? gauge[2]);
        if (n < -3 || n > 44) {
          context.addIssue({ code: 'custom', message: `unknown wire gauge '${input}': AWG runs from 0000 to 44` });
          return z.NEVER;
        }
        return { awg: n };
      }
      if (/awg/i.test(input)) {
        context.addIssue({ code: 'custom', message: `unknown wire gauge '${input}': write 'AWG 26' (0000 to 44)` });
        return z.NEVER;
      }
    }
    if (typeof input === 'number' && input >= 1e-2) {
      context.addIssue({
        code: 'custom',
        message: `expected a wire: 'AWG n' or a bare diameter like '0.6 mm', got ${input} (a bare number is metres; did you mean 'AWG ${input}'?)`,
      });
      return z.NEVER;
    }
    const diameter = readQuantity(input, 'length');
    if (!diameter.ok) {
      context.addIssue({
        code: 'custom',
        message: `expected a wire: 'AWG n' or a bare diameter like '0.6 mm', got ${describeValue(input)}`,
      });
      return z.NEVER;
    }
    if (!(diameter.value > 0)) {
      context.addIssue({ code: 'custom', message: `expected a positive wire diameter, got ${describeValue(input)}` });
      return z.NEVER;
    }
    if (diameter.value > 0.02) {
      context.addIssue({
        code: 'custom',
        message: `a wire diameter of ${describeValue(input)} is not a winding wire (above 20 mm)`,
      });
      return z.NEVER;
    }
    return { bareDiameter: diameter.value };
  });
}

function rangePhrase(field: FieldSpec & { type: 'quantity' }): string {
  const what =
    field.kind === 'dimensionless'
      ? field.integer
        ? 'integer'
        : 'number'
      : describeKind(field.kind).replace(/^an? /, '');
  switch (field.range) {
    case 'positive':
      return `a positive ${what}`;
    case 'nonnegative':
      return `a non-negative ${what}`;
    case 'fraction':
      return `a ${what} above 0 and at most 1`;
    default:
      return `${describeKind(field.kind)}`;
  }
}

/**
 * Plausible SI magnitudes of a bare number by kind of quantity, for a coil on a workshop floor (our
 * own bounds, generous on both sides): a bare number outside them was almost surely meant in a unit.
 */
export const PLAUSIBLE_BY_KIND: Partial<Record<QuantityKind, readonly [number, number]>> = {
  length: [1e-4, 30],
  capacitance: [1e-13, 1e-3],
  inductance: [1e-9, 10],
  voltage: [10, 1e7],
};

/** Units to suggest for an implausible bare number, most likely first (label, SI scale). */
const SUGGESTED_UNITS: Partial<Record<QuantityKind, ReadonlyArray<[string, number]>>> = {
  length: [
    ['mm', 1e-3],
    ['cm', 1e-2],
  ],
  capacitance: [
    ['nF', 1e-9],
    ['pF', 1e-12],
    ['uF', 1e-6],
  ],
  inductance: [
    ['uH', 1e-6],
    ['mH', 1e-3],
  ],
  voltage: [['kV', 1e3]],
};

/** The SI unit of each kind that has plausible bounds: its name for messages and its symbol. */
const SI_UNIT: Partial<Record<QuantityKind, { name: string; symbol: string }>> = {
  length: { name: 'metres', symbol: 'm' },
  capacitance: { name: 'farads', symbol: 'F' },
  inductance: { name: 'henries', symbol: 'H' },
  voltage: { name: 'volts', symbol: 'V' },
};

const BARE_NUMBER = /^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/;

/**
 * Why a bare number is implausible for its field, with the unit it probably meant, or null:
 * "110 (metres?) is not a plausible value here (0.1 mm to 30 m); did you mean '110 mm'?".
 */
export function implausibleBareNumber(
  field: FieldSpec & { type: 'quantity' },
  input: unknown,
  value: number,
): string | null {
  const bare = typeof input === 'number' || (typeof input === 'string' && BARE_NUMBER.test(input));
  const bounds = field.plausible ?? PLAUSIBLE_BY_KIND[field.kind];
  if (!bare || !bounds || value === 0 || !Number.isFinite(value)) return null;
  const magnitude = Math.abs(value);
  const [low, high] = bounds;
  const tooSmall = field.range === 'positive' && magnitude < low;
  if (!tooSmall && magnitude <= high) return null;
  const shown = typeof input === 'number' ? String(input) : String(input).trim();
  const unit = (SUGGESTED_UNITS[field.kind] ?? []).find(([, scale]) => {
    const meant = magnitude * scale;
    return meant >= low && meant <= high;
  });
  const span = `${formatBound(low, field.kind)} to ${formatBound(high, field.kind)}`;
  const guess = unit
    ? `; did you mean '${shown} ${unit[0]}'?`
    : `; give a unit, e.g. ${unitsOf(field.kind).slice(0, 3).join(', ')}`;
  return `${shown} (${SI_UNIT[field.kind]?.name ?? 'SI units'}?) is not a plausible ${describeKind(field.kind).replace(/^an? /, '')} here (${span})${guess}`;
}

/** A bound in the largest unit that keeps it at least 1: 5 mm, 30 m, 0.1 pF, 1000 uF. */
function formatBound(value: number, kind: QuantityKind): string {
  const units: Array<[string, number]> = [
    [SI_UNIT[kind]?.symbol ?? '', 1],
    ...[...(SUGGESTED_UNITS[kind] ?? [])].sort((a, b) => b[1] - a[1]),
  ];
  const [label, scale] = units.find(([, unitScale]) => value >= unitScale * 0.999) ??
    units[units.length - 1] ?? ['', 1];
  return `${Number((value / scale).toPrecision(3))} ${label}`;
}

function quantitySchema(field: FieldSpec & { type: 'quantity' }) {
  return z.unknown().transform((input, context): number => {
    const result = readQuantity(input, field.kind);
    if (!result.ok) {
      context.addIssue({ code: 'custom', message: result.reason });
      return z.NEVER;
    }
    const value = result.value;
    const implausible = implausibleBareNumber(field, input, value);
    if (implausible !== null) {
      context.addIssue({ code: 'custom', message: implausible });
      return z.NEVER;
    }
    const inRange =
      field.range === 'positive'
        ? value > 0
        : field.range === 'nonnegative'
          ? value >= 0
          : field.range === 'fraction'
            ? value > 0 && value <= 1
            : true;
    if (!inRange || (field.integer && !Number.isInteger(value))) {
      context.addIssue({
        code: 'custom',
        message: `expected ${field.integer ? rangePhrase(field).replace('number', 'integer') : rangePhrase(field)}, got ${describeValue(input)}`,
      });
      return z.NEVER;
    }
    return value;
  });
}

const leafSchemaCache = new Map<FieldSpec, z.ZodType<LeafValue>>();

/** The zod schema of one leaf of the design tree. */
export function leafSchema(field: FieldSpec): z.ZodType<LeafValue> {
  let schema = leafSchemaCache.get(field);
  if (schema) return schema;
  switch (field.type) {
    case 'quantity':
      schema = quantitySchema(field);
      break;
    case 'wire':
      schema = wireSchema();
      break;
    case 'boolean':
      schema = z.boolean({ error: (issue) => `expected true or false, got ${describeValue(issue.input)}` });
      break;
    case 'enum':
      schema = z.unknown().transform((input, context): string => {
        if (typeof input === 'string' && field.values.includes(input)) return input;
        const guess = typeof input === 'string' ? suggest(input, [...field.values]) : null;
        context.addIssue({
          code: 'custom',
          message: `expected one of ${field.values.join(', ')}, got ${describeValue(input)}${guess ? ` (did you mean '${guess}'?)` : ''}`,
        });
        return z.NEVER;
      });
      break;
  }
  leafSchemaCache.set(field, schema);
  return schema;
}

function readLeaf(
  field: FieldSpec,
  input: unknown,
  path: Array<string | number>,
  issues: InputIssue[],
): LeafValue | undefined {
  const result = leafSchema(field).safeParse(input);
  if (result.success) return result.data;
  const issue = result.error.issues[0];
  issues.push({
    path: [...path, ...issue.path.map((p) => (typeof p === 'symbol' ? String(p) : p))],
    message: issue.message,
  });
  return undefined;
}

// ---------------------------------------------------------------- sweep leaves: ranges and sets

const RANGE_KEYS = ['from', 'to', 'integer', 'scale', 'step'];

function readRange(
  field: FieldSpec,
  input: Record<string, unknown>,
  path: string[],
  state: WalkState,
): DimensionSlot | undefined {
  const issues = state.issues;
  if (field.type !== 'quantity') {
    issues.push({
      path,
      message: `a range needs a numeric field; use { choose: [...] } for ${field.type === 'wire' ? 'wire sizes' : 'this field'}`,
    });
    return undefined;
  }
  const bounds = readRangeBounds(field, input, path, issues);
  if (bounds === undefined) return undefined;
  const { from, to } = bounds;
  const options = readRangeOptions(field, input, path, from, issues);
  if (options === undefined) return undefined;
  if (options.integer && Math.floor(to) < Math.ceil(from)) {
    issues.push({ path, message: `no integer lies between ${from} and ${to}` });
    return undefined;
  }
  state.dimensions.push({
    kind: 'range',
    path,
    quantity: field.kind,
    from,
    to,
    scale: options.scale,
    integer: options.integer || (field.integer ?? false),
    step: options.step,
  });
  return { slot: state.dimensions.length - 1 };
}

/** A range's keys and its `from` below its `to`, SI; undefined after pushing the problem. */
function readRangeBounds(
  field: FieldSpec & { type: 'quantity' },
  input: Record<string, unknown>,
  path: string[],
  issues: InputIssue[],
): { from: number; to: number } | undefined {
  for (const key of Object.keys(input)) {
    if (!RANGE_KEYS.includes(key)) {
      issues.push({ path: [...path, key], message: unknownKeyMessage(key, RANGE_KEYS) });
      return undefined;
    }
  }
  for (const key of ['from', 'to']) {
    if (!(key in input)) {
      issues.push({ path, message: `a range needs both 'from' and 'to'; '${key}' is missing` });
      return undefined;
    }
  }
  const before = issues.length;
  const from = readLeaf(field, input.from, [...path, 'from'], issues) as number | undefined;
  const to = readLeaf(field, input.to, [...path, 'to'], issues) as number | undefined;
  if (issues.length > before || from === undefined || to === undefined) return undefined;
  if (!(from < to)) {
    issues.push({
      path,
      message:
        from === to
          ? `'from' equals 'to' (${describeValue(input.from)}); give a fixed value instead of a range`
          : `reversed range: 'from' (${describeValue(input.from)}) must be below 'to' (${describeValue(input.to)})`,
    });
    return undefined;
  }
  return { from, to };
}

/** A range's `integer`, `scale` and `step` (defaults: false, linear, none); undefined after pushing the problem. */
function readRangeOptions(
  field: FieldSpec & { type: 'quantity' },
  input: Record<string, unknown>,
  path: string[],
  from: number,
  issues: InputIssue[],
): { integer: boolean; scale: 'linear' | 'log'; step: number | null } | undefined {
  let integer = false;
  if (input.integer !== undefined) {
    if (typeof input.integer !== 'boolean') {
      issues.push({
        path: [...path, 'integer'],
        message: `expected true or false, got ${describeValue(input.integer)}`,
      });
      return undefined;
    }
    integer = input.integer;
  }
  let scale: 'linear' | 'log' = 'linear';
  if (input.scale !== undefined) {
    if (input.scale !== 'linear' && input.scale !== 'log') {
      issues.push({ path: [...path, 'scale'], message: `expected linear or log, got ${describeValue(input.scale)}` });
      return undefined;
    }
    scale = input.scale;
  }
  if (scale === 'log' && !(from > 0)) {
    issues.push({
      path: [...path, 'from'],
      message: `a log-scale range needs a positive 'from', got ${describeValue(input.from)}`,
    });
    return undefined;
  }
  let step: number | null = null;
  if (input.step !== undefined) {
    const stepField: FieldSpec = { ...field, range: 'positive', integer: false };
    const value = readLeaf(stepField, input.step, [...path, 'step'], issues) as number | undefined;
    if (value === undefined) return undefined;
    if (scale === 'log') {
      issues.push({ path: [...path, 'step'], message: `'step' cannot be combined with scale: log` });
      return undefined;
    }
    step = value;
  }
  return { integer, scale, step };
}

function labelOf(input: unknown): string {
  if (typeof input === 'string' || typeof input === 'number' || typeof input === 'boolean') return String(input);
  return yamlStringify(input, { collectionStyle: 'flow' }).trim();
}

/** A quantity as written, '450 mm': its number and its unit. */
const WRITTEN_QUANTITY = /^(-?[\d.]+(?:e-?\d+)?)\s*([^\d\s].*)$/;

/**
 * A short label for a whole section chosen from a set: its shape (when it has one) and its first two
 * size quantities (not heights or elevations), as written, sharing their unit when they have the same
 * one ('toroid 450×110 mm').
 */
export function sectionLabel(item: Record<string, unknown>): string {
  const parts: string[] = [];
  for (const key of ['shape', 'kind']) if (typeof item[key] === 'string') parts.push(item[key] as string);
  const quantities: Array<[string, string]> = [];
  for (const [key, value] of Object.entries(item)) {
    // the size, not the position: heights and elevations say where the section sits
    if (key === 'shape' || key === 'kind' || /height|elevation/.test(key) || typeof value !== 'string') continue;
    const match = WRITTEN_QUANTITY.exec(value.trim());
    if (match) quantities.push([match[1], match[2]]);
  }
  const [first, second] = quantities;
  if (first && second && first[1] === second[1]) parts.push(`${first[0]}×${second[0]} ${first[1]}`);
  else parts.push(...quantities.slice(0, 2).map(([number, unit]) => `${number} ${unit}`));
  return parts.length > 0 ? parts.join(' ') : labelOf(item);
}

/**
 * One choice of a set and its label: for whole sections, the user's `label:` (taken out of the
 * section) or one built from its key dimensions; for leaves, the value as written.
 */
function sectionChoice(
  raw: unknown,
  sections: boolean,
  path: Array<string | number>,
  state: WalkState,
): { item: unknown; label: string } | undefined {
  if (!sections || !isMapping(raw)) return { item: raw, label: labelOf(raw) };
  if (!('label' in raw)) return { item: raw, label: sectionLabel(raw) };
  const { label, ...item } = raw;
  if (typeof label !== 'string' || label.trim() === '') {
    state.issues.push({
      path: [...path, 'label'],
      message: `expected a short text label, got ${describeValue(label)}`,
    });
    return undefined;
  }
  return { item, label: label.trim() };
}

/** Labels as built, except that two equal ones fall back to the choices written out in full. */
function uniqueLabels(labels: string[], items: unknown[]): string[] {
  return labels.map((label, i) => (labels.indexOf(label) !== labels.lastIndexOf(label) ? labelOf(items[i]) : label));
}

function readChoose(
  input: Record<string, unknown>,
  path: string[],
  state: WalkState,
  readOne: (item: unknown, itemPath: Array<string | number>) => LeafValue | NormalSection | undefined,
  field?: FieldSpec,
  sections = false,
): DimensionSlot | undefined {
  const keys = Object.keys(input);
  if (keys.length !== 1) {
    const extra = must(keys.find((k) => k !== 'choose'));
    state.issues.push({ path: [...path, extra], message: `a set takes only 'choose', got '${extra}' beside it` });
    return undefined;
  }
  const items = input.choose;
  if (!Array.isArray(items)) {
    state.issues.push({
      path: [...path, 'choose'],
      message: `expected a list of choices, got ${describeValue(items)}`,
    });
    return undefined;
  }
  if (items.length === 0) {
    state.issues.push({ path: [...path, 'choose'], message: 'the set is empty; give at least one choice' });
    return undefined;
  }
  const values: Array<LeafValue | NormalSection> = [];
  const labels: string[] = [];
  for (let i = 0; i < items.length; i++) {
    const choice = sectionChoice(items[i], sections, [...path, 'choose', i], state);
    if (choice === undefined) return undefined;
    const value = readOne(choice.item, [...path, 'choose', i]);
    if (value === undefined) return undefined;
    values.push(value);
    labels.push(choice.label);
  }
  state.dimensions.push({
    kind: 'choose',
    path,
    values,
    labels: uniqueLabels(labels, items),
    ...(field?.type === 'quantity' ? { quantity: field.kind } : {}),
    ...(field?.type === 'wire' ? { wire: true } : {}),
  });
  return { slot: state.dimensions.length - 1 };
}

// ---------------------------------------------------------------- stock sets: sizes that can be bought

const STOCK_KEYS = ['stock', 'from', 'to'];

/** The bounds of a stock set as written: 'from 300 mm to 310 mm', 'from 300 mm', 'up to 8 mm'. */
function rangeText(from: unknown, to: unknown): string {
  if (from === undefined) return `up to ${describeValue(to)}`;
  if (to === undefined) return `from ${describeValue(from)} up`;
  return `from ${describeValue(from)} to ${describeValue(to)}`;
}

/** The diameter a wire value stands for, m (an AWG size by the ASTM B258 rule). */
function wireValueDiameter(wire: WireValue): number {
  return 'awg' in wire ? awgDiameter(wire.awg) : wire.bareDiameter;
}

/**
 * A stock set, `{ stock: NAME, from, to }` (from and to optional, inclusive): the catalogue's sizes
 * between the bounds, as an ordinary set of values (cli/stock/catalogues.ts). Length catalogues fit
 * length fields, wire catalogues wire fields; a wire's bounds may be written either way round.
 */
function readStock(
  field: FieldSpec,
  input: Record<string, unknown>,
  path: string[],
  state: WalkState,
): DimensionSlot | undefined {
  const issues = state.issues;
  for (const key of Object.keys(input)) {
    if (!STOCK_KEYS.includes(key)) {
      issues.push({ path: [...path, key], message: unknownKeyMessage(key, STOCK_KEYS) });
      return undefined;
    }
  }
  const name = input.stock;
  const catalogue = typeof name === 'string' ? STOCK_CATALOGUES.get(name) : undefined;
  if (catalogue === undefined) {
    const guess = typeof name === 'string' ? suggest(name, stockNames()) : null;
    issues.push({
      path: [...path, 'stock'],
      message: `unknown stock catalogue ${describeValue(name)}${guess ? ` (did you mean '${guess}'?)` : ''}; expected one of ${stockNames().join(', ')} (npx coilfront stock lists them)`,
    });
    return undefined;
  }
  const fieldKind = field.type === 'wire' ? 'wire' : field.type === 'quantity' ? field.kind : null;
  if (fieldKind !== catalogue.kind) {
    const fitting = [...STOCK_CATALOGUES.values()].filter((c) => c.kind === fieldKind).map((c) => c.name);
    const what = field.type === 'quantity' ? describeKind(field.kind) : field.type === 'wire' ? 'a wire' : field.type;
    issues.push({
      path: [...path, 'stock'],
      message: `stock '${catalogue.name}' holds ${catalogue.kind === 'wire' ? 'wire sizes' : 'lengths'}, but this field takes ${what}${fitting.length ? ` (use ${fitting.join(', ')})` : '; stock sets fit length and wire fields'}`,
    });
    return undefined;
  }
  const bound = (key: 'from' | 'to', fallback: number): number | undefined => {
    if (input[key] === undefined) return fallback;
    const value = readLeaf(field, input[key], [...path, key], issues);
    if (value === undefined) return undefined;
    return typeof value === 'number' ? value : wireValueDiameter(value as WireValue);
  };
  let low = bound('from', 0);
  let high = bound('to', Number.POSITIVE_INFINITY);
  if (low === undefined || high === undefined) return undefined;
  if (low > high) {
    if (catalogue.kind === 'wire') [low, high] = [high, low];
    else {
      issues.push({
        path,
        message: `reversed range: 'from' (${describeValue(input.from)}) must not be above 'to' (${describeValue(input.to)})`,
      });
      return undefined;
    }
  }
  const sizes = stockBetween(catalogue, low, high);
  if (sizes.length === 0) {
    const below = catalogue.sizes.filter((size) => size.diameter < low).at(-1);
    const above = catalogue.sizes.find((size) => size.diameter > high);
    const nearest = [below, above].filter((size) => size !== undefined).map((size) => size.label);
    issues.push({
      path,
      message: `no size of stock '${catalogue.name}' lies ${rangeText(input.from, input.to)}${nearest.length ? ` (nearest: ${nearest.join(', ')})` : ''}`,
    });
    return undefined;
  }
  state.dimensions.push({
    kind: 'choose',
    path,
    values: sizes.map((size) => size.value),
    labels: sizes.map((size) => size.label),
    ...(field.type === 'quantity' ? { quantity: field.kind } : {}),
    ...(field.type === 'wire' ? { wire: true } : {}),
  });
  return { slot: state.dimensions.length - 1 };
}

// ---------------------------------------------------------------- sections and the tree

function readSection(
  name: string,
  section: SectionSpec,
  input: unknown,
  path: string[],
  state: WalkState,
): NormalSection | DimensionSlot | undefined {
  if (state.mode === 'sweep' && isMapping(input) && 'choose' in input)
    return readSectionSet(name, section, input, path, state);
  if (!isMapping(input)) {
    state.issues.push({ path, message: `expected a mapping of ${name} fields, got ${describeValue(input)}` });
    return undefined;
  }
  const form = readForm(section, input, path, state);
  if (form === null) return undefined;
  const output: NormalSection = {};
  if (section.variants && form !== undefined) output[section.variants.key] = form;
  const fields = sectionFields(section, form);
  if (!onlyKnownKeys(section, fields, form, input, path, state)) return undefined;
  for (const [key, field] of Object.entries(fields)) {
    if (!readField(field, input[key], key, path, output, state)) return undefined;
  }
  for (const [key, sub] of Object.entries(section.subsections ?? {})) {
    if (!readSubsection(key, sub, input[key], path, output, state)) return undefined;
  }
  return output;
}

/** A set of whole sections (`{ choose: [...] }` in a sweep): each choice read as a fixed section. */
function readSectionSet(
  name: string,
  section: SectionSpec,
  input: Record<string, unknown>,
  path: string[],
  state: WalkState,
): DimensionSlot | undefined {
  const slot = readChoose(
    input,
    path,
    state,
    (item, itemPath) =>
      readSection(name, section, item, itemPath as string[], { ...state, mode: 'design' }) as NormalSection | undefined,
    undefined,
    true,
  );
  if (slot) attachSectionFields(section, state.dimensions[slot.slot]);
  return slot;
}

/** The form a section with variants names (its key's value); undefined without variants, null after a problem. */
function readForm(
  section: SectionSpec,
  input: Record<string, unknown>,
  path: string[],
  state: WalkState,
): string | undefined | null {
  if (!section.variants) return undefined;
  const key = section.variants.key;
  const forms = Object.keys(section.variants.forms);
  const given = input[key];
  if (given === undefined) {
    state.issues.push({ path: [...path, key], message: `required: one of ${forms.join(', ')}` });
    return null;
  }
  if (typeof given !== 'string' || !forms.includes(given)) {
    const guess = typeof given === 'string' ? suggest(given, forms) : null;
    state.issues.push({
      path: [...path, key],
      message: `expected one of ${forms.join(', ')}, got ${describeValue(given)}${guess ? ` (did you mean '${guess}'?)` : ''}`,
    });
    return null;
  }
  return given;
}

/** False after pushing the problem when the section holds a key that is neither a field nor a sub-section. */
function onlyKnownKeys(
  section: SectionSpec,
  fields: Record<string, FieldSpec>,
  form: string | undefined,
  input: Record<string, unknown>,
  path: string[],
  state: WalkState,
): boolean {
  const known = [
    ...(section.variants ? [section.variants.key] : []),
    ...Object.keys(fields),
    ...Object.keys(section.subsections ?? {}),
  ];
  const unknown = Object.keys(input).find((key) => !known.includes(key));
  if (unknown === undefined) return true;
  const inOtherForm = section.variants
    ? Object.entries(section.variants.forms).find(([, f]) => unknown in f)?.[0]
    : undefined;
  state.issues.push({
    path: [...path, unknown],
    message: inOtherForm
      ? `'${unknown}' belongs to ${must(section.variants).key} ${inOtherForm}, not ${form}`
      : unknownKeyMessage(unknown, known),
  });
  return false;
}

/** One field of a section into `output`: a fixed value, or in a sweep a range or set; false after a problem. */
function readField(
  field: FieldSpec,
  value: unknown,
  key: string,
  path: string[],
  output: NormalSection,
  state: WalkState,
): boolean {
  const fieldPath = [...path, key];
  // A field that may be chosen by the core (a tank bank's counts): the word auto is the same as leaving it out.
  if (value === 'auto' && field.type === 'quantity' && field.auto) return true;
  if (value === undefined || value === null) {
    if (field.optional) return true;
    state.issues.push({ path: fieldPath, message: `required: ${field.description}` });
    return false;
  }
  const read =
    state.mode === 'sweep' &&
    isMapping(value) &&
    ('from' in value || 'to' in value || 'choose' in value || 'stock' in value)
      ? readSweepLeaf(field, value, fieldPath, state)
      : readLeaf(field, value, fieldPath, state.issues);
  if (read === undefined) return false;
  output[key] = read;
  return true;
}

/** A sweep leaf written as a stock set, a set or a range: its dimension's slot. */
function readSweepLeaf(
  field: FieldSpec,
  value: Record<string, unknown>,
  path: string[],
  state: WalkState,
): DimensionSlot | undefined {
  if ('stock' in value) return readStock(field, value, path, state);
  if ('choose' in value)
    return readChoose(value, path, state, (item, itemPath) => readLeaf(field, item, itemPath, state.issues), field);
  return readRange(field, value, path, state);
}

/**
 * A section nested in another (`bank` in `tank`), read like any section at its full path: its fields go
 * into the outer section under dotted keys ('bank.part.capacitance'); a set of whole sub-sections
 * stays one slot at its own key ('bank.part'), marked so that filling it spreads its fields there.
 */
function readSubsection(
  name: string,
  sub: SectionSpec,
  value: unknown,
  path: string[],
  output: NormalSection,
  state: WalkState,
): boolean {
  const subPath = [...path, name];
  if (value === undefined || value === null) {
    if (sub.optional) return true;
    state.issues.push({ path: subPath, message: `required: ${sub.description}` });
    return false;
  }
  const read = readSection(name, sub, value, subPath, state);
  if (read === undefined) return false;
  if (isSlot(read)) {
    const dimension = state.dimensions[read.slot];
    if (dimension?.kind === 'choose') dimension.subsection = true;
    output[name] = read;
    return true;
  }
  for (const [key, leaf] of Object.entries(read)) output[`${name}.${key}`] = leaf;
  return true;
}

/** What reading a design tree gives: the normal tree and (in sweeps) the dimensions of the space. */
export interface TreeReading {
  tree: NormalTree;
  dimensions: Dimension[];
  issues: InputIssue[];
}

/**
 * Reads a design tree (the whole design file, or a sweep file's `design:`).
 * @param input the parsed YAML/JSON value
 * @param mode 'design' (fixed values only) or 'sweep' (ranges and sets allowed)
 * @param basePath path prefix for messages (['design'] in sweep files)
 */
export function readDesignTree(input: unknown, mode: Mode, basePath: string[] = []): TreeReading {
  const state: WalkState = { mode, issues: [], dimensions: [] };
  const tree: NormalTree = {};
  if (!isMapping(input)) {
    state.issues.push({
      path: basePath,
      message: `expected a mapping of sections (secondary, topload, primary, …), got ${describeValue(input)}`,
    });
    return { tree, dimensions: [], issues: state.issues };
  }
  const names = Object.keys(DESIGN_SECTIONS);
  for (const key of Object.keys(input)) {
    if (!names.includes(key)) {
      const sweepKey = mode === 'design' && ['design', 'objectives', 'constraints', 'sweep'].includes(key);
      state.issues.push({
        path: [...basePath, key],
        message: sweepKey
          ? `unknown key '${key}': this looks like a sweep file (use npx coilfront check or npx coilfront sweep)`
          : unknownKeyMessage(key, names),
      });
      return { tree, dimensions: [], issues: state.issues };
    }
  }
  for (const [name, section] of Object.entries(DESIGN_SECTIONS)) {
    const value = input[name];
    if (value === undefined || value === null) continue;
    const read = readSection(name, section, value, [...basePath, name], state);
    if (read === undefined) break;
    tree[name] = read;
  }
  if (state.issues.length === 0 && !('secondary' in tree) && !('topload' in tree)) {
    state.issues.push({ path: basePath, message: 'a design needs a secondary, a topload, or both' });
  }
  const dimensions = state.dimensions.map((dimension) => ({
    ...dimension,
    path: dimension.path.slice(basePath.length),
  }));
  return { tree, dimensions, issues: state.issues };
}

/** The numeric fields of a set of whole sections, for their own CSV columns (see Dimension). */
function attachSectionFields(section: SectionSpec, dimension: Dimension | undefined): void {
  if (dimension?.kind !== 'choose') return;
  const choices = dimension.values.filter((v): v is NormalSection => typeof v === 'object' && !('awg' in v));
  if (choices.length !== dimension.values.length) return;
  const names: string[] = [];
  for (const choice of choices) {
    for (const [key, value] of Object.entries(choice))
      if (typeof value === 'number' && !names.includes(key)) names.push(key);
  }
  dimension.sectionFields = names.map((name) => {
    const spec = fieldSpecIn(section, choices, name);
    return {
      name,
      quantity: spec?.type === 'quantity' ? spec.kind : null,
      values: choices.map((choice) => (typeof choice[name] === 'number' ? (choice[name] as number) : null)),
    };
  });
}

/** The field spec of a section's field (a dotted key for a sub-section's), in any of the choices' forms. */
function fieldSpecIn(section: SectionSpec, choices: NormalSection[], name: string): FieldSpec | undefined {
  for (const choice of choices) {
    const spec = flatFields(section, choice)[name];
    if (spec) return spec;
  }
  return undefined;
}
