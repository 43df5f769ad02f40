/**
 * A design file, from path to the physics core's SI `Design`: read, parse, validate, build.
 */
import type { Design } from '../core/design.ts';
import { buildDesign } from '../optimize/build-design.ts';
import { readDesignTree, type NormalTree } from './design-schema.ts';
import { fieldError } from '../run/input-error.ts';
import { readInputFile } from './read-file.ts';

export interface LoadedDesign {
  design: Design;
  /** The normal tree (file names, SI values): what `--json` prints as "design". */
  tree: NormalTree;
}

/** Turns a parsed design value into the SI design, or throws the first problem as an InputError. */
export function designFromValue(value: unknown, file: string): LoadedDesign {
  const reading = readDesignTree(value, 'design');
  if (reading.issues.length > 0) throw fieldError(file, reading.issues[0]);
  const built = buildDesign(reading.tree);
  if (built.issues.length > 0 || !built.design) throw fieldError(file, built.issues[0]);
  return { design: built.design, tree: reading.tree };
}

/** Loads a design file (YAML or JSON). */
export function loadDesignFile(file: string): LoadedDesign {
  return designFromValue(readInputFile(file), file);
}
