/**
 * The normal tree as plain JSON (SI numbers, file field names): wires become `{ awg }` or
 * `{ bare_diameter }`.
 */
import type { NormalTree } from './design-schema.ts';
import { DimensionSlot } from './design-schema.ts';

export function treeToJson(tree: NormalTree): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [name, section] of Object.entries(tree)) {
    if (section instanceof DimensionSlot) continue;
    const fields: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(section)) {
      if (value instanceof DimensionSlot) continue;
      if (typeof value === 'object' && value !== null) {
        fields[key] = 'awg' in value ? { awg: value.awg } : { bare_diameter: value.bareDiameter };
      } else fields[key] = value;
    }
    out[name] = fields;
  }
  return out;
}
