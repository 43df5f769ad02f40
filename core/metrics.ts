/**
 * The metric contract: every key `coilfront evaluate --json` prints, in a fixed order, with the SI
 * unit of its value. The order is also the column order of the typed arrays that workers return
 * and of the metric columns of every CSV, so it is part of the file contract: append, never
 * reorder or rename. A metric a design cannot have is `null` (NaN in typed arrays).
 */

export interface MetricInfo {
  /** snake_case key, stable. */
  key: string;
  /** SI unit of the value ('' for dimensionless, 'count' for counts). */
  unit: string;
  /** One-line meaning, for the README and the report. */
  description: string;
}

function metric(key: string, unit: string, description: string): MetricInfo {
  return { key, unit, description };
}

export const METRICS: readonly MetricInfo[] = [
  // --- secondary (magnetics) ---
  metric('secondary_turns', 'count', 'turns of the secondary winding'),
  metric('winding_length', 'm', 'axial length of the secondary winding'),
  metric('winding_aspect_ratio', '', 'winding length over form diameter'),
  metric('wire_length', 'm', 'length of secondary wire, helical'),
  metric('wire_mass', 'kg', 'mass of the secondary copper'),
  metric('secondary_dc_resistance', 'ohm', 'DC resistance of the secondary at the environment temperature'),
  metric(
    'secondary_ac_resistance',
    'ohm',
    'AC resistance of the secondary at its resonant frequency (skin and proximity effect)',
  ),
  metric('secondary_inductance', 'H', 'low-frequency inductance of the secondary (Nagaoka with Rosa corrections)'),
  metric('secondary_inductance_filament', 'H', 'the same by an exact sum over coaxial round-wire loops (cross-check)'),
  // --- capacitance and resonance (electrostatics) ---
  metric('secondary_self_capacitance', 'F', 'effective capacitance of the bare winding over the floor (field solve)'),
  metric('secondary_self_capacitance_medhurst', 'F', "Medhurst's empirical self-capacitance (cross-check)"),
  metric('topload_capacitance', 'F', 'charge on the topload per volt at the top, in situ'),
  metric('total_capacitance', 'F', 'energy-based effective capacitance at the top of the winding, 2W/V²'),
  metric('resonant_frequency', 'Hz', 'unloaded resonant frequency of the secondary with its topload'),
  metric('loaded_resonant_frequency', 'Hz', 'resonant frequency with streamer loading added at the top'),
  metric('topload_field_per_volt', '1/m', 'peak surface field on the topload per volt at the top'),
  metric('topload_underside_field_per_volt', '1/m', 'surface field at the underside of the topload per volt'),
  metric(
    'winding_top_field_per_volt',
    '1/m',
    'mean outward surface field over the top 5 % of the winding sheet, per volt',
  ),
  metric('topload_onset_field', 'V/m', "Peek's corona-onset surface field for the topload's curvature"),
  metric('air_density_factor', '', 'relative air density from altitude and temperature'),
  metric('breakout_voltage', 'V', 'top voltage at which the topload reaches corona onset (estimate)'),
  // --- primary, coupling and tuning (magnetics) ---
  metric('primary_inductance', 'H', 'inductance of the primary as tapped (whole primary when no tank)'),
  metric('primary_tap_turns', 'count', 'turns from the inner end at which the primary tunes to the secondary'),
  metric('primary_full_inductance', 'H', 'inductance of the whole primary'),
  metric('primary_frequency', 'Hz', 'resonant frequency of the tank at the reported tap'),
  metric('mutual_inductance', 'H', 'mutual inductance between the tapped primary and the secondary'),
  metric('coupling', '', 'coupling coefficient k = M / sqrt(L1 L2)'),
  metric('primary_outer_diameter', 'm', 'diameter of the outermost primary ring'),
  // --- losses and dynamics ---
  metric(
    'primary_resistance',
    'ohm',
    "series resistance of the primary loop as simulated: the tapped conductor's AC resistance at the tank frequency plus, for a spark gap, the gap's equivalent resistance while conducting (primary_conductor_resistance + gap_resistance)",
  ),
  metric('secondary_q', '', 'quality factor of the loaded secondary, 2πfL/R'),
  metric('mode_frequency_low', 'Hz', 'lower normal-mode frequency of the coupled circuit'),
  metric('mode_frequency_high', 'Hz', 'upper normal-mode frequency of the coupled circuit'),
  metric('full_transfer_coupling', '', 'the full-transfer coupling (2n+1)/(2n²+2n+1) nearest the design'),
  metric('transfer_time', 's', "first minimum of the primary's stored energy"),
  metric('energy_per_shot', 'J', 'energy delivered to the primary per shot or burst'),
  metric('input_power', 'W', 'average input power, energy per shot × repetition rate'),
  metric('peak_voltage', 'V', 'peak secondary voltage if the topload held'),
  metric('breakout_margin', '', 'breakout voltage over peak voltage'),
  metric('topload_peak_field', 'V/m', 'peak topload surface field at the peak voltage'),
  metric(
    'axial_gradient',
    'V/m',
    'steepest voltage gradient along the winding at the peak voltage (from the profile; linear: peak voltage over the winding length)',
  ),
  metric(
    'primary_strike_margin',
    '',
    'air-gap withstand between the primary outer ring and the winding over the voltage there',
  ),
  metric(
    'tank_voltage_margin',
    '',
    'capacitor rating over the charge voltage (spark gap) or over the peak tank voltage of the burst (solid state)',
  ),
  // --- outcome ---
  metric('overall_height', 'm', 'highest point of the topload (or winding) above the floor'),
  metric('spark_length', 'm', 'spark length estimate from input power (common practice, rule of thumb)'),
  // --- appended: the parts of primary_resistance ---
  metric(
    'primary_conductor_resistance',
    'ohm',
    'AC resistance (skin effect) of the tapped primary conductor at the tank frequency',
  ),
  metric(
    'gap_resistance',
    'ohm',
    "spark gap's equivalent resistance while conducting (included in primary_resistance; common practice 1 ohm unless given)",
  ),
  // --- appended: electrostatics ---
  metric(
    'topload_peak_field_angle',
    'rad',
    'where the topload peak field sits: angle around the tube (toroid) or elevation (sphere) from the outer equator, positive upward',
  ),
  // --- appended: tuning as a requirement, warnings, headroom ---
  metric(
    'tuning_error',
    '',
    "tank frequency at the tap over the secondary's resonant frequency, minus 1 (signed fraction; beyond ±0.03 the design is infeasible unless primary.require_tuning is false)",
  ),
  metric(
    'primary_tap_margin',
    'count',
    'turns between the tap and the nearer end of its range (one turn from the inner end, or the last turn): room left to retune',
  ),
  metric('warning_count', 'count', "number of the builder's warnings the design carries"),
  metric(
    'headroom_needed',
    'm',
    'overall height plus the spark length estimate (common practice: sparks reach about their length upward): the ceiling the sparks need',
  ),
  metric(
    'resonant_frequency_lumped',
    'Hz',
    "lumped cross-check: Thomson's 1/(2π√(L·C)) with the winding's inductance and the capacitance of the linear (or given) profile",
  ),
  metric('overtone_frequency', 'Hz', "first overtone of the winding's distributed resonance (computed profile)"),
  metric('overtone_ratio', '', 'first overtone over the fundamental (a uniform line would give 3)'),
  metric(
    'effective_inductance',
    'H',
    'inductance seen at the top at the fundamental: with effective_capacitance, the same frequency and stored energy',
  ),
  metric(
    'effective_capacitance',
    'F',
    'capacitance seen at the top at the fundamental: the stored energy of the computed profile over ½V² at the top',
  ),
  metric(
    'axial_gradient_position',
    '',
    'where the steepest voltage gradient along the winding sits, as a fraction of its length from the base',
  ),
  metric('resonator_segments', 'count', 'segments of the distributed model of the winding, chosen by convergence'),
  metric(
    'build_yield',
    '',
    "fraction of the sweep's tolerance draws (tolerances.sweep_draws) that would be feasible candidates; only in sweeps that ask for it",
  ),
];

export const METRIC_KEYS: readonly string[] = METRICS.map((m) => m.key);

export type Metrics = Record<string, number | null>;

/** A fresh metrics record with every key of the contract set to null. */
export function emptyMetrics(): Metrics {
  const metrics: Metrics = {};
  for (const key of METRIC_KEYS) metrics[key] = null;
  return metrics;
}

const METRIC_INDEX = new Map(METRIC_KEYS.map((key, index) => [key, index]));

/** Column index of a metric in typed-array rows, or -1 for an unknown key. */
export function metricIndex(key: string): number {
  return METRIC_INDEX.get(key) ?? -1;
}
