import { describe, expect, it } from 'vitest';
import { reportData, reportRows } from '../../../cli/views/report-data.ts';
import { parseRunTable } from '../../../cli/views/run-table.ts';

// The report's content from a run's summary and rows (invented numbers): what the page titles each
// column with, and how it labels the constraints' bars.
const table = parseRunTable(
  'rank,pareto_rank,sample_index,secondary.turns,build_quantile_1,breakout_voltage_kV\n1,1,4,900,1.2,350\n',
);
const summary = {
  version: 2,
  counts: { evaluated: 1, feasible: 1 },
  constraints: [{ metric: 'resonant_frequency', min: 90e3, max: 300e3, rejected: 3 }],
  objectives: [{ metric: 'breakout_voltage', sense: 'maximize' }],
  build_quantiles: [
    { column: 'build_quantile_1', metric: 'breakout_margin', quantile: 0.05, label: 'breakout_margin p05' },
  ],
};

describe('the report content', () => {
  const data = reportData('RUN', summary, table, reportRows(table, table), { drawings: {}, topThree: [], notes: [] });

  it('titles a build_quantile column with what summary.json says it holds', () => {
    expect(data.titles.build_quantile_1).toContain('breakout_margin p05 over the tolerance draws');
    expect(data.titles['secondary.turns']).not.toContain('tolerance');
  });

  it('without the mapping (a version 1 summary) the column keeps its plain title', () => {
    const old = reportData('RUN', { ...summary, version: 1 }, table, reportRows(table, table), {
      drawings: {},
      topThree: [],
      notes: [],
    });
    expect(old.titles.build_quantile_1).not.toContain('p05');
  });

  it('labels a constraint bar in display units', () => {
    expect(data.rejections[0]?.label).toBe('resonant_frequency 90 kHz … 300 kHz');
  });
});
