/**
 * A design of a finished run by the id every file uses: a rank in candidates.csv (`3`), a refined id
 * (`r3`) or an evolved id (`e3`). The design is rebuilt from the run's own full-precision records
 * (the sample index, or the stored values), as `show` does, never from the rounded CSV cells.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import type { Design } from '../core/design.ts';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import type { NormalTree } from '../optimize/design-tree.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { loadRunSpec } from './sweep-spec.ts';
import { fileError } from './input-errors.ts';

export interface RunDesign {
  /** The id as given, normalised: '3', 'r3', 'e3'. */
  id: string;
  /** 'candidate 3 of runs/night (sample 677)'. */
  label: string;
  design: Design;
  tree: NormalTree;
}

/** The space of a run, built once per command. */
export function runSpace(directory: string): DesignSpace {
  return new DesignSpace(spaceDefinitionOf(loadRunSpec(directory)));
}

/** Resolves one id of a run into its design; an unknown id is an input error naming what there is. */
export function runDesign(directory: string, idText: string, space: DesignSpace = runSpace(directory)): RunDesign {
  const match = /^([er]?)(\d+)$/.exec(idText);
  if (!match || Number(match[2]) < 1) {
    throw fileError(
      directory,
      `expected a rank in candidates.csv (1, 2, …), a refined id (r1, …) or an evolved id (e1, …), got '${idText}'`,
    );
  }
  const rank = Number(match[2]);
  if (match[1] !== '') {
    const stage =
      match[1] === 'e'
        ? { file: RUN_FILES.evolvedDesigns, word: 'evolved', command: 'evolve' }
        : { file: RUN_FILES.refinedDesigns, word: 'refined', command: 'refine' };
    const path = join(directory, stage.file);
    if (!existsSync(path))
      throw fileError(directory, `no ${stage.word} designs yet (run npx coilfront ${stage.command} ${directory})`);
    const designs = JSON.parse(readFileSync(path, 'utf8')) as { rank: number | null; values: number[] }[];
    const entry = designs.find((d) => d.rank === rank);
    if (!entry) throw fileError(directory, `there is no ${stage.word} design of rank ${rank}`);
    const sampled = space.designOf(entry.values);
    if (!sampled.design) throw fileError(directory, `${stage.word} design ${rank} cannot be built`);
    return {
      id: `${match[1]}${rank}`,
      label: `${stage.word} design ${rank} of ${directory}`,
      design: sampled.design,
      tree: sampled.tree,
    };
  }
  const path = join(directory, RUN_FILES.candidates);
  if (!existsSync(path)) throw fileError(path, `no such file`);
  const rows = parseCsv(readFileSync(path, 'utf8'), { columns: true, skip_empty_lines: true }) as Record<
    string,
    string
  >[];
  const row = rows.find((r) => r.rank === String(rank));
  if (!row) throw fileError(directory, `there is no candidate of rank ${rank} (${rows.length} in candidates.csv)`);
  const index = Number(row.sample_index);
  const sampled = space.designAt(index);
  if (!sampled.design) throw fileError(directory, `candidate ${rank} cannot be built`);
  return {
    id: String(rank),
    label: `candidate ${rank} of ${directory} (sample ${index})`,
    design: sampled.design,
    tree: sampled.tree,
  };
}
