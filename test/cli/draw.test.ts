import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { CliIo } from '../../cli/io.ts';
import { runCli } from '../../cli/program.ts';

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => (out += t), err: (t) => (err += t), isTty: false };
  const code = await runCli(args, io);
  return { code, out, err };
}

const directory = mkdtempSync(join(tmpdir(), 'coilfront-draw-'));

/** Attributes of every element of a class in an SVG text (a small reader for our own drawings). */
function elements(svg: string, className: string): Record<string, string>[] {
  const found: Record<string, string>[] = [];
  const pattern = new RegExp(`<(\\w+) class="${className}"([^>]*)>`, 'g');
  for (const match of svg.matchAll(pattern)) {
    const attributes: Record<string, string> = { tag: match[1] };
    for (const a of match[2].matchAll(/([\w-]+)="([^"]*)"/g)) attributes[a[1]] = a[2];
    found.push(attributes);
  }
  return found;
}

function rootNumber(svg: string, name: string): number {
  const value = new RegExp(`<svg[^>]* ${name}="([^"]+)"`).exec(svg)?.[1];
  if (value === undefined) throw new Error(`no ${name} on the root element`);
  return Number(value);
}

describe('coilfront draw examples/exhibit-two-metre-coil.yaml', async () => {
  const out = join(directory, 'exhibit.svg');
  const result = await run(['draw', 'examples/exhibit-two-metre-coil.yaml', '--out', out]);
  const svg = readFileSync(out, 'utf8');
  const scale = rootNumber(svg, 'data-scale');
  const axisX = rootNumber(svg, 'data-axis-x');
  const floorY = rootNumber(svg, 'data-floor-y');
  // Drawing units are rounded to 0.01, so lengths agree to about 0.02/scale m (< 0.1 mm here).
  const tolerance = 0.05 / scale;

  it('writes the SVG and prints its path', () => {
    expect(result.err).toBe('');
    expect(result.code).toBe(0);
    expect(result.out.trim()).toBe(out);
    expect(svg.startsWith('<svg')).toBe(true);
  });

  // Check values: the design file's own dimensions (examples/exhibit-two-metre-coil.yaml).
  it('draws the toroid 900 mm across and 230 mm thick, to scale', () => {
    const [topload] = elements(svg, 'topload');
    expect(Number(topload.width) / scale).toBeCloseTo(0.9, 3);
    expect(Math.abs(Number(topload.height) / scale - 0.23)).toBeLessThan(tolerance);
    expect(Math.abs(Number(topload.x) + Number(topload.width) / 2 - axisX)).toBeLessThan(0.02);
  });

  it('draws the coil form 250 mm across, the strike rail 1000 mm across, the innermost primary ring 360 mm across', () => {
    const [form] = elements(svg, 'coil-form');
    expect(Math.abs(Number(form.width) / scale - 0.25)).toBeLessThan(tolerance);
    const rail = elements(svg, 'strike-rail').map((c) => Number(c.cx));
    expect(rail.length).toBe(2);
    expect(Math.abs((Math.max(...rail) - Math.min(...rail)) / scale - 1)).toBeLessThan(tolerance);
    const rings = elements(svg, 'primary-ring');
    expect(rings.length).toBe(2 * 14); // 14 turns, drawn on both sides of the axis
    const radii = rings.map((c) => Math.abs(Number(c.cx) - axisX) / scale);
    expect(Math.abs(Math.min(...radii) - 0.18)).toBeLessThan(tolerance);
  });

  it('puts the winding’s base 700 mm above the floor and the top of the toroid at the reported overall height', async () => {
    const winding = /<g class="winding" data-bottom-z="([^"]+)"/.exec(svg);
    expect(Number(winding?.[1])).toBeCloseTo(0.7, 9);
    const evaluated = await run(['evaluate', 'examples/exhibit-two-metre-coil.yaml', '--json']);
    const overall = JSON.parse(evaluated.out).metrics.overall_height as number;
    const [topload] = elements(svg, 'topload');
    expect(Math.abs((floorY - Number(topload.y)) / scale - overall)).toBeLessThan(tolerance);
    const [dimension] = elements(svg, 'dimension overall-height');
    expect(Number(dimension['data-metres'])).toBe(overall);
  });

  it('draws equipotentials of the solved field at several levels, the peak-field spot and the strike distance', () => {
    const levels = new Set(elements(svg, 'equipotential').map((p) => p['data-level']));
    expect(levels.size).toBeGreaterThanOrEqual(7);
    expect(svg).toContain('class="peak-field"');
    const [strike] = elements(svg, 'dimension strike-distance');
    expect(Number(strike['data-metres'])).toBeGreaterThan(0.3);
    expect(svg).toMatch(/voltages are lethal/);
  });

  it('the 50 % equipotential is a long line that stays above the floor', () => {
    const half = elements(svg, 'equipotential').find((p) => p['data-level'] === '0.5');
    const ys = [...(half?.d ?? '').matchAll(/[ML][\d.]+,([\d.]+)/g)].map((m) => Number(m[1]));
    expect(ys.length).toBeGreaterThan(10);
    expect(Math.max(...ys)).toBeLessThan(floorY);
  });
});

describe('coilfront draw with bad input', () => {
  it('exits 2 with one line for a missing file, and writes nothing', async () => {
    const out = join(directory, 'none.svg');
    const result = await run(['draw', join(directory, 'missing.yaml'), '--out', out]);
    expect(result.code).toBe(2);
    expect(result.err.trim().split('\n').length).toBe(1);
  });

  it('exits 2 naming the field of a design that cannot be built', async () => {
    const file = join(directory, 'inside.yaml');
    writeFileSync(
      file,
      `secondary: { form_diameter: 160 mm, wire: AWG 26, turns: 1100, base_height: 450 mm }
topload: { shape: toroid, outer_diameter: 610 mm, tube_diameter: 150 mm, height_above_winding: 40 mm }
primary: { shape: flat_spiral, inner_diameter: 100 mm, turns: 8, conductor_diameter: 6.35 mm, turn_spacing: 6 mm }
`,
    );
    const result = await run(['draw', file]);
    expect(result.code).toBe(2);
    expect(result.err).toContain('primary.inner_diameter');
  });

  it('exits 2 for an output that is neither .svg nor .png', async () => {
    const result = await run(['draw', 'examples/exhibit-two-metre-coil.yaml', '--out', join(directory, 'x.pdf')]);
    expect(result.code).toBe(2);
    expect(result.err).toContain('--out');
  });
});

describe('coilfront draw examples/gallery-coil-breakout-point.yaml', async () => {
  const out = join(directory, 'gallery.svg');
  const result = await run(['draw', 'examples/gallery-coil-breakout-point.yaml', '--out', out]);
  const svg = readFileSync(out, 'utf8');
  const scale = rootNumber(svg, 'data-scale');
  const evaluated = await run(['evaluate', 'examples/gallery-coil-breakout-point.yaml', '--json']);
  const metrics = (JSON.parse(evaluated.out) as { metrics: Record<string, number | null> }).metrics;

  it('draws the breakout point at the length the evaluation sized it to', () => {
    expect(result.code).toBe(0);
    const points = [
      ...svg.matchAll(
        /class="breakout-point" data-length="([^"]+)"><line x1="([^"]+)" y1="([^"]+)" x2="([^"]+)" y2="([^"]+)"/g,
      ),
    ];
    expect(points.length).toBeGreaterThan(0);
    for (const [, length, x1, y1, x2, y2] of points) {
      expect(Number(length)).toBeCloseTo(metrics.breakout_point_length ?? Number.NaN, 12);
      expect(Math.hypot(Number(x2) - Number(x1), Number(y2) - Number(y1)) / scale).toBeCloseTo(Number(length), 4);
    }
  });

  it('draws the column on the axis, as wide as its diameter, up from the winding top', () => {
    const [column] = elements(svg, 'support');
    expect(column).toBeDefined();
    expect(Number(column?.['stroke-width']) / scale).toBeCloseTo(0.06, 4);
    expect(column?.x1).toBe(column?.x2);
    const top = elements(svg, 'winding').map((w) => Number(w.y1 ?? w.y ?? Number.NaN));
    expect(top.length).toBeGreaterThan(0);
  });
});

describe('coilfront draw examples/three-coil-exhibit.yaml (a resonator on its own axis)', async () => {
  const out = join(directory, 'three-coil.svg');
  const result = await run(['draw', 'examples/three-coil-exhibit.yaml', '--out', out]);
  const svg = readFileSync(out, 'utf8');
  const scale = rootNumber(svg, 'data-scale');
  const axisX = rootNumber(svg, 'data-axis-x');
  const floorY = rootNumber(svg, 'data-floor-y');
  const evaluated = await run(['evaluate', 'examples/three-coil-exhibit.yaml', '--json']);
  const metrics = (JSON.parse(evaluated.out) as { metrics: Record<string, number | null> }).metrics;
  // Check values: the design file's own dimensions (axis spacing 3 m, toroid 900 mm by 230 mm, a
  // 60 mm column) and the evaluation's sized rod; drawing units are rounded to 0.01.
  const resonatorX = axisX + 3 * scale;

  it('draws the resonator group 3 m from the secondary, with its own winding and equipotentials', () => {
    expect(result.code).toBe(0);
    const [group] = elements(svg, 'resonator');
    expect(Number(group?.['data-axis-spacing'])).toBe(3);
    const resonatorPart = svg.slice(svg.indexOf('<g class="resonator"'));
    expect(elements(resonatorPart, 'winding').length).toBe(1);
    expect(elements(resonatorPart, 'equipotential').length).toBeGreaterThan(3);
    expect(elements(svg, 'winding').length).toBe(2);
    expect(elements(svg, 'feed-line').length).toBe(1);
  });

  it('draws the toroid once, on the resonator, 900 mm across, with its centre disc 440 mm across', () => {
    const toploads = elements(svg, 'topload');
    expect(toploads.length).toBe(1);
    const [topload] = toploads;
    expect(Number(topload.width) / scale).toBeCloseTo(0.9, 3);
    expect(Math.abs(Number(topload.x) + Number(topload.width) / 2 - resonatorX)).toBeLessThan(0.02);
    const [disc] = elements(svg, 'center-disc');
    // the disc fills the hole: diameter = outer − 2 × tube = 900 − 460 mm
    expect(Number(disc?.width) / scale).toBeCloseTo(0.44, 3);
    expect(Math.abs(Number(disc?.x) + Number(disc?.width) / 2 - resonatorX)).toBeLessThan(0.02);
  });

  it('draws one breakout rod on the resonator axis at the sized length, and the column on that axis', () => {
    const points = [
      ...svg.matchAll(
        /class="breakout-point" data-length="([^"]+)"><line x1="([^"]+)" y1="([^"]+)" x2="([^"]+)" y2="([^"]+)"/g,
      ),
    ];
    expect(points.length).toBe(1);
    const [, length, x1, y1, x2, y2] = points[0] ?? [];
    expect(Number(length)).toBeCloseTo(metrics.breakout_point_length ?? Number.NaN, 12);
    expect(Math.abs(Number(x1) - resonatorX)).toBeLessThan(0.02);
    expect(Number(x2)).toBe(Number(x1));
    expect((Number(y1) - Number(y2)) / scale).toBeCloseTo(Number(length), 4);
    // the rod stands on the disc: its foot at the toroid's mid-plane, the centre of its drawn outline
    const [topload] = elements(svg, 'topload');
    const midPlaneY = Number(topload?.y) + Number(topload?.height) / 2;
    expect(Math.abs(Number(y1) - midPlaneY)).toBeLessThan(0.02);
    // the rod stays below the tube's top (1.02 + 0.06 + 0.115 m) and the feed line's conductor (1.2 m
    // up, 50 mm across) is the highest conductor: the overall height is its top
    expect(Number(length)).toBeLessThan(0.115);
    expect(metrics.overall_height ?? Number.NaN).toBeCloseTo(1.2 + 0.025, 9);
    expect((floorY - Number(y2)) / scale).toBeLessThan(metrics.overall_height ?? Number.NaN);
    const [column] = elements(svg, 'support');
    expect(Number(column?.['stroke-width']) / scale).toBeCloseTo(0.06, 4);
    expect(Math.abs(Number(column?.x1) - resonatorX)).toBeLessThan(0.02);
  });
});

describe('coilfront draw of a two-coil toroid with a centre disc', async () => {
  // the gallery example with center_disc added: the rod then stands on the disc, on the axis
  const source = join(directory, 'gallery-disc.yaml');
  writeFileSync(
    source,
    readFileSync('examples/gallery-coil-breakout-point.yaml', 'utf8').replace(
      'height_above_winding: 80 mm }',
      'height_above_winding: 80 mm, center_disc: true }',
    ),
  );
  const out = join(directory, 'gallery-disc.svg');
  const result = await run(['draw', source, '--out', out]);
  const svg = readFileSync(out, 'utf8');
  const scale = rootNumber(svg, 'data-scale');
  const axisX = rootNumber(svg, 'data-axis-x');

  it('draws the disc 260 mm across (500 − 2 × 120 mm) and one rod on the axis', () => {
    expect(result.code).toBe(0);
    const [disc] = elements(svg, 'center-disc');
    expect(Number(disc?.width) / scale).toBeCloseTo(0.26, 3);
    const rods = [...svg.matchAll(/class="breakout-point" data-length="[^"]+"><line x1="([^"]+)"/g)];
    expect(rods.length).toBe(1);
    expect(Math.abs(Number(rods[0]?.[1]) - axisX)).toBeLessThan(0.02);
    expect(elements(svg, 'resonator')).toEqual([]);
  });
});
