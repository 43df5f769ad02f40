/**
 * `coilfront check SPEC`: validates a sweep file and says what it will do: the varied dimensions,
 * the size of the discrete part of the space, and a run-time estimate measured on this machine.
 */
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';
import { fieldDisplay, formatNumber } from './display-units.ts';
import type { CliIo } from './io.ts';
import { formatDuration } from './duration.ts';
import { defaultWorkerCount } from '../workers/pool.ts';
import { measureBatchSize } from '../run/sweep-setup.ts';
import { discreteLevels, loadSweepFile } from './sweep-spec.ts';
import { SAFETY_LINE } from './safety.ts';
import { describeStage } from './sweep-stages.ts';
import type { QuantityKind } from './units.ts';

export function checkCommand(file: string, options: { workers?: number; force?: boolean }, io: CliIo): number {
  const spec = loadSweepFile(file, { force: options.force ?? false });
  const lines: string[] = [
    `${file}: valid sweep file (spec hash ${spec.hash.slice(0, 12)})`,
    `dimensions (${spec.dimensions.length}):`,
  ];
  let discrete = 1;
  for (const dimension of spec.dimensions) {
    const name = dimension.path.join('.');
    const levels = discreteLevels(dimension);
    if (levels !== null) discrete *= levels;
    if (dimension.kind === 'choose') lines.push(`  ${name}: one of ${dimension.labels.join(' | ')}`);
    else {
      const unit = fieldDisplay(name, dimension.quantity as QuantityKind, [dimension.from, dimension.to]);
      const show = (v: number) => `${formatNumber(v / unit.divisor, 6)}${unit.label ? ` ${unit.label}` : ''}`;
      const kind = dimension.integer
        ? 'integers'
        : dimension.step !== null
          ? `steps of ${show(dimension.step)}`
          : dimension.scale === 'log'
            ? 'log scale'
            : 'continuous';
      lines.push(
        `  ${name}: ${show(dimension.from)} to ${show(dimension.to)} (${kind}${levels !== null ? `, ${levels} levels` : ''})`,
      );
    }
  }
  const continuous = spec.dimensions.filter((d) => discreteLevels(d) === null).length;
  lines.push(
    `discrete part of the space: ${discrete} combinations${continuous ? ` × ${continuous} continuous dimension${continuous > 1 ? 's' : ''}` : ''}`,
  );
  lines.push(`constraints: ${spec.constraints.length ? spec.constraints.map((c) => c.metric).join(', ') : 'none'}`);
  lines.push(`objectives: ${spec.objectives.map((o) => `${o.sense} ${o.metric}`).join(', ')}`);
  lines.push(`sampling: ${spec.method}, ${spec.samples} designs, seed ${spec.seed}`);
  if (spec.stages && spec.stages.length > 0)
    lines.push(`stages after the sweep: ${spec.stages.map((stage) => describeStage(stage)).join(', then ')}`);
  const space = new DesignSpace(spaceDefinitionOf(spec));
  const { secondsPerDesign } = measureBatchSize(space, [0, Math.min(spec.samples, 64)]);
  const workers = options.workers ?? defaultWorkerCount();
  const estimate = (secondsPerDesign * spec.samples) / Math.max(1, workers);
  lines.push(
    `measured ${formatNumber(secondsPerDesign * 1000)} ms per design on this machine: about ${formatDuration(Math.max(1, estimate))} with ${workers} worker${workers > 1 ? 's' : ''}`,
  );
  lines.push(SAFETY_LINE);
  io.out(`${lines.join('\n')}\n`);
  return 0;
}
