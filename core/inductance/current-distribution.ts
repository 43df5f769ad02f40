/**
 * How current is spread over a round wire's cross-section, which decides the wire's internal
 * inductance: 'uniform' is the low-frequency (DC) case, 'surface' the high-frequency limit where
 * the skin depth is much smaller than the wire radius (no internal flux).
 */
export type CurrentDistribution = 'uniform' | 'surface';
