/**
 * The morning report of a run as one self-contained HTML page: its style, its data (JSON in a
 * script element), the Vega, Vega-Lite and vega-embed builds from node_modules and the page's own
 * script are all inlined, so that it opens offline and fetches nothing.
 *
 * The page's own script (REPORT_SCRIPT) is plain browser JavaScript kept here as text; it builds the
 * interactive front with vega-embed (axes from two selectors over the numeric columns, a tooltip on
 * hover, a click that shows the design's drawing and key figures beside the plot) and the sortable
 * table.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { SAFETY_CAUTIONS } from '../safety.ts';

/** What the page shows; everything is plain JSON. */
export interface ReportData {
  title: string;
  run: string;
  counts: Record<string, number>;
  /** One bar per constraint: how many designs it rejected; and per reason why designs could not be built. */
  rejections: { label: string; count: number; kind: 'constraint' | 'impossible' }[];
  objectives: { column: string; sense: string }[];
  /** Numeric columns a user may put on the axes. */
  axisColumns: string[];
  /** A readable title with its unit per column ('breakout voltage (kV)'). */
  titles: Record<string, string>;
  /** Default axes. */
  x: string;
  y: string;
  /** Candidates (small marks) and the front (large marks), every column of their CSV rows. */
  candidates: Record<string, number | string | null>[];
  front: Record<string, number | string | null>[];
  /** Columns of the top-candidates table and of a design's key figures. */
  tableColumns: string[];
  keyColumns: string[];
  /** Drawing (SVG text) per design id (the rank cell, as text). */
  drawings: Record<string, string>;
  /** The ids of the top three candidates, drawn in their own section. */
  topThree: string[];
  sensitivities: { parameters: string[]; metrics: string[]; values: (number | null)[][] } | null;
  /** The Sobol indices of `coilfront sensitivity … --out RUN` (sensitivity.csv), when the run has them. */
  globalIndices: { header: string[]; rows: (number | string | null)[][] } | null;
  /** The yields and quantiles of `coilfront tolerance RUN` (tolerance.csv), when the run has them. */
  buildTolerances?: { header: string[]; rows: (number | string | null)[][] } | null;
  notes: string[];
}

const require = createRequire(import.meta.url);

/**
 * A package's browser build from node_modules, as text safe inside a script element. The packages
 * export only their entry points, so the build folder is found beside the resolved entry.
 */
function libraryScript(name: string, file: string): string {
  const buildFolder = dirname(require.resolve(name));
  return scriptSafe(readFileSync(join(buildFolder, file), 'utf8'));
}

/** Text that cannot close its script element early. */
function scriptSafe(text: string): string {
  return text.replace(/<\/(script)/gi, '<\\/$1').replace(/<!--/g, '<\\!--');
}

function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

const STYLE = `
:root { --ink: #26313b; --muted: #66727c; --paper: #fbfaf6; --line: #ddd6c6; --accent: #0b6e69; --warn: #a3162d; }
* { box-sizing: border-box; }
body { margin: 0; font: 14px/1.45 "DejaVu Sans", Verdana, sans-serif; color: var(--ink); background: var(--paper); }
header, section { max-width: 1320px; margin: 0 auto; padding: 12px 24px; }
h1 { font-size: 22px; margin: 12px 0 4px; } h2 { font-size: 17px; margin: 18px 0 8px; border-bottom: 1px solid var(--line); }
.cautions { border: 2px solid var(--warn); background: #fff4f2; padding: 8px 16px; }
.cautions h2 { color: var(--warn); border: none; margin: 4px 0; }
.cautions li { margin: 2px 0; }
.counts { display: flex; gap: 12px; flex-wrap: wrap; }
.count { border: 1px solid var(--line); padding: 6px 14px; background: white; }
.count b { display: block; font-size: 20px; }
.bars { display: grid; grid-template-columns: minmax(200px, 460px) 1fr 70px; gap: 4px 10px; align-items: center; }
.bar { height: 14px; background: var(--accent); }
.bar.impossible { background: #c2571a; }
.front-area { display: flex; gap: 20px; align-items: flex-start; flex-wrap: wrap; }
#detail { flex: 1 1 420px; min-width: 360px; border: 1px solid var(--line); background: white; padding: 8px 12px; }
#detail svg { width: 100%; height: auto; }
.axes label { margin-right: 14px; }
table { border-collapse: collapse; background: white; }
td, th { border: 1px solid var(--line); padding: 3px 8px; text-align: right; white-space: nowrap; }
th { background: #efe9dc; cursor: pointer; user-select: none; }
th.sorted-up::after { content: " \\25B2"; } th.sorted-down::after { content: " \\25BC"; }
td.text { text-align: left; }
.table-wrap { overflow-x: auto; max-width: 100%; }
.drawings { display: flex; gap: 16px; flex-wrap: wrap; }
.drawings figure { margin: 0; flex: 1 1 380px; border: 1px solid var(--line); background: white; padding: 6px; }
.drawings svg { width: 100%; height: auto; }
.sens td.cell { min-width: 90px; }
.note { color: var(--muted); }
`;

/** The page's own script: plain browser JavaScript. */
const REPORT_SCRIPT = `
(function () {
  'use strict';
  var data = JSON.parse(document.getElementById('report-data').textContent);
  var state = { x: data.x, y: data.y, view: null };
  function fmt(v) {
    if (v === null || v === undefined || v === '') return '\\u2014';
    if (typeof v !== 'number') return String(v);
    if (v === 0) return '0';
    var a = Math.abs(v);
    if (a >= 1e7 || a < 1e-4) return v.toExponential(3);
    return String(Number(v.toPrecision(4)));
  }
  function title(column) { return data.titles[column] || column.replace(/[._]/g, ' '); }
  function el(tag, attrs, text) {
    var e = document.createElement(tag);
    if (attrs) for (var k in attrs) e.setAttribute(k, attrs[k]);
    if (text !== undefined) e.textContent = text;
    return e;
  }

  // Axes selectors over the numeric columns.
  function fillSelect(id, chosen) {
    var select = document.getElementById(id);
    data.axisColumns.forEach(function (c) {
      var option = el('option', { value: c }, title(c));
      if (c === chosen) option.selected = true;
      select.appendChild(option);
    });
    select.addEventListener('change', function () { state[id === 'axis-x' ? 'x' : 'y'] = select.value; drawFront(); });
  }

  function tooltipFields() {
    var fields = [{ field: 'rank', type: 'nominal', title: 'rank' }];
    var seen = { rank: true };
    [state.x, state.y].concat(data.objectives.map(function (o) { return o.column; })).concat(data.keyColumns.slice(0, 6))
      .forEach(function (c) {
        if (seen[c]) return;
        seen[c] = true;
        fields.push({ field: c, type: 'quantitative', title: title(c), format: '.4~g' });
      });
    return fields;
  }

  function frontSpec() {
    var enc = function (size) {
      return {
        x: { field: state.x, type: 'quantitative', title: title(state.x), scale: { zero: false } },
        y: { field: state.y, type: 'quantitative', title: title(state.y), scale: { zero: false } },
        tooltip: tooltipFields(),
        size: { value: size }
      };
    };
    return {
      $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
      width: 640, height: 440,
      background: '#ffffff',
      datasets: { candidates: data.candidates, front: data.front },
      layer: [
        { name: 'candidates', data: { name: 'candidates' }, mark: { type: 'point', filled: true, color: '#8795a1', opacity: 0.55 }, encoding: enc(22) },
        { name: 'front', data: { name: 'front' }, mark: { type: 'point', filled: true, color: '#0b6e69', cursor: 'pointer', stroke: '#ffffff', strokeWidth: 1 }, encoding: enc(110) },
        { name: 'front_labels', data: { name: 'front' }, mark: { type: 'text', dx: 9, dy: -7, fontSize: 10, color: '#0b6e69' },
          encoding: { x: { field: state.x, type: 'quantitative' }, y: { field: state.y, type: 'quantitative' }, text: { field: 'rank' } } }
      ]
    };
  }

  function drawFront() {
    if (state.view) state.view.finalize();
    vegaEmbed('#front-plot', frontSpec(), { renderer: 'svg', actions: false }).then(function (result) {
      state.view = result.view;
      window.coilfrontReport.view = result.view;
      result.view.addEventListener('click', function (event, item) {
        if (item && item.datum && item.mark && item.mark.marktype === 'symbol' && item.datum.rank !== undefined) {
          var datum = item.datum;
          var row = data.front.filter(function (r) { return String(r.rank) === String(datum.rank); })[0] ||
            data.candidates.filter(function (r) { return String(r.rank) === String(datum.rank); })[0];
          if (row) showDetail(row);
        }
      });
      document.body.setAttribute('data-front-ready', String(Date.now()));
    }).catch(function (error) { console.error(error); });
  }

  function showDetail(row) {
    var detail = document.getElementById('detail');
    detail.innerHTML = '';
    var id = String(row.rank);
    detail.setAttribute('data-rank', id);
    detail.appendChild(el('h3', null, (data.front.indexOf(row) >= 0 ? 'front design ' : 'candidate ') + id));
    var svg = data.drawings[id];
    if (svg) {
      var holder = el('div', { class: 'drawing' });
      holder.innerHTML = svg;
      detail.appendChild(holder);
    } else {
      detail.appendChild(el('p', { class: 'note' }, 'No drawing in this report for ' + id + ': npx coilfront draw ' + data.run + ' ' + id));
    }
    var table = el('table', { class: 'key-figures' });
    var columns = data.keyColumns.filter(function (c) { return c in row; });
    columns.forEach(function (c) {
      var tr = el('tr');
      tr.appendChild(el('td', { class: 'text' }, title(c)));
      tr.appendChild(el('td', { 'data-column': c }, fmt(row[c])));
      table.appendChild(tr);
    });
    detail.appendChild(table);
    detail.appendChild(el('p', { class: 'note' }, 'Design file: npx coilfront show ' + data.run + ' ' + id));
  }

  // Sortable table of the top candidates.
  function buildTable() {
    var table = document.getElementById('top-table');
    var head = el('tr');
    var rows = data.candidates.slice(0, 50);
    var sort = { column: null, up: true };
    data.tableColumns.forEach(function (c) {
      var th = el('th', { 'data-column': c }, title(c));
      th.addEventListener('click', function () {
        sort.up = sort.column === c ? !sort.up : true;
        sort.column = c;
        Array.prototype.forEach.call(head.children, function (h) { h.className = ''; });
        th.className = sort.up ? 'sorted-up' : 'sorted-down';
        rows.sort(function (a, b) {
          var u = a[c], v = b[c];
          if (u === null || u === undefined) return 1;
          if (v === null || v === undefined) return -1;
          var d = typeof u === 'number' && typeof v === 'number' ? u - v : String(u).localeCompare(String(v));
          return sort.up ? d : -d;
        });
        fillBody();
      });
      head.appendChild(th);
    });
    var thead = el('thead'); thead.appendChild(head); table.appendChild(thead);
    var body = el('tbody'); table.appendChild(body);
    function fillBody() {
      body.innerHTML = '';
      rows.forEach(function (r) {
        var tr = el('tr');
        data.tableColumns.forEach(function (c) {
          tr.appendChild(el('td', typeof r[c] === 'number' ? null : { class: 'text' }, fmt(r[c])));
        });
        tr.addEventListener('click', function () { showDetail(r); });
        body.appendChild(tr);
      });
    }
    fillBody();
  }

  window.coilfrontReport = { view: null, showDetail: showDetail };
  fillSelect('axis-x', data.x);
  fillSelect('axis-y', data.y);
  buildTable();
  drawFront();
})();
`;

/** The whole page. */
export function reportHtml(data: ReportData): string {
  const parts: string[] = [];
  headPart(parts, data);
  countsPart(parts, data);
  frontPart(parts, data);
  sensitivitiesPart(parts, data);
  studiesPart(parts, data);
  notesAndScripts(parts, data);
  return `${parts.join('\n')}\n`;
}

/** The page head (title, the content policy that forbids every fetch, the style) and the cautions first. */
function headPart(parts: string[], data: ReportData): void {
  parts.push('<!DOCTYPE html>', '<html lang="en"><head><meta charset="utf-8">');
  parts.push(`<title>${escapeHtml(data.title)}</title>`);
  // Nothing may be fetched: a policy that forbids every network source but inline code and data URLs.
  parts.push(
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; script-src 'unsafe-inline' 'unsafe-eval'; style-src 'unsafe-inline'; img-src data:; font-src data:">`,
  );
  parts.push(`<style>${STYLE}</style></head><body>`);
  parts.push('<header>', `<h1>${escapeHtml(data.title)}</h1>`);
  parts.push('<div class="cautions" id="cautions"><h2>Safety: read this first</h2><ul>');
  for (const caution of joinedCautions()) parts.push(`<li>${escapeHtml(caution)}</li>`);
  parts.push('</ul></div></header>');
}

/** The run's counts and a bar per rejection reason. */
function countsPart(parts: string[], data: ReportData): void {
  parts.push('<section id="counts"><h2>What the run evaluated</h2><div class="counts">');
  for (const [key, value] of Object.entries(data.counts)) {
    parts.push(`<div class="count" data-count="${escapeHtml(key)}"><b>${value}</b>${escapeHtml(key)}</div>`);
  }
  parts.push('</div>');
  if (data.rejections.length > 0) {
    const largest = Math.max(1, ...data.rejections.map((r) => r.count));
    parts.push('<h3>What rejected designs</h3><div class="bars" id="rejections">');
    for (const r of data.rejections) {
      const width = (100 * r.count) / largest;
      parts.push(
        `<div>${escapeHtml(r.label)}</div><div><div class="bar ${r.kind}" style="width:${width.toFixed(1)}%"></div></div><div data-rejected="${escapeHtml(r.label)}">${r.count}</div>`,
      );
    }
    parts.push(
      '</div><p class="note">Green bars: designs that broke a constraint; orange: designs that cannot be built as given.</p>',
    );
  }
  parts.push('</section>');
}

/** The interactive front, the top-candidates table and the top three drawn to scale. */
function frontPart(parts: string[], data: ReportData): void {
  parts.push('<section id="front"><h2>The front</h2>');
  parts.push(
    '<p class="axes"><label>across <select id="axis-x"></select></label><label>up <select id="axis-y"></select></label><span class="note">Hover a mark for its values; click a front mark (teal) for its drawing and key figures.</span></p>',
  );
  parts.push(
    '<div class="front-area"><div id="front-plot"></div><div id="detail"><p class="note">Click a front design.</p></div></div>',
  );
  parts.push('</section>');

  parts.push(
    '<section id="top"><h2>Top candidates</h2><p class="note">Click a heading to sort; click a row to see it beside the front.</p>',
  );
  parts.push('<div class="table-wrap"><table id="top-table"></table></div></section>');

  parts.push('<section id="top-three"><h2>The top three, drawn to scale</h2><div class="drawings">');
  for (const id of data.topThree) {
    const svg = data.drawings[id];
    if (svg) parts.push(`<figure data-rank="${escapeHtml(id)}">${svg}</figure>`);
  }
  parts.push('</div></section>');
}

/** The rank correlations of summary.json, coloured by sign. */
function sensitivitiesPart(parts: string[], data: ReportData): void {
  if (data.sensitivities) {
    parts.push('<section id="sensitivities"><h2>Sensitivities</h2>');
    parts.push(
      '<p class="note">Spearman rank correlation of each parameter with each objective over the feasible sample (summary.json): +1 rises with it, −1 falls with it.</p>',
    );
    parts.push('<table class="sens"><tr><th>parameter</th>');
    for (const metric of data.sensitivities.metrics) parts.push(`<th>${escapeHtml(metric.replace(/_/g, ' '))}</th>`);
    parts.push('</tr>');
    data.sensitivities.parameters.forEach((parameter, p) => {
      parts.push(`<tr><td class="text">${escapeHtml(parameter)}</td>`);
      for (const value of data.sensitivities?.values[p] ?? []) {
        if (value === null) {
          parts.push('<td class="cell">—</td>');
          continue;
        }
        const colour =
          value >= 0
            ? `rgba(11,110,105,${Math.abs(value).toFixed(2)})`
            : `rgba(194,87,26,${Math.abs(value).toFixed(2)})`;
        parts.push(`<td class="cell" style="background:${colour}">${value.toFixed(2)}</td>`);
      }
      parts.push('</tr>');
    });
    parts.push('</table></section>');
  }
}

/** The Sobol indices and the tolerance study, when the run holds them. */
function studiesPart(parts: string[], data: ReportData): void {
  if (data.globalIndices) {
    parts.push('<section id="global-indices"><h2>Global sensitivity (Sobol indices)</h2>');
    parts.push(
      '<p class="note">From sensitivity.csv in the run (npx coilfront sensitivity … --out RUN): S1 the share of a metric\'s variance a field explains alone, ST with its interactions, 95 % bootstrap intervals. Rows whose metric is <code>feasible</code> are the indices of the 0/1 feasibility indicator over every sample; a metric\'s own indices use only the samples whose rows all have it (the kept column), so where designs could not be built they are indicative.</p>',
    );
    studyTable(parts, data.globalIndices, (value) => value.toFixed(3));
  }
  if (data.buildTolerances) {
    parts.push('<section id="build-tolerances"><h2>Tolerances and yield</h2>');
    parts.push(
      '<p class="note">From tolerance.csv in the run (npx coilfront tolerance RUN): the fraction of builds within the tolerances that would be feasible candidates, with its 95 % Wilson interval, and the 5/50/95 % quantiles of each objective and constrained metric over the same builds for every candidate.</p>',
    );
    studyTable(parts, data.buildTolerances, (value) => value.toPrecision(4));
  }
}

/** A study's table from its CSV (Sobol indices, tolerances): text cells left, numbers in their format. */
function studyTable(
  parts: string[],
  table: { header: string[]; rows: Array<Array<string | number | null>> },
  format: (value: number) => string,
): void {
  parts.push('<table><tr>');
  for (const h of table.header) parts.push(`<th>${escapeHtml(h)}</th>`);
  parts.push('</tr>');
  for (const row of table.rows) {
    parts.push('<tr>');
    for (const cell of row) {
      const text = typeof cell === 'number' ? (Number.isInteger(cell) ? String(cell) : format(cell)) : (cell ?? '—');
      parts.push(`<td${typeof cell === 'number' ? '' : ' class="text"'}>${escapeHtml(String(text))}</td>`);
    }
    parts.push('</tr>');
  }
  parts.push('</table></section>');
}

/** The notes, the report data and the inlined libraries and page script. */
function notesAndScripts(parts: string[], data: ReportData): void {
  if (data.notes.length > 0) {
    parts.push('<section id="notes"><h2>Notes</h2><ul>');
    for (const note of data.notes) parts.push(`<li class="note">${escapeHtml(note)}</li>`);
    parts.push('</ul></section>');
  }

  const json = JSON.stringify(data).replace(/</g, '\\u003c');
  parts.push(`<script type="application/json" id="report-data">${json}</script>`);
  for (const [name, file] of [
    ['vega', 'vega.min.js'],
    ['vega-lite', 'vega-lite.min.js'],
    ['vega-embed', 'vega-embed.min.js'],
  ]) {
    parts.push(`<script>${libraryScript(name, file)}</script>`);
  }
  parts.push(`<script>${scriptSafe(REPORT_SCRIPT)}</script>`);
  parts.push('</body></html>');
}

/** The cautions of cli/safety.ts, one item per caution (the indented lines continue the one before). */
function joinedCautions(): string[] {
  const items: string[] = [];
  for (const line of SAFETY_CAUTIONS) {
    if (line.startsWith('  ') && items.length > 0) items[items.length - 1] += ` ${line.trim()}`;
    else items.push(line);
  }
  return items;
}
