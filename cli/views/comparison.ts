/**
 * The comparison of `coilfront compare`: the chosen designs side by side, a column each, every
 * design parameter and every metric in its practical unit (a row of lengths in the unit
 * `lengthDisplay` picks for the largest of them, so one row has one unit), the rows where the
 * designs differ marked; and their drawings side by side at one scale.
 */
import type { Design } from '../../core/design.ts';
import type { designField } from '../../core/design-field.ts';
import type { Evaluation } from '../../core/evaluate.ts';
import { METRIC_KEYS } from '../../core/metrics.ts';
import type { NormalTree } from '../../optimize/design-tree.ts';
import { isSlot } from '../../optimize/design-tree.ts';
import type { QuantityKind } from '../units.ts';
import { DESIGN_SECTIONS, flatFields } from '../design-fields.ts';
import { METRIC_DISPLAY, fieldDisplay, formatNumber, humanUnit, lengthText } from '../display-units.ts';
import { safetyBlock } from '../safety.ts';
import { designDrawingSvg } from './design-drawing.ts';

/** The marker of a row whose designs differ. */
export const DIFFERS = '≠';

export interface Compared {
  name: string;
  design: Design;
  tree: NormalTree;
  evaluation: Evaluation;
  field: ReturnType<typeof designField>;
}

interface Cell {
  text: string;
  value: number | string;
}

/** One design's parameter: a text, or an SI quantity of a kind (formatted once the row's unit is known). */
type Parameter = { text: string } | { si: number; kind: QuantityKind };

/** A design's parameters by field path: 'secondary.form_diameter' → 0.16 m. */
function parameters(tree: NormalTree): Map<string, Parameter> {
  const cells = new Map<string, Parameter>();
  for (const [name, section] of Object.entries(tree)) {
    if (isSlot(section)) continue;
    const spec = DESIGN_SECTIONS[name];
    if (!spec) continue;
    const fields = flatFields(spec, section); // a sub-section's fields by their dotted keys
    for (const [key, value] of Object.entries(section)) {
      if (isSlot(value)) continue;
      const field = fields[key];
      if (typeof value === 'object' && value !== null) {
        const wire = value as { awg?: number; bareDiameter: number };
        cells.set(`${name}.${key}`, {
          text: wire.awg !== undefined ? `AWG ${wire.awg}` : lengthText(wire.bareDiameter, 6),
        });
      } else if (typeof value === 'number' && field?.type === 'quantity') {
        cells.set(`${name}.${key}`, { si: value, kind: field.kind });
      } else {
        cells.set(`${name}.${key}`, { text: String(value) });
      }
    }
  }
  return cells;
}

/** A row of parameters: its label with the unit shared by its cells, and the cells. */
function parameterRow(path: string, values: (Parameter | undefined)[]): { label: string; cells: Cell[] } {
  const quantity = values.find((v): v is { si: number; kind: QuantityKind } => v !== undefined && 'si' in v);
  const si = values.flatMap((v) => (v !== undefined && 'si' in v ? [v.si] : []));
  const display = quantity ? fieldDisplay(path, quantity.kind, si) : undefined;
  const unit = display ? humanUnit(display.label) : '';
  const cells = values.map((v): Cell => {
    if (v === undefined) return { text: '—', value: '—' };
    if ('text' in v) return { text: v.text, value: v.text };
    const shown = v.si / (display?.divisor ?? 1);
    return { text: formatNumber(shown, 6), value: shown };
  });
  return { label: unit === '' ? path : `${path} (${unit})`, cells };
}

/** A metric's row label with its unit: 'resonant_frequency (kHz)'. */
function metricLabel(key: string): string {
  const display = METRIC_DISPLAY[key];
  const unit = display ? humanUnit(display.label) : '';
  return unit === '' ? key : `${key} (${unit})`;
}

function metricCell(evaluation: Evaluation, key: string): Cell {
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
  const addRow = (label: string, cells: Cell[]) => {
    rows.push([differ(cells.map((c) => c.value)) ? DIFFERS : '', label, ...cells.map((c) => c.text)]);
  };
  section('design');
  const parameterSets = compared.map((c) => parameters(c.tree));
  const paths: string[] = [];
  for (const set of parameterSets) for (const path of set.keys()) if (!paths.includes(path)) paths.push(path);
  for (const path of paths) {
    const row = parameterRow(
      path,
      parameterSets.map((set) => set.get(path)),
    );
    addRow(row.label, row.cells);
  }
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
