import type { UnitCubeSampler } from './unit-cube-sampler.ts';
import { assertIndex } from './unit-cube-sampler.ts';

/**
 * The full factorial grid over `levels[d]` levels per dimension, mixed radix with dimension 0 varying
 * fastest. Endpoints are included, as a builder expects of "from 600 to 1600 in 5 levels": level j of L
 * sits at j/(L − 1), so the coordinates reach both 0 and 1; a dimension with one level sits at 0.5 (the
 * middle of its range).
 * @example new GridSampler([3, 2]) has size 6; point 4 is [1/2, 1] (levels j = 1 and 1).
 */
export class GridSampler implements UnitCubeSampler {
  readonly dimensions: number;
  readonly size: number;
  private readonly levels: Int32Array;

  constructor(levels: readonly number[]) {
    if (levels.length < 1) throw new RangeError('GridSampler: levels must list at least one dimension, got none');
    let size = 1;
    for (const count of levels) {
      if (!Number.isInteger(count) || count < 1) {
        throw new RangeError(`GridSampler: every level count must be an integer of at least 1, got ${count}`);
      }
      size *= count;
    }
    if (size > Number.MAX_SAFE_INTEGER) {
      throw new RangeError(`GridSampler: the grid must have at most 2^53 − 1 points, got ${size}`);
    }
    this.dimensions = levels.length;
    this.size = size;
    this.levels = Int32Array.from(levels);
  }

  pointAt(index: number, out: Float64Array): void {
    assertIndex(index, this.size, 'GridSampler.pointAt');
    let rest = index;
    for (let d = 0; d < this.dimensions; d++) {
      const count = this.levels[d];
      const level = rest % count;
      rest = (rest - level) / count;
      out[d] = count === 1 ? 0.5 : level / (count - 1);
    }
  }
}
