/**
 * Properties of the inductance functions (fast-check, seeded), and the fast ring-to-winding
 * mutual inductance against the plain sum over turns.
 */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { coaxialLoopMutualInductance } from '../../../core/inductance/coaxial-loops.ts';
import { roundWireSolenoidInductance } from '../../../core/inductance/rosa.ts';
import { loopSumSolenoidInductance } from '../../../core/inductance/filament-sum.ts';
import {
  ringToSheetMutualInductance,
  ringToSheetSegmentMutuals,
  ringToTurnsMutualInductance,
} from '../../../core/inductance/sheet-mutual.ts';
import { currentSheetInductance } from '../../../core/inductance/nagaoka.ts';
import { turnMutuals } from '../../../core/inductance/turn-mutuals.ts';
import { gaussLegendreRule } from '../../../core/gauss-legendre.ts';

const SEED = 20261201;

describe('coaxialLoopMutualInductance(a, b, d)', () => {
  test('is symmetric in a and b, positive, even in d, and falls as |d| grows', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-3, max: 10, noNaN: true }),
        fc.double({ min: 1e-3, max: 10, noNaN: true }),
        fc.double({ min: 1e-4, max: 50, noNaN: true }),
        fc.double({ min: 1.001, max: 10, noNaN: true }),
        (a, b, d, factor) => {
          const m = coaxialLoopMutualInductance(a, b, d);
          expect(m).toBeGreaterThan(0);
          expect(Math.abs(coaxialLoopMutualInductance(b, a, d) / m - 1)).toBeLessThan(1e-13);
          expect(coaxialLoopMutualInductance(a, b, -d)).toBe(m);
          expect(coaxialLoopMutualInductance(a, b, d * factor)).toBeLessThan(m);
        },
      ),
      { seed: SEED, numRuns: 300 },
    );
  });

  test('is bounded by the geometric mean of the two loops’ self-inductances (|k| < 1)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.01, max: 1, noNaN: true }),
        fc.double({ min: 0.01, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (a, b, d) => {
          const wireRadius = 1e-3 * Math.min(a, b);
          if (Math.hypot(a - b, d) < 3 * wireRadius) return; // conductors would overlap
          const selfA = 4e-7 * Math.PI * a * (Math.log((8 * a) / wireRadius) - 2);
          const selfB = 4e-7 * Math.PI * b * (Math.log((8 * b) / wireRadius) - 2);
          expect(coaxialLoopMutualInductance(a, b, d)).toBeLessThan(Math.sqrt(selfA * selfB));
        },
      ),
      { seed: SEED, numRuns: 300 },
    );
  });
});

describe('solenoid inductance', () => {
  test('grows with turns at a fixed pitch (Nagaoka + Rosa and the loop sum alike)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.02, max: 0.3, noNaN: true }),
        fc.integer({ min: 2, max: 300 }),
        fc.double({ min: 0.3e-3, max: 3e-3, noNaN: true }),
        fc.double({ min: 0.5, max: 1, noNaN: true }),
        (radius, turns, pitch, fill) => {
          const bareDiameter = pitch * fill;
          const fewer = roundWireSolenoidInductance({ radius, turns, pitch, bareDiameter }, 'uniform');
          const more = roundWireSolenoidInductance({ radius, turns: turns + 1, pitch, bareDiameter }, 'uniform');
          expect(more).toBeGreaterThan(fewer);
          const sumFewer = loopSumSolenoidInductance(radius, turns, pitch, bareDiameter / 2, 'uniform');
          const sumMore = loopSumSolenoidInductance(radius, turns + 0.5, pitch, bareDiameter / 2, 'uniform');
          expect(sumMore).toBeGreaterThan(sumFewer);
        },
      ),
      { seed: SEED, numRuns: 150 },
    );
  });

  test('the loop sum and Nagaoka + Rosa agree to 1e-3 for N ≥ 20 and p ≪ a (issue target 0.1 %)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.03, max: 0.3, noNaN: true }),
        fc.integer({ min: 20, max: 400 }),
        fc.double({ min: 0.3e-3, max: 2e-3, noNaN: true }),
        fc.double({ min: 0.6, max: 0.98, noNaN: true }),
        (radius, turns, pitch, fill) => {
          const bareDiameter = pitch * fill;
          const rosa = roundWireSolenoidInductance({ radius, turns, pitch, bareDiameter }, 'uniform');
          const sum = loopSumSolenoidInductance(radius, turns, pitch, bareDiameter / 2, 'uniform');
          expect(Math.abs(rosa / sum - 1)).toBeLessThan(1e-3);
        },
      ),
      { seed: SEED, numRuns: 100 },
    );
  });

  test('the loop sum with fractional turns is continuous: N → whole N from both sides', () => {
    const at = (n: number) => loopSumSolenoidInductance(0.08, n, 0.6e-3, 0.25e-3, 'uniform');
    expect(Math.abs(at(100 - 1e-7) / at(100) - 1)).toBeLessThan(1e-8);
    expect(Math.abs(at(100 + 1e-7) / at(100) - 1)).toBeLessThan(1e-8);
    expect(at(0)).toBeNaN();
  });
});

describe('ringToSheetMutualInductance against the sum over turns (ringToTurnsMutualInductance)', () => {
  test('agree to 1e-4 (issue target) over random rings at least ten pitches from windings of 200–1500 turns', () => {
    // The turn sum is the midpoint rule of the sheet integral. Its difference from the sheet is a
    // physical one, not a quadrature error: near a winding end it is the Euler–Maclaurin end term
    // (p²/24)·f′ (up to 1e-5 for a ring 2 mm from the end of a 0.2 mm-pitch winding); closer than a
    // few pitches to the turns, of order exp(−2π gap / pitch).
    fc.assert(
      fc.property(
        fc.double({ min: 0.03, max: 0.25, noNaN: true }),
        fc.integer({ min: 200, max: 1500 }),
        fc.double({ min: 0.2e-3, max: 1.2e-3, noNaN: true }),
        fc.double({ min: 0, max: 2.5, noNaN: true }), // extra ring radius over the winding radius
        fc.double({ min: -0.3, max: 1.3, noNaN: true }), // ring height as a fraction of the length
        (radius, turns, pitch, gap, heightFraction) => {
          const bottomZ = 0.4;
          const length = turns * pitch;
          const winding = { radius, bottomZ, topZ: bottomZ + length, turns };
          const ringRadius = radius * (1 + gap) + 10 * pitch;
          const ringZ = bottomZ + heightFraction * length;
          const bySheet = ringToSheetMutualInductance(ringRadius, ringZ, winding);
          const byTurns = ringToTurnsMutualInductance(ringRadius, ringZ, winding);
          expect(Math.abs(bySheet / byTurns - 1)).toBeLessThan(1e-4);
        },
      ),
      { seed: SEED, numRuns: 120 },
    );
  });

  test('the quadrature converges to the sheet integral even for a ring one pitch from the winding', () => {
    // the midpoint sum over 40 000 turns of the same winding approximates the sheet integral to
    // well below 1e-7, so it checks the sinh-mapped Gauss–Legendre rule where the peak is sharp
    const fine = { radius: 0.1, bottomZ: 0.3, topZ: 1.1, turns: 40000 };
    for (const [ringRadius, ringZ] of [
      [0.1008, 0.7],
      [0.101, 0.3],
      [0.1005, 1.2],
      [0.3, 0.2],
    ]) {
      const bySheet = ringToSheetMutualInductance(ringRadius, ringZ, fine);
      const byTurns = ringToTurnsMutualInductance(ringRadius, ringZ, fine);
      expect(Math.abs(bySheet / byTurns - 1)).toBeLessThan(2e-7);
    }
  });

  test('ringToSheetSegmentMutuals: each of 16 segments agrees with the sum over its own turns (Maxwell [maxwell1873] §701) to 2e-7, rings one pitch to far from the winding', () => {
    // 40 000 turns, 2 500 to a segment: the turn sum over a segment is the midpoint rule of its
    // sheet integral, well below 1e-7 from it (as in the whole-sheet check above).
    const turns = 40000;
    const fine = { radius: 0.1, bottomZ: 0.3, topZ: 1.1, turns };
    const fractions = Array.from({ length: 17 }, (_, k) => k / 16);
    const pitch = (fine.topZ - fine.bottomZ) / turns;
    for (const [ringRadius, ringZ] of [
      [0.1008, 0.7],
      [0.101, 0.3],
      [0.1005, 1.2],
      [0.3, 0.2],
      [0.16, 0.31],
    ]) {
      const segments = ringToSheetSegmentMutuals(ringRadius, ringZ, fine, fractions);
      for (let k = 0; k < 16; k++) {
        let byTurns = 0;
        for (let j = 2500 * k; j < 2500 * (k + 1); j++)
          byTurns += coaxialLoopMutualInductance(ringRadius, fine.radius, fine.bottomZ + (j + 0.5) * pitch - ringZ);
        expect(Math.abs(segments[k] / byTurns - 1)).toBeLessThan(2e-7);
      }
    }
  });

  test('ringToSheetSegmentMutuals sums to the whole sheet’s mutual (12-point panels) within 1e-9 over random rings and node sets', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.03, max: 0.15, noNaN: true }),
        fc.double({ min: 0.2, max: 1.2, noNaN: true }),
        fc.double({ min: 1.002, max: 3.5, noNaN: true }), // ring radius over the winding radius
        fc.double({ min: -0.3, max: 1.3, noNaN: true }), // ring height as a fraction of the length
        fc.integer({ min: 1, max: 32 }),
        (radius, length, ratio, heightFraction, segments) => {
          const winding = { radius, bottomZ: 0.4, topZ: 0.4 + length, turns: 1000 };
          const ringZ = winding.bottomZ + heightFraction * length;
          const fractions = Array.from({ length: segments + 1 }, (_, k) => k / segments);
          const parts = ringToSheetSegmentMutuals(radius * ratio, ringZ, winding, fractions);
          const whole = ringToSheetMutualInductance(radius * ratio, ringZ, winding);
          let sum = 0;
          for (const part of parts) sum += part;
          expect(Math.abs(sum / whole - 1)).toBeLessThan(1e-9);
        },
      ),
      { seed: SEED, numRuns: 200 },
    );
  });

  test('integrated over a second coaxial sheet it gives the mutual inductance that Nagaoka’s formula implies', () => {
    // Two coaxial sheets of equal radius a and turn density n on [0, l1] and [l1 + g, l1 + g + l2]:
    // superposition of current-sheet self-inductances F(x) = L_s(a, x, n x) gives exactly
    // 2 M = F(l1 + g + l2) − F(l1 + g) − F(g + l2) + F(g) (Lorenz/Nagaoka, exact elliptic form).
    const radius = 0.1;
    const density = 1000;
    const [l1, gap, l2] = [0.3, 0.05, 0.2];
    const sheet = (x: number) => currentSheetInductance(radius, x, density * x);
    const expected = (sheet(l1 + gap + l2) - sheet(l1 + gap) - sheet(gap + l2) + sheet(gap)) / 2;
    const winding = { radius, bottomZ: 0, topZ: l1, turns: density * l1 };
    const rule = gaussLegendreRule(48);
    let integral = 0;
    for (let i = 0; i < rule.nodes.length; i++) {
      const z = l1 + gap + (l2 * (rule.nodes[i] + 1)) / 2;
      integral += ((rule.weights[i] * l2) / 2) * ringToSheetMutualInductance(radius, z, winding);
    }
    expect(Math.abs((density * integral) / expected - 1)).toBeLessThan(1e-9);
  });

  test('a ring round the middle of a long winding links μ0 n π a² (infinite-solenoid limit, exact)', () => {
    const radius = 0.05;
    const ringRadius = 0.08;
    const length = 20;
    const winding = { radius, bottomZ: 0, topZ: length, turns: 20000 }; // n = 1000 /m
    const ringMutual = ringToSheetMutualInductance(ringRadius, length / 2, winding);
    const infiniteSolenoidFlux = 4e-7 * Math.PI * 1000 * Math.PI * radius * radius;
    // finite length: less flux inside (≈ 2a²/L²) and some return flux through the ring (≈ 2(r² − a²)/L²)
    const deficit = 1 - ringMutual / infiniteSolenoidFlux;
    expect(deficit).toBeGreaterThan(0);
    expect(deficit).toBeLessThan((1.5 * (2 * radius ** 2 + 2 * (ringRadius ** 2 - radius ** 2))) / length ** 2);
    expect(currentSheetInductance(radius, length, 20000)).toBeGreaterThan(0);
  });

  test('NaN for an empty winding', () => {
    expect(ringToSheetMutualInductance(0.1, 0, { radius: 0.05, bottomZ: 0, topZ: 0, turns: 10 })).toBeNaN();
  });
});

describe('turnMutuals(radius, pitch, count)', () => {
  test('is Maxwell’s mutual of two turns s pitches apart at index s, for one winding after another (the kept series is not reused for other numbers)', () => {
    // Maxwell [maxwell1873] §701 through coaxialLoopMutualInductance (checked in test/reference).
    for (const [radius, pitch, count] of [
      [0.08, 0.0008, 50],
      [0.08, 0.0008, 50],
      [0.08, 0.0009, 50],
      [0.1, 0.0009, 50],
      [0.1, 0.0009, 7],
      [0.1, 0.0009, 1],
    ] as const) {
      const mutuals = turnMutuals(radius, pitch, count);
      expect(mutuals.length).toBe(count);
      for (let s = 1; s < count; s++) expect(mutuals[s]).toBe(coaxialLoopMutualInductance(radius, radius, s * pitch));
    }
  });
});
