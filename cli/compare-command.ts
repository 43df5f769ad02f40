/**
 * `coilfront compare RUN 1 3 7` (or `coilfront compare a.yaml b.yaml`): the chosen designs side by
 * side, a column each, every design parameter and every metric in its practical unit, the rows where
 * the designs differ marked; `--svg FILE` also draws them side by side at one scale.
 */
import { existsSync, statSync } from 'node:fs';
import type { Design } from '../core/design.ts';
import { designField } from '../core/design-field.ts';
import type { Evaluation } from '../core/evaluate.ts';
import { METRIC_KEYS } from '../core/metrics.ts';
import type { NormalTree } from '../optimize/design-tree.ts';
import { isSlot } from '../optimize/design-tree.ts';
import { DESIGN_SECTIONS, sectionFields } from './design-fields.ts';
import { KIND_DISPLAY, METRIC_DISPLAY, formatNumber, humanUnit } from './display-units.ts';
import { writeFileAtomicSync } from '../run/durable/atomic-write.ts';
import { fieldError, InputError, optionError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { loadDesignFile } from './load-design.ts';
import { runDesign, runSpace } from './run-design.ts';
import { safetyBlock } from './safety.ts';
import { designDrawingSvg } from './views/design-drawing.ts';

/** The marker of a row whose designs differ. */
export const DIFFERS = '≠';

interface Compared {
  name: string;
  design: Design;
  tree: NormalTree;
  evaluation: Evaluation;
  field: ReturnType<typeof designField>;
}

/** A design's parameters as rows: 'secondary.form_diameter (mm)' → '160'. */
function parameterCells(tree: NormalTree): Map<string, { text: string; value: number | string }> {
  const cells = new Map<string, { text: string; value: number | string }>();
  for (const [name, section] of Object.entries(tree)) {
    if (isSlot(section)) continue;
    const spec = DESIGN_SECTIONS[name];
    if (!spec) continue;
    const form = spec.variants ? (section[spec.variants.key] as string) : undefined;
    const fields = sectionFields(spec, form);
    for (const [key, value] of Object.entries(section)) {
      if (isSlot(value)) continue;
      const field = fields[key];
      if (typeof value === 'object' && value !== null) {
        const wire = value as { awg?: number; bareDiameter: number };
        const text = wire.awg !== undefined ? `AWG ${wire.awg}` : `${formatNumber(wire.bareDiameter * 1000, 6)} mm`;
        cells.set(`${name}.${key}`, { text, value: text });
      } else if (typeof value === 'number' && field?.type === 'quantity') {
        const display = KIND_DISPLAY[field.kind];
        const unit = humanUnit(display.label);
        cells.set(`${name}.${key}${unit === '' ? '' : ` (${unit})`}`, {
          text: formatNumber(value / display.divisor, 6),
          value: value / display.divisor,
        });
      } else {
        cells.set(`${name}.${key}`, { text: String(value), value: String(value) });
      }
    }
  }
  return cells;
}

/** A metric's row label with its unit: 'resonant_frequency (kHz)'. */
function metricLabel(key: string): string {
  const display = METRIC_DISPLAY[key];
  const unit = display ? humanUnit(display.label) : '';
  return unit === '' ? key : `${key} (${unit})`;
}

function metricCell(evaluation: Evaluation, key: string): { text: string; value: number | string } {
  const value = evaluation.metrics[key];
  if (value === null || value === undefined || !Number.isFinite(value)) return { text: '—', value: '—' };
  const display = METRIC_DISPLAY[key];
  const shown = value / (display?.divisor ?? 1);
  return { text: formatNumber(shown, 5), value: shown };
}

/**
 * Whether the values of a row differ: texts, or numbers in their display unit apart by more than
 * 1e-9 both relatively and absolutely (rounding noise, such as a tuning error of 2e-16 against 0,
 * is no difference).
 */
function differ(values: (number | string)[]): boolean {
  const first = values[0];
  return values.some((v) => {
    if (typeof v === 'number' && typeof first === 'number') {
      const gap = Math.abs(v - first);
      return gap > 1e-9 && gap > 1e-9 * Math.max(Math.abs(v), Math.abs(first));
    }
    return v !== first;
  });
}

/** The comparison as text: a heading row, the parameters, the metrics, the warnings, the cautions. */
export function comparisonText(compared: Compared[]): string {
  const header = ['', 'field', ...compared.map((c) => c.name)];
  const rows: string[][] = [];
  const section = (title: string) => rows.push(['', `— ${title} —`, ...compared.map(() => '')]);
  const addRow = (label: string, cells: { text: string; value: number | string }[]) => {
    rows.push([differ(cells.map((c) => c.value)) ? DIFFERS : '', label, ...cells.map((c) => c.text)]);
  };
  section('design');
  const parameterSets = compared.map((c) => parameterCells(c.tree));
  const labels: string[] = [];
  for (const set of parameterSets) for (const label of set.keys()) if (!labels.includes(label)) labels.push(label);
  for (const label of labels)
    addRow(
      label,
      parameterSets.map((set) => set.get(label) ?? { text: '—', value: '—' }),
    );
  section('metrics');
  for (const key of METRIC_KEYS) {
    addRow(
      metricLabel(key),
      compared.map((c) => metricCell(c.evaluation, key)),
    );
  }
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) =>
    cells
      .map((cell, i) => (i <= 1 ? cell.padEnd(widths[i]) : cell.padStart(widths[i])))
      .join('  ')
      .trimEnd();
  const out = [
    line(header),
    ...rows.map(line),
    '',
    `${DIFFERS} marks the rows where the designs differ.`,
    '',
    'warnings:',
  ];
  for (const c of compared) {
    const keys = c.evaluation.warnings.map((w) => w.key).join(', ');
    out.push(`  ${c.name}: ${keys === '' ? 'none' : keys}`);
  }
  out.push('');
  out.push(safetyBlock(), '');
  return out.join('\n');
}

/** The designs named on the command line: ids of one run, or design files. */
function comparedDesigns(source: string, rest: string[]): Compared[] {
  const isRun = existsSync(source) && statSync(source).isDirectory();
  const found: { name: string; design: Design; tree: NormalTree; file: string }[] = [];
  if (isRun) {
    if (rest.length < 1)
      throw new InputError(`compare: give the ranks to compare after the run (compare ${source} 1 3 7)`);
    const space = runSpace(source);
    for (const id of rest) {
      const design = runDesign(source, id, space);
      found.push({ name: id, design: design.design, tree: design.tree, file: source });
    }
  } else {
    for (const file of [source, ...rest]) {
      const loaded = loadDesignFile(file);
      found.push({ name: file, design: loaded.design, tree: loaded.tree, file });
    }
  }
  if (found.length < 2) throw new InputError('compare: give at least two designs');
  return found.map((f) => {
    const field = designField(f.design);
    if (field.evaluation.problems.length > 0) {
      const problem = field.evaluation.problems[0];
      throw fieldError(f.file, { path: problem.field.split('.'), message: `${f.name}: ${problem.reason}` });
    }
    return { name: f.name, design: f.design, tree: f.tree, evaluation: field.evaluation, field };
  });
}

/** The drawings side by side, all at one scale (the tallest design fills the height). */
export function sideBySideSvg(compared: Compared[]): string {
  const tallest = Math.max(...compared.map((c) => c.evaluation.metrics.overall_height ?? 0.5));
  const drawings = compared.map((c) =>
    designDrawingSvg(c.design, c.field, { title: c.name, pictureTop: tallest * 1.15 + 0.05 }),
  );
  let x = 0;
  let height = 0;
  const placed: string[] = [];
  for (const svg of drawings) {
    const w = Number(/<svg[^>]* width="([\d.]+)"/.exec(svg)?.[1] ?? 0);
    const h = Number(/<svg[^>]* height="([\d.]+)"/.exec(svg)?.[1] ?? 0);
    placed.push(svg.replace(/^<svg /, `<svg x="${x}" y="0" `));
    x += w;
    height = Math.max(height, h);
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${x}" height="${height}" viewBox="0 0 ${x} ${height}">\n${placed.join('\n')}</svg>\n`;
}

export function compareCommand(source: string, rest: string[], options: { svg?: string }, io: CliIo): number {
  if (options.svg !== undefined && !/\.svg$/i.test(options.svg))
    throw optionError('--svg', `expected a file name ending in .svg, got '${options.svg}'`);
  const compared = comparedDesigns(source, rest);
  if (options.svg !== undefined) writeFileAtomicSync(options.svg, sideBySideSvg(compared));
  io.out(comparisonText(compared));
  if (options.svg !== undefined) io.out(`drawings side by side: ${options.svg}\n`);
  return 0;
}
