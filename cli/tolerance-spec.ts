/**
 * The `tolerances:` section of a sweep file (and of a `--tolerances FILE` for one design): how each design
 * field spreads when the coil is really built, and the ranges of the surroundings. Read into plain
 * ToleranceFields (optimize/tolerance); every problem is one line naming the field path.
 *
 *   tolerances:
 *     draws: 256                                  # builds per candidate (optional)
 *     seed: 7                                     # of the draws (optional; default the sweep's)
 *     secondary:
 *       winding_length: ±1 %                      # a spread alone: uniform over ±1 %
 *     tank:
 *       capacitance: { spread: ±5 %, distribution: normal, sigmas: 2 }
 *       bank: { part: { capacitance: ±5 % } }     # a sub-section's fields, nested as in the design file
 *     topload:
 *       height_above_winding: { spread: ±10 mm, distribution: truncated_normal, sigmas: 2 }
 *     environment:
 *       altitude: { from: 0 m, to: 1500 m }       # a range of the surroundings, uniform unless said
 */
import type { ToleranceDistribution, ToleranceField } from '../optimize/tolerance/tolerance-draws.ts';
import { DESIGN_SECTIONS, type FieldSpec, type SectionSpec } from './design-fields.ts';
import type { InputIssue } from '../run/input-error.ts';
import { suggest } from './suggest.ts';
import { describeValue, readQuantity, type QuantityKind } from './units.ts';

export interface ToleranceSection {
  fields: ToleranceField[];
  /** Builds per candidate, when the section says. */
  draws: number | null;
  /** Seed of the draws, when the section says. */
  seed: number | null;
  /** Draws per design for a robust merit (build_yield) inside a sweep, when the section says. */
  sweepDraws: number | null;
}

/** Most builds per candidate a file may ask for. */
export const MAX_TOLERANCE_DRAWS = 1_000_000;

const SETTING_KEYS = ['draws', 'seed', 'sweep_draws'];
/** Most draws per design a robust merit may ask for: each one is a full evaluation. */
export const MAX_SWEEP_DRAWS = 1024;
const ENTRY_KEYS = ['spread', 'from', 'to', 'distribution', 'sigmas'];
const DISTRIBUTIONS: readonly ToleranceDistribution[] = ['uniform', 'normal', 'truncated_normal'];

function isMapping(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** Every field a section can have, in any of its forms. */
function allFields(section: SectionSpec): Record<string, FieldSpec> {
  const fields: Record<string, FieldSpec> = { ...section.fields };
  for (const form of Object.values(section.variants?.forms ?? {})) Object.assign(fields, form);
  return fields;
}

/** A temperature difference: kelvin and Celsius degrees count 1, Fahrenheit degrees 5/9. */
const TEMPERATURE_STEP: Record<string, number> = { K: 1, degC: 1, '°C': 1, degF: 5 / 9, '°F': 5 / 9 };

const SPREAD_PATTERN = /^\s*(?:±|\+-|\+\/-)?\s*((?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/;

/** Reads a spread: `±2 %` (relative) or `±10 mm` (absolute, in the field's kind). */
function readSpread(
  input: unknown,
  kind: QuantityKind,
): { ok: true; relative: boolean; value: number } | { ok: false; reason: string } {
  const expected = `expected a spread such as '±2 %' or '±${kind === 'dimensionless' ? '3' : kind === 'temperature' ? '5 K' : '10 mm'}'`;
  if (typeof input === 'number') {
    if (!Number.isFinite(input) || input < 0) return { ok: false, reason: `${expected}, got ${describeValue(input)}` };
    return { ok: true, relative: false, value: input };
  }
  if (typeof input !== 'string') return { ok: false, reason: `${expected}, got ${describeValue(input)}` };
  const match = SPREAD_PATTERN.exec(input);
  if (!match) return { ok: false, reason: `${expected}, got '${input}'` };
  const number = Number(match[1]);
  const unit = match[2] ?? '';
  if (unit === '%') {
    if (number >= 100) return { ok: false, reason: `a relative spread must be below 100 %, got '${input}'` };
    return { ok: true, relative: true, value: number / 100 };
  }
  if (kind === 'temperature') {
    const step = TEMPERATURE_STEP[unit];
    if (step === undefined && unit !== '')
      return { ok: false, reason: `a temperature spread takes K, degC or degF (or %), got '${input}'` };
    return { ok: true, relative: false, value: number * (step ?? 1) };
  }
  const read = readQuantity(`${match[1]} ${unit}`.trim(), kind);
  if (!read.ok) return { ok: false, reason: read.reason };
  return { ok: true, relative: false, value: read.value };
}

/** A problem found while reading, or the value read. */
type Reading<T> = { issue: InputIssue } | { value: T };

const problem = (path: Array<string | number>, message: string): { issue: InputIssue } => ({
  issue: { path, message },
});

/** An unknown key of a tolerance entry, or null when every key is known. */
function unknownEntryKey(entry: Record<string, unknown>, path: Array<string | number>): InputIssue | null {
  const name = Object.keys(entry).find((key) => !ENTRY_KEYS.includes(key));
  if (name === undefined) return null;
  const guess = suggest(name, ENTRY_KEYS);
  return {
    path: [...path, name],
    message: guess
      ? `unknown key '${name}' (did you mean '${guess}'?)`
      : `unknown key '${name}'; expected one of ${ENTRY_KEYS.join(', ')}`,
  };
}

/** The entry's distribution and its sigmas (1 for uniform). */
function readDistribution(
  entry: Record<string, unknown>,
  path: Array<string | number>,
): Reading<{ distribution: ToleranceDistribution; sigmas: number }> {
  const input = entry.distribution ?? 'uniform';
  if (typeof input !== 'string' || !(DISTRIBUTIONS as readonly string[]).includes(input)) {
    const guess = typeof input === 'string' ? suggest(input, [...DISTRIBUTIONS]) : null;
    return problem(
      [...path, 'distribution'],
      `expected one of ${DISTRIBUTIONS.join(', ')}, got ${describeValue(input)}${guess ? ` (did you mean '${guess}'?)` : ''}`,
    );
  }
  const distribution = input as ToleranceDistribution;
  const given = entry.sigmas;
  if (distribution === 'uniform') {
    if (given !== undefined)
      return problem([...path, 'sigmas'], 'only a normal or truncated_normal distribution takes sigmas');
    return { value: { distribution, sigmas: 1 } };
  }
  if (typeof given !== 'number' || !Number.isFinite(given) || given <= 0 || given > 8) {
    return problem(
      [...path, 'sigmas'],
      given === undefined
        ? `required for ${distribution}: how many standard deviations the spread is (e.g. 2 or 3)`
        : `expected a number of standard deviations above 0 and at most 8, got ${describeValue(given)}`,
    );
  }
  return { value: { distribution, sigmas: given } };
}

/** A range `{ from, to }` of an entry as its centre and half-width. */
function readRange(
  entry: Record<string, unknown>,
  kind: QuantityKind,
  path: Array<string | number>,
): Reading<{ centre: number; spread: number }> {
  if (entry.spread !== undefined) return problem([...path, 'spread'], 'give a spread or a range (from, to), not both');
  const ends: number[] = [];
  for (const end of ['from', 'to'] as const) {
    if (entry[end] === undefined) return problem([...path, end], 'required with a range: give from and to');
    const read = readQuantity(entry[end], kind);
    if (!read.ok) return problem([...path, end], read.reason);
    ends.push(read.value);
  }
  if (ends[0] > ends[1]) {
    return problem(
      [...path, 'to'],
      `the range ends below its start (${describeValue(entry.to)} < ${describeValue(entry.from)})`,
    );
  }
  return { value: { centre: (ends[0] + ends[1]) / 2, spread: (ends[1] - ends[0]) / 2 } };
}

function readEntry(
  sectionName: string,
  key: string,
  field: FieldSpec & { type: 'quantity' },
  createSection: boolean,
  input: unknown,
  path: Array<string | number>,
): Reading<ToleranceField> {
  const entry: Record<string, unknown> = isMapping(input) ? input : { spread: input };
  const unknown = unknownEntryKey(entry, path);
  if (unknown) return { issue: unknown };
  const law = readDistribution(entry, path);
  if ('issue' in law) return law;
  const base = {
    path: [sectionName, key] as [string, string],
    ...law.value,
    fallback: field.default ?? null,
    createSection,
  };
  if (entry.from !== undefined || entry.to !== undefined) {
    const range = readRange(entry, field.kind, path);
    if ('issue' in range) return range;
    return { value: { ...base, mode: 'interval', ...range.value } };
  }
  if (entry.spread === undefined)
    return problem([...path, 'spread'], "required: a spread such as '±2 %', or a range { from, to }");
  const spread = readSpread(entry.spread, field.kind);
  if (!spread.ok) return problem(isMapping(input) ? [...path, 'spread'] : path, spread.reason);
  return { value: { ...base, mode: spread.relative ? 'relative' : 'absolute', centre: 0, spread: spread.value } };
}

/** Reads one of draws, seed or sweep_draws into the section. */
function readSetting(section: ToleranceSection, name: string, value: unknown, path: Array<string | number>) {
  const [min, max] =
    name === 'draws' ? [1, MAX_TOLERANCE_DRAWS] : name === 'sweep_draws' ? [1, MAX_SWEEP_DRAWS] : [0, 2 ** 32 - 1];
  if (typeof value !== 'number' || !Number.isInteger(value) || value < min || value > max)
    return problem([...path, name], `expected a whole number from ${min} to ${max}, got ${describeValue(value)}`).issue;
  if (name === 'sweep_draws') section.sweepDraws = value;
  else section[name as 'draws' | 'seed'] = value;
  return null;
}

/** The toleranced field `key` of a design section, or why it cannot take a spread. */
function readField(
  name: string,
  fields: ReturnType<typeof allFields>,
  createSection: boolean,
  key: string,
  entry: unknown,
  at: Array<string | number>,
): Reading<ToleranceField> {
  const field = fields[key];
  if (!field) {
    const guess = suggest(key, Object.keys(fields));
    return problem(
      at,
      guess ? `unknown field '${key}' (did you mean '${guess}'?)` : `unknown field '${key}' of ${name}`,
    );
  }
  if (field.type !== 'quantity') {
    const what = field.type === 'wire' ? 'a wire size' : `a ${field.type === 'enum' ? 'choice' : 'yes/no'} field`;
    return problem(at, `${what} takes no spread; only numeric fields do`);
  }
  if (field.integer) return problem(at, 'a whole-number field takes no spread');
  return readEntry(name, key, field, createSection, entry, at);
}

/** Reads the fields of design section `name` of a tolerances value into the section. */
function readDesignSection(
  section: ToleranceSection,
  name: string,
  value: unknown,
  path: Array<string | number>,
): InputIssue | null {
  const spec = DESIGN_SECTIONS[name];
  if (!spec) {
    const known = [...Object.keys(DESIGN_SECTIONS), ...SETTING_KEYS];
    const guess = suggest(name, known);
    return problem(
      [...path, name],
      guess
        ? `unknown key '${name}' (did you mean '${guess}'?)`
        : `unknown key '${name}'; expected one of ${known.join(', ')}`,
    ).issue;
  }
  if (!isMapping(value))
    return problem([...path, name], `expected a mapping of field: spread, got ${describeValue(value)}`).issue;
  const createSection = spec.optional && !spec.variants && Object.values(spec.fields).every((f) => f.optional);
  return readSectionFields(section, name, spec, '', createSection, value, [...path, name]);
}

/**
 * Reads the fields of `spec` (the design section `name`, or a sub-section of it such as `tank.bank.part`,
 * whose fields the design tree holds under dotted keys `prefix` + field: 'bank.part.capacitance').
 */
function readSectionFields(
  section: ToleranceSection,
  name: string,
  spec: SectionSpec,
  prefix: string,
  createSection: boolean,
  value: Record<string, unknown>,
  at: Array<string | number>,
): InputIssue | null {
  const fields = allFields(spec);
  for (const [key, entry] of Object.entries(value)) {
    const sub = spec.subsections?.[key];
    if (sub) {
      if (!isMapping(entry))
        return problem([...at, key], `expected a mapping of field: spread, got ${describeValue(entry)}`).issue;
      const issue = readSectionFields(section, name, sub, `${prefix}${key}.`, false, entry, [...at, key]);
      if (issue) return issue;
      continue;
    }
    const where = prefix ? `${name}.${prefix.slice(0, -1)}` : name;
    const read = readField(where, fields, createSection, key, entry, [...at, key]);
    if ('issue' in read) return read.issue;
    section.fields.push({ ...read.value, path: [name, `${prefix}${key}`] });
  }
  return null;
}

/**
 * Reads a `tolerances:` value. Problems go to `issues` (the first one is the message); null when there
 * is a problem or nothing to read.
 */
export function readTolerances(
  input: unknown,
  path: Array<string | number>,
  issues: InputIssue[],
): ToleranceSection | null {
  if (!isMapping(input)) {
    issues.push({ path, message: `expected a mapping of section: { field: spread }, got ${describeValue(input)}` });
    return null;
  }
  const section: ToleranceSection = { fields: [], draws: null, seed: null, sweepDraws: null };
  for (const [name, value] of Object.entries(input)) {
    const issue = SETTING_KEYS.includes(name)
      ? readSetting(section, name, value, path)
      : readDesignSection(section, name, value, path);
    if (issue) {
      issues.push(issue);
      return null;
    }
  }
  if (section.fields.length === 0) {
    issues.push({
      path,
      message: 'no field has a spread: give at least one, e.g. secondary: { winding_length: ±1 % }',
    });
    return null;
  }
  if (section.fields.length > 64) {
    issues.push({ path, message: `${section.fields.length} toleranced fields; at most 64` });
    return null;
  }
  return section;
}
