/**
 * The normal tree as plain JSON (SI numbers, file field names): wires become `{ awg }` or
 * `{ bare_diameter }`; a sub-section's fields are nested (`tank: { bank: { part: … } }`).
 */
import { isSlot, nestSection, type NormalTree } from '../optimize/design-tree.ts';

export function treeToJson(tree: NormalTree): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [name, section] of Object.entries(tree)) {
    if (isSlot(section)) continue;
    const fields: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(section)) {
      if (isSlot(value)) continue;
      if (typeof value === 'object' && value !== null) {
        fields[key] = 'awg' in value ? { awg: value.awg } : { bare_diameter: value.bareDiameter };
      } else fields[key] = value;
    }
    out[name] = nestSection(fields); // a sub-section's dotted keys nested as the file writes them
  }
  return out;
}
