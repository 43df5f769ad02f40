/**
 * The JSON Schema (draft 2020-12) of sweep files and design files, made from the field table, so that
 * editors can complete and check them (`coilfront schema`, `coilfront schema --design`).
 */
import { METRIC_KEYS } from '../core/metrics.ts';
import { DESIGN_SECTIONS, type FieldSpec, type SectionSpec } from './design-fields.ts';
import { unitsOf } from './units.ts';
import { STOCK_CATALOGUES } from './stock/catalogues.ts';
import { stagesSchema } from './sweep-stages.ts';

type Schema = Record<string, unknown>;

function leaf(field: FieldSpec): Schema {
  switch (field.type) {
    case 'quantity': {
      const units = unitsOf(field.kind);
      const number: Schema = { type: field.integer ? 'integer' : 'number' };
      if (field.range === 'positive' || field.range === 'fraction') number.exclusiveMinimum = 0;
      if (field.range === 'nonnegative') number.minimum = 0;
      if (field.range === 'fraction') number.maximum = 1;
      if (field.auto) return { oneOf: [number, { const: 'auto' }], description: field.description };
      if (units.length === 0) return { ...number, description: field.description };
      return {
        description: `${field.description} (SI number, or a string with a unit: ${units.join(', ')})`,
        oneOf: [number, { type: 'string', pattern: '^\\s*[+-]?(\\d+(\\.\\d*)?|\\.\\d+)([eE][+-]?\\d+)?\\s*\\S*\\s*$' }],
      };
    }
    case 'enum':
      return { enum: [...field.values], description: field.description };
    case 'boolean':
      return { type: 'boolean', description: field.description };
    case 'wire':
      return { type: 'string', description: field.description, examples: ['AWG 26', '0.6 mm'] };
  }
}

function sweepLeaf(field: FieldSpec): Schema {
  const value = leaf(field);
  const choose = {
    type: 'object',
    properties: { choose: { type: 'array', minItems: 1, items: value } },
    required: ['choose'],
    additionalProperties: false,
  };
  const stockKind = field.type === 'wire' ? 'wire' : field.type === 'quantity' ? field.kind : null;
  const catalogues = [...STOCK_CATALOGUES.values()].filter((c) => c.kind === stockKind).map((c) => c.name);
  const stock = {
    type: 'object',
    description: 'stock sizes of a catalogue (npx coilfront stock), optionally from/to inclusive',
    properties: { stock: { enum: catalogues }, from: value, to: value },
    required: ['stock'],
    additionalProperties: false,
  };
  const stocked = catalogues.length > 0 ? [stock] : [];
  if (field.type !== 'quantity') return { anyOf: [value, choose, ...stocked] };
  const range = {
    type: 'object',
    properties: {
      from: value,
      to: value,
      integer: { type: 'boolean' },
      scale: { enum: ['linear', 'log'] },
      step: value,
    },
    required: ['from', 'to'],
    additionalProperties: false,
  };
  return { anyOf: [value, range, choose, ...stocked], description: field.description };
}

function section(spec: SectionSpec, sweep: boolean): Schema {
  const make = sweep ? sweepLeaf : leaf;
  const forms = spec.variants ? Object.entries(spec.variants.forms) : [[undefined, {}] as const];
  const variants = forms.map(([form, extra]) => {
    const fields = { ...spec.fields, ...extra } as Record<string, FieldSpec>;
    const properties: Schema = {};
    if (spec.variants) properties[spec.variants.key] = { const: form };
    for (const [key, field] of Object.entries(fields)) properties[key] = make(field);
    const subsections = Object.entries(spec.subsections ?? {});
    for (const [key, sub] of subsections) properties[key] = section(sub, sweep);
    const required = [
      ...(spec.variants ? [spec.variants.key] : []),
      ...Object.entries(fields)
        .filter(([, f]) => !f.optional)
        .map(([k]) => k),
      ...subsections.filter(([, sub]) => !sub.optional).map(([k]) => k),
    ];
    return { type: 'object', properties, required, additionalProperties: false };
  });
  const body: Schema =
    variants.length === 1
      ? { ...variants[0], description: spec.description }
      : { description: spec.description, oneOf: variants };
  if (!sweep) return body;
  return {
    anyOf: [
      body,
      {
        type: 'object',
        properties: { choose: { type: 'array', minItems: 1, items: labelled(section(spec, false)) } },
        required: ['choose'],
        additionalProperties: false,
      },
    ],
  };
}

export function designSchema(sweep = false): Schema {
  const properties: Schema = {};
  for (const [name, spec] of Object.entries(DESIGN_SECTIONS)) properties[name] = section(spec, sweep);
  return { type: 'object', properties, additionalProperties: false };
}

export function sweepSchema(): Schema {
  const metric = { enum: [...METRIC_KEYS] };
  const bound = { oneOf: [{ type: 'number' }, { type: 'string' }] };
  return {
    $schema: 'https://json-schema.org/draft/2020-12/schema',
    $id: 'https://coilfront.invalid/schema/sweep.json',
    title: 'coilfront sweep file',
    type: 'object',
    properties: {
      design: designSchema(true),
      constraints: {
        type: 'object',
        propertyNames: metric,
        additionalProperties: {
          type: 'object',
          properties: { min: bound, max: bound },
          additionalProperties: false,
          minProperties: 1,
        },
      },
      objectives: {
        type: 'array',
        minItems: 1,
        maxItems: 4,
        items: {
          oneOf: [
            { type: 'object', properties: { maximize: metric }, required: ['maximize'], additionalProperties: false },
            { type: 'object', properties: { minimize: metric }, required: ['minimize'], additionalProperties: false },
          ],
        },
      },
      sweep: {
        type: 'object',
        properties: {
          method: { enum: ['sobol', 'lhs', 'grid', 'random'] },
          samples: { type: 'integer', minimum: 1 },
          seed: { type: 'integer', minimum: 0, maximum: 4294967295 },
          levels: { type: 'integer', minimum: 2, maximum: 1000 },
          shard_count: { type: 'integer', minimum: 1 },
          reference_point: { type: 'object', additionalProperties: bound },
          stages: stagesSchema(),
        },
        additionalProperties: false,
      },
      tolerances: {
        type: 'object',
        description: 'build tolerances and ranges of the surroundings, for coilfront tolerance',
        properties: {
          draws: { type: 'integer', minimum: 1, maximum: 1000000 },
          seed: { type: 'integer', minimum: 0, maximum: 4294967295 },
          sweep_draws: { type: 'integer', minimum: 1, maximum: 1024 },
        },
        additionalProperties: {
          type: 'object',
          additionalProperties: {
            oneOf: [
              { type: 'string', description: "a spread: '±2 %' or '±10 mm' (uniform)" },
              { type: 'number' },
              {
                type: 'object',
                properties: {
                  spread: bound,
                  from: bound,
                  to: bound,
                  distribution: { enum: ['uniform', 'normal', 'truncated_normal'] },
                  sigmas: { type: 'number', exclusiveMinimum: 0, maximum: 8 },
                },
                additionalProperties: false,
              },
            ],
          },
        },
      },
    },
    required: ['design', 'objectives'],
    additionalProperties: false,
  };
}

export function designFileSchema(): Schema {
  return {
    $schema: 'https://json-schema.org/draft/2020-12/schema',
    title: 'coilfront design file',
    ...designSchema(false),
  };
}

/** A section schema whose object forms also take a `label:` (the short name of a choice in a set). */
function labelled(schema: Schema): Schema {
  const label = { type: 'string', minLength: 1, description: 'short label of this choice (console, check, CSV)' };
  const addLabel = (form: Schema): Schema => ({ ...form, properties: { ...(form.properties as Schema), label } });
  if (Array.isArray(schema.oneOf)) return { ...schema, oneOf: (schema.oneOf as Schema[]).map(addLabel) };
  return addLabel(schema);
}
