/**
 * Stock catalogues: the sizes against the standards' tables, stock sets in sweep files, and bad
 * input. Every catalogue value is typed from memory of its standard (refs §12); the checks below
 * that use a table value say so. The sweep scenario is invented test data.
 */
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../run/input-error.ts';
import { sweepFromValue } from '../../cli/sweep-spec.ts';
import { sweepSchema } from '../../cli/json-schema.ts';
import { STOCK_CATALOGUES, type StockCatalogue } from '../../cli/stock/catalogues.ts';
import { ASTM_D1785_ROWS } from '../../cli/stock/pipe-astm-d1785.ts';
import { ASTM_B88_ROWS } from '../../cli/stock/copper-tube.ts';
import { cli } from './in-process.ts';

const INCH = 0.0254;

function catalogue(name: string): StockCatalogue {
  const found = STOCK_CATALOGUES.get(name);
  if (!found) throw new Error(`no catalogue ${name}`);
  return found;
}

/** The size of a catalogue with a label. */
function size(name: string, label: string) {
  const found = catalogue(name).sizes.find((s) => s.label === label);
  if (!found) throw new Error(`no size ${label} in ${name}`);
  return found;
}

describe('the stock catalogues against their standards', () => {
  it('every catalogue names its source standard and is sorted by strictly increasing diameter', () => {
    for (const c of STOCK_CATALOGUES.values()) {
      expect(c.source).toMatch(/ISO 161-1|ASTM D1785|ASTM B88|EN 1057|ASTM B258|IEC 60317-0-1/);
      expect(c.sizes.length).toBeGreaterThan(5);
      for (let i = 1; i < c.sizes.length; i++) expect(c.sizes[i].diameter).toBeGreaterThan(c.sizes[i - 1].diameter);
    }
  });

  it('pipe_metric holds the ISO 161-1 nominal outside diameters (table of dn, values from memory)', () => {
    const dn = catalogue('pipe_metric').sizes.map((s) => Math.round(s.diameter * 1e4) / 10);
    // ISO 161-1 table of nominal outside diameters, 10 mm to 1000 mm (from memory)
    expect(dn).toEqual([
      10, 12, 16, 20, 25, 32, 40, 50, 63, 75, 90, 110, 125, 140, 160, 180, 200, 225, 250, 280, 315, 355, 400, 450, 500,
      560, 630, 710, 800, 900, 1000,
    ]);
  });

  it('pipe_inch_sch40 and _sch80 give the ASTM D1785 outside diameters and walls (values from memory)', () => {
    // ASTM D1785 table of dimensions (from memory): 4 in: OD 4.500 in, sch 40 wall 0.237 in, sch 80 0.337 in
    const four40 = size('pipe_inch_sch40', '4 in sch 40');
    expect(four40.value).toBeCloseTo(4.5 * INCH, 12);
    expect(four40.cells).toEqual([4.5, 114.3, 6.02, 102.26]);
    const four80 = size('pipe_inch_sch80', '4 in sch 80');
    expect(four80.cells).toEqual([4.5, 114.3, 8.56, 97.18]);
    // 6 in: OD 6.625 in, walls 0.280 / 0.432 in; 2 in: OD 2.375 in, walls 0.154 / 0.218 in (from memory)
    expect(size('pipe_inch_sch40', '6 in sch 40').cells.slice(0, 3)).toEqual([6.625, 168.275, 7.112]);
    expect(size('pipe_inch_sch80', '6 in sch 80').cells[2]).toBe(10.973);
    expect(size('pipe_inch_sch40', '2 in sch 40').cells.slice(0, 3)).toEqual([2.375, 60.325, 3.912]);
  });

  it('a schedule 80 wall is thicker than the schedule 40 wall of the same size (ASTM D1785: same outside)', () => {
    for (const row of ASTM_D1785_ROWS) expect(row.wallSchedule80).toBeGreaterThan(row.wallSchedule40);
    expect(catalogue('pipe_inch_sch40').sizes.map((s) => s.value)).toEqual(
      catalogue('pipe_inch_sch80').sizes.map((s) => s.value),
    );
  });

  it('tube_inch: every ASTM B88 outside diameter is the nominal size plus 1/8 in, walls K > L > M', () => {
    for (const row of ASTM_B88_ROWS) {
      const [whole, fraction] = row.size.includes('-')
        ? row.size.split('-')
        : row.size.includes('/')
          ? ['0', row.size]
          : [row.size, '0/1'];
      const [n, d] = fraction.split('/').map(Number);
      // ASTM B88: outside diameter = standard size + 0.125 in (every type)
      expect(row.outside).toBeCloseTo(Number(whole) + n / d + 0.125, 12);
      expect(row.wallK).toBeGreaterThan(row.wallL);
      if (row.wallM !== null) expect(row.wallL).toBeGreaterThan(row.wallM);
    }
    // ASTM B88 table (from memory): 1/2 in type L: OD 0.625 in, wall 0.040 in
    expect(size('tube_inch', '1/2 in tube').cells.slice(0, 4)).toEqual([0.625, 15.875, 1.245, 1.016]);
  });

  it('tube_metric holds the EN 1057 outside diameters plumbers buy (values from memory)', () => {
    const od = catalogue('tube_metric').sizes.map((s) => Math.round(s.diameter * 1e5) / 100);
    // EN 1057 table of outside diameters (from memory)
    for (const d of [6, 8, 10, 12, 15, 18, 22, 28, 35, 42, 54, 76.1, 108]) expect(od).toContain(d);
  });

  it('wire_awg reuses the ASTM B258 rule and matches its table of nominal diameters (4 decimals of an inch)', () => {
    const awg = catalogue('wire_awg');
    expect(awg.sizes[0].label).toBe('AWG 44');
    expect(awg.sizes.at(-1)?.label).toBe('AWG 4/0');
    expect(awg.sizes).toHaveLength(48);
    // ASTM B258 Table 1, nominal diameters in inches
    const table: Array<[string, number]> = [
      ['AWG 4/0', 0.46],
      ['AWG 1/0', 0.3249],
      ['AWG 10', 0.1019],
      ['AWG 18', 0.0403],
      ['AWG 24', 0.0201],
      ['AWG 30', 0.01],
      ['AWG 36', 0.005],
      ['AWG 40', 0.0031],
    ];
    for (const [label, inches] of table) expect(size('wire_awg', label).cells[0]).toBe(inches);
    expect(size('wire_awg', 'AWG 26').value).toEqual({ awg: 26 });
  });

  it('wire_metric: the IEC 60317-0-1 nominal diameters are the ISO 3 R 20 and R 40 numbers, to the micrometre', () => {
    // ISO 3 preferred numbers [iso3] (from memory): R 20, and the R 40 numbers between them
    const r20 = [1, 1.12, 1.25, 1.4, 1.6, 1.8, 2, 2.24, 2.5, 2.8, 3.15, 3.55, 4, 4.5, 5, 5.6, 6.3, 7.1, 8, 9];
    const r40 = [
      1.06, 1.18, 1.32, 1.5, 1.7, 1.9, 2.12, 2.36, 2.65, 3, 3.35, 3.75, 4.25, 4.75, 5.3, 6, 6.7, 7.5, 8.5, 9.5,
    ];
    const sizes = catalogue('wire_metric').sizes;
    const steps: number[] = [];
    for (const s of sizes) {
      const d = s.diameter * 1e3;
      const decade = 10 ** Math.floor(Math.log10(d) + 1e-9);
      const series = s.cells[1] === 'R20' ? r20 : r40;
      // the nominal diameter is a preferred number of its series, rounded to 0.001 mm (0.0224 → 0.022)
      const nearest = Math.min(...series.map((p) => Math.abs(p * decade - d)));
      expect(nearest).toBeLessThanOrEqual(0.0005 + 1e-12);
      steps.push(Math.round(40 * Math.log10(d)));
    }
    // no size missing: every R 20 step from 0.018 mm, every R 40 step from 0.1 mm, up to 5 mm
    for (let i = 1; i < steps.length; i++) expect(steps[i] - steps[i - 1]).toBe(sizes[i].diameter <= 0.1e-3 ? 2 : 1);
    expect(sizes[0].diameter).toBeCloseTo(0.018e-3, 15);
    expect(sizes.at(-1)?.diameter).toBeCloseTo(5e-3, 15);
    expect(size('wire_metric', '0.5 mm').value).toEqual({ bareDiameter: 0.5e-3 });
  });
});

const SWEEP = `design:
  secondary:
    form_diameter: { stock: pipe_metric, from: 100 mm, to: 250 mm }
    wire: { stock: wire_awg, from: AWG 28, to: AWG 24 }
    turns: { from: 600, to: 1200, integer: true }
    base_height: 500 mm
    voltage_profile: linear
  topload: { shape: toroid, outer_diameter: 500 mm, tube_diameter: 120 mm, height_above_winding: 40 mm }
  primary:
    shape: flat_spiral
    inner_diameter: 320 mm
    turns: 12
    conductor_diameter: { stock: tube_metric, from: 6 mm, to: 10 mm }
    turn_spacing: 6 mm
  tank: { capacitance: 30 nF, charge_voltage: 14 kV }
  driver: { kind: spark_gap, break_rate: 120 Hz }
objectives:
  - maximize: breakout_voltage
sweep: { method: sobol, samples: 16, seed: 3 }
`;

/** The message of the InputError a sweep file gives, after one replacement in the text above. */
function refusal(from: string, to: string): string {
  const text = SWEEP.replace(from, to);
  expect(text).not.toBe(SWEEP);
  try {
    sweepFromValue(parse(text), 'stock.yaml');
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    expect((error as Error).message).not.toMatch(/\n/);
    return (error as Error).message;
  }
  throw new Error('expected the sweep file to be refused');
}

describe('stock sets in sweep files', () => {
  it('a stock set becomes an ordinary set of the catalogue sizes between the bounds, inclusive', () => {
    const spec = sweepFromValue(parse(SWEEP), 'stock.yaml');
    const [form, wire, , conductor] = spec.dimensions;
    expect(form).toMatchObject({ kind: 'choose', path: ['secondary', 'form_diameter'], quantity: 'length' });
    if (form.kind !== 'choose' || wire.kind !== 'choose' || conductor.kind !== 'choose') throw new Error('sets');
    // ISO 161-1 sizes from 100 mm to 250 mm (from memory): 110 … 250
    expect(form.labels).toEqual(['110 mm', '125 mm', '140 mm', '160 mm', '180 mm', '200 mm', '225 mm', '250 mm']);
    expect(form.values[0]).toBeCloseTo(0.11, 15);
    // AWG 28 to AWG 24, bounded by bare diameter either way round
    expect(wire).toMatchObject({ wire: true, labels: ['AWG 28', 'AWG 27', 'AWG 26', 'AWG 25', 'AWG 24'] });
    expect(wire.values[2]).toEqual({ awg: 26 });
    expect(conductor.labels).toEqual(['6 mm', '8 mm', '10 mm']);
  });

  it('a wire set reads the same with its bounds reversed, and without bounds holds the whole catalogue', () => {
    const reversed = sweepFromValue(parse(SWEEP.replace('from: AWG 28, to: AWG 24', 'from: AWG 24, to: AWG 28')), 's');
    const whole = sweepFromValue(parse(SWEEP.replace(', from: AWG 28, to: AWG 24', '')), 's');
    expect(reversed.dimensions[1]).toEqual(sweepFromValue(parse(SWEEP), 's').dimensions[1]);
    const all = whole.dimensions[1];
    expect(all.kind === 'choose' && all.values.length).toBe(48);
  });

  it('an unknown catalogue: one line naming the field, with a suggestion', () => {
    expect(refusal('stock: pipe_metric', 'stock: pipe_metrc')).toBe(
      "stock.yaml: design.secondary.form_diameter.stock: unknown stock catalogue 'pipe_metrc' (did you mean 'pipe_metric'?); expected one of pipe_metric, pipe_inch_sch40, pipe_inch_sch80, tube_inch, tube_metric, wire_awg, wire_metric (npx coilfront stock lists them)",
    );
  });

  it('a range that holds no stock size: the field, the bounds and the nearest sizes', () => {
    expect(refusal('from: 100 mm, to: 250 mm', 'from: 290 mm, to: 310 mm')).toBe(
      "stock.yaml: design.secondary.form_diameter: no size of stock 'pipe_metric' lies from '290 mm' to '310 mm' (nearest: 280 mm, 315 mm)",
    );
  });

  it('a wire catalogue on a length field, a reversed length range and an unknown key are refused', () => {
    expect(refusal('stock: pipe_metric', 'stock: wire_awg')).toContain(
      "design.secondary.form_diameter.stock: stock 'wire_awg' holds wire sizes, but this field takes a length (use pipe_metric",
    );
    expect(refusal('stock: wire_awg', 'stock: tube_metric')).toContain('holds lengths, but this field takes a wire');
    expect(refusal('from: 100 mm, to: 250 mm', 'from: 250 mm, to: 100 mm')).toContain(
      'design.secondary.form_diameter: reversed range',
    );
    expect(refusal('stock: pipe_metric, from', 'stock: pipe_metric, step: 1 mm, from')).toContain(
      "design.secondary.form_diameter.step: unknown key 'step'",
    );
    expect(refusal('from: 100 mm, to: 250', 'from: 100 mm, to: 250 parsecs')).toContain(
      'design.secondary.form_diameter.to:',
    );
  });

  it('check exits 2 with one line for a bad stock name, and lists the chosen sizes of a good one', async () => {
    const { mkdtempSync, writeFileSync, rmSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { tmpdir } = await import('node:os');
    const dir = mkdtempSync(join(tmpdir(), 'stock-'));
    try {
      const bad = join(dir, 'bad.yaml');
      writeFileSync(bad, SWEEP.replace('stock: tube_metric', 'stock: copper'));
      const refused = await cli(['check', bad]);
      expect(refused.code).toBe(2);
      expect(refused.err.trim().split('\n')).toHaveLength(1);
      expect(refused.err).toContain('design.primary.conductor_diameter.stock: unknown stock catalogue');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('the JSON Schema of sweep files', () => {
  type Node = { anyOf?: Node[]; properties?: Record<string, Node>; enum?: string[] };
  const leaf = (field: string): Node[] => {
    const secondary = (sweepSchema() as Node).properties?.design?.properties?.secondary;
    const form = secondary?.anyOf?.[0]?.properties?.[field];
    return form?.anyOf ?? [];
  };

  it('offers the length catalogues on a length field and the wire catalogues on the wire', () => {
    const stockOf = (field: string) => leaf(field).find((node) => node.properties?.stock)?.properties?.stock?.enum;
    expect(stockOf('form_diameter')).toEqual([
      'pipe_metric',
      'pipe_inch_sch40',
      'pipe_inch_sch80',
      'tube_inch',
      'tube_metric',
    ]);
    expect(stockOf('wire')).toEqual(['wire_awg', 'wire_metric']);
    expect(stockOf('turns')).toBeUndefined();
  });
});

describe('coilfront stock', () => {
  it('lists every catalogue with what it fits and its size count, then the safety line', async () => {
    const { code, out } = await cli(['stock']);
    expect(code).toBe(0);
    for (const name of STOCK_CATALOGUES.keys()) expect(out).toContain(name);
    expect(out).toMatch(/pipe_metric\s+length\s+31/);
    expect(out).toContain('DANGER');
  });

  it('lists the sizes of one catalogue with its source and how sure its values are', async () => {
    const { code, out } = await cli(['stock', 'pipe_inch_sch40']);
    expect(code).toBe(0);
    expect(out).toContain('source: ASTM D1785');
    expect(out).toContain('from memory');
    expect(out).toMatch(/4 in sch 40\s+4\.5\s+114\.3\s+6\.02\s+102\.26/);
  });

  it('an unknown catalogue: one line, exit 2', async () => {
    const { code, err } = await cli(['stock', 'wire_awgg']);
    expect(code).toBe(2);
    expect(err.trim().split('\n')).toHaveLength(1);
    expect(err).toContain("did you mean 'wire_awg'");
  });
});
