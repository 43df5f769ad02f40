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
  metric(
    'peak_voltage',
    'V',
    'peak secondary voltage if the topload held (with a breakout point: capped at its firing voltage)',
  ),
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
  metric('overall_height', 'm', 'highest conductor above the floor: topload, breakout point, winding or feed line'),
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
  // --- appended: supply, tank bank, safety gap ---
  metric(
    'supply_resonant_capacitance',
    'F',
    "tank capacitance that resonates with the supply's reactance at mains frequency, I/(2πfV)",
  ),
  metric(
    'supply_capacitance_ratio',
    '',
    "the tank's capacitance over the supply's resonant size (common practice: stay outside 0.7–1.4)",
  ),
  metric(
    'supply_charge_limit',
    'V',
    'peak tank voltage the supply reaches without firing, √2·V / abs(1 − C/C_res) (lossless bound)',
  ),
  metric(
    'supply_charge_voltage',
    'V',
    'tank voltage at firing as simulated: the static gap setting, or the charge a rotary gap reaches',
  ),
  metric('supply_charge_ratio', '', 'supply_charge_voltage over supply_charge_limit'),
  metric(
    'supply_break_rate_estimate',
    'Hz',
    "static gap: firings per second the supply's mean rectified current gives at the setting (estimate)",
  ),
  metric('supply_load_fraction', '', "input power over the supply's rated VA"),
  metric('tank_bank_series', 'count', 'parts in series per string of the tank bank'),
  metric('tank_bank_parallel', 'count', 'strings in parallel of the tank bank'),
  metric('tank_bank_part_count', 'count', 'parts in the tank bank, series × parallel'),
  metric('tank_bank_capacitance', 'F', "the bank's capacitance, parallel × part / series (the tank's capacitance)"),
  metric('tank_bank_stored_energy', 'J', 'energy the bank holds at the working voltage, ½CV²'),
  metric(
    'tank_bank_part_voltage',
    'V',
    'largest voltage across one part (the tank voltage of either polarity over the series count)',
  ),
  metric('tank_peak_current', 'A', 'largest tank (primary) current of one shot'),
  metric('tank_rms_current', 'A', 'rms tank current: √(break rate × ∫i1²dt over one shot)'),
  metric('tank_voltage_reversal', '', 'largest reverse tank voltage of one shot over the charge voltage'),
  metric('tank_bank_part_rms_current', 'A', 'rms current of one part, tank_rms_current over the parallel count'),
  metric('tank_bank_part_peak_current', 'A', 'peak current of one part, tank_peak_current over the parallel count'),
  metric(
    'tank_bank_bleeder_resistance',
    'ohm',
    'largest bleeder per part that brings the bank below 50 V within the bleed time',
  ),
  metric('tank_bank_bleeder_power', 'W', 'dissipation of one bleeder at the working voltage'),
  metric('safety_gap_voltage', 'V', 'voltage at which the safety gap is set to fire, fire_at × charge voltage'),
  metric(
    'safety_gap_spacing',
    'm',
    'safety-gap spacing for that voltage (sphere gaps: IEC 60052 table points from memory, air-density corrected)',
  ),
  // --- appended: three-coil systems (a separate resonator fed through a line) ---
  metric('resonator_turns', 'count', 'turns of the separate resonator'),
  metric(
    'resonator_effective_inductance',
    'H',
    "the resonator's effective inductance at its top (distributed model, base grounded)",
  ),
  metric(
    'resonator_effective_capacitance',
    'F',
    "the resonator's effective capacitance at its top, with the topload (distributed model)",
  ),
  metric('resonator_frequency', 'Hz', "the resonator's own fundamental with its topload, base grounded"),
  metric('line_capacitance', 'F', 'capacitance of the connecting line to the floor, 2πε0 ℓ / arcosh(h/a)'),
  metric('line_inductance', 'H', 'series inductance of the connecting line over the floor, (μ0/2π) ℓ arcosh(h/a)'),
  metric(
    'junction_capacitance',
    'F',
    "capacitance at the junction: the secondary's own top capacitance (winding alone) plus the line's",
  ),
  metric('three_coil_mode_frequency_low', 'Hz', 'lowest of the three ringing frequencies of the three-coil circuit'),
  metric('three_coil_mode_frequency_mid', 'Hz', 'middle ringing frequency of the three-coil circuit'),
  metric('three_coil_mode_frequency_high', 'Hz', 'highest ringing frequency of the three-coil circuit'),
  metric(
    'three_coil_ratio_error',
    '',
    'distance of the lossless mode ratios from the complete-transfer 1:2:3: √((f2/f1 − 2)² + (f3/f1 − 3)²)',
  ),
  metric(
    'resonator_transfer_time',
    's',
    "first full transfer to the resonator's top: the largest top voltage before its envelope (per period of the lowest mode) stops rising",
  ),
  metric(
    'resonator_peak_voltage',
    'V',
    "the resonator's top voltage at resonator_transfer_time (also peak_voltage; a breakout point caps both)",
  ),
  metric('junction_peak_voltage', 'V', 'largest voltage at the junction (top of the secondary) up to that time'),
  metric(
    'resonator_ac_resistance',
    'ohm',
    "series resistance of the resonator's loop: its wire's AC resistance for its mode's current plus the line's conductor",
  ),
  metric(
    'line_length_for_ratios',
    'm',
    'the line length (0.1 to 4 times the given one, same conductor and height) that, with its own best tap, comes nearest complete transfer (the largest three_coil_lossless_transfer)',
  ),
  metric('three_coil_ratio_error_at_that_length', '', 'three_coil_ratio_error with that line length and its tap'),
  metric(
    'resonator_separation_needed',
    'm',
    'axis distance beyond which the secondary–resonator coupling stays below 1 % of the primary coupling',
  ),
  // --- appended: a breakout point and the supports ---
  metric(
    'breakout_point_length',
    'm',
    "height of the breakout point from the topload's surface to its tip (given, or solved for fire_at)",
  ),
  metric(
    'breakout_point_enhancement',
    '',
    'field enhancement at the tip of the breakout point: a hemisphere-capped rod on a plane in a uniform field',
  ),
  metric(
    'breakout_point_base_field_per_volt',
    '1/m',
    "topload's own surface field per volt where the breakout point stands",
  ),
  metric(
    'breakout_point_onset_field',
    'V/m',
    "Peek's corona-onset field for the tip radius (held at its 1 mm value below 1 mm)",
  ),
  metric('breakout_point_voltage', 'V', 'top voltage at which the tip of the breakout point reaches corona onset'),
  metric(
    'peak_voltage_without_point',
    'V',
    'peak secondary voltage the dynamics give before the breakout point caps it (peak_voltage is then the lower of this and breakout_point_voltage)',
  ),
  metric('support_peak_field_per_volt', '1/m', 'largest field along the support per volt at the top'),
  metric(
    'support_peak_field_position',
    '',
    "where that field sits: fraction of the support's length from its first end (a column: its foot)",
  ),
  metric('support_peak_field', 'V/m', 'largest field along the support at the peak voltage'),
  metric(
    'support_field_margin',
    '',
    "support field limit (common practice 1 MV/m unless given) over the support's largest field at the peak voltage",
  ),
  metric(
    'topload_low_field_angle',
    'rad',
    "centre of the band (a twelfth of the topload's meridian) with the lowest surface field, where supports are best brought in; angle as topload_peak_field_angle",
  ),
  metric('topload_low_field_per_volt', '1/m', 'mean surface field over that band per volt at the top'),
  metric(
    'build_yield',
    '',
    "fraction of the sweep's tolerance draws (tolerances.sweep_draws) that would be feasible candidates; only in sweeps that ask for it",
  ),
  // --- appended: three-coil tuning for complete transfer ---
  metric(
    'three_coil_lossless_transfer',
    '',
    "fraction of the tank's energy on the resonator's top at half a period of the lowest mode, lossless circuit (1 at complete transfer)",
  ),
  metric(
    'three_coil_lossless_transfer_at_that_length',
    '',
    'three_coil_lossless_transfer with line_length_for_ratios and its tap',
  ),
  metric(
    'three_coil_transfer_fraction',
    '',
    "fraction of the energy per shot on the resonator's top at resonator_transfer_time, with every loss (½C3 v3² / ½C1 V²)",
  ),
  metric(
    'three_coil_capacitance_ratio',
    '',
    "the resonator's top capacitance over the junction's, C3/C2 (15/32 at complete transfer)",
  ),
  metric('three_coil_coupling_ratio', '', 'coupling over the complete-transfer coupling √(5/11) = 0.674'),
  ...[1, 2, 3, 4].map((k) =>
    metric(
      `build_quantile_${k}`,
      '',
      `quantile merit ${k} of the sweep file (objectives first, then constraints, in the file's order): that quantile of its metric over the sweep's tolerance draws, in SI; only in sweeps that ask for it`,
    ),
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
