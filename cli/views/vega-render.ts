/**
 * Vega-Lite specs rendered headless: SVG by Vega's View.toSVG, PNG by rasterising that SVG with
 * @resvg/resvg-js. Vega is loaded on first use (most commands never draw, and it takes a while).
 */
import type { TopLevelSpec } from 'vega-lite';
import { KIND_DISPLAY, METRIC_DISPLAY, humanUnit } from '../display-units.ts';
import { type LabelRequest, placeLabels, pointBox } from './label-placement.ts';

/** The one-line caution every picture carries. */
export const PICTURE_CAUTION =
  'Model estimates, not a safety assessment: tank and supply voltages are lethal — read the safety cautions.';

/**
 * Labels a spec asks for beside its points (in `usermeta.pointLabels`, data coordinates of its x and
 * y scales), placed once the scales are known so that no two overlap (label-placement.ts); the spec
 * draws them through the layers of `pointLabelLayers`.
 */
export interface PointLabel {
  x: number;
  y: number;
  text: string;
}

/** Font size of the point labels, px. */
export const POINT_LABEL_FONT_SIZE = 9;
/** Radius of the marks the labels stand beside, px (a square of size 46 is about 7 px across). */
const POINT_LABEL_CLEARANCE = 4;
const LABEL_DATA = { start: 'point_labels_start', middle: 'point_labels_middle', end: 'point_labels_end' } as const;
const LEADER_DATA = 'point_label_leaders';

/** The layers that draw the placed labels and their leaders (pixel positions, no scale). */
export function pointLabelLayers(colour: string): Record<string, unknown>[] {
  const pixel = (field: string) => ({ field, type: 'quantitative' as const, scale: null });
  const align = { start: 'left', middle: 'center', end: 'right' } as const;
  return [
    {
      data: { name: LEADER_DATA },
      mark: { type: 'rule', color: colour, strokeWidth: 0.6, opacity: 0.7 },
      encoding: { x: pixel('x1'), y: pixel('y1'), x2: { field: 'x2' }, y2: { field: 'y2' } },
    },
    ...(['start', 'middle', 'end'] as const).map((anchor) => ({
      data: { name: LABEL_DATA[anchor] },
      mark: {
        type: 'text',
        align: align[anchor],
        baseline: 'alphabetic',
        fontSize: POINT_LABEL_FONT_SIZE,
        color: colour,
      },
      encoding: { x: pixel('x'), y: pixel('y'), text: { field: 'text' } },
    })),
  ];
}

export async function vegaLiteSvg(spec: TopLevelSpec): Promise<string> {
  const [vega, { compile }] = await Promise.all([import('vega'), import('vega-lite')]);
  const compiled = compile(spec).spec;
  const view = new vega.View(vega.parse(compiled), { renderer: 'none' });
  const labels = (spec.usermeta?.pointLabels ?? []) as PointLabel[];
  if (labels.length > 0) {
    await view.runAsync();
    const width = Number(view.signal('width'));
    const height = Number(view.signal('height'));
    const xs = view.scale('x') as (value: number) => number;
    const ys = view.scale('y') as (value: number) => number;
    const requests: LabelRequest[] = labels.map((label) => ({
      x: xs(label.x),
      y: ys(label.y),
      text: label.text,
      fontSize: POINT_LABEL_FONT_SIZE,
      clearance: POINT_LABEL_CLEARANCE,
    }));
    const marks = requests.map((r) => pointBox(r.x, r.y, POINT_LABEL_CLEARANCE));
    const { placed } = placeLabels(requests, { x0: 0, y0: 0, x1: width, y1: height }, marks);
    for (const anchor of ['start', 'middle', 'end'] as const)
      view.data(
        LABEL_DATA[anchor],
        placed.filter((p) => p.anchor === anchor).map((p) => ({ x: p.x, y: p.y, text: p.request.text })),
      );
    view.data(
      LEADER_DATA,
      placed.flatMap((p) => (p.leader ? [p.leader] : [])),
    );
  }
  const svg = await view.toSVG();
  view.finalize();
  return `${svg}\n`;
}

/** PNG bytes of an SVG text, at `scale` times its size (system fonts for the text). */
export async function svgToPng(svg: string, scale = 2): Promise<Buffer> {
  const { Resvg } = await import('@resvg/resvg-js');
  const resvg = new Resvg(svg, {
    fitTo: { mode: 'zoom', value: scale },
    background: 'white',
    font: { loadSystemFonts: true, defaultFontFamily: 'DejaVu Sans' },
  });
  return Buffer.from(resvg.render().asPng());
}

const UNIT_LABELS = [...new Set([...Object.values(METRIC_DISPLAY), ...Object.values(KIND_DISPLAY)].map((u) => u.label))]
  .filter((label) => label !== '')
  .sort((a, b) => b.length - a.length);

/** A column name as an axis title: `secondary.form_diameter_mm` → `secondary form diameter (mm)`. */
export function columnTitle(column: string): string {
  for (const label of UNIT_LABELS) {
    if (column.endsWith(`_${label}`)) {
      const name = column.slice(0, -label.length - 1);
      return `${name.replace(/[._]/g, ' ')} (${humanUnit(label)})`;
    }
  }
  return column.replace(/[._]/g, ' ');
}

/**
 * Text broken into lines of at most `width` pixels by Vega's own estimate of headless text
 * (0.8 × font size per character), so that a long title does not widen the canvas beyond the plot.
 */
export function wrapText(text: string, width: number, fontSize: number): string[] {
  const maxChars = Math.max(20, Math.floor(width / (0.8 * fontSize)));
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/)) {
    if (line !== '' && line.length + 1 + word.length > maxChars) {
      lines.push(line);
      line = word;
    } else line = line === '' ? word : `${line} ${word}`;
  }
  if (line !== '') lines.push(line);
  return lines;
}
