/**
 * The types that describe a design space, kept together because they refer to each other: a space may
 * carry a robust merit (a few tolerance draws per design), whose tolerance space holds a space of its
 * own. Types only, so the modules that build and evaluate spaces (design-space.ts, tolerance/) import
 * them without importing each other.
 */
import type { Dimension, NormalTree } from './design-tree.ts';
import type { MetricBounds } from './pareto/constraint-violation.ts';
import type { ToleranceField } from './tolerance/tolerance-draws.ts';

export interface SpaceDefinition {
  tree: NormalTree;
  dimensions: Dimension[];
  method: 'sobol' | 'lhs' | 'grid' | 'random';
  samples: number;
  seed: number;
  gridLevels: number[] | null;
  /** A robust merit: each design's build_yield over a few tolerance draws (optimize/tolerance/robust-yield.ts). */
  robust?: RobustDefinition;
}

/** A bound on a metric, as the tolerance study and the robust merits count it. */
export interface ToleranceConstraint extends MetricBounds {
  metric: string;
}

/** Quantile merit k: the p quantile of `metric` over the draws, written into QUANTILE_SLOTS[k]. */
export interface RobustQuantile {
  metric: string;
  /** 0 < p < 1. */
  p: number;
}

export interface RobustDefinition {
  tolerance: ToleranceSpace;
  draws: number;
  seed: number;
  /** The sweep's constraints (the robust merits' own left out). */
  constraints: ToleranceConstraint[];
  /** Metrics a build must have (the sweep's objectives, the robust merits left out). */
  required: string[];
  /** The quantile merits, in slot order (none: build_yield alone). */
  quantiles?: RobustQuantile[];
}

/** Where a field's nominal comes from, per candidate. */
export type NominalSource =
  | { kind: 'fixed'; value: number }
  | { kind: 'range'; dimension: number }
  | { kind: 'choice'; dimension: number; values: Array<number | null> }
  | { kind: 'none' };

export interface ToleranceSpace {
  /** The space the pool evaluates: base dimensions, then one per field. */
  definition: SpaceDefinition;
  /** Number of the sweep's own dimensions (the first values of a row). */
  baseDimensions: number;
  fields: ToleranceField[];
  nominals: NominalSource[];
}
