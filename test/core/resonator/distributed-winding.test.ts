/**
 * The winding as a distributed resonator in the pipeline (core/resonator/design-resonator.ts and
 * the stages that use it), against exact limits and published theory; each check names its source.
 */
import { describe, expect, it } from 'vitest';
import { designFromValue } from '../../../cli/load-design.ts';
import { nodeCapacitanceMatrix } from '../../../core/electrostatics/capacitance-matrix.ts';
import type { FieldArrangement } from '../../../core/electrostatics/field-solve.ts';
import { evaluateDesign } from '../../../core/evaluate.ts';
import { distributedWinding } from '../../../core/resonator/design-resonator.ts';
import { coarsenCapacitance, foldTopload, solveResonator } from '../../../core/resonator/resonator.ts';
import { segmentInductanceMatrix } from '../../../core/resonator/segment-inductance.ts';
import { CONVERGENCE_ORDER, windingResonator } from '../../../core/resonator/winding-resonator.ts';

const C = 299_792_458;

// Modified Bessel functions for small arguments: the polynomial approximations of Abramowitz &
// Stegun 9.8.1, 9.8.3, 9.8.5 and 9.8.7 (|error| below 2·10⁻⁷ relative for 0 < x ≤ 2), [abramowitz1964].
function besselI0(x: number): number {
  const t = (x / 3.75) ** 2;
  return 1 + t * (3.5156229 + t * (3.0899424 + t * (1.2067492 + t * (0.2659732 + t * (0.0360768 + t * 0.0045813)))));
}
function besselI1(x: number): number {
  const t = (x / 3.75) ** 2;
  return (
    x *
    (0.5 +
      t * (0.87890594 + t * (0.51498869 + t * (0.15084934 + t * (0.02658733 + t * (0.00301532 + t * 0.00032411))))))
  );
}
function besselK0(x: number): number {
  const y = (x * x) / 4;
  return (
    -Math.log(x / 2) * besselI0(x) +
    (-0.57721566 +
      y * (0.4227842 + y * (0.23069756 + y * (0.0348859 + y * (0.00262698 + y * (0.0001075 + y * 0.0000074))))))
  );
}
function besselK1(x: number): number {
  const y = (x * x) / 4;
  return (
    Math.log(x / 2) * besselI1(x) +
    (1 / x) *
      (1 +
        y *
          (0.15443144 +
            y * (-0.67278579 + y * (-0.18156897 + y * (-0.01919402 + y * (-0.00110404 + y * -0.00004686))))))
  );
}

/**
 * Quarter-wave resonance of a sheath helix of radius a and pitch p over a length ℓ: the slow-wave
 * (quasi-static) limit of the sheath-helix dispersion relation, (βa)² I0K0/(I1K1) = (ka cot ψ)²,
 * so v/c = k/β = tan ψ √(I0(βa)K0(βa) / (I1(βa)K1(βa))), tan ψ = p/(2πa); with β = π/(2ℓ) the
 * frequency is f = v/(4ℓ). Ollendorff; Sensiper 1955; Pierce 1950, ch. 3 [pierce1950] [sensiper1955].
 */
function sheathHelixQuarterWave(radius: number, length: number, pitch: number): number {
  const beta = Math.PI / (2 * length);
  const x = beta * radius;
  const tanPsi = pitch / (2 * Math.PI * radius);
  const velocity = C * tanPsi * Math.sqrt((besselI0(x) * besselK0(x)) / (besselI1(x) * besselK1(x)));
  return velocity / (4 * length);
}

/** A bare winding far above the floor (its base node grounded), for the helix comparison. */
function farWinding(
  radius: number,
  length: number,
  turns: number,
): { arrangement: FieldArrangement; fundamental: number } {
  const arrangement: FieldArrangement = {
    floor: true,
    winding: { radius, bottomZ: 20, topZ: 20 + length, profile: 'linear' },
  };
  const model = distributedWinding(arrangement, { radius, turns, pitch: length / turns, wireRadius: 0.0002 });
  if (!model) throw new Error('the distributed model found no resonance');
  return { arrangement, fundamental: model.fundamental };
}

describe('a long thin coil against the sheath helix (Ollendorff; Sensiper 1955; Pierce 1950)', () => {
  it('within 5 % of the helix quarter-wave resonance for ℓ/a of 100 and 200, and closer for the longer coil', () => {
    const ratio = (radius: number) => {
      const { fundamental } = farWinding(radius, 2, 2000);
      return fundamental / sheathHelixQuarterWave(radius, 2, 2 / 2000);
    };
    const at100 = ratio(0.02);
    const at200 = ratio(0.01);
    // The finite coil's ends hold more charge than the infinite helix: it resonates a little lower.
    expect(at100).toBeGreaterThan(0.95);
    expect(at100).toBeLessThan(1);
    expect(at200).toBeGreaterThan(at100);
    expect(at200).toBeLessThan(1);
  });
});

describe('convergence in the segment count (the rule: within 0.1 % of the doubled count)', () => {
  it('the chosen fundamental is within 0.1 % of the one at twice the segments, from a finer solve', () => {
    const { arrangement, fundamental } = farWinding(0.05, 1, 1500);
    const winding = { radius: 0.05, turns: 1500, pitch: 1 / 1500, wireRadius: 0.0002 };
    const fine = windingResonator(arrangement, winding, 0, 128, nodeCapacitanceMatrix(arrangement, 128));
    expect(fine).not.toBeNull();
    const finest = fine?.fundamentalByCount.at(-1)?.frequency ?? Number.NaN;
    expect(Math.abs(fundamental / finest - 1)).toBeLessThan(1e-3);
  });
});

/** A winding of the given turns with its base 0.6 m above the floor, bare or with a small toroid. */
function floorCoil(radius: number, length: number, turns: number, toroid = 0) {
  const arrangement: FieldArrangement = {
    floor: true,
    winding: { radius, bottomZ: 0.6, topZ: 0.6 + length, profile: 'linear' },
  };
  if (toroid > 0)
    arrangement.topload = {
      shape: 'toroid',
      majorRadius: toroid,
      minorRadius: toroid / 3,
      centerZ: 0.65 + length + toroid / 3,
    };
  return { arrangement, winding: { radius, turns, pitch: length / turns, wireRadius: 0.0002 } };
}

/** The fundamental at 8, 16, 32 and 64 uniform segments, all from one 128-panel solve. */
function fundamentalsToSixtyFour({ arrangement, winding }: ReturnType<typeof floorCoil>): number[] {
  const matrix = nodeCapacitanceMatrix(arrangement, 128, 64);
  if (!matrix) throw new Error('no capacitance matrix');
  const folded = foldTopload(matrix.matrix, matrix.size, matrix.nodes);
  const frequencies: number[] = [];
  for (const stride of [8, 4, 2, 1]) {
    const coarse = coarsenCapacitance(folded, matrix.fractions, stride);
    if (!coarse) throw new Error('no coarse ladder');
    const inductance = segmentInductanceMatrix(winding, Array.from(coarse.fractions));
    const solution = solveResonator({ inductance, capacitance: coarse.matrix, fractions: coarse.fractions, length: 1 });
    frequencies.push(solution?.fundamental.frequency ?? Number.NaN);
  }
  return frequencies;
}

describe('the observed order of convergence in the segment count (Richardson and Gaunt 1927, [richardson1927])', () => {
  it('successive changes 8 → 16 → 32 → 64 shrink by a ratio between 2^1.6 and 4.2 (an order between 1.6 and 2), bare and top-loaded', () => {
    for (const coil of [floorCoil(0.1, 0.6, 400), floorCoil(0.055, 0.315, 900, 0.06), floorCoil(0.02, 1.5, 1500)]) {
      const f = fundamentalsToSixtyFour(coil);
      const changes = f.slice(1).map((value, k) => f[k] - value);
      // the consistent ladder approaches its limit from above (a Rayleigh–Ritz-like overestimate)
      for (const change of changes) expect(change).toBeGreaterThan(0);
      for (let k = 1; k < changes.length; k++) {
        const ratio = changes[k - 1] / changes[k];
        expect(ratio).toBeGreaterThan(2 ** CONVERGENCE_ORDER);
        expect(ratio).toBeLessThan(4.2);
      }
    }
  });
});

describe('coils of a few hundred turns and more converge (the rule: Richardson estimate within 0.1 %)', () => {
  it('bare 400- and 1000-turn coils converge, within 0.1 % of the order-2 limit of 32 and 64 segments', () => {
    for (const coil of [floorCoil(0.1, 0.6, 400), floorCoil(0.1, 0.8, 1000), floorCoil(0.08, 0.5, 250)]) {
      const model = distributedWinding(coil.arrangement, coil.winding);
      expect(model?.converged).toBe(true);
      expect(model?.lastChange ?? 1).toBeLessThan(1e-3);
      const f = fundamentalsToSixtyFour(coil);
      const limit = f[3] + (f[3] - f[2]) / 3;
      expect(Math.abs((model?.fundamental ?? 0) / limit - 1)).toBeLessThan(1e-3);
    }
  });
});

/** A design with a toroid of the given outer diameter on a 110 mm form (an invented test coil). */
function design(toroid: string | null, profile = 'computed', extra: Record<string, unknown> = {}) {
  const value: Record<string, unknown> = {
    secondary: { form_diameter: '110 mm', wire: 'AWG 28', turns: 900, base_height: '300 mm', voltage_profile: profile },
    environment: { altitude: '100 m', temperature: '20 degC' },
    ...extra,
  };
  if (toroid)
    value.topload = { shape: 'toroid', outer_diameter: toroid, tube_diameter: '150 mm', height_above_winding: '80 mm' };
  return designFromValue(value, 'test').design;
}

describe('limits of the distributed model in the pipeline', () => {
  it("a topload many times the winding's capacitance: the fundamental is Thomson's lumped value within 0.5 % (Thomson 1853, [thomson1853])", () => {
    const { metrics, problems } = evaluateDesign(design('900 mm'));
    expect(problems).toEqual([]);
    const fundamental = metrics.resonant_frequency ?? Number.NaN;
    const lumped = metrics.resonant_frequency_lumped ?? Number.NaN;
    expect((metrics.topload_capacitance ?? 0) / (metrics.secondary_self_capacitance ?? 1)).toBeGreaterThan(5);
    expect(Math.abs(fundamental / lumped - 1)).toBeLessThan(0.005);
  });

  it('no topload: the fundamental lies below the lumped estimate with the linear profile, and above the uniform line (exact: f_line/f_lumped = π/(2√3))', () => {
    // A uniform line with total L and C: quarter wave 1/(4√(LC)); the linear profile's energy
    // capacitance is C/3, so Thomson gives √3/(2π√(LC)); their ratio is π/(2√3) = 0.9069.
    const { metrics } = evaluateDesign(design(null));
    const ratio = (metrics.resonant_frequency ?? 0) / (metrics.resonant_frequency_lumped ?? 1);
    expect(ratio).toBeLessThan(1);
    expect(ratio).toBeGreaterThan(Math.PI / (2 * Math.sqrt(3)));
    // a helix is dispersive: its first overtone sits below the uniform line's 3 (Pierce 1950)
    expect(metrics.overtone_ratio ?? 3).toBeLessThan(3);
  });

  it('the effective values give the fundamental and the profile rises from 0 at the base to 1 at the top (definitions, refs §11)', () => {
    const evaluation = evaluateDesign(
      design('450 mm', 'computed', {
        environment: { altitude: '100 m', temperature: '20 degC', streamer_length: '1 m' },
      }),
    );
    const { metrics, profile } = evaluation;
    const l = metrics.effective_inductance ?? Number.NaN;
    const c = metrics.effective_capacitance ?? Number.NaN;
    expect(1 / (2 * Math.PI * Math.sqrt(l * c)) / (metrics.resonant_frequency ?? 1)).toBeCloseTo(1, 10);
    expect(metrics.total_capacitance).toBe(c);
    expect(profile?.voltage[0]).toBe(0);
    expect(profile?.voltage[10]).toBeCloseTo(1, 12);
    for (let k = 1; k <= 10; k++) expect(profile?.voltage[k] ?? 0).toBeGreaterThan(profile?.voltage[k - 1] ?? 1);
    // the current is near its largest at the base (> 0.9 of its peak) and falls toward the top from a
    // peak inside the winding: charge leaves along the upper winding, while the low part, near the
    // grounded base and floor, carries a little charge of the other sign (so the base is not the peak)
    const current = profile?.current ?? [];
    expect(current[0] ?? 0).toBeGreaterThan(0.9);
    const peak = current.indexOf(Math.max(...current));
    expect(peak).toBeGreaterThan(0);
    expect(peak).toBeLessThan(10);
    expect(current[10] ?? 1).toBeLessThan(0.99);
    // streamer loading at the top lowers the frequency
    expect(metrics.loaded_resonant_frequency ?? Number.POSITIVE_INFINITY).toBeLessThan(metrics.resonant_frequency ?? 0);
  });

  it('an assumed profile keeps the lumped model: resonant_frequency is Thomson and equals resonant_frequency_lumped', () => {
    const { metrics, profile } = evaluateDesign(design('450 mm', 'linear'));
    expect(metrics.resonant_frequency).toBe(metrics.resonant_frequency_lumped);
    expect(metrics.overtone_frequency).toBeNull();
    expect(profile).toBeNull();
  });

  it('the tank tunes to the distributed fundamental and the coupling uses the mode current (tuning within 1e-9)', () => {
    const primary = {
      primary: {
        shape: 'flat_spiral',
        inner_diameter: '160 mm',
        turns: 12,
        conductor_diameter: '6.35 mm',
        turn_spacing: '6 mm',
        elevation: '0 mm',
      },
      tank: { capacitance: '11 nF', charge_voltage: '12 kV', voltage_rating: '24 kV' },
      driver: { kind: 'spark_gap', gap: 'static', break_rate: '120 Hz' },
    };
    const computed = evaluateDesign(design('300 mm', 'computed', primary)).metrics;
    const linear = evaluateDesign(design('300 mm', 'linear', primary)).metrics;
    expect(computed.primary_tap_margin ?? 0).toBeGreaterThan(0); // the tap is inside its range
    expect(Math.abs((computed.primary_frequency ?? 0) / (computed.resonant_frequency ?? 1) - 1)).toBeLessThan(1e-9);
    // the mode's current is not uniform, so its mutual differs from the uniform sheet's, but not by much
    const ratio = (computed.coupling ?? 0) / (linear.coupling ?? 1);
    expect(ratio).toBeGreaterThan(0.9);
    expect(ratio).toBeLessThan(1.1);
  });
});
