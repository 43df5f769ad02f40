import { describe, expect, test } from 'vitest';
import { loadDesignFile } from '../../cli/load-design.ts';
import { designField } from '../../core/design-field.ts';

describe('designField (the evaluation with its field solved at the winding profile)', () => {
  for (const name of ['exhibit-two-metre-coil', 'tabletop-teaching-coil']) {
    test(`examples/${name}.yaml: the direct solve at the computed profile gives the stage's topload charge and peak field`, () => {
      const { design } = loadDesignFile(`examples/${name}.yaml`);
      const result = designField(design);
      expect(result.evaluation.problems).toEqual([]);
      const field = result.field;
      if (!field) throw new Error('no field');
      // The stage forms these by superposition over the resonator's node matrix; a direct solve with
      // the same voltage shape agrees to discretisation accuracy (3e-5 on these examples; 1e-3 allowed).
      const metrics = result.evaluation.metrics;
      expect(Math.abs((field.toploadCapacitance ?? 0) / (metrics.topload_capacitance ?? 1) - 1)).toBeLessThan(1e-3);
      expect(Math.abs((field.toploadPeakFieldPerVolt ?? 0) / (metrics.topload_field_per_volt ?? 1) - 1)).toBeLessThan(
        1e-3,
      );
      expect(result.profile?.(0)).toBeCloseTo(0, 6);
      expect(result.profile?.(1)).toBeCloseTo(1, 6);
    });
  }

  test('an impossible design has no field and says why', () => {
    const { design } = loadDesignFile('examples/tabletop-teaching-coil.yaml');
    const broken = { ...design, topload: design.topload && { ...design.topload, heightAboveWinding: -0.2 } };
    const result = designField(broken);
    expect(result.field).toBeNull();
    expect(result.evaluation.problems.length).toBeGreaterThan(0);
  });
});
