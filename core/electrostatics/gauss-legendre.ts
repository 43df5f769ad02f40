/**
 * The Gauss–Legendre rules the field solve uses (2, 4 and 8 points on [−1, 1]; exact for polynomials
 * of degree 2n − 1), as plain arrays, from the one rule generator of the core (core/gauss-legendre.ts,
 * A&S §25.4.29 and Table 25.4).
 */
import { gaussLegendreRule } from '../gauss-legendre.ts';
import { must } from '../must.ts';

const [rule2, rule4, rule8] = [2, 4, 8].map((n) => gaussLegendreRule(n));

export const GAUSS2_NODES: readonly number[] = Array.from(must(rule2).nodes);
export const GAUSS2_WEIGHTS: readonly number[] = Array.from(must(rule2).weights);
export const GAUSS4_NODES: readonly number[] = Array.from(must(rule4).nodes);
export const GAUSS4_WEIGHTS: readonly number[] = Array.from(must(rule4).weights);
export const GAUSS8_NODES: readonly number[] = Array.from(must(rule8).nodes);
export const GAUSS8_WEIGHTS: readonly number[] = Array.from(must(rule8).weights);
