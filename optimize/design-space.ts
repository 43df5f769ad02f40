/**
 * A design space: the tree of a sweep with its dimensions, and the map from a sample index to one
 * design. Index-addressable and seeded: design i is a pure function of the space, the sampling method,
 * the seed and i, so a worker, a resumed run or a cluster shard regenerates exactly the same designs.
 */
import type { Design } from '../core/design.ts';
import { buildDesign, type FieldIssue } from './build-design.ts';
import { fillSlots, type Dimension, type NormalTree } from './design-tree.ts';
import { createSampler } from './sampling/create-sampler.ts';
import type { UnitCubeSampler } from './sampling/unit-cube-sampler.ts';
import { mapUnitToChoice, mapUnitToRange } from './sampling/unit-interval-mapping.ts';
import type { SpaceDefinition } from './space-definition.ts';

export type { SpaceDefinition };

/** What a worker needs to regenerate designs: plain data (structured-clone and JSON safe). */
/** The space definition alone (what a worker needs), picked out of a larger object such as a sweep file's. */
export function spaceDefinitionOf(spec: SpaceDefinition): SpaceDefinition {
  return {
    tree: spec.tree,
    dimensions: spec.dimensions,
    method: spec.method,
    samples: spec.samples,
    seed: spec.seed,
    gridLevels: spec.gridLevels,
    ...(spec.robust ? { robust: spec.robust } : {}),
  };
}

/** The value of one dimension at unit coordinate u: a number for ranges, a choice position for sets. */
export function dimensionValue(dimension: Dimension, u: number): number {
  if (dimension.kind === 'choose') return mapUnitToChoice(u, dimension.values.length);
  if (dimension.step !== null) {
    const levels = Math.floor((dimension.to - dimension.from) / dimension.step + 1e-9) + 1;
    return dimension.from + dimension.step * mapUnitToChoice(u, levels);
  }
  return mapUnitToRange(u, {
    from: dimension.from,
    to: dimension.to,
    scale: dimension.scale,
    integer: dimension.integer,
  });
}

/** One sampled design: its dimension values and the design, or the reason it cannot be built. */
export interface SampledDesign {
  index: number;
  values: Float64Array;
  tree: NormalTree;
  design: Design | null;
  issue: FieldIssue | null;
}

export class DesignSpace {
  readonly sampler: UnitCubeSampler;
  private readonly unit: Float64Array;

  constructor(readonly definition: SpaceDefinition) {
    const options = {
      method: definition.method,
      dimensions: definition.dimensions.length,
      seed: definition.seed,
      samples: definition.samples,
      ...(definition.gridLevels ? { levels: definition.gridLevels } : {}),
    };
    this.sampler = createSampler(options);
    this.unit = new Float64Array(definition.dimensions.length);
  }

  get dimensionCount(): number {
    return this.definition.dimensions.length;
  }

  /** Dimension values of sample i, written into `out`. */
  valuesAt(index: number, out: Float64Array): void {
    this.sampler.pointAt(index, this.unit);
    for (let d = 0; d < this.definition.dimensions.length; d++)
      out[d] = dimensionValue(this.definition.dimensions[d], this.unit[d]);
  }

  /** The design of given dimension values (also used by refinement, off the sample grid). */
  designOf(values: ArrayLike<number>, index = -1): SampledDesign {
    const tree = fillSlots(this.definition.tree, this.definition.dimensions, values);
    const built = buildDesign(tree);
    return { index, values: Float64Array.from(values), tree, design: built.design, issue: built.issues[0] ?? null };
  }

  /** Sample i as a design. */
  designAt(index: number): SampledDesign {
    const values = new Float64Array(this.definition.dimensions.length);
    this.valuesAt(index, values);
    return this.designOf(values, index);
  }
}
