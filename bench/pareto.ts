import { CandidatePool } from '../optimize/pareto/candidate-pool.ts';
import { hypervolume, defaultReferencePoint } from '../optimize/pareto/hypervolume.ts';
import { IndexSample } from '../optimize/sampling/index-sample.ts';
import { createSampler } from '../optimize/sampling/create-sampler.ts';
import { uniformAt } from '../optimize/random.ts';

/** Objective data for the benchmark: independent uniform, or correlated (a common factor plus noise). */
type DataKind = 'independent' | 'correlated' | 'anticorrelated';

function fillObjectives(kind: DataKind, index: number, out: Float64Array): void {
  const m = out.length;
  if (kind === 'independent') {
    for (let j = 0; j < m; j++) out[j] = uniformAt(1, index, j);
    return;
  }
  const common = uniformAt(1, index, 100);
  for (let j = 0; j < m; j++) {
    const noise = 0.1 * uniformAt(1, index, j);
    // anticorrelated: objectives trade off along a simplex-like front (the hard case for a Pareto store).
    out[j] = kind === 'correlated' ? common + noise : (j % 2 === 0 ? common : 1 - common) + noise;
  }
}

function megabytes(bytes: number): string {
  return `${(bytes / 1048576).toFixed(0)} MB`;
}

/**
 * Benchmarks of the Pareto machinery: CandidatePool.offer throughput and kept-set sizes at 10^6 offers with
 * K = 1000 for 2 to 4 objectives and three kinds of data, the final ranking, hypervolume, the index
 * sample, and sampler speed. Returns printable lines.
 */
export async function benchPareto(options: { offers?: number; keep?: number } = {}): Promise<string[]> {
  const offers = options.offers ?? 1_000_000;
  const keep = options.keep ?? 1000;
  const lines: string[] = [`pareto: ${offers} offers per case, keep ${keep}`];
  for (const objectiveCount of [1, 2, 3, 4]) {
    for (const kind of ['independent', 'correlated', 'anticorrelated'] as DataKind[]) {
      if (objectiveCount === 1 && kind !== 'independent') continue;
      const pool = new CandidatePool<Float64Array>(keep, objectiveCount);
      const objectives = new Float64Array(objectiveCount);
      const item = { index: 0, violation: 0, objectives };
      const rssBefore = process.memoryUsage().rss;
      const started = performance.now();
      for (let i = 0; i < offers; i++) {
        fillObjectives(kind, i, objectives);
        item.index = i;
        item.violation = i % 10 === 9 ? uniformAt(2, i, 0) : 0; // 10 % infeasible
        pool.offer(item, new Float64Array(30)); // a metrics row per candidate, as the runner will pass
      }
      const offerSeconds = (performance.now() - started) / 1000;
      const rankStarted = performance.now();
      const ranked = pool.ranked();
      const front = pool.front();
      const rankSeconds = (performance.now() - rankStarted) / 1000;
      let hvText = '';
      if (objectiveCount >= 2) {
        const points = front.map((e) => e.item.objectives);
        const hvStarted = performance.now();
        const value = hypervolume(points, defaultReferencePoint(points));
        hvText = `, hypervolume of front ${value.toPrecision(6)} in ${((performance.now() - hvStarted) / 1000).toFixed(2)} s`;
      }
      lines.push(
        `  ${objectiveCount} objective(s), ${kind}: ${Math.round(offers / offerSeconds).toLocaleString('en-US')} offers/s ` +
          `(${offerSeconds.toFixed(2)} s), kept ${pool.feasibleSize} feasible + ${pool.size - pool.feasibleSize} infeasible, ` +
          `front ${front.length}, ranked ${ranked.length} in ${rankSeconds.toFixed(2)} s${hvText}, ` +
          `RSS +${megabytes(Math.max(0, process.memoryUsage().rss - rssBefore))}`,
      );
      await new Promise((resolve) => setImmediate(resolve));
    }
  }
  {
    const sample = new IndexSample<Float64Array>(10_000, 3);
    const row = new Float64Array(30);
    const started = performance.now();
    for (let i = 0; i < offers; i++) sample.offer(i, row);
    const seconds = (performance.now() - started) / 1000;
    lines.push(
      `  IndexSample(10 000): ${Math.round(offers / seconds).toLocaleString('en-US')} offers/s, kept ${sample.size}`,
    );
  }
  for (const method of ['sobol', 'lhs', 'random'] as const) {
    const sampler = createSampler({ method, dimensions: 20, seed: 5, samples: offers });
    const out = new Float64Array(20);
    const started = performance.now();
    for (let i = 0; i < offers; i++) sampler.pointAt(i, out);
    const seconds = (performance.now() - started) / 1000;
    lines.push(`  ${method} sampler, 20 dimensions: ${Math.round(offers / seconds).toLocaleString('en-US')} points/s`);
  }
  lines.push(`  peak RSS of the process: ${megabytes(process.resourceUsage().maxRSS * 1024)}`);
  return lines;
}
