/**
 * The builder's warnings: one line each, with the number that triggered it in practical units and
 * the limit it was held against. Every limit here is a rule of thumb and says so.
 */

/** Coupling above which a spark gap tends to quench poorly and racing arcs appear (common practice, REFERENCES §9 [C]: k ≈ 0.10–0.20). */
export const SPARK_GAP_COUPLING_LIMIT = 0.2;
/**
 * Axial gradient (peak voltage over winding length) above which racing arcs along the winding
 * become likely, V/m: about 10 kV per inch ≈ 400 kV/m (common practice, from memory; no source).
 */
export const AXIAL_GRADIENT_LIMIT = 400e3;
/** Tank capacitor rating over the working voltage that builders aim for (common practice, §9 [C]: 1.5–2×). */
export const TANK_RATING_FACTOR = 1.5;
/** Relative mistuning of the primary against the secondary beyond which a warning is given. */
export const TUNING_TOLERANCE = 0.03;

const PREFIXES: ReadonlyArray<[number, string]> = [
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
];

/** A value with an SI prefix and three significant digits, e.g. formatQuantity(4.2e5, 'V') → '420 kV'. */
export function formatQuantity(value: number, unit: string): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`;
  const magnitude = Math.abs(value);
  for (const [factor, prefix] of PREFIXES) {
    if (magnitude >= factor * 0.9995 || factor === 1e-12)
      return `${trim((value / factor).toPrecision(3))} ${prefix}${unit}`;
  }
  return `${value} ${unit}`;
}

/** A dimensionless number to three significant digits. */
export function formatNumber(value: number): string {
  return trim(value.toPrecision(3));
}

function trim(text: string): string {
  return text.includes('e') ? text : text.replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '');
}
