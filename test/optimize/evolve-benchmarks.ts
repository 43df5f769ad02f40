/**
 * Benchmark problems with exactly known Pareto fronts, and a plain NSGA-II written independently of
 * optimize/ as the yardstick the evolutionary stage must at least match.
 *
 * ZDT1–ZDT3: Zitzler, Deb & Thiele 2000 [zitzler2000zdt], n = 30 real variables in [0, 1].
 * CONSTR: Deb 2001 [deb2001book], two variables, two constraints; its front is known in closed form.
 */
import type { EvolveField, EvolveProblem, Outcome } from '../../optimize/evolve/index.ts';

export interface Benchmark {
  name: string;
  fields: EvolveField[];
  /** Objectives and total violation of real values (level fields already mapped to their values). */
  score(x: Float64Array): Outcome;
  /** The reference point of the pinned hypervolumes. */
  reference: [number, number];
  /** Hypervolume of the exact front with respect to `reference`. */
  exactHypervolume: number;
}

const zdtFields = (n: number): EvolveField[] => Array.from({ length: n }, () => ({ kind: 'real', lower: 0, upper: 1 }));

function zdtG(x: Float64Array): number {
  let sum = 0;
  for (let i = 1; i < x.length; i++) sum += x[i];
  return 1 + (9 * sum) / (x.length - 1);
}

/** ZDT1 (eq. for f2 = g·(1 − √(f1/g))): front f2 = 1 − √f1, f1 ∈ [0, 1]; HV to (1, 1) = ∫√f1 = 2/3. */
export const ZDT1: Benchmark = {
  name: 'ZDT1',
  fields: zdtFields(30),
  score: (x) => {
    const g = zdtG(x);
    return { objectives: Float64Array.of(x[0], g * (1 - Math.sqrt(x[0] / g))), violation: 0 };
  },
  reference: [1, 1],
  exactHypervolume: 2 / 3,
};

/** ZDT2 (f2 = g·(1 − (f1/g)²)): front f2 = 1 − f1², non-convex; HV to (1, 1) = ∫f1² = 1/3. */
export const ZDT2: Benchmark = {
  name: 'ZDT2',
  fields: zdtFields(30),
  score: (x) => {
    const g = zdtG(x);
    return { objectives: Float64Array.of(x[0], g * (1 - (x[0] / g) ** 2)), violation: 0 };
  },
  reference: [1, 1],
  exactHypervolume: 1 / 3,
};

/**
 * ZDT3 (f2 = g·(1 − √(f1/g) − (f1/g)·sin 10πf1)): a disconnected front, the non-dominated parts of
 * f2 = 1 − √f1 − f1·sin 10πf1. Its hypervolume to (1, 1) is computed here from that closed form: the
 * area under the curve's running minimum, integrated by the midpoint rule on 10^6 cells (error < 1e-6).
 */
function zdt3ExactHypervolume(): number {
  const cells = 1_000_000;
  let area = 0;
  let runningMin = Infinity;
  // Sweep f1 upward; the dominated region's lower edge at f1 is the minimum of f2 over [0, f1].
  for (let k = 0; k < cells; k++) {
    const f1 = (k + 0.5) / cells;
    const f2 = 1 - Math.sqrt(f1) - f1 * Math.sin(10 * Math.PI * f1);
    runningMin = Math.min(runningMin, f2);
    area += (1 - runningMin) / cells;
  }
  return area;
}

export const ZDT3: Benchmark = {
  name: 'ZDT3',
  fields: zdtFields(30),
  score: (x) => {
    const g = zdtG(x);
    const r = x[0] / g;
    return {
      objectives: Float64Array.of(x[0], g * (1 - Math.sqrt(r) - r * Math.sin(10 * Math.PI * x[0]))),
      violation: 0,
    };
  },
  reference: [1, 1],
  exactHypervolume: zdt3ExactHypervolume(),
};

/**
 * CONSTR (Deb 2001 [deb2001book]): minimise f1 = x1 and f2 = (1 + x2)/x1, x1 ∈ [0.1, 1], x2 ∈ [0, 5],
 * subject to x2 + 9x1 ≥ 6 and −x2 + 9x1 ≥ 1. Front: x2 = 6 − 9x1 for x1 ∈ [7/18, 2/3] (f2 = 7/f1 − 9),
 * x2 = 0 for x1 ∈ [2/3, 1] (f2 = 1/f1). HV to (1, 10), integrated in closed form:
 * ∫_{7/18}^{2/3} (19 − 7/f1) df1 + ∫_{2/3}^{1} (10 − 1/f1) df1 = 95/18 − 7 ln(12/7) + 10/3 − ln(3/2).
 */
export const CONSTR: Benchmark = {
  name: 'CONSTR',
  fields: [
    { kind: 'real', lower: 0.1, upper: 1 },
    { kind: 'real', lower: 0, upper: 5 },
  ],
  score: (x) => {
    const g1 = (x[1] + 9 * x[0]) / 6 - 1;
    const g2 = -x[1] + 9 * x[0] - 1;
    return {
      objectives: Float64Array.of(x[0], (1 + x[1]) / x[0]),
      violation: Math.max(0, -g1) + Math.max(0, -g2),
    };
  },
  reference: [1, 10],
  exactHypervolume: 95 / 18 - 7 * Math.log(12 / 7) + 10 / 3 - Math.log(1.5),
};

/**
 * ZDT1 with mixed fields: x2 … x11 on 11 levels {0, 0.1, …, 1} (a discrete set), the rest real. Level 0
 * is a level, so the exact front (and HV 2/3) is unchanged.
 */
export const ZDT1_MIXED: Benchmark = {
  name: 'ZDT1 mixed',
  fields: zdtFields(30).map((f, i) => (i >= 1 && i <= 10 ? { kind: 'levels', count: 11 } : f)),
  score: (x) => ZDT1.score(x),
  reference: [1, 1],
  exactHypervolume: 2 / 3,
};

/** The problem as the stage sees it: level indices mapped to values, evaluations counted. */
export function asProblem(benchmark: Benchmark): EvolveProblem & { count: number } {
  const problem = {
    fields: benchmark.fields,
    count: 0,
    evaluate: async (genomes: readonly Float64Array[]) => {
      problem.count += genomes.length;
      return genomes.map((genome) => {
        const x = Float64Array.from(genome);
        benchmark.fields.forEach((field, i) => {
          if (field.kind === 'levels') x[i] = genome[i] / (field.count - 1);
        });
        return benchmark.score(x);
      });
    },
  };
  return problem;
}

/** Mulberry32 (T. Ettinger, public domain): the reference's own generator, unrelated to optimize/random.ts. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface Member {
  x: Float64Array;
  f: Float64Array;
  cv: number;
  rank: number;
  crowd: number;
}

/** Deb's constrained domination, written out again for the reference. */
function constrainedDominates(a: Member, b: Member): boolean {
  if (a.cv === 0 && b.cv > 0) return true;
  if (a.cv > 0 && b.cv === 0) return false;
  if (a.cv > 0 && b.cv > 0) return a.cv < b.cv;
  let better = false;
  for (let m = 0; m < a.f.length; m++) {
    if (a.f[m] > b.f[m]) return false;
    if (a.f[m] < b.f[m]) better = true;
  }
  return better;
}

/**
 * Plain NSGA-II as published (Deb, Pratap, Agarwal & Meyarivan 2002 [deb2002]): random start, binary
 * crowded tournament, SBX (ηc = 15, pc = 0.9, each variable with probability 0.5), polynomial mutation
 * (ηm = 20, pm = 1/n), fast non-dominated sort with domination counts, one-shot crowding truncation.
 * Real variables only (level fields are treated as reals and rounded). Returns the final population's
 * objective vectors of feasible members.
 */
export function referenceNsga2(benchmark: Benchmark, seed: number, evaluations: number, size: number): Float64Array[] {
  const random = mulberry32(seed);
  const n = benchmark.fields.length;
  const bounds = benchmark.fields.map((f) => (f.kind === 'real' ? [f.lower, f.upper] : [0, f.count - 1]));
  const evaluate = (x: Float64Array): Member => {
    const v = Float64Array.from(x);
    benchmark.fields.forEach((field, i) => {
      if (field.kind === 'levels') v[i] = Math.round(x[i]) / (field.count - 1);
    });
    const { objectives, violation } = benchmark.score(v);
    return { x, f: objectives, cv: violation, rank: 0, crowd: 0 };
  };
  const sortAndCrowd = (all: Member[]): Member[][] => {
    const dominatedBy: number[][] = all.map(() => []);
    const count = new Array<number>(all.length).fill(0);
    const fronts: Member[][] = [];
    let current: number[] = [];
    for (let p = 0; p < all.length; p++) {
      for (let q = 0; q < all.length; q++) {
        if (p === q) continue;
        if (constrainedDominates(all[p], all[q])) dominatedBy[p].push(q);
        else if (constrainedDominates(all[q], all[p])) count[p]++;
      }
      if (count[p] === 0) current.push(p);
    }
    let rank = 0;
    while (current.length > 0) {
      const next: number[] = [];
      for (const p of current) {
        all[p].rank = rank;
        for (const q of dominatedBy[p]) if (--count[q] === 0) next.push(q);
      }
      const front = current.map((p) => all[p]);
      for (const member of front) member.crowd = 0;
      for (let m = 0; m < front[0].f.length; m++) {
        front.sort((a, b) => a.f[m] - b.f[m]);
        const range = front[front.length - 1].f[m] - front[0].f[m];
        front[0].crowd = Infinity;
        front[front.length - 1].crowd = Infinity;
        if (range > 0)
          for (let i = 1; i < front.length - 1; i++) front[i].crowd += (front[i + 1].f[m] - front[i - 1].f[m]) / range;
      }
      fronts.push(front);
      current = next;
      rank++;
    }
    return fronts;
  };
  const pick = (pop: Member[]): Member => {
    const a = pop[Math.floor(random() * pop.length)];
    const b = pop[Math.floor(random() * pop.length)];
    if (a.rank !== b.rank) return a.rank < b.rank ? a : b;
    return b.crowd > a.crowd ? b : a;
  };
  const sbxPair = (a: number, b: number, lo: number, hi: number): [number, number] => {
    if (Math.abs(a - b) <= 1e-14) return [a, b];
    const y1 = Math.min(a, b);
    const y2 = Math.max(a, b);
    const u = random();
    const eta = 15;
    const betaq = (beta: number) => {
      const alpha = 2 - beta ** -(eta + 1);
      return u <= 1 / alpha ? (u * alpha) ** (1 / (eta + 1)) : (1 / (2 - u * alpha)) ** (1 / (eta + 1));
    };
    let c1 = 0.5 * (y1 + y2 - betaq(1 + (2 * (y1 - lo)) / (y2 - y1)) * (y2 - y1));
    let c2 = 0.5 * (y1 + y2 + betaq(1 + (2 * (hi - y2)) / (y2 - y1)) * (y2 - y1));
    c1 = Math.min(hi, Math.max(lo, c1));
    c2 = Math.min(hi, Math.max(lo, c2));
    return random() < 0.5 ? [c2, c1] : [c1, c2];
  };
  const mutate = (x: Float64Array) => {
    for (let i = 0; i < n; i++) {
      if (random() >= 1 / n) continue;
      const [lo, hi] = bounds[i];
      const d1 = (x[i] - lo) / (hi - lo);
      const d2 = (hi - x[i]) / (hi - lo);
      const u = random();
      const eta = 20;
      const dq =
        u <= 0.5
          ? (2 * u + (1 - 2 * u) * (1 - d1) ** (eta + 1)) ** (1 / (eta + 1)) - 1
          : 1 - (2 * (1 - u) + 2 * (u - 0.5) * (1 - d2) ** (eta + 1)) ** (1 / (eta + 1));
      x[i] = Math.min(hi, Math.max(lo, x[i] + dq * (hi - lo)));
    }
  };
  let pop: Member[] = [];
  for (let k = 0; k < size; k++) pop.push(evaluate(Float64Array.from(bounds, ([lo, hi]) => lo + random() * (hi - lo))));
  let used = size;
  sortAndCrowd(pop);
  while (used < evaluations) {
    const children: Member[] = [];
    const want = Math.min(size, evaluations - used);
    while (children.length < want) {
      const a = pick(pop).x;
      const b = pick(pop).x;
      const c1 = Float64Array.from(a);
      const c2 = Float64Array.from(b);
      if (random() < 0.9)
        for (let i = 0; i < n; i++)
          if (random() < 0.5) [c1[i], c2[i]] = sbxPair(a[i], b[i], bounds[i][0], bounds[i][1]);
      mutate(c1);
      mutate(c2);
      children.push(evaluate(c1));
      if (children.length < want) children.push(evaluate(c2));
    }
    used += children.length;
    const fronts = sortAndCrowd(pop.concat(children));
    const next: Member[] = [];
    for (const front of fronts) {
      if (next.length + front.length <= size) next.push(...front);
      else {
        next.push(
          ...front
            .slice()
            .sort((p, q) => q.crowd - p.crowd)
            .slice(0, size - next.length),
        );
        break;
      }
    }
    pop = next;
    sortAndCrowd(pop);
  }
  return pop.filter((m) => m.cv === 0).map((m) => m.f);
}
