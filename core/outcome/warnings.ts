/**
 * The builder's warnings: one line each, with the number that triggered it in practical units and
 * the limit it was held against. Every limit here is a rule of thumb and says so.
 */

/** Coupling above which a spark gap tends to quench poorly and racing arcs appear (common practice, refs §9 [C]: k ≈ 0.10–0.20). */
export const SPARK_GAP_COUPLING_LIMIT = 0.2;
/**
 * Axial gradient (peak voltage over winding length) above which racing arcs along the winding
 * become likely, V/m: about 10 kV per inch ≈ 400 kV/m (common practice, from memory; no source).
 */
export const AXIAL_GRADIENT_LIMIT = 400e3;
/** Tank capacitor rating over the working voltage that builders aim for (common practice, §9 [C]: 1.5–2×). */
export const TANK_RATING_FACTOR = 1.5;
/**
 * Relative mistuning of the tank against the secondary beyond which a design does not count as
 * tuned (|tuning_error| > 3 %: infeasible unless primary.require_tuning is false). Common practice:
 * builders retune when the tank is a few per cent off; the number is ours, not from a source.
 */
export const TUNING_TOLERANCE = 0.03;
/**
 * A breakout point that fires below this share of the peak voltage the coil would reach without it
 * clips the coil's swing to little use (common practice: the point should take the discharge near
 * the top of the swing; the number 0.5 is ours).
 */
export const POINT_USEFUL_FRACTION = 0.5;

/**
 * Every warning the core can give, by a stable short key (the CSV's warnings column names these,
 * joined by ';'). Append, never reorder: a row stores its warnings as a bit mask over this list.
 */
export const WARNING_KEYS = [
  'wire_table_extrapolated',
  'primary_untuned',
  'fixed_tap_mistuned',
  'gap_coupling_high',
  'no_charge_voltage',
  'no_ringing_modes',
  'no_transfer',
  'burst_not_simulated',
  'burst_truncated',
  'current_limit_reached',
  'breakout_during_burst',
  'tank_rating_exceeded',
  'tank_rating_low',
  'topload_breaks_out_early',
  'topload_never_breaks_out',
  'axial_gradient_high',
  'primary_strike_risk',
  'strike_rail_needed',
  'resonator_unconverged',
  // --- appended: supply and safety gap ---
  'supply_resonant_rise',
  'supply_overloaded',
  'safety_gap_outside_table',
  // --- appended: three-coil systems ---
  'resonator_too_close',
  'breakout_point_fires_low',
  'breakout_point_above_topload',
  'breakout_point_never_fires',
  'breakout_point_beyond_model',
  'support_field_high',
] as const;

export type WarningKey = (typeof WARNING_KEYS)[number];

/** One builder's warning: its stable key and the line a person reads, with the numbers. */
export interface DesignWarning {
  readonly key: WarningKey;
  readonly message: string;
}

const WARNING_BIT = new Map<string, number>(WARNING_KEYS.map((key, index) => [key, index]));
// Warning sets travel as 32-bit masks (batch results, packed rows, checkpoints): a 33rd key would
// silently alias the first. Widening the mask is a format change of the checkpoint and the journal.
if (WARNING_KEYS.length > 32)
  throw new Error(`internal error: ${WARNING_KEYS.length} warning keys exceed the 32-bit mask`);

/** The bit mask of a list of warnings (bit i set when WARNING_KEYS[i] is among them). */
export function warningMask(warnings: readonly DesignWarning[]): number {
  let mask = 0;
  for (const warning of warnings) mask |= 1 << (WARNING_BIT.get(warning.key) ?? 0);
  return mask >>> 0;
}

/** The keys of a warning mask, in the order of WARNING_KEYS. */
export function warningKeysOf(mask: number): WarningKey[] {
  const keys: WarningKey[] = [];
  WARNING_KEYS.forEach((key, index) => {
    if ((mask >>> index) & 1) keys.push(key);
  });
  return keys;
}

/** The number of warnings in a mask. */
export function warningCountOf(mask: number): number {
  let count = 0;
  for (let bits = mask >>> 0; bits !== 0; bits &= bits - 1) count++;
  return count;
}

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
