/**
 * front.svg: the trade-offs of a run drawn with Vega-Lite (rendered headless by Vega's View.toSVG),
 * so a builder sees the front without opening a spreadsheet. With two or more objectives, the first
 * objective against each of the others (up to three panels): the ranked candidates as small grey
 * marks, the non-dominated front as larger dark marks joined by a step line. With one objective, the
 * objective against rank. Values in the CSVs' practical units. Deterministic for the same rows.
 */
import type { TopLevelSpec } from 'vega-lite';
import { METRIC_KEYS } from '../core/metrics.ts';
import type { CandidateRow } from '../optimize/sweep-state.ts';
import { METRIC_DISPLAY, humanUnit } from './display-units.ts';
import type { ObjectiveSpec } from './sweep-spec.ts';

interface Point {
  set: string;
  x: number;
  y: number;
}

function axisTitle(objective: ObjectiveSpec): string {
  const display = METRIC_DISPLAY[objective.metric];
  return `${objective.metric.replace(/_/g, ' ')}${display ? ` (${humanUnit(display.label)})` : ''} — ${objective.sense}`;
}

function valueOf(row: CandidateRow, metric: string): number | null {
  const value = row.metrics[METRIC_KEYS.indexOf(metric)];
  if (value === null || value === undefined) return null;
  const display = METRIC_DISPLAY[metric];
  return display ? value / display.divisor : value;
}

const CAUTION =
  'Model estimates, not a safety assessment: tank and supply voltages are lethal — read the safety cautions.';

/** The SVG text of the run's plot. */
export async function frontPlotSvg(
  objectives: readonly ObjectiveSpec[],
  candidates: readonly CandidateRow[],
  front: readonly CandidateRow[],
): Promise<string> {
  let spec: TopLevelSpec;
  if (objectives.length === 1) {
    const objective = objectives[0];
    const values = candidates.flatMap((row, i) => {
      const y = valueOf(row, objective.metric);
      return y === null ? [] : [{ set: 'candidates', x: i + 1, y }];
    });
    spec = {
      $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
      title: { text: `Ranked candidates by ${objective.metric.replace(/_/g, ' ')}`, subtitle: CAUTION },
      data: { values },
      mark: { type: 'point', filled: true, size: 14, color: '#3a5f7d' },
      encoding: {
        x: { field: 'x', type: 'quantitative', title: 'rank' },
        y: { field: 'y', type: 'quantitative', title: axisTitle(objective), scale: { zero: false } },
      },
      width: 520,
      height: 360,
    };
  } else {
    const panels = objectives.slice(1, 4).map((other) => {
      const points = (rows: readonly CandidateRow[], set: string): Point[] =>
        rows.flatMap((row) => {
          const x = valueOf(row, objectives[0].metric);
          const y = valueOf(row, other.metric);
          return x === null || y === null ? [] : [{ set, x, y }];
        });
      const frontPoints = points(front, 'front').sort((a, b) => a.x - b.x || a.y - b.y);
      return {
        data: { values: [...points(candidates, 'candidates'), ...frontPoints] },
        width: 420,
        height: 320,
        layer: [
          {
            transform: [{ filter: "datum.set === 'candidates'" }],
            mark: { type: 'point' as const, filled: true, size: 10, color: '#b9b4a8', opacity: 0.7 },
            encoding: {
              x: {
                field: 'x',
                type: 'quantitative' as const,
                title: axisTitle(objectives[0]),
                scale: { zero: false },
              },
              y: { field: 'y', type: 'quantitative' as const, title: axisTitle(other), scale: { zero: false } },
            },
          },
          {
            transform: [{ filter: "datum.set === 'front'" }],
            mark: { type: 'line' as const, interpolate: 'step-after' as const, color: '#7a2e1f', strokeWidth: 1 },
            encoding: {
              x: { field: 'x', type: 'quantitative' as const },
              y: { field: 'y', type: 'quantitative' as const },
              order: { field: 'x', type: 'quantitative' as const },
            },
          },
          {
            transform: [{ filter: "datum.set === 'front'" }],
            mark: { type: 'point' as const, filled: true, size: 30, color: '#7a2e1f' },
            encoding: {
              x: { field: 'x', type: 'quantitative' as const },
              y: { field: 'y', type: 'quantitative' as const },
            },
          },
        ],
      };
    });
    spec = {
      $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
      title: {
        text: `Trade-offs: ${front.length} non-dominated designs (dark) among ${candidates.length} ranked candidates`,
        subtitle: CAUTION,
      },
      hconcat: panels,
    } as TopLevelSpec;
  }
  // Vega is loaded on first use: most commands never draw, and it takes a while to load.
  const [vega, { compile }] = await Promise.all([import('vega'), import('vega-lite')]);
  const compiled = compile(spec).spec;
  const view = new vega.View(vega.parse(compiled), { renderer: 'none' });
  const svg = await view.toSVG();
  view.finalize();
  return `${svg}\n`;
}
