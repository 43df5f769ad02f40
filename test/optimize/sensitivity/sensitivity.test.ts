import { describe, expect, it } from 'vitest';
import { SaltelliDesign, sobolIndices } from '../../../optimize/sensitivity/index.ts';

/** Evaluates f on a Saltelli design with unit coordinates. */
function run(k: number, n: number, f: (u: Float64Array) => number) {
  const design = new SaltelliDesign(k, n, 7);
  const values = new Float64Array(design.size);
  const u = new Float64Array(k);
  for (let r = 0; r < design.size; r++) {
    design.pointAt(r, u);
    values[r] = f(u);
  }
  return sobolIndices(values, k, { resamples: 300, seed: 3 });
}

function expectWithin(estimate: { value: number; low: number; high: number }, exact: number, slack = 0) {
  expect(estimate.low - slack).toBeLessThanOrEqual(exact);
  expect(estimate.high + slack).toBeGreaterThanOrEqual(exact);
}

describe('Saltelli design', () => {
  it('AB(i) equals A except column i, which equals B', () => {
    const k = 3;
    const d = new SaltelliDesign(k, 8, 1);
    const a = new Float64Array(k);
    const b = new Float64Array(k);
    const ab = new Float64Array(k);
    d.pointAt(5, a);
    d.pointAt(8 + 5, b);
    d.pointAt((2 + 1) * 8 + 5, ab);
    expect([ab[0], ab[1], ab[2]]).toEqual([a[0], b[1], a[2]]);
    expect(a[1]).not.toBe(b[1]);
  });
});

describe('Sobol indices', () => {
  it('Ishigami a=7, b=0.1 at N = 4096', () => {
    // Ishigami & Homma 1990 [ishigami1990]; analytic values as published in Saltelli et al. 2008
    // [saltelli2008] (from memory): S1 0.3139, S2 0.4424, S3 0, ST1 0.5576, ST2 0.4424, ST3 0.2437.
    const r = run(3, 4096, (u) => {
      const x = u.map((v) => Math.PI * (2 * v - 1));
      return Math.sin(x[0]) + 7 * Math.sin(x[1]) ** 2 + 0.1 * x[2] ** 4 * Math.sin(x[0]);
    });
    const s1 = [0.3139, 0.4424, 0];
    const st = [0.5576, 0.4424, 0.2437];
    for (let i = 0; i < 3; i++) {
      expectWithin(r.first[i], s1[i]);
      expectWithin(r.total[i], st[i]);
    }
  });

  it("Sobol's G-function, exact indices from the closed form", () => {
    // G = Π (|4u − 2| + aᵢ)/(1 + aᵢ); Vᵢ = 1/(3(1+aᵢ)²), V = Π(1+Vᵢ) − 1, STᵢ = Vᵢ Π_{j≠i}(1+Vⱼ)/V
    // (Saltelli et al. 2008 [saltelli2008], §3.6; Sobol 1993 [sobol1993]).
    const a = [0, 1, 4.5, 9, 99];
    const vi = a.map((ai) => 1 / (3 * (1 + ai) ** 2));
    const prod = vi.reduce((p, v) => p * (1 + v), 1);
    const v = prod - 1;
    const r = run(a.length, 4096, (u) => a.reduce((p, ai, i) => (p * (Math.abs(4 * u[i] - 2) + ai)) / (1 + ai), 1));
    for (let i = 0; i < a.length; i++) {
      expectWithin(r.first[i], vi[i] / v);
      expectWithin(r.total[i], (vi[i] * prod) / (1 + vi[i]) / v);
    }
  });

  it('additive linear function: S = ST = cᵢ²/Σc² (exact, uniform inputs)', () => {
    const c = [1, 2, 3, 0.5];
    const sum = c.reduce((s, x) => s + x * x, 0);
    const r = run(c.length, 1024, (u) => c.reduce((s, ci, i) => s + ci * u[i], 0));
    for (let i = 0; i < c.length; i++) {
      expectWithin(r.first[i], (c[i] * c[i]) / sum);
      expectWithin(r.total[i], (c[i] * c[i]) / sum);
    }
  });

  it('gives the same indices when a large constant is added to the output (exact: indices are shift-free)', () => {
    // Sobol indices are ratios of variances, so f and f + c have the same ones (exact). An output whose
    // spread is a tiny fraction of its mean is what a narrow tolerance box gives; the estimators centre
    // the values, so the constant neither biases nor blurs them.
    const c = [1, 2, 3, 0.5];
    const sum = c.reduce((s, x) => s + x * x, 0);
    const f = (u: Float64Array) => c.reduce((s, ci, i) => s + ci * u[i], 0);
    const plain = run(c.length, 256, f);
    const shifted = run(c.length, 256, (u) => 1e4 + f(u));
    for (let i = 0; i < c.length; i++) {
      expect(shifted.first[i].value).toBeCloseTo(plain.first[i].value, 8);
      expect(shifted.total[i].value).toBeCloseTo(plain.total[i].value, 8);
      expectWithin(shifted.first[i], (c[i] * c[i]) / sum);
    }
  });

  it('is deterministic and rejects bad input', () => {
    const f = (u: Float64Array) => u[0] + u[1] * u[1];
    expect(run(2, 64, f)).toEqual(run(2, 64, f));
    expect(() => sobolIndices([1, 2, 3], 2)).toThrow(RangeError);
    expect(() => sobolIndices(new Float64Array(8).fill(1), 2)).toThrow(/zero variance/);
  });
});
