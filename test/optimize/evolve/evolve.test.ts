import { describe, expect, it } from 'vitest';
import {
  Draws,
  type EvolveState,
  evolve,
  hasBudget,
  initialState,
  levelMutation,
  polynomialMutation,
  sbx,
  stepGeneration,
  survivors,
} from '../../../optimize/evolve/index.ts';
import { hypervolume } from '../../../optimize/pareto/index.ts';
import {
  asProblem,
  type Benchmark,
  CONSTR,
  referenceNsga2,
  ZDT1,
  ZDT1_MIXED,
  ZDT2,
  ZDT3,
} from '../evolve-benchmarks.ts';

const POPULATION = 100;

const runs = new Map<string, Promise<EvolveState>>();
function run(benchmark: Benchmark, seed: number, evaluations: number): Promise<EvolveState> {
  const key = `${benchmark.name}/${seed}/${evaluations}`;
  if (!runs.has(key)) runs.set(key, evolve(asProblem(benchmark), { seed, evaluations, population: POPULATION }));
  return runs.get(key) as Promise<EvolveState>;
}
const frontHv = (state: EvolveState, benchmark: Benchmark) =>
  hypervolume(
    state.population.filter((m) => m.violation === 0).map((m) => m.objectives),
    benchmark.reference,
  );

describe('variation operators', () => {
  it('SBX keeps children within the bounds, equal parents give equal children, and is reproducible', () => {
    // Deb & Agrawal 1995 [deb1995sbx], bounded form: children never leave [lower, upper].
    for (let slot = 0; slot < 2000; slot++) {
      const draws = new Draws(7, 1, slot);
      const a = draws.next();
      const b = draws.next();
      const [c1, c2] = sbx(a, b, 0, 1, 15, draws);
      expect(c1).toBeGreaterThanOrEqual(0);
      expect(c2).toBeLessThanOrEqual(1);
      expect(c1).toBeLessThanOrEqual(1);
      expect(c2).toBeGreaterThanOrEqual(0);
    }
    expect(sbx(0.3, 0.3, 0, 1, 15, new Draws(1, 1, 1))).toEqual([0.3, 0.3]);
    expect(sbx(0.2, 0.7, 0, 1, 15, new Draws(3, 2, 5))).toEqual(sbx(0.2, 0.7, 0, 1, 15, new Draws(3, 2, 5)));
  });

  it('SBX far from the bounds preserves the parents mean and spreads more for a small index', () => {
    // Deb & Agrawal 1995 [deb1995sbx]: c1 + c2 = y1 + y2 when the bounds do not bite (spread factor
    // symmetric); the expected spread |c2 − c1| / |y2 − y1| shrinks as ηc grows.
    let spreadWide = 0;
    let spreadNarrow = 0;
    for (let slot = 0; slot < 4000; slot++) {
      const [a, b] = sbx(499.5, 500.5, 0, 1000, 2, new Draws(11, 0, slot));
      expect(a + b).toBeCloseTo(1000, 9);
      spreadWide += Math.abs(a - b) / 4000;
      const [c, d] = sbx(499.5, 500.5, 0, 1000, 20, new Draws(11, 0, slot));
      spreadNarrow += Math.abs(c - d) / 4000;
    }
    expect(spreadWide).toBeGreaterThan(spreadNarrow);
  });

  it('polynomial mutation stays within the bounds; level moves always change the level and stay in range', () => {
    // Deb & Goyal 1996 [deb1996pm], bounded form.
    for (let slot = 0; slot < 2000; slot++) {
      const draws = new Draws(5, 3, slot);
      const y = polynomialMutation(draws.next() * 10 - 5, -5, 5, 5, draws);
      expect(Math.abs(y)).toBeLessThanOrEqual(5);
      const level = draws.below(4);
      const moved = levelMutation(level, 4, 5, draws);
      expect(moved).not.toBe(level);
      expect(Number.isInteger(moved) && moved >= 0 && moved < 4).toBe(true);
    }
  });
});

describe('survival under constraint domination', () => {
  it('feasible first by front, infeasible by violation, the last front thinned keeping its extremes', () => {
    const m = (index: number, f: number[], violation = 0) => ({
      index,
      violation,
      genome: new Float64Array(1),
      objectives: Float64Array.from(f),
    });
    const pool = [
      m(0, [0, 1]),
      m(1, [0.1, 0.9]),
      m(2, [0.11, 0.89]),
      m(3, [0.5, 0.5]),
      m(4, [1, 0]),
      m(5, [2, 2]),
      m(6, [0, 0], 0.5),
      m(7, [0, 0], 0.1),
    ];
    // Front {0,1,2,3,4} thinned to 4. Exclusive hypervolume contributions (Beume et al. 2007
    // [beume2007sms]), by hand: member 1 adds (0.11 − 0.1)·(1 − 0.9) = 0.001, member 2 adds
    // (0.5 − 0.11)·(0.9 − 0.89) = 0.0039, member 3 adds 0.5·0.39 = 0.195; the extremes stay. So 1 goes.
    // Crowding (Deb et al. 2002 [deb2002]): 1 has 0.11 + 0.11 = 0.22, 2 has 0.4 + 0.4 = 0.8: 1 goes too.
    expect(survivors(pool, 4, 'auto').map((x) => x.index)).toEqual([0, 2, 3, 4]);
    expect(survivors(pool, 4, 'crowding').map((x) => x.index)).toEqual([0, 2, 3, 4]);
    // Six feasible, then the smaller violation (Deb 2000 [deb2000constraints]).
    expect(survivors(pool, 7, 'auto').map((x) => x.index)).toEqual([0, 1, 2, 3, 4, 5, 7]);
  });
});

describe('evolve on benchmarks with known fronts (population 100)', () => {
  // Pinned hypervolumes: the run is a pure function of (problem, seed, budget); a change to any operator
  // shows here. Each is also checked against the exact front's hypervolume (ZDT: Zitzler, Deb & Thiele
  // 2000 [zitzler2000zdt]; CONSTR: Deb 2001 [deb2001book]), which no run can exceed.
  const pinned: Array<[string, Benchmark, number, number]> = [
    ['ZDT1', ZDT1, 5000, 0.5570354328076615],
    ['ZDT2', ZDT2, 5000, 0.17881168449226598],
    ['ZDT3', ZDT3, 5000, 0.8974215827808274],
    ['CONSTR', CONSTR, 2000, 4.3252973627720035],
    ['ZDT1 mixed', ZDT1_MIXED, 5000, 0.5540019417468478],
  ];
  it.each(pinned)(
    '%s, seed 1: pinned hypervolume at its budget, below the exact front',
    async (_name, benchmark, budget, expected) => {
      const counted = asProblem(benchmark);
      const state = await evolve(counted, { seed: 1, evaluations: budget, population: POPULATION });
      expect(state).toEqual(await run(benchmark, 1, budget));
      expect(counted.count).toBe(budget);
      expect(state.used).toBe(budget);
      const hv = frontHv(state, benchmark);
      expect(hv).toBeLessThanOrEqual(benchmark.exactHypervolume + 1e-9);
      expect(hv).toBeCloseTo(expected, 12);
    },
  );

  it('CONSTR: every survivor is feasible, none beats the exact front, two thirds lie within 1 % of it', async () => {
    const state = await run(CONSTR, 1, 2000);
    let close = 0;
    for (const member of state.population) {
      expect(member.violation).toBe(0);
      const [f1, f2] = member.objectives;
      const exact = f1 <= 2 / 3 ? 7 / f1 - 9 : 1 / f1; // Deb 2001 [deb2001book]
      expect(f2).toBeGreaterThanOrEqual(exact - 1e-9);
      if (f2 < exact * 1.01) close++;
    }
    // The member of smallest f1 is non-dominated whatever its f2, so the steep end converges last.
    expect(close).toBeGreaterThanOrEqual((2 / 3) * state.population.length);
    expect(frontHv(state, CONSTR)).toBeGreaterThan(0.97 * CONSTR.exactHypervolume);
  });

  it('mixed fields: level genes stay integer levels and the run approaches the exact ZDT1 front', async () => {
    const state = await run(ZDT1_MIXED, 1, 5000);
    for (const member of state.population) {
      for (let i = 1; i <= 10; i++) {
        expect(Number.isInteger(member.genome[i])).toBe(true);
        expect(member.genome[i]).toBeGreaterThanOrEqual(0);
        expect(member.genome[i]).toBeLessThanOrEqual(10);
      }
    }
    expect(frontHv(state, ZDT1_MIXED)).toBeGreaterThan(0.75 * ZDT1_MIXED.exactHypervolume);
  });

  // The yardstick: referenceNsga2 (evolve-benchmarks.ts), a plain NSGA-II [deb2002] from random start.
  // On CONSTR both runs sit within 0.1 % of each other and of saturation at this budget, so the check
  // allows that much (our measurement: four seeds, 4.3603 against 4.3622); on ZDT1–3 no slack.
  it.each([
    ['ZDT1', ZDT1, 5000, 0, [1, 2]],
    ['ZDT2', ZDT2, 5000, 0, [1, 2]],
    ['ZDT3', ZDT3, 5000, 0, [1, 2]],
    ['CONSTR', CONSTR, 2000, 0.001, [1, 2, 3, 4]],
  ] as Array<[string, Benchmark, number, number, number[]]>)(
    '%s: at least the plain NSGA-II of the same budget (mean over seeds)',
    async (_name, benchmark, budget, slack, seeds) => {
      let ours = 0;
      let reference = 0;
      for (const seed of seeds) {
        ours += frontHv(await run(benchmark, seed, budget), benchmark) / seeds.length;
        reference +=
          hypervolume(referenceNsga2(benchmark, seed, budget, POPULATION), benchmark.reference) / seeds.length;
      }
      expect(ours).toBeGreaterThanOrEqual(reference * (1 - slack));
    },
  );
});

describe('a run is a pure function of (problem, seed, budget, seeds)', () => {
  it('resuming from a JSON round trip of the state after every generation gives the identical run', async () => {
    const options = { seed: 9, evaluations: 1200, population: 40 };
    const whole = await evolve(asProblem(ZDT3), options);
    const problem = asProblem(ZDT3);
    let state = await initialState(problem, options);
    const revive = (s: EvolveState): EvolveState => {
      const text = JSON.stringify({
        ...s,
        population: s.population.map((m) => ({ ...m, genome: [...m.genome], objectives: [...m.objectives] })),
      });
      const plain = JSON.parse(text);
      return {
        ...plain,
        population: plain.population.map((m: { genome: number[]; objectives: number[] }) => ({
          ...m,
          genome: Float64Array.from(m.genome),
          objectives: Float64Array.from(m.objectives),
        })),
      };
    };
    while (hasBudget(options, state)) state = await stepGeneration(problem, options, revive(state));
    expect(state).toEqual(whole);
    const other = await evolve(asProblem(ZDT3), { ...options, seed: 10 });
    expect(other).not.toEqual(whole);
  });

  it('starts from seeds: the first population is their best, and no seed evaluation is spent again', async () => {
    const seeded = await evolve(asProblem(ZDT1), { seed: 1, evaluations: 500, population: 50 });
    const problem = asProblem(ZDT1);
    const next = await evolve(problem, { seed: 2, evaluations: 1000, population: 50 }, seeded.population);
    expect(problem.count).toBe(1000);
    expect(frontHv(next, ZDT1)).toBeGreaterThanOrEqual(frontHv(seeded, ZDT1));
    expect(Math.min(...next.population.map((m) => m.index))).toBeGreaterThanOrEqual(0);
  });
});
