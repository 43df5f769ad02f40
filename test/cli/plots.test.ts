import { describe, expect, it } from 'vitest';
import { frontPlotSvg } from '../../cli/plots.ts';
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
