import { readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { loadDesignFile } from '../../../cli/load-design.ts';
import { frontPlotSvg } from '../../../cli/plots.ts';
import { columnPlotSpec } from '../../../cli/views/column-plot.ts';
import { designDrawingSvg } from '../../../cli/views/design-drawing.ts';
import { placeLabels } from '../../../cli/views/label-placement.ts';
import { parseRunTable } from '../../../cli/views/run-table.ts';
import { vegaLiteSvg } from '../../../cli/views/vega-render.ts';
import { designField } from '../../../core/design-field.ts';
import { METRIC_KEYS } from '../../../core/metrics.ts';
import type { CandidateRow } from '../../../optimize/sweep-state.ts';

/**
 * The boxes of every text of an SVG, read back from the file: positions from the text's x/y or its
 * translate, the translations of the enclosing groups and nested svg elements added, a rotation of
 * ±90° turning the box. The width is ESTIMATED, not measured: 0.6 × font size per character (about
 * the mean advance of a sans-serif face's digits and lower case, from memory; the placement itself
 * reserves 0.62, so this reader is a little kinder than the placer), the height 0.7 × font size above
 * the baseline and 0.2 below. Boxes are shrunk by half a pixel so that texts that only touch pass.
 */
interface TextBox {
  text: string;
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

function translateOf(transform: string | undefined): [number, number] {
  const m = /translate\(\s*([-\d.e]+)[ ,]+([-\d.e]+)\s*\)/.exec(transform ?? '');
  return m ? [Number(m[1]), Number(m[2])] : [0, 0];
}

function attributes(tag: string): Record<string, string> {
  const found: Record<string, string> = {};
  for (const a of tag.matchAll(/([\w-]+)="([^"]*)"/g)) found[a[1]] = a[2];
  return found;
}

function textBoxes(svg: string): TextBox[] {
  const boxes: TextBox[] = [];
  const stack: Array<[number, number, number]> = []; // offset x, y, inherited font size
  let offset: [number, number, number] = [0, 0, 16];
  const tokens = svg.matchAll(/<(\/?)(g|svg|text)\b([^>]*?)(\/?)>([^<]*(?:<tspan[^>]*>[^<]*<\/tspan>[^<]*)*)/g);
  for (const [, closing, name, rest, selfClosing, body] of tokens) {
    if (closing) {
      if (name !== 'text') offset = stack.pop() ?? [0, 0, 16];
      continue;
    }
    const a = attributes(rest);
    const fontSize = a['font-size'] !== undefined ? Number.parseFloat(a['font-size']) : offset[2];
    if (name !== 'text') {
      if (selfClosing) continue;
      stack.push(offset);
      const [tx, ty] = translateOf(a.transform);
      const sx = name === 'svg' ? Number(a.x ?? 0) : 0;
      const sy = name === 'svg' ? Number(a.y ?? 0) : 0;
      offset = [offset[0] + tx + sx, offset[1] + ty + sy, fontSize];
      continue;
    }
    if (a.opacity === '0' || a['fill-opacity'] === '0') continue;
    const [tx, ty] = translateOf(a.transform);
    const x = offset[0] + tx + Number(a.x ?? 0);
    const y = offset[1] + ty + Number(a.y ?? 0);
    const lines = body.includes('<tspan')
      ? [...body.matchAll(/<tspan[^>]*>([^<]*)<\/tspan>/g)].map((m) => m[1])
      : [body.replace(/&[a-z]+;/g, '&')];
    const rotated = /rotate\(\s*-?90\s*\)/.test(a.transform ?? '');
    lines.forEach((line, k) => {
      const text = line.replace(/&[a-z]+;/g, '&');
      if (text.trim() === '') return;
      const width = 0.6 * fontSize * [...text].length;
      const anchor = a['text-anchor'] ?? 'start';
      const start = anchor === 'middle' ? -width / 2 : anchor === 'end' ? -width : 0;
      const base = k * 1.2 * fontSize; // Vega's tspans step down by about 1.2 em
      const along = [start + 0.5, start + width - 0.5];
      const across = [base - 0.7 * fontSize + 0.5, base + 0.2 * fontSize - 0.5];
      boxes.push(
        rotated
          ? { text, x0: x + across[0], x1: x + across[1], y0: y - along[1], y1: y - along[0] }
          : { text, x0: x + along[0], x1: x + along[1], y0: y + across[0], y1: y + across[1] },
      );
    });
  }
  return boxes;
}

function overlaps(boxes: TextBox[]): string[] {
  const found: string[] = [];
  for (let i = 0; i < boxes.length; i++)
    for (let j = i + 1; j < boxes.length; j++) {
      const a = boxes[i];
      const b = boxes[j];
      if (a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1) found.push(`'${a.text}' × '${b.text}'`);
    }
  return found;
}

describe('placeLabels', () => {
  it('puts a lone label beside its point, up and to the right, without a leader', () => {
    // exact: clearance 4 + 2 px along the diagonal; box bottom at that corner (label-placement.ts)
    const { placed, dropped } = placeLabels([{ x: 100, y: 100, text: '7', fontSize: 10, clearance: 4 }], {
      x0: 0,
      y0: 0,
      x1: 400,
      y1: 400,
    });
    expect(dropped).toEqual([]);
    expect(placed[0].anchor).toBe('start');
    expect(placed[0].x).toBeCloseTo(100 + 6 * Math.SQRT1_2, 9);
    expect(placed[0].leader).toBeNull();
  });

  it('places thirty labels on one point without overlap, using leaders and dropping the rest', () => {
    const requests = Array.from({ length: 30 }, (_, i) => ({
      x: 200,
      y: 200,
      text: String(i + 1),
      fontSize: 9,
      clearance: 4,
    }));
    const { placed, dropped } = placeLabels(requests, { x0: 0, y0: 0, x1: 400, y1: 400 });
    expect(placed.length + dropped.length).toBe(30);
    expect(placed.length).toBeGreaterThan(8);
    expect(placed[0].request.text).toBe('1'); // priority order kept
    expect(placed.some((p) => p.leader !== null)).toBe(true);
    const boxes = placed.map((p) => ({ text: p.request.text, ...p.box }));
    expect(overlaps(boxes)).toEqual([]);
  });
});

describe('no two texts overlap in crowded pictures (boxes estimated from the font size, see textBoxes)', () => {
  it('in coilfront plot with forty front designs packed into a corner', async () => {
    const header = 'rank,pareto_rank,crowding,feasible,sample_index,secondary.wire,tank.capacitance_nF,wire_mass_kg';
    const lines = [header];
    for (let i = 1; i <= 40; i++) lines.push(`${i},1,,1,${i},AWG 24,${20 + (i % 7) * 0.01},${0.4 + i * 0.0005}`);
    lines.push('41,2,,1,41,AWG 24,40,1.4');
    const table = parseRunTable(`${lines.join('\n')}\n`);
    const front = parseRunTable(`${lines.slice(0, 41).join('\n')}\n`);
    const svg = await vegaLiteSvg(
      columnPlotSpec({ candidates: table, front, infeasible: null }, { x: 'tank.capacitance_nF', y: 'wire_mass_kg' }),
    );
    const boxes = textBoxes(svg);
    expect(boxes.filter((b) => /^\d+$/.test(b.text)).length).toBeGreaterThan(10); // rank labels kept
    expect(boxes.some((b) => b.text === '1')).toBe(true); // the best rank is never dropped
    expect(overlaps(boxes)).toEqual([]);
  });

  it('in front.svg with thirty front designs on a tight staircase', async () => {
    const objectives = [
      { metric: 'breakout_voltage', sense: 'maximize' as const },
      { metric: 'wire_mass', sense: 'minimize' as const },
    ];
    const row = (b: number, m: number): CandidateRow => {
      const metrics: (number | null)[] = METRIC_KEYS.map(() => null);
      metrics[METRIC_KEYS.indexOf('breakout_voltage')] = b;
      metrics[METRIC_KEYS.indexOf('wire_mass')] = m;
      return { values: [], metrics, status: 0, reason: null, warningMask: 0 };
    };
    const front = Array.from({ length: 30 }, (_, i) => row(400e3 + i * 1e3, 0.5 + i * 0.002));
    const candidates = [...front, row(300e3, 2)];
    const svg = await frontPlotSvg(objectives, candidates, front, { ranks: front.map((_, i) => i + 1) });
    expect(overlaps(textBoxes(svg))).toEqual([]);
  });

  const examples = readdirSync('examples').filter((f) => f.endsWith('.yaml'));
  for (const file of examples) {
    it(`in the drawing of examples/${file}`, () => {
      const loaded = loadDesignFile(`examples/${file}`);
      const field = designField(loaded.design);
      const svg = designDrawingSvg(loaded.design, field, { title: file, fieldColumns: 24 });
      const boxes = textBoxes(svg);
      expect(boxes.length).toBeGreaterThan(10);
      expect(overlaps(boxes)).toEqual([]);
    });
  }
});
