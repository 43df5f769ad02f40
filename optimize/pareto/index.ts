// The Pareto machinery of optimize/: dominance, constraint handling, ranking, the candidate pool, hypervolume.

// Dominance and constraints
export { dominates } from './dominates.ts';
export { totalViolation, VIOLATION_SCALE_FLOOR } from './constraint-violation.ts';
export type { MetricBounds } from './constraint-violation.ts';
export type { Scored } from './scored.ts';
export { constrainedBetter } from './constrained-better.ts';

// Ranking
export { nondominatedSort } from './nondominated-sort.ts';
export { crowdingDistance } from './crowding-distance.ts';
export { rankCandidates } from './rank-candidates.ts';
export type { CandidateRanking } from './rank-candidates.ts';

// Streaming stores
export { BoundedBest } from './bounded-best.ts';
export { CandidatePool } from './candidate-pool.ts';
export type { PoolEntry, RankedEntry, PoolRecord, CandidatePoolData, JsonNumber } from './candidate-pool.ts';

// Hypervolume
export { hypervolume, defaultReferencePoint } from './hypervolume.ts';
