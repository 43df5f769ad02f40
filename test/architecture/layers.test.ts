/**
 * The layering of the source tree, read from the imports themselves: each layer imports only itself
 * and the layers below it (api → cli → run → workers → optimize → core; nothing imports the library
 * entry api/), and no file reaches itself
 * through its imports (no cycles). The rule is ours (DEVELOPERS.md); the check is exact.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, normalize, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const ORDER = ['core', 'optimize', 'workers', 'run', 'cli', 'api'] as const;
type Layer = (typeof ORDER)[number];

function sourceFiles(folder: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(folder)) {
    const path = join(folder, name);
    if (statSync(path).isDirectory()) out.push(...sourceFiles(path));
    else if (name.endsWith('.ts')) out.push(path);
  }
  return out;
}

/** Relative imports of a file (static, dynamic and type-only), resolved to repository paths. */
function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  const found: string[] = [];
  for (const match of text.matchAll(/(?:from|import)\s*\(?\s*['"](\.{1,2}\/[^'"]+)['"]/g)) {
    const spec = match[1];
    if (spec !== undefined) found.push(normalize(join(dirname(file), spec)));
  }
  return found;
}

const layerOf = (path: string): Layer | undefined => ORDER.find((layer) => path.startsWith(`${layer}/`));
const files = ORDER.flatMap((layer) => sourceFiles(layer));
const graph = new Map(files.map((file) => [file, importsOf(file)]));

describe('the source layers', () => {
  it('import only their own layer and the layers below (cli → run → workers → optimize → core)', () => {
    const upward: string[] = [];
    for (const [file, targets] of graph) {
      const from = ORDER.indexOf(layerOf(file) as Layer);
      for (const target of targets) {
        const layer = layerOf(target);
        if (layer === undefined) {
          upward.push(`${file} → ${relative('.', target)} (outside the layers)`);
          continue;
        }
        if (ORDER.indexOf(layer) > from) upward.push(`${file} → ${target}`);
      }
    }
    expect(upward).toEqual([]);
  });

  it('have no import cycles, type-only imports included (a picture drawn from the imports has no circles)', () => {
    const state = new Map<string, 'open' | 'done'>();
    const cycles: string[] = [];
    const visit = (file: string, trail: string[]) => {
      const seen = state.get(file);
      if (seen === 'done') return;
      if (seen === 'open') {
        cycles.push([...trail.slice(trail.indexOf(file)), file].join(' → '));
        return;
      }
      state.set(file, 'open');
      for (const target of graph.get(file) ?? []) if (graph.has(target)) visit(target, [...trail, file]);
      state.set(file, 'done');
    };
    for (const file of graph.keys()) visit(file, []);
    expect(cycles).toEqual([]);
  });
});
