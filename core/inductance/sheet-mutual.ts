/**
 * Mutual inductance between a coaxial ring and a single-layer winding.
 *
 * Two functions: the plain sum over the winding's turns (the reference), and the same quantity
 * with the winding as a uniform current sheet, integrated by Gauss–Legendre after a sinh change of
 * variable. Turn centres sit at bottom + (j + ½) p, so the turn sum is the midpoint rule of the
 * sheet integral; for an integrand that is analytic near the real axis the midpoint rule's error
 * is only the Euler–Maclaurin end terms (p²/24)·f′, below 10⁻⁴ for real windings.
 */
import { coaxialLoopMutualInductance } from './coaxial-loops.ts';
import { gaussLegendreRule, type QuadratureRule } from '../gauss-legendre.ts';

/** A single-layer winding seen as a coaxial current sheet, SI; z above the floor. */
export interface WindingSheet {
  /** Radius of the wire's centre line, m. */
  radius: number;
  /** Bottom of the winding (bottom edge of the first turn's pitch cell), m. */
  bottomZ: number;
  /** Top of the winding, m: bottomZ + turns × pitch. */
  topZ: number;
  /** Number of turns (may be fractional). */
  turns: number;
}

/**
 * Mutual inductance of a ring and a winding by summing Maxwell's formula over the turns, H.
 * Turn j (from 0) sits at bottomZ + (j + ½) p with p = (topZ − bottomZ)/turns; a fractional last
 * turn counts with its fraction as weight. Cost: ceil(N) Maxwell evaluations.
 * @param ringRadius m
 * @param ringZ height of the ring, m
 * @param winding the winding
 * Source: Maxwell (1873) §701, superposition.
 */
export function ringToTurnsMutualInductance(ringRadius: number, ringZ: number, winding: WindingSheet): number {
  const pitch = (winding.topZ - winding.bottomZ) / winding.turns;
  const count = Math.ceil(winding.turns - 1e-9);
  let total = 0;
  for (let j = 0; j < count; j++) {
    const weight = Math.min(1, winding.turns - j);
    const turnZ = winding.bottomZ + (j + 0.5) * pitch;
    total += weight * coaxialLoopMutualInductance(ringRadius, winding.radius, turnZ - ringZ);
  }
  return total;
}

/** Gauss–Legendre points per panel; panels are at most PANEL_WIDTH wide in the sinh variable. */
const POINTS_PER_PANEL = 12;
const PANEL_WIDTH = 1.5;
const PANEL_RULE = gaussLegendreRule(POINTS_PER_PANEL);

/**
 * Points per panel of a segment's piece by the panel's width in u (`ringToSheetSegmentMutuals`):
 * [width above which, rule]. A piece far from the ring is narrow in u (the sinh variable compresses
 * distance logarithmically) and its integrand, smooth on the scale of one unit of u, needs fewer
 * points: Gauss–Legendre's error falls like ρ^(−2q) with ρ growing as the panel narrows (Trefethen
 * 2013 [trefethen2013] Thm 19.3). The counts were chosen so that every segment's mutual stays
 * within 10⁻⁹ of the 12-point rule on six-fold refined panels (tests: against the sum over the
 * turns, and against the whole sheet's integral); they take about a third of the evaluations.
 */
const SEGMENT_RULES: ReadonlyArray<readonly [number, QuadratureRule]> = [
  [1, PANEL_RULE],
  [0.6, gaussLegendreRule(8)],
  [0.3, gaussLegendreRule(6)],
  [0.12, gaussLegendreRule(4)],
  [0, gaussLegendreRule(3)],
];

/** The 12-point rule whatever the width (`ringToSheetMutualInductance`). */
function wholeSheetRule(): QuadratureRule {
  return PANEL_RULE;
}

/** The rule of SEGMENT_RULES for a panel of this width in u. */
function segmentRule(width: number): QuadratureRule {
  for (const [above, rule] of SEGMENT_RULES) if (width > above) return rule;
  return SEGMENT_RULES[SEGMENT_RULES.length - 1][1];
}

/**
 * ∫ M(r, a, ζ) dζ over ζ = h sinh u, u in [u1, u2] (u1 < u2), by composite Gauss–Legendre: panels
 * at most PANEL_WIDTH wide, each with the rule `ruleFor` gives for its width.
 */
function integrateInSinhVariable(
  ringRadius: number,
  sheetRadius: number,
  scale: number,
  u1: number,
  u2: number,
  ruleFor: (width: number) => QuadratureRule = wholeSheetRule,
): number {
  const panels = Math.max(1, Math.ceil((u2 - u1) / PANEL_WIDTH));
  const width = (u2 - u1) / panels;
  const rule = ruleFor(width);
  const points = rule.nodes.length;
  let total = 0;
  for (let panel = 0; panel < panels; panel++) {
    const centre = u1 + (panel + 0.5) * width;
    for (let i = 0; i < points; i++) {
      const u = centre + 0.5 * width * rule.nodes[i];
      const zeta = scale * Math.sinh(u);
      total +=
        rule.weights[i] *
        0.5 *
        width *
        scale *
        Math.cosh(u) *
        coaxialLoopMutualInductance(ringRadius, sheetRadius, zeta);
    }
  }
  return total;
}

/**
 * Mutual inductance of a ring and a winding modelled as a uniform current sheet of N/ℓ turns per
 * metre over [bottomZ, topZ], H: M = (N/ℓ) ∫ M_Maxwell(r, a, z − z_ring) dz.
 *
 * The integrand peaks where the sheet passes the ring, with width of order |r − a|; the change of
 * variable z − z_ring = h sinh u with h = max(|r − a|, 10⁻³ (r + a)) spreads that peak evenly, the
 * interval is split at the ring's height, and each part is integrated with 12-point Gauss–Legendre
 * panels of width ≤ 1.5 in u: about a hundred Maxwell evaluations instead of N. The quadrature
 * error is below 2·10⁻⁷ even for a ring one pitch from the winding (tests, against a 40 000-turn
 * sum); against the sum over the actual turns the difference is the physical end term of the
 * midpoint rule, (p²/24)·f′ at the winding ends, up to 10⁻⁵ in the tests (rings ≥ 10 pitches away).
 * @param ringRadius m (> 0; a ring on the sheet itself, r = a, needs r ≠ a within the winding)
 * @param ringZ height of the ring, m
 * @param winding the winding
 * Source: Maxwell (1873) §701 integrated over the current sheet; Gauss–Legendre per A&S §25.4.29.
 */
export function ringToSheetMutualInductance(ringRadius: number, ringZ: number, winding: WindingSheet): number {
  const length = winding.topZ - winding.bottomZ;
  if (!(length > 0) || !(winding.turns > 0)) return Number.NaN;
  const scale = Math.max(Math.abs(ringRadius - winding.radius), 1e-3 * (ringRadius + winding.radius));
  const u1 = Math.asinh((winding.bottomZ - ringZ) / scale);
  const u2 = Math.asinh((winding.topZ - ringZ) / scale);
  let integral: number;
  if (u1 < 0 && u2 > 0) {
    integral =
      integrateInSinhVariable(ringRadius, winding.radius, scale, u1, 0) +
      integrateInSinhVariable(ringRadius, winding.radius, scale, 0, u2);
  } else {
    integral = integrateInSinhVariable(ringRadius, winding.radius, scale, u1, u2);
  }
  return (winding.turns / length) * integral;
}

/**
 * Mutual inductance of a ring to each axial segment of a winding seen as a uniform current sheet,
 * H: segment k spans the fractions [f_k, f_(k+1)] of the length and carries its share of the turns,
 * M_k = (N/ℓ) ∫ M_Maxwell(r, a, z − z_ring) dz over the segment. One pass over the sheet: the
 * interval is cut at every node and at the ring's height, and each piece is integrated in the same
 * sinh variable with Gauss–Legendre panels at most 1.5 wide in u, as in
 * `ringToSheetMutualInductance`, so each Maxwell evaluation serves one segment only; a panel takes
 * 12 points down to 3 by its width (SEGMENT_RULES), within 10⁻⁹ of the 12-point rule. The sum over
 * the segments is the whole sheet's mutual to the same accuracy (tests).
 * @param ringRadius m (> 0)
 * @param ringZ height of the ring, m
 * @param winding the winding
 * @param fractions n + 1 increasing node fractions, 0 first and 1 last
 * @param out n values, written (a new array when not given)
 * Source: Maxwell (1873) §701 integrated over the current sheet; Gauss–Legendre per A&S §25.4.29.
 */
export function ringToSheetSegmentMutuals(
  ringRadius: number,
  ringZ: number,
  winding: WindingSheet,
  fractions: ArrayLike<number>,
  out = new Float64Array(fractions.length - 1),
): Float64Array {
  const n = fractions.length - 1;
  const length = winding.topZ - winding.bottomZ;
  if (!(length > 0) || !(winding.turns > 0)) return out.fill(Number.NaN);
  const scale = Math.max(Math.abs(ringRadius - winding.radius), 1e-3 * (ringRadius + winding.radius));
  const density = winding.turns / length;
  const uAt = (fraction: number) => Math.asinh((winding.bottomZ + fraction * length - ringZ) / scale);
  let lower = uAt(fractions[0]);
  for (let k = 0; k < n; k++) {
    const upper = uAt(fractions[k + 1]);
    // Split at the ring's height (u = 0), where the integrand peaks.
    const integral =
      lower < 0 && upper > 0
        ? integrateInSinhVariable(ringRadius, winding.radius, scale, lower, 0, segmentRule) +
          integrateInSinhVariable(ringRadius, winding.radius, scale, 0, upper, segmentRule)
        : integrateInSinhVariable(ringRadius, winding.radius, scale, lower, upper, segmentRule);
    out[k] = density * integral;
    lower = upper;
  }
  return out;
}
