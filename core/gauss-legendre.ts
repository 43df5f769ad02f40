/**
 * Gauss–Legendre quadrature nodes and weights on [−1, 1]: the rule generator, and the fixed 2-, 4-
 * and 8-point rules of the field solve as plain arrays.
 */
import { must } from './must.ts';

/** Nodes and weights of an n-point rule, ascending nodes. */
export interface QuadratureRule {
  nodes: Float64Array;
  weights: Float64Array;
}

/**
 * The n-point Gauss–Legendre rule, exact for polynomials of degree ≤ 2n − 1.
 * Nodes are the roots of P_n, found by Newton's method from Tricomi's initial guess
 * cos(π (i − 1/4)/(n + 1/2)); weights w_i = 2 / ((1 − x_i²) P_n′(x_i)²).
 * @param n number of points, 1 ≤ n ≤ 200
 * Source: Abramowitz & Stegun (1964) §25.4.29 and Table 25.4; recurrence (A&S 22.7.10).
 */
export function gaussLegendreRule(n: number): QuadratureRule {
  if (!Number.isInteger(n) || n < 1 || n > 200)
    throw new RangeError(`gaussLegendreRule requires an integer n in 1..200, got ${n}`);
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < Math.ceil(n / 2); i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      // three-term recurrence (A&S 22.7.10): (k+1) P_{k+1} = (2k+1) x P_k − k P_{k−1}
      let previous = 1;
      let current = x;
      for (let k = 1; k < n; k++) {
        const next = ((2 * k + 1) * x * current - k * previous) / (k + 1);
        previous = current;
        current = next;
      }
      const value = n === 1 ? x : current;
      const lower = n === 1 ? 1 : previous;
      derivative = (n * (x * value - lower)) / (x * x - 1);
      const step = value / derivative;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    nodes[i] = -x;
    nodes[n - 1 - i] = x;
    const weight = 2 / ((1 - x * x) * derivative * derivative);
    weights[i] = weight;
    weights[n - 1 - i] = weight;
  }
  return { nodes, weights };
}

const [rule2, rule4, rule8] = [2, 4, 8].map((n) => gaussLegendreRule(n));

/** The 2-, 4- and 8-point rules (exact for polynomials of degree 3, 7, 15), as plain arrays. */
export const GAUSS2_NODES: readonly number[] = Array.from(must(rule2).nodes);
export const GAUSS2_WEIGHTS: readonly number[] = Array.from(must(rule2).weights);
export const GAUSS4_NODES: readonly number[] = Array.from(must(rule4).nodes);
export const GAUSS4_WEIGHTS: readonly number[] = Array.from(must(rule4).weights);
export const GAUSS8_NODES: readonly number[] = Array.from(must(rule8).nodes);
export const GAUSS8_WEIGHTS: readonly number[] = Array.from(must(rule8).weights);
