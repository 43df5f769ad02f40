/**
 * Greedy exclusive-hypervolume thinning for three or more objectives (Beume, Naujoks & Emmerich 2007
 * [beume2007sms]): a case worked by hand, and the incremental computation against the definition
 * contribution(p) = HV(S) − HV(S \ {p}) evaluated directly, removal by removal, on random fronts.
 */
import { describe, expect, it } from 'vitest';
import { thinByContributionMany } from '../../../optimize/evolve/contribution-thinning.ts';
import { Draws, survivors } from '../../../optimize/evolve/index.ts';
import { hypervolume, type Scored } from '../../../optimize/pareto/index.ts';

const member = (index: number, objectives: number[]): Scored & { genome: Float64Array } => ({
  index,
  violation: 0,
  objectives: Float64Array.from(objectives),
  genome: new Float64Array(0),
});

describe('three objectives, worked by hand', () => {
  // Extremes a, b, c span [0, 1] in each objective, so the normalisation changes nothing; reference
  // 1.1 in each. d = (0.5, 0.5, 0.5): its box 0.6³ = 0.216; covered by e's shadow (0.5, 0.55, 0.5),
  // 0.6·0.55·0.6 = 0.198, and the part of b's shadow (1, 0.5, 1) below y = 0.55, 0.1·0.05·0.1 =
  // 0.0005 (a's and c's shadows lie inside e's): contribution 0.0175. e = (0.45, 0.55, 0.5): its box
  // 0.65·0.55·0.6 = 0.2145, covered 0.198 + 0.0005 (a's shadow beyond x < 0.5): contribution 0.016.
  const front = [
    member(0, [0, 1, 1]),
    member(1, [1, 0, 1]),
    member(2, [1, 1, 0]),
    member(3, [0.5, 0.5, 0.5]),
    member(4, [0.45, 0.55, 0.5]),
  ];
  it('removes e (0.016) before d (0.0175), and keeps the extremes to the last', () => {
    expect(thinByContributionMany(front, 4).map((m) => m.index)).toEqual([0, 1, 2, 3]);
    expect(thinByContributionMany(front, 3).map((m) => m.index)).toEqual([0, 1, 2]);
  });
  it("is what survival selection uses with diversity 'contribution' on three objectives", () => {
    expect(survivors(front, 4, 'contribution').map((m) => m.index)).toEqual([0, 1, 2, 3]);
  });
});

/** Greedy removal straight from the definition, in the same normalisation and reference. */
function bruteForce(members: Scored[], keep: number): number[] {
  const d = members[0].objectives.length;
  const low = Array.from({ length: d }, (_, j) => Math.min(...members.map((m) => m.objectives[j])));
  const high = Array.from({ length: d }, (_, j) => Math.max(...members.map((m) => m.objectives[j])));
  const points = members.map((m) => Array.from(m.objectives, (v, j) => (v - low[j]) / (high[j] - low[j])));
  const reference = new Array(d).fill(1.1);
  const extremes = new Set(
    Array.from({ length: d }, (_, j) => points.reduce((best, p, i) => (p[j] < points[best][j] ? i : best), 0)),
  );
  const alive = members.map((_, i) => i);
  while (alive.length > keep) {
    const total = hypervolume(
      alive.map((i) => points[i]),
      reference,
    );
    let worst = -1;
    let worstValue = Infinity;
    for (const p of alive) {
      if (extremes.has(p)) continue;
      const without = hypervolume(
        alive.filter((i) => i !== p).map((i) => points[i]),
        reference,
      );
      const value = total - without;
      if (value < worstValue || (value === worstValue && p > worst)) [worst, worstValue] = [p, value];
    }
    alive.splice(alive.indexOf(worst), 1);
  }
  return alive;
}

/** `count` mutually non-dominated points on the positive unit sphere in `d` objectives. */
function sphereFront(d: number, count: number, seed: number): Scored[] {
  const draws = new Draws(seed, 0, 0);
  return Array.from({ length: count }, (_, index) => {
    const direction = Array.from({ length: d }, () => 0.05 + draws.next());
    const norm = Math.hypot(...direction);
    return member(
      index,
      direction.map((v) => v / norm),
    );
  });
}

describe('the incremental thinning equals greedy removal by the definition', () => {
  it.each([
    [3, 40, 12, 1],
    [3, 60, 25, 2],
    [4, 30, 10, 3],
    [4, 40, 18, 4],
  ])('%i objectives, %i members thinned to %i (seed %i)', (d, count, keep, seed) => {
    const front = sphereFront(d, count, seed);
    expect(thinByContributionMany(front, keep).map((m) => m.index)).toEqual(bruteForce(front, keep));
  });
});
