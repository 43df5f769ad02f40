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

function readEntry(
  sectionName: string,
  key: string,
  field: FieldSpec & { type: 'quantity' },
  createSection: boolean,
  input: unknown,
  path: Array<string | number>,
  issues: InputIssue[],
): ToleranceField | null {
  const entry: Record<string, unknown> = isMapping(input) ? input : { spread: input };
  for (const name of Object.keys(entry)) {
    if (!ENTRY_KEYS.includes(name)) {
      const guess = suggest(name, ENTRY_KEYS);
      issues.push({
        path: [...path, name],
        message: guess
          ? `unknown key '${name}' (did you mean '${guess}'?)`
          : `unknown key '${name}'; expected one of ${ENTRY_KEYS.join(', ')}`,
      });
      return null;
    }
  }
  const distributionInput = entry.distribution ?? 'uniform';
  if (typeof distributionInput !== 'string' || !(DISTRIBUTIONS as readonly string[]).includes(distributionInput)) {
    const guess = typeof distributionInput === 'string' ? suggest(distributionInput, [...DISTRIBUTIONS]) : null;
    issues.push({
      path: [...path, 'distribution'],
      message: `expected one of ${DISTRIBUTIONS.join(', ')}, got ${describeValue(distributionInput)}${guess ? ` (did you mean '${guess}'?)` : ''}`,
    });
    return null;
  }
  const distribution = distributionInput as ToleranceDistribution;
  let sigmas = 1;
  if (distribution === 'uniform') {
    if (entry.sigmas !== undefined) {
      issues.push({
        path: [...path, 'sigmas'],
        message: 'only a normal or truncated_normal distribution takes sigmas',
      });
      return null;
    }
  } else {
    const given = entry.sigmas;
    if (typeof given !== 'number' || !Number.isFinite(given) || given <= 0 || given > 8) {
      issues.push({
        path: [...path, 'sigmas'],
        message:
          given === undefined
            ? `required for ${distribution}: how many standard deviations the spread is (e.g. 2 or 3)`
            : `expected a number of standard deviations above 0 and at most 8, got ${describeValue(given)}`,
      });
      return null;
    }
    sigmas = given;
  }
  const base = {
    path: [sectionName, key] as [string, string],
    distribution,
    sigmas,
    fallback: field.default ?? null,
    createSection,
  };
  const hasRange = entry.from !== undefined || entry.to !== undefined;
  if (hasRange) {
    if (entry.spread !== undefined) {
      issues.push({ path: [...path, 'spread'], message: 'give a spread or a range (from, to), not both' });
      return null;
    }
    const ends: number[] = [];
    for (const end of ['from', 'to'] as const) {
      if (entry[end] === undefined) {
        issues.push({ path: [...path, end], message: 'required with a range: give from and to' });
        return null;
      }
      const read = readQuantity(entry[end], field.kind);
      if (!read.ok) {
        issues.push({ path: [...path, end], message: read.reason });
        return null;
      }
      ends.push(read.value);
    }
    if (ends[0] > ends[1]) {
      issues.push({
        path: [...path, 'to'],
        message: `the range ends below its start (${describeValue(entry.to)} < ${describeValue(entry.from)})`,
      });
      return null;
    }
    return { ...base, mode: 'interval', centre: (ends[0] + ends[1]) / 2, spread: (ends[1] - ends[0]) / 2 };
  }
  if (entry.spread === undefined) {
    issues.push({ path: [...path, 'spread'], message: "required: a spread such as '±2 %', or a range { from, to }" });
    return null;
  }
  const spread = readSpread(entry.spread, field.kind);
  if (!spread.ok) {
    issues.push({ path: isMapping(input) ? [...path, 'spread'] : path, message: spread.reason });
    return null;
  }
  return { ...base, mode: spread.relative ? 'relative' : 'absolute', centre: 0, spread: spread.value };
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
  const names = Object.keys(DESIGN_SECTIONS);
  for (const [name, value] of Object.entries(input)) {
    if (SETTING_KEYS.includes(name)) {
      const [min, max] =
        name === 'draws' ? [1, MAX_TOLERANCE_DRAWS] : name === 'sweep_draws' ? [1, MAX_SWEEP_DRAWS] : [0, 2 ** 32 - 1];
      if (typeof value !== 'number' || !Number.isInteger(value) || value < min || value > max) {
        issues.push({
          path: [...path, name],
          message: `expected a whole number from ${min} to ${max}, got ${describeValue(value)}`,
        });
        return null;
      }
      if (name === 'sweep_draws') section.sweepDraws = value;
      else section[name as 'draws' | 'seed'] = value;
      continue;
    }
    const spec = DESIGN_SECTIONS[name];
    if (!spec) {
      const known = [...names, ...SETTING_KEYS];
      const guess = suggest(name, known);
      issues.push({
        path: [...path, name],
        message: guess
          ? `unknown key '${name}' (did you mean '${guess}'?)`
          : `unknown key '${name}'; expected one of ${known.join(', ')}`,
      });
      return null;
    }
    if (!isMapping(value)) {
      issues.push({
        path: [...path, name],
        message: `expected a mapping of field: spread, got ${describeValue(value)}`,
      });
      return null;
    }
    const fields = allFields(spec);
    const createSection = spec.optional && !spec.variants && Object.values(spec.fields).every((f) => f.optional);
    for (const [key, entry] of Object.entries(value)) {
      const field = fields[key];
      const at = [...path, name, key];
      if (!field) {
        const guess = suggest(key, Object.keys(fields));
        issues.push({
          path: at,
          message: guess ? `unknown field '${key}' (did you mean '${guess}'?)` : `unknown field '${key}' of ${name}`,
        });
        return null;
      }
      if (field.type !== 'quantity') {
        issues.push({
          path: at,
          message: `${field.type === 'wire' ? 'a wire size' : `a ${field.type === 'enum' ? 'choice' : 'yes/no'} field`} takes no spread; only numeric fields do`,
        });
        return null;
      }
      if (field.integer) {
        issues.push({ path: at, message: 'a whole-number field takes no spread' });
        return null;
      }
      const read = readEntry(name, key, field, createSection, entry, at, issues);
      if (!read) return null;
      section.fields.push(read);
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
