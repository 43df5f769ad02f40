/**
 * The space a tolerance study evaluates in: the sweep's own design space with one more dimension per
 * toleranced field, whose slot replaces the field in the tree. A row of values is a candidate's sweep
 * values followed by the built value of each toleranced field, so every draw of every candidate goes
 * through the sweep's worker pool as a `values` task.
 *
 * Where a field sits decides its nominal: a fixed leaf of the tree, a swept range (the candidate's value),
 * a set of quantities (the chosen one), a field inside a set of whole sections (the chosen section's), or
 * the field's default where the design leaves it out. An interval needs no nominal.
 */
import type { NominalSource, SpaceDefinition, ToleranceSpace } from '../space-definition.ts';
import { isSlot, type Dimension, type NormalSection, type NormalTree } from '../design-tree.ts';
import { deviatedValue, type ToleranceField } from './tolerance-draws.ts';

/** A field that cannot be toleranced in this design space, with the reason. */
export class ToleranceSetupError extends Error {
  constructor(
    readonly path: [string, string],
    reason: string,
  ) {
    super(reason);
    this.name = 'ToleranceSetupError';
  }
}

function numberOrNull(value: unknown): number | null {
  return typeof value === 'number' ? value : null;
}

/** Builds the tolerance space of a sweep's space (or of one design: a space with no dimensions). */
export function toleranceSpace(base: SpaceDefinition, fields: readonly ToleranceField[]): ToleranceSpace {
  const baseDimensions = base.dimensions.length;
  const tree: NormalTree = {};
  for (const [name, section] of Object.entries(base.tree)) tree[name] = isSlot(section) ? section : { ...section };
  const dimensions: Dimension[] = base.dimensions.map((d) => ({ ...d }));
  const nominals: NominalSource[] = [];
  for (let t = 0; t < fields.length; t++) {
    const field = fields[t];
    const [sectionName, key] = field.path;
    const slot = { slot: baseDimensions + t };
    const needsNominal = field.mode !== 'interval';
    const section = tree[sectionName];
    if (section === undefined) {
      if (needsNominal && field.fallback === null)
        throw new ToleranceSetupError(field.path, `the design has no ${sectionName} section to take the spread of`);
      if (!field.createSection) throw new ToleranceSetupError(field.path, `the design has no ${sectionName} section`);
      tree[sectionName] = { [key]: slot };
      nominals.push(needsNominal ? { kind: 'fixed', value: field.fallback as number } : { kind: 'none' });
    } else if (isSlot(section)) {
      // A set of whole sections: the field goes into every choice that has it (or takes its default).
      const dimension = dimensions[section.slot];
      if (dimension.kind !== 'choose') throw new ToleranceSetupError(field.path, 'not a set of sections');
      const values: Array<number | null> = [];
      let any = false;
      dimension.values = dimension.values.map((choice) => {
        const chosen = { ...(choice as NormalSection) };
        const nominal = key in chosen ? numberOrNull(chosen[key]) : field.fallback;
        if ((key in chosen && nominal === null) || (needsNominal && nominal === null)) {
          values.push(null);
          return chosen;
        }
        values.push(nominal);
        any = true;
        chosen[key] = slot;
        return chosen;
      });
      if (!any) throw new ToleranceSetupError(field.path, `no choice of ${sectionName} has this field as a number`);
      nominals.push(needsNominal ? { kind: 'choice', dimension: section.slot, values } : { kind: 'none' });
    } else {
      const leaf = section[key];
      if (leaf === undefined) {
        if (needsNominal && field.fallback === null)
          throw new ToleranceSetupError(field.path, 'not given in the design: a spread needs a nominal value');
        nominals.push(needsNominal ? { kind: 'fixed', value: field.fallback as number } : { kind: 'none' });
      } else if (isSlot(leaf)) {
        const dimension = dimensions[leaf.slot];
        if (dimension.kind === 'range') nominals.push({ kind: 'range', dimension: leaf.slot });
        else {
          const values = dimension.values.map(numberOrNull);
          if (values.some((v) => v === null))
            throw new ToleranceSetupError(field.path, 'a set of non-numeric values takes no spread');
          nominals.push({ kind: 'choice', dimension: leaf.slot, values });
        }
        if (!needsNominal) nominals[nominals.length - 1] = { kind: 'none' };
      } else if (typeof leaf === 'number') {
        nominals.push(needsNominal ? { kind: 'fixed', value: leaf } : { kind: 'none' });
      } else {
        throw new ToleranceSetupError(field.path, 'not a number in the design: only numeric fields take a spread');
      }
      (tree[sectionName] as NormalSection)[key] = slot;
    }
    dimensions.push({
      kind: 'range',
      path: [...field.path],
      quantity: 'dimensionless',
      from: 0,
      to: 1,
      scale: 'linear',
      integer: false,
      step: null,
    });
  }
  return {
    // The sampler of this definition is never used (rows come as values); 'random' takes any dimension count.
    definition: { tree, dimensions, method: 'random', samples: base.samples, seed: base.seed, gridLevels: null },
    baseDimensions,
    fields: [...fields],
    nominals,
  };
}

/** The nominal of field t for a candidate's base values, or null where the candidate has no such field. */
export function nominalOf(space: ToleranceSpace, t: number, baseValues: ArrayLike<number>): number | null {
  const source = space.nominals[t];
  switch (source.kind) {
    case 'fixed':
      return source.value;
    case 'range':
      return baseValues[source.dimension];
    case 'choice':
      return source.values[baseValues[source.dimension]] ?? null;
    case 'none':
      return null;
  }
}

/**
 * One evaluation row: the candidate's base values, then each field's built value at deviations `z`.
 * A field the candidate lacks gets NaN (its slot is not in the chosen section, so it is never read).
 */
export function drawRow(
  space: ToleranceSpace,
  baseValues: ArrayLike<number>,
  z: ArrayLike<number>,
  out: Float64Array,
  offset = 0,
): void {
  const d0 = space.baseDimensions;
  for (let d = 0; d < d0; d++) out[offset + d] = baseValues[d];
  for (let t = 0; t < space.fields.length; t++) {
    const field = space.fields[t];
    const nominal = nominalOf(space, t, baseValues);
    out[offset + d0 + t] =
      field.mode === 'interval'
        ? deviatedValue(field, 0, z[t])
        : nominal === null
          ? Number.NaN
          : deviatedValue(field, nominal, z[t]);
  }
}
