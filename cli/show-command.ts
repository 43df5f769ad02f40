/**
 * `coilfront show RUN_DIR RANK` prints the complete design file of a ranked candidate (or, with
 * `--refined` or an id r3, of a refined design; with an id e3, of an evolved design), in each quantity in a practical unit with the fewest digits that read back exactly, so that a row
 * of the spreadsheet goes straight to `coilfront evaluate` and gives the same metrics.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { isSlot, type LeafValue, type NormalTree } from '../optimize/design-tree.ts';
import { DESIGN_SECTIONS, flatFields, type FieldSpec } from './design-fields.ts';
import { KIND_DISPLAY, formatNumber, lengthText } from './display-units.ts';
import { exactQuantityText } from './units.ts';
import type { CliIo } from './io.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { SAFETY_LINE } from './safety.ts';
import { loadRunSpec } from './sweep-spec.ts';
import { commandError, fileError } from './input-errors.ts';

/** A design's normal tree as YAML text: exact SI numbers, a unit comment beside each quantity. */
export function treeToYaml(tree: NormalTree, heading: string[]): string {
  const lines = [...heading, SAFETY_LINE].map((line) => `# ${line}`);
  for (const [name, section] of Object.entries(tree)) {
    if (isSlot(section)) continue;
    const fields = flatFields(DESIGN_SECTIONS[name], section);
    lines.push(`${name}:`);
    // A sub-section's fields (dotted keys, 'bank.part.capacitance') are written nested, as the file has them.
    const open: string[] = [];
    for (const [key, value] of Object.entries(section)) {
      if (isSlot(value)) continue;
      const names = key.split('.');
      let depth = 0;
      while (depth < open.length && depth < names.length - 1 && open[depth] === names[depth]) depth++;
      open.length = depth;
      for (; depth < names.length - 1; depth++) {
        lines.push(`${'  '.repeat(depth + 1)}${names[depth]}:`);
        open.push(names[depth]);
      }
      lines.push(`${'  '.repeat(depth + 1)}${names[depth]}: ${yamlValue(value, fields[key])}`);
    }
  }
  return `${lines.join('\n')}\n`;
}

/** One value of the normal tree as YAML: a wire, a quantity in a practical unit that reads back exactly, or as it is. */
function yamlValue(value: LeafValue, field: FieldSpec | undefined): string {
  if (typeof value === 'object') {
    return 'awg' in value ? `AWG ${value.awg}` : `${value.bareDiameter}  # ${lengthText(value.bareDiameter, 6)}`;
  }
  if (typeof value === 'number' && field?.type === 'quantity' && field.kind !== 'dimensionless') {
    // In a practical unit, with the fewest digits that read back to exactly this SI value.
    const exact = exactQuantityText(value, field.kind);
    const display = KIND_DISPLAY[field.kind];
    return exact !== null ? exact : `${value}  # ${formatNumber(value / display.divisor, 6)} ${display.label}`;
  }
  return typeof value === 'string' ? value : String(value);
}

function readCsvRows(path: string): Record<string, string>[] {
  if (!existsSync(path)) throw fileError(path, `no such file`);
  return parseCsv(readFileSync(path, 'utf8'), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
}

/** A design of a run, by rank (candidates.csv), stage id (r3, e3 / --refined 3) or --sample I: its normal tree and what it is. */
export function runDesignTree(
  directory: string,
  rankText: string | undefined,
  options: { refined?: string; sample?: string },
): { tree: NormalTree; title: string } {
  const spec = loadRunSpec(directory);
  const space = new DesignSpace(spaceDefinitionOf(spec));
  if (options.sample !== undefined) {
    const index = Number(options.sample);
    if (!/^\d+$/.test(options.sample) || index >= spec.samples)
      throw commandError(
        'show --sample',
        `expected a sample index 0 … ${spec.samples - 1} (the sample_index column), got '${options.sample}'`,
      );
    return { tree: space.designAt(index).tree, title: `sample ${index} of ${directory}` };
  }
  // A stage design is known by its id: `show RUN r3` (refined.csv, or --refined 3), `show RUN e3` (evolved.csv).
  const stageId = rankText !== undefined ? /^([er])(\d+)$/.exec(rankText) : null;
  if (stageId?.[1] === 'r') options = { ...options, refined: stageId[2] };
  const wanted = stageId?.[1] === 'e' ? stageId[2] : (options.refined ?? rankText);
  if (wanted === undefined || !/^\d+$/.test(wanted) || Number(wanted) < 1) {
    throw commandError(
      'show',
      `expected a rank in candidates.csv (1, 2, …), a refined id (r1, r2, …), an evolved id (e1, e2, …) or --sample I, got '${wanted ?? ''}'`,
    );
  }
  const rank = Number(wanted);
  const stage =
    stageId?.[1] === 'e'
      ? { file: RUN_FILES.evolvedDesigns, csv: RUN_FILES.evolved, word: 'evolved', command: 'evolve' }
      : options.refined !== undefined
        ? { file: RUN_FILES.refinedDesigns, csv: RUN_FILES.refined, word: 'refined', command: 'refine' }
        : null;
  if (stage) {
    const path = join(directory, stage.file);
    if (!existsSync(path))
      throw fileError(directory, `no ${stage.word} designs yet (run npx coilfront ${stage.command} ${directory})`);
    // Designs without a rank (evolved ones near an improved one) are there for later stages only.
    const designs = (JSON.parse(readFileSync(path, 'utf8')) as { rank: number | null; values: number[] }[]).filter(
      (d) => d.rank !== null,
    );
    const entry = designs.find((d) => d.rank === rank);
    if (!entry)
      throw fileError(
        directory,
        `there is no ${stage.word} design of rank ${rank} (${designs.length} in ${stage.csv})`,
      );
    return { tree: space.designOf(entry.values).tree, title: `${stage.word} design ${rank} of ${directory}` };
  }
  const rows = readCsvRows(join(directory, RUN_FILES.candidates));
  const row = rows.find((r) => r.rank === String(rank));
  if (!row) throw fileError(directory, `there is no candidate of rank ${rank} (${rows.length} in candidates.csv)`);
  const index = Number(row.sample_index);
  return { tree: space.designAt(index).tree, title: `candidate ${rank} of ${directory} (sample ${index})` };
}

export function showCommand(
  directory: string,
  rankText: string | undefined,
  options: { refined?: string; sample?: string },
  io: CliIo,
): number {
  const { tree, title } = runDesignTree(directory, rankText, options);
  io.out(treeToYaml(tree, [title, 'each value in a practical unit that reads back exactly']));
  return 0;
}
