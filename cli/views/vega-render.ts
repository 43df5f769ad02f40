/**
 * Vega-Lite specs rendered headless: SVG by Vega's View.toSVG, PNG by rasterising that SVG with
 * @resvg/resvg-js. Vega is loaded on first use (most commands never draw, and it takes a while).
 */
import type { TopLevelSpec } from 'vega-lite';
import { KIND_DISPLAY, METRIC_DISPLAY, humanUnit } from '../display-units.ts';

/** The one-line caution every picture carries. */
export const PICTURE_CAUTION =
  'Model estimates, not a safety assessment: tank and supply voltages are lethal — read the safety cautions.';

export async function vegaLiteSvg(spec: TopLevelSpec): Promise<string> {
  const [vega, { compile }] = await Promise.all([import('vega'), import('vega-lite')]);
  const compiled = compile(spec).spec;
  const view = new vega.View(vega.parse(compiled), { renderer: 'none' });
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
