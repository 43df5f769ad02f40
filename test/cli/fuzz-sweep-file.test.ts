import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { stringify as yamlStringify } from 'yaml';
import { sweepFromValue } from '../../cli/sweep-spec.ts';
import { parseInputText } from '../../cli/read-file.ts';
import { applyMutation, expectReaderContract, hostileLeaf, hostileTexts, mutationsOf } from './fuzz-inputs.ts';

// The sweep-file reader never throws a stack trace on any input: every problem is one line with the
// file and the field path. The base sweep is an invented demo scenario.
const FILE = 'night.yaml';
const base = {
  design: {
    secondary: {
      form_diameter: { choose: ['110 mm', '160 mm'] },
      wire: 'AWG 26',
      turns: { from: 700, to: 1300, integer: true },
      base_height: '500 mm',
    },
    topload: {
      shape: 'toroid',
      outer_diameter: { from: '300 mm', to: '700 mm', scale: 'log' },
      tube_diameter: '110 mm',
      height_above_winding: '30 mm',
    },
    primary: {
      shape: 'flat_spiral',
      inner_diameter: '240 mm',
      turns: 12,
      conductor_diameter: '6 mm',
      turn_spacing: '5 mm',
      elevation: '0 mm',
    },
    tank: { capacitance: '25 nF', charge_voltage: '12 kV' },
    driver: { kind: 'spark_gap', break_rate: '150 Hz' },
    environment: { altitude: '300 m', temperature: '18 degC' },
  },
  constraints: { overall_height: { max: '2 m' }, resonant_frequency: { min: '100 kHz', max: '400 kHz' } },
  objectives: [{ maximize: 'breakout_voltage' }, { minimize: 'wire_mass' }],
  sweep: { method: 'sobol', samples: 512, seed: 17 },
};

describe('sweepFromValue(value, file) under fuzzing', () => {
  it('reads the unmutated base sweep (the harness starts from a valid file)', () => {
    expect(expectReaderContract(() => sweepFromValue(base, FILE), FILE)).toBeNull();
  });

  it('answers any mutation of a valid sweep with a result or a one-line InputError', () => {
    fc.assert(
      fc.property(mutationsOf(base), ({ value }) => {
        expectReaderContract(() => sweepFromValue(value, FILE), FILE);
      }),
      { numRuns: 400, seed: 6 },
    );
  });

  it('names the field path for a bad value at a leaf', () => {
    const leaves: Array<Array<string | number>> = [
      ['design', 'secondary', 'turns'],
      ['design', 'topload', 'outer_diameter'],
      ['design', 'tank', 'capacitance'],
      ['sweep', 'samples'],
    ];
    const bad = [
      Number.NaN,
      Number.POSITIVE_INFINITY,
      Number.NEGATIVE_INFINITY,
      '30 nF',
      { from: 10, to: 1 },
      { choose: [] },
      [],
      true,
    ];
    for (const path of leaves) {
      for (const value of bad) {
        if (path[0] === 'design' && path[2] === 'capacitance' && value === '30 nF') continue; // right kind there
        const mutated = applyMutation(base, { kind: 'replace', path, value });
        const message = expectReaderContract(() => sweepFromValue(mutated, FILE), FILE);
        expect(message, `${path.join('.')} = ${JSON.stringify(value)}`).not.toBeNull();
        expect(message).toContain(path.join('.'));
      }
    }
  });

  it('suggests the key a one-letter typo was meant to be', () => {
    const typos: Array<[Array<string | number>, string, string]> = [
      [['design', 'secondary'], 'turns', 'tunrs'],
      [['design'], 'topload', 'topolad'],
      [['sweep'], 'samples', 'sample'],
      [[], 'objectives', 'objectivs'],
    ];
    for (const [parent, key, typo] of typos) {
      let mutated = applyMutation(base, { kind: 'add-key', path: parent, key: typo, value: 1 });
      mutated = applyMutation(mutated, { kind: 'delete', path: [...parent, key] });
      const message = expectReaderContract(() => sweepFromValue(mutated, FILE), FILE);
      expect(message).toContain(`did you mean '${key}'`);
    }
  });

  it('answers arbitrary values with a result or a one-line InputError', () => {
    fc.assert(
      fc.property(fc.oneof(hostileLeaf, fc.anything({ maxDepth: 3 })), (value) => {
        expectReaderContract(() => sweepFromValue(value, FILE), FILE);
      }),
      { numRuns: 200, seed: 8 },
    );
  });
});

describe('parseInputText(text, file) and sweepFromValue under fuzzing of the text', () => {
  const text = yamlStringify(base);

  it('answers any edit of a valid file, and parser traps, with a result or a one-line InputError', () => {
    fc.assert(
      fc.property(hostileTexts(text), (edited) => {
        expectReaderContract(() => sweepFromValue(parseInputText(edited, FILE), FILE), FILE);
      }),
      { numRuns: 200, seed: 4 },
    );
  });
});
