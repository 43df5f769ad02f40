import { describe, expect, it } from 'vitest';
import { frontPlotSvg } from '../../cli/plots.ts';
import { columnPlotSpec } from '../../cli/views/column-plot.ts';
import { parseRunTable } from '../../cli/views/run-table.ts';
import { svgToPng, vegaLiteSvg } from '../../cli/views/vega-render.ts';
import { METRIC_KEYS } from '../../core/metrics.ts';
import type { CandidateRow } from '../../optimize/sweep-state.ts';

function row(breakout: number, mass: number): CandidateRow {
  const metrics: Array<number | null> = METRIC_KEYS.map(() => null);
  metrics[METRIC_KEYS.indexOf('breakout_voltage')] = breakout;
  metrics[METRIC_KEYS.indexOf('wire_mass')] = mass;
  return { values: [], metrics, status: 0, reason: null, warningMask: 0 };
}

describe('frontPlotSvg(objectives, candidates, front)', () => {
  const objectives = [
    { metric: 'breakout_voltage', sense: 'maximize' as const },
    { metric: 'wire_mass', sense: 'minimize' as const },
  ];
  const candidates = [row(400e3, 0.5), row(500e3, 0.9), row(450e3, 1.2)];
  const front = [row(400e3, 0.5), row(500e3, 0.9)];

  it('draws an SVG with the axes in practical units and the safety caution', async () => {
    const svg = await frontPlotSvg(objectives, candidates, front);
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg).toContain('breakout voltage (kV)');
    expect(svg).toContain('wire mass (kg)');
    expect(svg).toMatch(/voltages are lethal/);
  });

  it('is the same text for the same rows (runs are byte-identical)', async () => {
    expect(await frontPlotSvg(objectives, candidates, front)).toBe(await frontPlotSvg(objectives, candidates, front));
  });

  it('plots one objective against rank', async () => {
    const svg = await frontPlotSvg([objectives[1]], candidates, front);
    expect(svg).toContain('rank');
  });
});

describe('front.svg, mended', () => {
  const two = [
    { metric: 'breakout_voltage', sense: 'maximize' as const },
    { metric: 'wire_mass', sense: 'minimize' as const },
  ];
  const candidates = [row(400e3, 0.5), row(500e3, 0.9), row(450e3, 1.2)];
  const front = [row(400e3, 0.5), row(500e3, 0.9)];

  it('labels each front point with its rank and tells refined designs apart in a legend', async () => {
    const svg = await frontPlotSvg(two, candidates, front, { ranks: [17, 4], refined: [false, true] });
    expect(svg).toContain('>17<');
    expect(svg).toContain('>4<');
    expect(svg).toContain('refined front');
    expect(svg).toContain('swept front');
  });

  it('draws one panel as wide as the canvas allows with two objectives', async () => {
    const svg = await frontPlotSvg(two, candidates, front);
    const width = Number(/<svg[^>]*width="(\d+(\.\d+)?)"/.exec(svg)?.[1]);
    // 640 px of plot, the y axis and the legend: the panel takes most of the canvas.
    expect(640 / width).toBeGreaterThan(0.7);
  });

  it('draws every pair of four objectives as points, none joined', async () => {
    const four = [
      ...two,
      { metric: 'resonant_frequency', sense: 'minimize' as const },
      { metric: 'peak_voltage', sense: 'maximize' as const },
    ];
    const full = (b: number, m: number, f: number, v: number) => {
      const r = row(b, m);
      r.metrics[METRIC_KEYS.indexOf('resonant_frequency')] = f;
      r.metrics[METRIC_KEYS.indexOf('peak_voltage')] = v;
      return r;
    };
    const rows = [full(400e3, 0.5, 150e3, 600e3), full(500e3, 0.9, 120e3, 700e3), full(450e3, 1.2, 200e3, 500e3)];
    const svg = await frontPlotSvg(four, rows, rows.slice(0, 2));
    // 4 objectives: C(4,2) = 6 panels, each with its own pair of axis titles.
    expect(svg.match(/>resonant frequency \(kHz\)/g)?.length).toBe(3);
    expect(svg.match(/>peak voltage \(kV\)/g)?.length).toBe(3);
    expect(svg).not.toMatch(/class="mark-line/);
  });

  it('says in words when nothing is feasible', async () => {
    const svg = await frontPlotSvg(two, [], []);
    expect(svg).toContain('No feasible design in this run');
    expect(svg).toContain('infeasible.csv');
  });
});

describe('coilfront plot: any column against any other', () => {
  const csv = (lines: string[]) => parseRunTable(`${lines.join('\n')}\n`);
  const header = 'rank,pareto_rank,crowding,feasible,sample_index,secondary.wire,tank.capacitance_nF,wire_mass_kg';
  const tables = {
    candidates: csv([header, '1,1,,1,12,AWG 24,20,0.4', '2,1,,1,3,AWG 22,30,0.6', '3,2,0.5,1,7,AWG 24,40,0.9']),
    front: csv([header, '1,1,,1,3,AWG 22,30,0.6', '2,1,,1,12,AWG 24,20,0.4']),
    infeasible: csv([header, '1,,,0,9,AWG 22,40,1.4']),
  };

  it('plots set quantities as numbers, labels front marks by candidate rank, titles axes with units', async () => {
    const svg = await vegaLiteSvg(
      columnPlotSpec(tables, {
        x: 'tank.capacitance_nF',
        y: 'wire_mass_kg',
        color: 'secondary.wire',
        nearMisses: true,
      }),
    );
    expect(svg).toContain('tank capacitance (nF)');
    expect(svg).toContain('wire mass (kg)');
    expect(svg).toMatch(/voltages are lethal/);
    // the front's sample 3 is rank 2 of candidates.csv, sample 12 rank 1
    expect(svg).toContain('>2<');
    expect(svg).toContain('AWG 22');
    const png = await svgToPng(svg, 1);
    expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]); // PNG signature
  });

  it('colours by a set of quantities with one swatch per value, and by a range with a scale; the legend title is whole', async () => {
    const bySet = columnPlotSpec(tables, { x: 'wire_mass_kg', y: 'wire_mass_kg', color: 'tank.capacitance_nF' });
    const encoding = JSON.stringify(bySet);
    expect(encoding).toContain('"type":"ordinal"');
    const svg = await vegaLiteSvg(bySet);
    // 20, 30 and 40 nF are the levels: each a legend entry, no in-between ticks such as 25
    for (const level of ['>20<', '>30<', '>40<']) expect(svg).toContain(level);
    expect(svg).not.toContain('>25<');
    expect(svg).toContain('tank capacitance (nF)');
    expect(svg).not.toContain('…');
    const many = csv([
      header,
      ...Array.from({ length: 12 }, (_, i) => `${i + 1},1,,1,${i},AWG 24,${10 + i},${0.1 * (i + 1)}`),
    ]);
    const byRange = columnPlotSpec(
      { ...tables, candidates: many },
      { x: 'wire_mass_kg', y: 'wire_mass_kg', color: 'tank.capacitance_nF' },
    );
    expect(JSON.stringify(byRange)).toContain('"type":"quantitative"');
  });

  it('refuses a text column as an axis and an unknown column, naming the option', () => {
    expect(() => columnPlotSpec(tables, { x: 'secondary.wire', y: 'wire_mass_kg' })).toThrow(/--x: .*holds text/);
    expect(() => columnPlotSpec(tables, { x: 'tank.capacitance', y: 'wire_mass_kg' })).toThrow(
      /--x: no column 'tank.capacitance'.*tank.capacitance_nF/,
    );
    // No column contains the name: the columns sharing its last word are suggested, not all of them.
    expect(() => columnPlotSpec(tables, { x: 'coil_mass', y: 'wire_mass_kg' })).toThrow(
      /--x: no column 'coil_mass' in the run \(did you mean wire_mass_kg\?\)$/,
    );
    expect(() => columnPlotSpec(tables, { x: 'zzz', y: 'wire_mass_kg' })).toThrow(
      /no column 'zzz' in the run \(its \d+ columns are the header line of the CSV file\)$/,
    );
  });
});
