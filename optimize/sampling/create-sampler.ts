import type { SamplerOptions, UnitCubeSampler } from './unit-cube-sampler.ts';
import { SobolSampler } from './sobol-sampler.ts';
import { LatinHypercubeSampler } from './latin-hypercube-sampler.ts';
import { GridSampler } from './grid-sampler.ts';
import { RandomSampler } from './random-sampler.ts';

/**
 * The sampler of a sweep: `sobol` (scrambled unless `scramble: false`), `lhs` (N = `samples`), `grid`
 * (`levels` per dimension, which must list `dimensions` counts) or `random`.
 * @throws RangeError for options out of range (the runner validates the sweep file first).
 * @example
 * const sampler = createSampler({ method: 'sobol', dimensions: 4, seed: 1, samples: 1024 });
 * const point = new Float64Array(sampler.dimensions);
 * sampler.pointAt(17, point); // the same point for the same options on any worker
 */
export function createSampler(options: SamplerOptions): UnitCubeSampler {
  switch (options.method) {
    case 'sobol':
      return new SobolSampler(options.dimensions, options.seed, options.scramble ?? true);
    case 'lhs':
      return new LatinHypercubeSampler(options.dimensions, options.samples, options.seed);
    case 'grid': {
      const levels = options.levels;
      if (levels === undefined || levels.length !== options.dimensions) {
        throw new RangeError(
          `createSampler: a grid needs one level count per dimension (${options.dimensions}), got ${levels?.length ?? 'none'}`,
        );
      }
      return new GridSampler(levels);
    }
    case 'random':
      return new RandomSampler(options.dimensions, options.seed);
    default:
      throw new RangeError(`createSampler: method must be sobol, lhs, grid or random, got ${String(options.method)}`);
  }
}
