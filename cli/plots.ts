/**
 * front.svg: the trade-offs of a run drawn with Vega-Lite (rendered headless), so a builder sees the
 * front without opening a spreadsheet. Values in the CSVs' practical units; deterministic for the
 * same rows.
 * - One objective: the objective against rank.
 * - Two objectives: one panel filling the canvas, the ranked candidates as small marks, the front as
 *   a staircase with each point labelled by its rank in candidates.csv; evolved and refined designs
 *   (after `evolve`, `refine`) each in their own colour and shape, with a legend.
 * - Three or more: a matrix of every pair of objectives, the front as points (a front of three or
 *   more objectives is no staircase in a 2-D projection, so nothing is joined).
 * - No feasible design: the picture says so in words.
 */
import type { TopLevelSpec } from 'vega-lite';
import { METRIC_KEYS } from '../core/metrics.ts';
import type { CandidateRow } from '../optimize/sweep-state.ts';
import { METRIC_DISPLAY, humanUnit } from './display-units.ts';
import type { ObjectiveDefinition } from '../optimize/sweep-state.ts';
import { PLOT_COLOURS } from './views/column-plot.ts';
import { PICTURE_CAUTION, type PointLabel, pointLabelLayers, vegaLiteSvg, wrapText } from './views/vega-render.ts';

/** What the front's points are, beside their rows: rank in candidates.csv, refined or swept. */
export interface FrontMarks {
  ranks?: ReadonlyArray<number | null>;
  refined?: readonly boolean[];
  /** Designs of `evolve` (their own colour and shape). */
  evolved?: readonly boolean[];
}

type MarkSet = 'candidate' | 'swept front' | 'evolved front' | 'refined front';

interface Datum {
  set: MarkSet;
  label: string;
  [axis: string]: number | string;
}

function axisTitle(objective: ObjectiveDefinition): string {
  const display = METRIC_DISPLAY[objective.metric];
  return `${objective.metric.replace(/_/g, ' ')}${display ? ` (${humanUnit(display.label)})` : ''} — ${objective.sense}`;
}

function displayValueOf(row: CandidateRow, metric: string): number | null {
  const value = row.metrics[METRIC_KEYS.indexOf(metric)];
  if (value === null || value === undefined) return null;
  const display = METRIC_DISPLAY[metric];
  return display ? value / display.divisor : value;
}

const SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';
const SETS: MarkSet[] = ['candidate', 'swept front', 'evolved front', 'refined front'];
const SET_COLOURS = [PLOT_COLOURS.candidate, PLOT_COLOURS.front, PLOT_COLOURS.evolved, PLOT_COLOURS.refined];
const SET_SHAPES = ['circle', 'square', 'triangle-up', 'diamond'];

function title(text: string, width: number) {
  return {
    text: wrapText(text, width, 14),
    subtitle: wrapText(PICTURE_CAUTION, width, 11),
    fontSize: 14,
    subtitleFontSize: 11,
    anchor: 'start' as const,
  };
}

/** The front's rank labels, best rank first (placed first when the plot is crowded). */
function rankLabels(data: readonly Datum[]): PointLabel[] {
  return data
    .filter((d) => d.set !== 'candidate' && d.label !== '')
    .sort((a, b) => Number(a.label) - Number(b.label))
    .map((d) => ({ x: Number(d.o0), y: Number(d.o1), text: d.label }));
}

function messageSpec(message: string): TopLevelSpec {
  return {
    $schema: SCHEMA,
    title: title('No feasible design in this run', 560),
    width: 560,
    height: 120,
    data: { values: wrapText(message, 560, 13).map((line, i) => ({ line, i })) },
    mark: { type: 'text', align: 'left', fontSize: 13, color: '#5b2a12' },
    encoding: {
      x: { value: 0 },
      y: { field: 'i', type: 'ordinal', axis: null },
      text: { field: 'line' },
    },
  };
}

const SET_ENCODING = {
  field: 'set',
  type: 'nominal' as const,
  title: null,
  scale: { domain: SETS, range: SET_COLOURS },
};
const SHAPE_ENCODING = {
  field: 'set',
  type: 'nominal' as const,
  title: null,
  scale: { domain: SETS, range: SET_SHAPES },
};

/** The axis of objective j, its title wrapped to the panel's width. */
function objectiveAxis(objectives: readonly ObjectiveDefinition[], j: number, width: number) {
  return {
    field: `o${j}`,
    type: 'quantitative' as const,
    title: wrapText(axisTitle(objectives[j]), width, 11),
    scale: { zero: false },
  };
}

/** One objective: the objective against rank. */
function oneObjectiveSpec(objective: ObjectiveDefinition, candidates: readonly CandidateRow[]): TopLevelSpec {
  const values = candidates.flatMap((row, i) => {
    const y = displayValueOf(row, objective.metric);
    return y === null ? [] : [{ set: 'candidate', x: i + 1, y }];
  });
  return {
    $schema: SCHEMA,
    title: title(`Ranked candidates by ${objective.metric.replace(/_/g, ' ')}`, 640),
    data: { values },
    mark: { type: 'point', filled: true, size: 14, color: PLOT_COLOURS.front },
    encoding: {
      x: { field: 'x', type: 'quantitative', title: 'rank' },
      y: { field: 'y', type: 'quantitative', title: axisTitle(objective), scale: { zero: false } },
    },
    width: 640,
    height: 420,
  };
}

/** Two objectives: one panel, the front as a staircase with its rank labels placed clear of each other. */
function twoObjectiveSpec(objectives: readonly ObjectiveDefinition[], data: Datum[], heading: string): TopLevelSpec {
  const axis = (j: number, width: number) => objectiveAxis(objectives, j, width);
  const frontFilter = "datum.set !== 'candidate'";
  return {
    $schema: SCHEMA,
    title: title(`${heading}; each front point carries its rank in candidates.csv`, 640),
    width: 640,
    height: 420,
    data: { values: data as unknown as Record<string, unknown>[] },
    encoding: { x: axis(0, 640), y: axis(1, 420) },
    layer: [
      {
        transform: [{ filter: "datum.set === 'candidate'" }],
        mark: { type: 'point', filled: true, size: 12, opacity: 0.7 },
        encoding: { color: SET_ENCODING, shape: SHAPE_ENCODING },
      },
      {
        transform: [{ filter: frontFilter }],
        mark: { type: 'line', interpolate: 'step-after', color: PLOT_COLOURS.front, strokeWidth: 1, opacity: 0.6 },
        encoding: { order: { field: 'o0', type: 'quantitative' } },
      },
      {
        transform: [{ filter: frontFilter }],
        mark: { type: 'point', filled: true, size: 44, stroke: '#102a2a', strokeWidth: 0.6 },
        encoding: { color: SET_ENCODING, shape: SHAPE_ENCODING },
      },
      ...pointLabelLayers('#102a2a'),
    ],
    usermeta: { pointLabels: rankLabels(data) },
  } as unknown as TopLevelSpec;
}

/** Three or more objectives: every pair, one panel each, rows of up to three, the front as points. */
function pairMatrixSpec(objectives: readonly ObjectiveDefinition[], data: Datum[], heading: string): TopLevelSpec {
  const axis = (j: number, width: number) => objectiveAxis(objectives, j, width);
  // Every pair of objectives, one panel each, rows of up to three.
  const size = 240;
  const panels = [];
  for (let a = 0; a < objectives.length; a++)
    for (let b = a + 1; b < objectives.length; b++)
      panels.push({
        width: size,
        height: size,
        encoding: { x: axis(a, size), y: axis(b, size) },
        layer: [
          {
            transform: [{ filter: "datum.set === 'candidate'" }],
            mark: { type: 'point' as const, filled: true, size: 8, opacity: 0.6 },
            encoding: { color: SET_ENCODING, shape: SHAPE_ENCODING },
          },
          {
            transform: [{ filter: "datum.set !== 'candidate'" }],
            mark: { type: 'point' as const, filled: true, size: 30, stroke: '#102a2a', strokeWidth: 0.5 },
            encoding: { color: SET_ENCODING, shape: SHAPE_ENCODING },
          },
        ],
      });
  const rows = [];
  for (let i = 0; i < panels.length; i += 3) rows.push({ hconcat: panels.slice(i, i + 3) });
  return {
    $schema: SCHEMA,
    title: title(`${heading}, every pair of the ${objectives.length} objectives`, 3 * size + 120),
    data: { values: data as unknown as Record<string, unknown>[] },
    vconcat: rows,
  } as TopLevelSpec;
}

/** The Vega-Lite spec of front.svg (exported for the report). */
export function frontPlotSpec(
  objectives: readonly ObjectiveDefinition[],
  candidates: readonly CandidateRow[],
  front: readonly CandidateRow[],
  marks: FrontMarks = {},
): TopLevelSpec {
  if (candidates.length === 0 && front.length === 0) {
    return messageSpec(
      'Nothing met every constraint, so there is no front to draw. infeasible.csv lists the closest misses with their reasons, and summary.json counts the designs each constraint rejected.',
    );
  }
  const data: Datum[] = [];
  const push = (row: CandidateRow, set: MarkSet, label: string) => {
    const datum: Datum = { set, label };
    for (let j = 0; j < objectives.length; j++) {
      const value = displayValueOf(row, objectives[j].metric);
      if (value === null) return;
      datum[`o${j}`] = value;
    }
    data.push(datum);
  };
  for (const row of candidates) push(row, 'candidate', '');
  front.forEach((row, i) => {
    const rank = marks.ranks?.[i];
    push(
      row,
      marks.refined?.[i] ? 'refined front' : marks.evolved?.[i] ? 'evolved front' : 'swept front',
      rank === null || rank === undefined ? '' : String(rank),
    );
  });
  // After a stage the points behind the front are its listed designs (evolved.csv, refined.csv), not the ranked ones.
  const heading = `Trade-offs: ${front.length} non-dominated designs and the ${candidates.length} listed candidates`;
  if (objectives.length === 1) return oneObjectiveSpec(objectives[0], candidates);
  return objectives.length === 2
    ? twoObjectiveSpec(objectives, data, heading)
    : pairMatrixSpec(objectives, data, heading);
}

/** The SVG text of the run's plot. */
export async function frontPlotSvg(
  objectives: readonly ObjectiveDefinition[],
  candidates: readonly CandidateRow[],
  front: readonly CandidateRow[],
  marks: FrontMarks = {},
): Promise<string> {
  return vegaLiteSvg(frontPlotSpec(objectives, candidates, front, marks));
}
