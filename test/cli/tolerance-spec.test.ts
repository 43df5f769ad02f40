import { describe, expect, it } from 'vitest';
import type { InputIssue } from '../../run/input-error.ts';
import { readTolerances } from '../../cli/tolerance-spec.ts';

function read(input: unknown) {
  const issues: InputIssue[] = [];
  const section = readTolerances(input, ['tolerances'], issues);
  return { section, issues };
}

describe('readTolerances', () => {
  it('reads relative, absolute and temperature spreads, ranges and their distributions in SI', () => {
    const { section, issues } = read({
      draws: 64,
      seed: 5,
      sweep_draws: 8,
      secondary: { turns: '±2 %', base_height: { spread: '+-10 mm', distribution: 'normal', sigmas: 3 } },
      tank: { capacitance: { spread: '±1 nF', distribution: 'truncated_normal', sigmas: 2 } },
      environment: {
        temperature: { spread: '±9 degF' },
        altitude: { from: '0 m', to: '1.5 km' },
        streamer_length: { from: '20 cm', to: '60 cm', distribution: 'normal', sigmas: 2 },
      },
    });
    expect(issues).toEqual([]);
    expect(section?.draws).toBe(64);
    expect(section?.seed).toBe(5);
    expect(section?.sweepDraws).toBe(8);
    const byPath = Object.fromEntries((section?.fields ?? []).map((f) => [f.path.join('.'), f]));
    expect(byPath['secondary.turns']).toMatchObject({ mode: 'relative', spread: 0.02, distribution: 'uniform' });
    expect(byPath['secondary.base_height']).toMatchObject({ mode: 'absolute', distribution: 'normal', sigmas: 3 });
    expect(byPath['secondary.base_height'].spread).toBeCloseTo(0.01, 15);
    expect(byPath['secondary.base_height'].fallback).toBe(0);
    expect(byPath['tank.capacitance'].spread).toBeCloseTo(1e-9, 20);
    expect(byPath['tank.capacitance'].createSection).toBe(false);
    // A temperature spread is a difference: 9 °F is 5 K (not an absolute temperature).
    expect(byPath['environment.temperature'].spread).toBeCloseTo(5, 12);
    expect(byPath['environment.temperature'].fallback).toBe(293.15);
    expect(byPath['environment.altitude']).toMatchObject({ mode: 'interval', centre: 750, spread: 750 });
    expect(byPath['environment.altitude'].createSection).toBe(true);
    expect(byPath['environment.streamer_length'].centre).toBeCloseTo(0.4, 15);
  });

  it("reads a sub-section's fields nested as the design file writes them (tank.bank.part), under dotted keys", () => {
    const { section, issues } = read({ tank: { bank: { part: { capacitance: '±5 %', voltage_rating: '±200 V' } } } });
    expect(issues).toEqual([]);
    expect(section?.fields.map((f) => f.path)).toEqual([
      ['tank', 'bank.part.capacitance'],
      ['tank', 'bank.part.voltage_rating'],
    ]);
    expect(section?.fields[0]).toMatchObject({ mode: 'relative', spread: 0.05, createSection: false });
    expect(section?.fields[1].spread).toBeCloseTo(200, 12);
    // Mistakes name the nested path; a layout count is a whole number and takes no spread.
    expect(read({ tank: { bank: { part: { capacitence: '±5 %' } } } }).issues[0]).toEqual({
      path: ['tolerances', 'tank', 'bank', 'part', 'capacitence'],
      message: "unknown field 'capacitence' (did you mean 'capacitance'?)",
    });
    expect(read({ tank: { bank: { series: '±1' } } }).issues[0].message).toBe('a whole-number field takes no spread');
    expect(read({ tank: { bank: { part: '±5 %' } } }).issues[0]).toMatchObject({
      path: ['tolerances', 'tank', 'bank', 'part'],
    });
  });

  it('takes a spread of zero (no spread) and a plain number as an SI spread', () => {
    const { section } = read({ secondary: { turns: '±0 %', base_height: 0.005 } });
    expect(section?.fields.map((f) => [f.mode, f.spread])).toEqual([
      ['relative', 0],
      ['absolute', 0.005],
    ]);
  });

  it('refuses sigmas on a uniform law, a negative number, and a sigma count beyond 8', () => {
    expect(read({ secondary: { turns: { spread: '±1 %', sigmas: 2 } } }).issues[0].message).toMatch(
      /only a normal or truncated_normal distribution takes sigmas/,
    );
    expect(read({ secondary: { base_height: -0.01 } }).issues[0].message).toMatch(/expected a spread/);
    expect(
      read({ secondary: { turns: { spread: '±1 %', distribution: 'normal', sigmas: 9 } } }).issues[0].path,
    ).toEqual(['tolerances', 'secondary', 'turns', 'sigmas']);
    expect(read({ driver: { cycles: '±1 %' } }).issues[0].message).toMatch(/whole-number field takes no spread/);
    expect(read({ secondry: { turns: '±1 %' } }).issues[0].message).toMatch(/did you mean 'secondary'/);
    expect(read({ secondary: { turns: '±1 %' }, sweep_draws: 0 }).issues[0].path).toEqual([
      'tolerances',
      'sweep_draws',
    ]);
  });
});
