import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseInputText } from '../../cli/read-file.ts';
import { sweepFromValue } from '../../cli/sweep-spec.ts';
import { stageDefaults } from '../../cli/sweep-stages.ts';
import { SMALL_SWEEP } from './sweep-harness.ts';

// The default budget split of sweep.stages (a rule of ours, measured by bench/stage-split.ts): the
// sweep's samples are a tenth of sweep + evolve, evolve nine tenths at population 60, refine the samples
// again when listed, with floors.
describe('stageDefaults', () => {
  it('gives evolve nine times the samples and refine the samples, over four starts per objective', () => {
    expect(stageDefaults({ samples: 5000, dimensions: 8, objectives: 2 })).toEqual({
      evolve: { evaluations: 45_000, population: 60 },
      refine: { starts: 8, evaluations: 5000 },
    });
    expect(stageDefaults({ samples: 20_000, dimensions: 6, objectives: 3 }).refine).toEqual({
      starts: 12,
      evaluations: 20_000,
    });
  });

  it('keeps ten generations of evolve and dimensions + 2 evaluations per refine start on a small sweep', () => {
    expect(stageDefaults({ samples: 10, dimensions: 30, objectives: 4 })).toEqual({
      evolve: { evaluations: 600, population: 60 },
      refine: { starts: 16, evaluations: 16 * 32 },
    });
  });

  it('fills the unset settings of bare stages in a sweep file from its size, and keeps the ones given', () => {
    const text = readFileSync(SMALL_SWEEP, 'utf8').replace(
      /^sweep: \{ (.*) \}$/m,
      'sweep: { $1, stages: [evolve, { refine: { starts: 3 } }] }',
    );
    const spec = sweepFromValue(parseInputText(text, 'small.yaml'), 'small.yaml');
    expect(spec.samples).toBe(256);
    expect(spec.stages).toEqual([
      { stage: 'evolve', evaluations: 2304, population: 60 },
      { stage: 'refine', starts: 3, evaluations: 256 },
    ]);
  });
});
