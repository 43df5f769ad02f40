/**
 * The report in a real headless browser: playwright-core driving the system's Chromium
 * (/usr/bin/chromium; .ci/run installs it when missing). Skipped, with a message saying so, only
 * when that browser is missing. The run is the machinery fixture test/fixtures/sweep-sets.yaml
 * (64 Sobol samples of invented demo data).
 */
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseRunTable } from '../../cli/views/run-table.ts';
import { cli } from './in-process.ts';

const CHROMIUM = '/usr/bin/chromium';
const haveChromium = existsSync(CHROMIUM);
if (!haveChromium) {
  console.warn(`report-browser.test.ts: SKIPPED: ${CHROMIUM} is missing (apt-get install chromium, as .ci/run does)`);
}

const root = mkdtempSync(join(tmpdir(), 'coilfront-report-'));
const run = join(root, 'run');
const reportPath = join(root, 'report.html');

beforeAll(async () => {
  const sweep = await cli(['sweep', 'test/fixtures/sweep-sets.yaml', '--out', run, '--workers', '1', '--quiet']);
  expect(sweep.code).toBe(0);
  const report = await cli(['report', run, '--out', reportPath]);
  expect(report.err).toBe('');
  expect(report.code).toBe(0);
}, 60_000);

describe('coilfront report (the file)', () => {
  it('writes one HTML file that carries the cautions in full before anything else', () => {
    const html = readFileSync(reportPath, 'utf8');
    const cautions = html.indexOf('id="cautions"');
    expect(cautions).toBeGreaterThan(0);
    expect(cautions).toBeLessThan(html.indexOf('id="counts"'));
    expect(html).toContain('lethal energy at lethal voltage');
    expect(html).toContain('medical implants');
    expect(html).toContain('local electrical codes and licensed practice');
  });

  it('labels the rejection bars in display units, as the sweep file wrote the limits', () => {
    const html = readFileSync(reportPath, 'utf8');
    expect(html).toContain('<div>overall_height ≤ 2.4 m</div>');
    expect(html).toContain('<div>resonant_frequency 90 kHz … 300 kHz</div>');
    expect(html).not.toContain('(SI)');
  });

  it('inlines every script: no script or style element refers to another file', () => {
    const html = readFileSync(reportPath, 'utf8');
    expect(html).not.toMatch(/<script[^>]+src=/i);
    expect(html).not.toMatch(/<link[^>]+href=/i);
  });

  it('adds the Sobol indices of a sensitivity analysis written into the run (sensitivity.csv)', async () => {
    const sensitivity = await cli([
      'sensitivity',
      'test/fixtures/sweep-sets.yaml',
      '--samples',
      '8',
      '--workers',
      '0',
      '--out',
      run,
    ]);
    expect(sensitivity.code).toBe(0);
    const withIndices = join(root, 'with-indices.html');
    expect((await cli(['report', run, '--out', withIndices])).code).toBe(0);
    const html = readFileSync(withIndices, 'utf8');
    expect(html).toContain('id="global-indices"');
    const fields = parseRunTable(readFileSync(join(run, 'sensitivity.csv'), 'utf8')).rows.map((r) => String(r[0]));
    for (const field of fields) expect(html).toContain(`<td class="text">${field}</td>`);
  }, 30_000);

  it('refuses a directory that is not a finished run, and an --out that is not .html, with exit 2', async () => {
    const missing = await cli(['report', join(root, 'nothing-here')]);
    expect(missing.code).toBe(2);
    expect(missing.err.trim().split('\n').length).toBe(1);
    const wrong = await cli(['report', run, '--out', join(root, 'r.pdf')]);
    expect(wrong.code).toBe(2);
    expect(wrong.err).toContain('--out');
  });
});

describe.skipIf(!haveChromium)(`coilfront report in headless Chromium (${CHROMIUM})`, () => {
  type Browser = import('playwright-core').Browser;
  type Page = import('playwright-core').Page;
  let browser: Browser;
  let page: Page;
  const consoleErrors: string[] = [];
  const blocked: string[] = [];

  beforeAll(async () => {
    const { chromium } = await import('playwright-core');
    browser = await chromium.launch({ executablePath: CHROMIUM, args: ['--no-sandbox'] });
    page = await browser.newPage({ viewport: { width: 1400, height: 1100 } });
    // The network is off: every request but the report file itself is aborted (and counted).
    await page.route('**/*', (route) => {
      const url = route.request().url();
      if (url === `file://${reportPath}`) return route.continue();
      blocked.push(url);
      return route.abort();
    });
    page.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
    page.on('pageerror', (error) => consoleErrors.push(error.message));
    await page.goto(`file://${reportPath}`);
    await page.waitForSelector('body[data-front-ready]', { timeout: 10_000 });
  }, 20_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('loads with the network blocked, asking for nothing, and logs no console error', () => {
    expect(blocked).toEqual([]);
    expect(consoleErrors).toEqual([]);
  });

  it('draws as many front marks as front.csv has rows', async () => {
    const rows = parseRunTable(readFileSync(join(run, 'front.csv'), 'utf8')).rows.length;
    expect(rows).toBeGreaterThan(0);
    const marks = await page.locator('#front-plot g.front_marks path').count();
    expect(marks).toBe(rows);
  });

  it("shows a clicked front design's own values and its drawing beside the plot, and writes a screenshot", async () => {
    const front = parseRunTable(readFileSync(join(run, 'front.csv'), 'utf8'));
    const mark = page.locator('#front-plot g.front_marks path').first();
    await mark.click({ force: true });
    await page.waitForSelector('#detail[data-rank]', { timeout: 5_000 });
    const rank = await page.locator('#detail').getAttribute('data-rank');
    const rankColumn = front.header.indexOf('rank');
    const row = front.rows.find((r) => String(r[rankColumn]) === rank);
    expect(row).toBeDefined();
    // The detail's figure for the first objective equals front.csv's cell for that design (4 digits).
    const column = 'breakout_voltage_kV';
    const expected = Number(row?.[front.header.indexOf(column)]);
    const shown = Number(await page.locator(`#detail td[data-column="${column}"]`).textContent());
    expect(Math.abs(shown / expected - 1)).toBeLessThan(5e-4);
    expect(await page.locator(`#detail svg[data-rank="${rank}"] .topload`).count()).toBe(1);
    await page.locator('#front').scrollIntoViewIfNeeded();
    const screenshot = join(root, 'report-screenshot.png');
    await page.screenshot({ path: screenshot, fullPage: false });
    console.log(`report screenshot: ${screenshot}`);
    expect(existsSync(screenshot)).toBe(true);
  });

  it("shows a front design's values on hover (vega-embed's tooltip)", async () => {
    await page.locator('#front-plot g.front_marks path').nth(1).hover({ force: true });
    const tooltip = page.locator('#vg-tooltip-element');
    await tooltip.waitFor({ state: 'visible', timeout: 5_000 });
    const text = (await tooltip.textContent()) ?? '';
    expect(text).toContain('rank');
    expect(text).toContain('breakout voltage (kV)');
  });

  it('sorts the top-candidates table by a clicked heading', async () => {
    const heading = page.locator('#top-table th[data-column="wire_mass_kg"]');
    await heading.click();
    const column = await page
      .locator('#top-table th')
      .evaluateAll((ths) => ths.findIndex((th) => th.getAttribute('data-column') === 'wire_mass_kg'));
    const values = await page
      .locator(`#top-table tbody tr td:nth-child(${column + 1})`)
      .evaluateAll((tds) => tds.map((td) => Number(td.textContent)));
    expect(values.length).toBeGreaterThan(1);
    for (let i = 1; i < values.length; i++) expect(values[i]).toBeGreaterThanOrEqual(values[i - 1]);
  });

  it('redraws the front on axes chosen from the columns', async () => {
    const before = await page.locator('body').getAttribute('data-front-ready');
    await page.selectOption('#axis-x', 'resonant_frequency_kHz');
    await page.waitForFunction(`document.body.getAttribute('data-front-ready') !== ${JSON.stringify(before)}`);
    expect(await page.locator('#front-plot').textContent()).toContain('resonant frequency (kHz)');
    expect(consoleErrors).toEqual([]);
  });
});
