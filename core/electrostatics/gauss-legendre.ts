/**
 * Gauss–Legendre nodes and weights on [−1, 1] for 2, 4 and 8 points (A&S Table 25.4; exact for
 * polynomials of degree 2n − 1).
 */

/** 2-point rule: nodes ±1/√3, weights 1. */
export const GAUSS2_NODES: readonly number[] = [-0.5773502691896257, 0.5773502691896257];
export const GAUSS2_WEIGHTS: readonly number[] = [1, 1];

/** 4-point rule (A&S Table 25.4). */
export const GAUSS4_NODES: readonly number[] = [
  -0.8611363115940526, -0.3399810435848563, 0.3399810435848563, 0.8611363115940526,
];
export const GAUSS4_WEIGHTS: readonly number[] = [
  0.3478548451374538, 0.6521451548625461, 0.6521451548625461, 0.3478548451374538,
];

/** 8-point rule (A&S Table 25.4). */
export const GAUSS8_NODES: readonly number[] = [
  -0.9602898564975363, -0.7966664774136267, -0.525532409916329, -0.1834346424956498, 0.1834346424956498,
  0.525532409916329, 0.7966664774136267, 0.9602898564975363,
];
export const GAUSS8_WEIGHTS: readonly number[] = [
  0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.362683783378362, 0.362683783378362,
  0.3137066458778873, 0.2223810344533745, 0.1012285362903763,
];
