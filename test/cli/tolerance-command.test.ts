import { existsSync, mkdtempSync, readFileSync, truncateSync, statSync, writeFileSync } from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { parse as parseYaml } from 'yaml';
import { describe, expect, it } from 'vitest';
import type { CliIo } from '../../cli/io.ts';
import { loadDesignFile } from '../../cli/load-design.ts';
import { runCli } from '../../cli/program.ts';
import { currentBootId } from '../../run/durable/lock.ts';
import { SAFETY_CAUTIONS } from '../../cli/safety.ts';
import { sweepFromValue } from '../../cli/sweep-spec.ts';
import { evaluateDesign } from '../../core/evaluate.ts';
import { buildDesign } from '../../optimize/build-design.ts';
import type { NormalSection } from '../../optimize/design-tree.ts';
import { deviatedValue, ToleranceDraws } from '../../optimize/tolerance/index.ts';

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = { out: (t) => out.push(t), err: (t) => err.push(t), isTty: false };
  return { io, out, err, text: () => out.join(''), errors: () => err.join('') };
}

const DESIGN = 'examples/tabletop-teaching-coil.yaml';
const SWEEP = 'test/fixtures/sweep-tolerances.yaml';
const TOLERANCES = `tolerances:
  draws: 8
  seed: 3
  secondary: { turns: ±2 %, base_height: { spread: ±15 mm, distribution: normal, sigmas: 2 } }
  tank: { capacitance: { spread: ±10 %, distribution: truncated_normal, sigmas: 2 } }
  environment: { altitude: { from: 0 m, to: 2500 m } }
constraints:
  overall_height: { max: 1.35 m }
  breakout_margin: { min: 0.8 }
objectives:
  - maximize: spark_length
`;

function scratch(): string {
  return mkdtempSync(join(tmpdir(), 'coilfront-tol-'));
}

describe('coilfront tolerance of one design', () => {
  it("spreads a tank bank's part: with the layout fixed the bank's capacitance is part × parallel / series in every build", async () => {
    // The example's bank with its layout fixed at what auto chose (13 in series × 3 strings: see evaluate);
    // the check is the bank arithmetic, exact by hand: C_bank = C_part · parallel / series.
    const dir = scratch();
    const design = readFileSync('examples/rotary-bank-coil.yaml', 'utf8')
      .replace(/series: auto/, 'series: 13')
      .replace(/parallel: auto/, 'parallel: 3')
      // Parts rated higher than the example's, so that no build is impossible (a smaller bank charges higher).
      .replace(/voltage_rating: 2 kV/, 'voltage_rating: 4 kV');
    expect(design).toContain('series: 13');
    expect(design).toContain('voltage_rating: 4 kV');
    writeFileSync(join(dir, 'design.yaml'), design);
    writeFileSync(
      join(dir, 'tol.yaml'),
      'tolerances:\n  draws: 32\n  tank: { bank: { part: { capacitance: ±10 % } } }\nmetrics: [tank_bank_capacitance]\n',
    );
    const { io, errors } = capture();
    const args = ['tolerance', join(dir, 'design.yaml'), '--tolerances', join(dir, 'tol.yaml'), '--workers', '0'];
    expect(await runCli([...args, '--out', dir], io), errors()).toBe(0);
    const [row] = parseCsv(readFileSync(join(dir, 'tolerance.csv'), 'utf8'), { columns: true }) as Record<
      string,
      string
    >[];
    const nominal = (150 * 3) / 13; // nF
    const p05 = Number(row.tank_bank_capacitance_p05_nF) / nominal;
    const p95 = Number(row.tank_bank_capacitance_p95_nF) / nominal;
    // Uniform over ±10 %: the 5 % and 95 % quantiles of the part sit near 0.91 and 1.09 (32 Sobol draws).
    expect(p05).toBeGreaterThan(0.9);
    expect(p05).toBeLessThan(0.93);
    expect(p95).toBeGreaterThan(1.07);
    expect(p95).toBeLessThan(1.1);
    expect(Number(row.tank_bank_capacitance_p50_nF) / nominal).toBeCloseTo(1, 1);
    expect(row.impossible).toBe('0');
  });

  it("matches an independent Monte Carlo of the same draws through the core's evaluate", async () => {
    const dir = scratch();
    writeFileSync(join(dir, 'tol.yaml'), TOLERANCES);
    const { io, text } = capture();
    const code = await runCli(
      ['tolerance', DESIGN, '--tolerances', join(dir, 'tol.yaml'), '--workers', '0', '--out', dir],
      io,
    );
    expect(code).toBe(0);
    for (const line of SAFETY_CAUTIONS) expect(text()).toContain(line);
    const json = JSON.parse(readFileSync(join(dir, 'tolerance.json'), 'utf8'));
    const rows = parseCsv(readFileSync(join(dir, 'tolerance.csv'), 'utf8'), { columns: true }) as Record<
      string,
      string
    >[];
    expect(rows).toHaveLength(1);
    expect(rows[0].rank).toBe('design');

    // Our own Monte Carlo: perturb the normal tree field by field with the same deviations, build, evaluate.
    const { tree } = loadDesignFile(DESIGN);
    const fields = json.fields.map((f: { path: string }) => ({ ...f, path: f.path.split('.') }));
    const draws = new ToleranceDraws(fields, 3);
    const z = new Float64Array(fields.length);
    let passing = 0;
    const heights: number[] = [];
    for (let j = 0; j < 8; j++) {
      draws.deviatesAt(j, z);
      const built: Record<string, NormalSection> = {};
      for (const [name, section] of Object.entries(tree)) built[name] = { ...(section as NormalSection) };
      fields.forEach((f: { path: [string, string]; mode: string }, t: number) => {
        const [section, key] = f.path;
        built[section] ??= {};
        const nominal = built[section][key] as number;
        built[section][key] = deviatedValue(fields[t], nominal, z[t]);
      });
      const design = buildDesign(built).design;
      if (!design) continue;
      const metrics = evaluateDesign(design).metrics;
      heights.push(metrics.overall_height as number);
      const ok =
        (metrics.overall_height as number) <= 1.35 &&
        (metrics.breakout_margin as number) >= 0.8 &&
        metrics.spark_length !== null;
      if (ok) passing++;
    }
    expect(json.candidates[0].passing).toBe(passing);
    heights.sort((a, b) => a - b);
    const height = json.candidates[0].quantiles.find((q: { metric: string }) => q.metric === 'overall_height');
    expect(height.p50).toBeCloseTo((heights[3] + heights[4]) / 2, 12);
    expect(Number(rows[0].overall_height_p50_m)).toBeCloseTo(height.p50, 6);
  }, 60_000);

  it('gives the same files on a rerun, from its journal', async () => {
    const dir = scratch();
    writeFileSync(join(dir, 'tol.yaml'), TOLERANCES.replace('draws: 8', 'draws: 4'));
    const args = ['tolerance', DESIGN, '--tolerances', join(dir, 'tol.yaml'), '--workers', '0', '--out', dir];
    expect(await runCli(args, capture().io)).toBe(0);
    const first = readFileSync(join(dir, 'tolerance.csv'), 'utf8') + readFileSync(join(dir, 'tolerance.json'), 'utf8');
    const again = capture();
    expect(await runCli(args, again.io)).toBe(0);
    expect(again.errors()).toContain('1 of 1 candidates taken from the journal');
    expect(readFileSync(join(dir, 'tolerance.csv'), 'utf8') + readFileSync(join(dir, 'tolerance.json'), 'utf8')).toBe(
      first,
    );
    // Other settings (more draws) do not reuse the journal.
    const more = capture();
    expect(await runCli([...args, '--draws', '5'], more.io)).toBe(0);
    expect(more.errors()).toContain('starting afresh');
  }, 60_000);
});

describe('the example tolerance file', () => {
  it('reads and runs (two builds)', async () => {
    const dir = scratch();
    const { io, text } = capture();
    const args = [
      'tolerance',
      DESIGN,
      '--tolerances',
      'examples/tolerances/tabletop-teaching-coil.yaml',
      '--draws',
      '2',
    ];
    expect(await runCli([...args, '--workers', '0', '--out', dir], io)).toBe(0);
    expect(text()).toContain('2 builds per candidate, 7 toleranced fields');
  }, 60_000);
});

describe('coilfront tolerance of a run', () => {
  it('studies the top candidates of candidates.csv, resumes after a torn journal and gives the same files', async () => {
    const dir = scratch();
    const run = join(dir, 'run');
    expect(await runCli(['sweep', SWEEP, '--out', run, '--workers', '0', '--quiet'], capture().io)).toBe(0);
    const first = capture();
    expect(await runCli(['tolerance', run, '--top', '2', '--workers', '0'], first.io)).toBe(0);
    const csv2 = readFileSync(join(run, 'tolerance.csv'), 'utf8');
    const rows2 = parseCsv(csv2, { columns: true }) as Record<string, string>[];
    expect(rows2.map((r) => r.rank)).toEqual(['1', '2']);
    expect(Number(rows2[0].draws)).toBe(16);
    const candidates = parseCsv(readFileSync(join(run, 'candidates.csv'), 'utf8'), { columns: true }) as Record<
      string,
      string
    >[];
    expect(rows2[1].sample_index).toBe(candidates[1].sample_index);
    for (const row of rows2) {
      const y = Number(row.yield);
      expect(Number(row.yield_low)).toBeLessThanOrEqual(y);
      expect(Number(row.yield_high)).toBeGreaterThanOrEqual(y);
      expect(Number(row.breakout_voltage_p05_kV)).toBeLessThanOrEqual(Number(row.breakout_voltage_p50_kV));
      expect(Number(row.breakout_voltage_p50_kV)).toBeLessThanOrEqual(Number(row.breakout_voltage_p95_kV));
    }
    // Three candidates: the first two come from the journal, and their rows are unchanged.
    const three = capture();
    expect(await runCli(['tolerance', run, '--top', '3', '--workers', '0'], three.io)).toBe(0);
    expect(three.errors()).toContain('2 of 3 candidates taken from the journal');
    const csv3 = readFileSync(join(run, 'tolerance.csv'), 'utf8');
    expect(csv3.startsWith(csv2)).toBe(true);
    // A torn last record (a kill during a write) is cut off and that candidate evaluated again.
    const journal = join(run, 'tolerance-journal.log');
    truncateSync(journal, statSync(journal).size - 7);
    const resumed = capture();
    expect(await runCli(['tolerance', run, '--top', '3', '--workers', '0'], resumed.io)).toBe(0);
    expect(resumed.errors()).toContain('2 of 3 candidates taken from the journal');
    expect(readFileSync(join(run, 'tolerance.csv'), 'utf8')).toBe(csv3);
    // The morning report of the run carries the study as a section.
    expect(await runCli(['report', run, '--out', join(dir, 'report.html')], capture().io)).toBe(0);
    const html = readFileSync(join(dir, 'report.html'), 'utf8');
    expect(html).toContain('<section id="build-tolerances"><h2>Tolerances and yield</h2>');
    expect(html).toContain('<th>yield_low</th>');
  }, 120_000);
});

describe('build_yield as a robust merit of a sweep', () => {
  it('equals the yield coilfront tolerance finds at the same draws, in candidates.csv', async () => {
    const dir = scratch();
    const value = parseYaml(readFileSync(SWEEP, 'utf8'));
    value.sweep.samples = 16;
    value.tolerances.sweep_draws = 3;
    // Wide enough that some builds leave the frequency band or the ceiling: yields between 0 and 1.
    value.tolerances.secondary.turns = '±25 %';
    value.constraints.resonant_frequency = { min: '90 kHz', max: '150 kHz' };
    value.objectives = [{ maximize: 'build_yield' }, { minimize: 'wire_mass' }];
    writeFileSync(join(dir, 'robust.yaml'), JSON.stringify(value));
    const run = join(dir, 'run');
    expect(
      await runCli(['sweep', join(dir, 'robust.yaml'), '--out', run, '--workers', '0', '--quiet'], capture().io),
    ).toBe(0);
    const candidates = parseCsv(readFileSync(join(run, 'candidates.csv'), 'utf8'), { columns: true }) as Record<
      string,
      string
    >[];
    expect(candidates.length).toBeGreaterThan(0);
    // Steps of 1/3 (three draws).
    for (const row of candidates) {
      const y = Number(row.build_yield);
      expect(Math.abs(y * 3 - Math.round(y * 3))).toBeLessThan(1e-5);
    }
    expect(candidates.some((r) => Number(r.build_yield) < 1)).toBe(true);
    expect(await runCli(['tolerance', run, '--top', '100', '--draws', '3', '--workers', '0'], capture().io)).toBe(0);
    const study = JSON.parse(readFileSync(join(run, 'tolerance.json'), 'utf8'));
    expect(study.candidates).toHaveLength(candidates.length);
    for (let c = 0; c < study.candidates.length; c++) {
      expect(study.candidates[c].yield.estimate).toBeCloseTo(Number(candidates[c].build_yield), 6);
    }
  }, 120_000);

  it('needs tolerances.sweep_draws', () => {
    const value = parseYaml(readFileSync(SWEEP, 'utf8'));
    value.objectives = [{ maximize: 'build_yield' }];
    expect(() => sweepFromValue(value, 'night.yaml')).toThrow(
      /^night\.yaml: tolerances\.sweep_draws: required for build_yield/,
    );
  });
});

describe('bad tolerance input', () => {
  const cases: Array<[string, string, RegExp]> = [
    [
      'a wire size',
      'tolerances: { secondary: { wire: ±1 % } }',
      /tolerances\.secondary\.wire: a wire size takes no spread/,
    ],
    [
      'a misspelt field',
      'tolerances: { secondary: { turn: ±1 % } }',
      /tolerances\.secondary\.turn: unknown field 'turn' \(did you mean 'turns'\?\)/,
    ],
    [
      'a normal law without its sigmas',
      'tolerances: { tank: { capacitance: { spread: ±5 %, distribution: normal } } }',
      /tolerances\.tank\.capacitance\.sigmas: required for normal/,
    ],
    [
      'a spread of 100 %',
      'tolerances: { secondary: { turns: ±100 % } }',
      /tolerances\.secondary\.turns: a relative spread must be below 100 %/,
    ],
    [
      'a spread in the wrong unit',
      'tolerances: { secondary: { base_height: ±5 kV } }',
      /tolerances\.secondary\.base_height: '5 kV' is a voltage/,
    ],
    [
      'a range the wrong way round',
      'tolerances: { environment: { altitude: { from: 2 km, to: 1 km } } }',
      /tolerances\.environment\.altitude\.to: the range ends below its start/,
    ],
    [
      'a spread and a range together',
      'tolerances: { environment: { altitude: { spread: ±1 %, from: 0 m, to: 1 km } } }',
      /tolerances\.environment\.altitude\.spread: give a spread or a range/,
    ],
    [
      'an unknown distribution',
      'tolerances: { secondary: { turns: { spread: ±1 %, distribution: normall, sigmas: 2 } } }',
      /did you mean 'normal'/,
    ],
    [
      'a field the design lacks',
      'tolerances: { secondary: { winding_length: ±1 % } }',
      /tolerances\.secondary\.winding_length: not given in the design/,
    ],
    ['no field at all', 'tolerances: { draws: 10 }', /tolerances: no field has a spread/],
    [
      'draws of zero',
      'tolerances: { draws: 0, secondary: { turns: ±1 % } }',
      /tolerances\.draws: expected a whole number from 1/,
    ],
  ];
  it.each(cases)('refuses %s with one line naming the field, exit 2', async (_what, yamlText, message) => {
    const dir = scratch();
    const file = join(dir, 'tol.yaml');
    writeFileSync(file, `${yamlText}\nconstraints: { overall_height: { max: 2 m } }\n`);
    const { io, errors, out } = capture();
    const code = await runCli(['tolerance', DESIGN, '--tolerances', file, '--workers', '0', '--out', dir], io);
    expect(code).toBe(2);
    expect(errors().trim().split('\n')).toHaveLength(1);
    expect(errors()).toMatch(message);
    expect(errors()).toContain(file);
    expect(out).toHaveLength(0);
  });

  it('refuses a directory another live run holds (run.lock), exit 2', async () => {
    const dir = scratch();
    writeFileSync(join(dir, 'tol.yaml'), TOLERANCES);
    const holder = { pid: process.pid, hostname: hostname(), bootId: currentBootId(), startedAt: '', token: 'other' };
    writeFileSync(join(dir, 'run.lock'), JSON.stringify(holder));
    const { io, errors } = capture();
    const code = await runCli(
      ['tolerance', DESIGN, '--tolerances', join(dir, 'tol.yaml'), '--workers', '0', '--out', dir],
      io,
    );
    expect(code).toBe(2);
    expect(errors().trim().split('\n')).toHaveLength(1);
    expect(existsSync(join(dir, 'tolerance.csv'))).toBe(false);
  });

  it('refuses a design file without --tolerances, and a bad --draws', async () => {
    const a = capture();
    expect(await runCli(['tolerance', DESIGN, '--workers', '0'], a.io)).toBe(2);
    expect(a.errors()).toMatch(/--tolerances: required for a design file/);
    const b = capture();
    expect(await runCli(['tolerance', DESIGN, '--draws', '0'], b.io)).toBe(2);
    expect(b.errors()).toMatch(/--draws/);
  });

  it('refuses a bad tolerances section of a sweep file as the sweep is read', () => {
    const value = parseYaml(readFileSync(SWEEP, 'utf8'));
    value.tolerances.topload = { height_above_winding: { spread: 'about 20' } };
    expect(() => sweepFromValue(value, 'night.yaml')).toThrow(
      /^night\.yaml: tolerances\.topload\.height_above_winding\.spread: expected a spread such as/,
    );
  });
});
