/**
 * The readable report of one evaluation (`coilfront evaluate FILE`): grouped values with practical
 * units, then the warnings, then the safety cautions.
 */
import { METRICS } from '../core/metrics.ts';
import type { Evaluation } from '../core/evaluate.ts';
import { METRIC_DISPLAY, formatNumber, humanUnit } from './display-units.ts';
import { safetyBlock } from './safety.ts';

interface Group {
  title: string;
  keys: string[];
  note?: string;
}

const GROUPS: Group[] = [
  {
    title: 'Secondary',
    keys: [
      'secondary_turns',
      'winding_length',
      'winding_aspect_ratio',
      'wire_length',
      'wire_mass',
      'secondary_dc_resistance',
      'secondary_ac_resistance',
      'secondary_inductance',
      'secondary_inductance_filament',
      'secondary_q',
    ],
  },
  {
    title: 'Capacitance, field and resonance',
    keys: [
      'secondary_self_capacitance',
      'secondary_self_capacitance_medhurst',
      'topload_capacitance',
      'total_capacitance',
      'resonant_frequency',
      'loaded_resonant_frequency',
      'topload_field_per_volt',
      'topload_peak_field_angle',
      'topload_underside_field_per_volt',
      'winding_top_field_per_volt',
      'air_density_factor',
      'topload_onset_field',
      'breakout_voltage',
    ],
    note: "breakout voltage is a corona-onset estimate (Peek's law), not a guarantee of streamers",
  },
  {
    title: 'The winding as a distributed resonator',
    keys: [
      'resonant_frequency_lumped',
      'overtone_frequency',
      'overtone_ratio',
      'effective_inductance',
      'effective_capacitance',
      'axial_gradient_position',
      'resonator_segments',
    ],
    note: 'with voltage_profile computed (the default); the lumped value is the linear-profile cross-check',
  },
  {
    title: 'Primary, coupling and tuning',
    keys: [
      'primary_full_inductance',
      'primary_tap_turns',
      'primary_inductance',
      'primary_frequency',
      'tuning_error',
      'primary_tap_margin',
      'primary_outer_diameter',
      'mutual_inductance',
      'coupling',
      'full_transfer_coupling',
    ],
  },
  {
    title: 'Energy transfer',
    keys: [
      'primary_resistance',
      'primary_conductor_resistance',
      'gap_resistance',
      'mode_frequency_low',
      'mode_frequency_high',
      'transfer_time',
      'energy_per_shot',
      'input_power',
      'peak_voltage',
      'breakout_margin',
      'topload_peak_field',
      'axial_gradient',
      'primary_strike_margin',
      'tank_voltage_margin',
    ],
  },
  {
    title: 'Breakout point and supports',
    keys: [
      'breakout_point_length',
      'breakout_point_enhancement',
      'breakout_point_base_field_per_volt',
      'breakout_point_onset_field',
      'breakout_point_voltage',
      'peak_voltage_without_point',
      'support_peak_field_per_volt',
      'support_peak_field_position',
      'support_peak_field',
      'support_field_margin',
      'topload_low_field_angle',
      'topload_low_field_per_volt',
    ],
    note: 'the point caps peak_voltage at its firing voltage; the support limit is common practice (1 MV/m unless given)',
  },
  {
    title: 'Outcome',
    keys: ['overall_height', 'spark_length', 'headroom_needed', 'warning_count'],
    note: 'spark length: common practice rule of thumb from input power, not a physical model',
  },
  {
    title: 'Supply, tank bank and safety gap',
    keys: [
      'supply_resonant_capacitance',
      'supply_capacitance_ratio',
      'supply_charge_limit',
      'supply_charge_voltage',
      'supply_charge_ratio',
      'supply_break_rate_estimate',
      'supply_load_fraction',
      'tank_peak_current',
      'tank_rms_current',
      'tank_voltage_reversal',
      'tank_bank_series',
      'tank_bank_parallel',
      'tank_bank_part_count',
      'tank_bank_capacitance',
      'tank_bank_stored_energy',
      'tank_bank_part_voltage',
      'tank_bank_part_rms_current',
      'tank_bank_part_peak_current',
      'tank_bank_bleeder_resistance',
      'tank_bank_bleeder_power',
      'safety_gap_voltage',
      'safety_gap_spacing',
    ],
    note: 'safety-gap spacing from sphere-gap table points typed from memory of IEC 60052: check against the standard',
  },
  {
    title: 'Three-coil system (the secondary drives a separate resonator)',
    keys: [
      'resonator_turns',
      'resonator_effective_inductance',
      'resonator_effective_capacitance',
      'resonator_frequency',
      'resonator_ac_resistance',
      'line_capacitance',
      'line_inductance',
      'junction_capacitance',
      'three_coil_mode_frequency_low',
      'three_coil_mode_frequency_mid',
      'three_coil_mode_frequency_high',
      'three_coil_ratio_error',
      'line_length_for_ratios',
      'three_coil_ratio_error_at_that_length',
      'three_coil_lossless_transfer',
      'three_coil_lossless_transfer_at_that_length',
      'three_coil_capacitance_ratio',
      'three_coil_coupling_ratio',
      'resonator_transfer_time',
      'three_coil_transfer_fraction',
      'resonator_peak_voltage',
      'junction_peak_voltage',
      'resonator_separation_needed',
    ],
    note: 'the secondary is solved without the topload; the topload, its breakout margin and field, the breakout point and the supports belong to the resonator',
  },
];

/** Short labels for the report (the metric descriptions in core/metrics.ts say more). */
const LABELS: Record<string, string> = {
  resonator_turns: 'turns of the resonator',
  resonator_effective_inductance: 'resonator effective inductance at its top',
  resonator_effective_capacitance: 'resonator effective capacitance at its top',
  resonator_frequency: 'resonator fundamental (base grounded)',
  resonator_ac_resistance: 'resonator loop resistance (wire + line)',
  line_capacitance: 'line capacitance to the floor',
  line_inductance: 'line inductance',
  junction_capacitance: 'junction capacitance (secondary top + line)',
  three_coil_mode_frequency_low: 'lowest mode frequency',
  three_coil_mode_frequency_mid: 'middle mode frequency',
  three_coil_mode_frequency_high: 'highest mode frequency',
  three_coil_ratio_error: 'distance of the mode ratios from 1:2:3',
  line_length_for_ratios: 'line length that comes nearest 1:2:3 (with its tap)',
  three_coil_ratio_error_at_that_length: 'distance from 1:2:3 with that line',
  three_coil_lossless_transfer: 'lossless transfer to the resonator top (1 complete)',
  three_coil_lossless_transfer_at_that_length: 'lossless transfer with that line',
  three_coil_capacitance_ratio: 'resonator top / junction capacitance (15/32 ideal)',
  three_coil_coupling_ratio: 'coupling / complete-transfer coupling',
  three_coil_transfer_fraction: 'energy reaching the resonator top, with losses',
  resonator_transfer_time: "time to the first full transfer to the resonator's top",
  resonator_peak_voltage: "resonator's top voltage then",
  junction_peak_voltage: 'largest junction voltage up to then',
  resonator_separation_needed: 'axis distance for negligible secondary-resonator coupling',
  secondary_turns: 'turns',
  resonant_frequency_lumped: 'lumped cross-check (Thomson, linear profile)',
  overtone_frequency: 'first overtone',
  overtone_ratio: 'overtone / fundamental',
  effective_inductance: 'effective inductance at the top',
  effective_capacitance: 'effective capacitance at the top',
  axial_gradient_position: 'steepest gradient at (fraction of length from base)',
  resonator_segments: 'segments of the model',
  winding_length: 'winding length',
  winding_aspect_ratio: 'winding length / form diameter',
  wire_length: 'wire length',
  wire_mass: 'copper mass',
  secondary_dc_resistance: 'DC resistance',
  secondary_ac_resistance: 'AC resistance at resonance (skin + proximity)',
  secondary_inductance: 'inductance (Nagaoka + Rosa)',
  secondary_inductance_filament: 'inductance (loop sum, cross-check)',
  secondary_q: 'Q of the secondary',
  secondary_self_capacitance: 'bare-winding capacitance (field solve)',
  secondary_self_capacitance_medhurst: 'self-capacitance (Medhurst, cross-check)',
  topload_capacitance: 'topload capacitance in place',
  total_capacitance: 'total capacitance at the top (energy based)',
  resonant_frequency: 'resonant frequency',
  loaded_resonant_frequency: 'resonant frequency with streamer loading',
  topload_field_per_volt: 'topload peak surface field per volt',
  topload_underside_field_per_volt: 'topload underside field per volt',
  winding_top_field_per_volt: 'field on the top turns per volt',
  topload_peak_field_angle: 'where the topload peak field sits (from the outer equator)',
  air_density_factor: 'relative air density',
  topload_onset_field: "corona-onset field (Peek's law)",
  breakout_voltage: 'breakout voltage (corona-onset estimate)',
  primary_full_inductance: 'inductance of the whole primary',
  primary_tap_turns: 'tap for tuning (turns from the inner end)',
  primary_inductance: 'inductance at the tap',
  primary_frequency: 'tank frequency at the tap',
  primary_outer_diameter: 'outer ring diameter',
  mutual_inductance: 'mutual inductance',
  coupling: 'coupling coefficient k',
  full_transfer_coupling: 'nearest full-transfer coupling',
  primary_resistance: 'primary loop resistance (conductor + gap)',
  primary_conductor_resistance: 'primary conductor AC resistance',
  gap_resistance: 'gap resistance while conducting',
  mode_frequency_low: 'lower mode frequency',
  mode_frequency_high: 'upper mode frequency',
  transfer_time: 'time to the first energy transfer',
  energy_per_shot: 'energy per shot or burst',
  input_power: 'average input power',
  peak_voltage: 'peak secondary voltage (if the topload held)',
  breakout_margin: 'breakout margin (breakout / peak voltage)',
  topload_peak_field: 'topload peak field at the peak voltage',
  axial_gradient: 'axial gradient along the winding',
  primary_strike_margin: 'primary-to-secondary strike margin',
  tank_voltage_margin: 'tank capacitor rating margin',
  overall_height: 'overall height',
  spark_length: 'spark length (rule of thumb, common practice)',
  tuning_error: 'tank against secondary frequency (tuning error)',
  primary_tap_margin: 'turns left beyond the tap to retune',
  headroom_needed: 'headroom the sparks need (height + spark length, common practice)',
  warning_count: 'warnings',
  // --- appended: supply, tank bank, safety gap ---
  supply_resonant_capacitance: "supply's resonant tank size I/(2πfV)",
  supply_capacitance_ratio: 'tank over resonant size (common practice: outside 0.7–1.4)',
  supply_charge_limit: 'most the supply charges the tank to (lossless)',
  supply_charge_voltage: 'tank voltage at firing',
  supply_charge_ratio: 'firing voltage over that limit',
  supply_break_rate_estimate: 'static gap: firings per second (estimate)',
  supply_load_fraction: 'input power over the rated VA',
  tank_peak_current: 'peak tank current',
  tank_rms_current: 'rms tank current',
  tank_voltage_reversal: 'voltage reversal (fraction of the charge)',
  tank_bank_series: 'bank: parts in series',
  tank_bank_parallel: 'bank: strings in parallel',
  tank_bank_part_count: 'bank: parts',
  tank_bank_capacitance: 'bank capacitance (the tank)',
  tank_bank_stored_energy: 'bank: stored energy',
  tank_bank_part_voltage: 'bank: largest voltage across a part',
  tank_bank_part_rms_current: 'bank: rms current of a part',
  tank_bank_part_peak_current: 'bank: peak current of a part',
  tank_bank_bleeder_resistance: 'bank: bleeder per part, at most (below 50 V in time)',
  tank_bank_bleeder_power: 'bank: bleeder dissipation',
  safety_gap_voltage: 'safety gap fires at',
  safety_gap_spacing: 'safety-gap spacing',
  breakout_point_length: 'breakout point: rod length (surface to tip)',
  breakout_point_enhancement: 'breakout point: tip field enhancement',
  breakout_point_base_field_per_volt: 'breakout point: topload field at its base per volt',
  breakout_point_onset_field: "breakout point: tip onset field (Peek's law)",
  breakout_point_voltage: 'breakout point: firing voltage',
  peak_voltage_without_point: 'peak voltage the coil would reach without the point',
  support_peak_field_per_volt: 'support: largest field along it per volt',
  support_peak_field_position: 'support: where (fraction of its length from the first end)',
  support_peak_field: 'support: largest field at the peak voltage',
  support_field_margin: 'support: field limit / largest field',
  topload_low_field_angle: 'topload: centre of its lowest-field band',
  topload_low_field_per_volt: 'topload: mean field in that band per volt',
};

/**
 * The tuning error, which the model solves to zero in closed form where the tap can reach (the tap is exact):
 * a few units of the last place (2e-16) are rounding, printed as 0, as `compare` treats them.
 */
const ZERO_BY_CONSTRUCTION = new Set(['tuning_error']);
const ROUNDING_NOISE = 1e-9;

function line(key: string, value: number | null): string {
  const info = METRICS.find((m) => m.key === key);
  const label = LABELS[key] ?? info?.description ?? key;
  const display = METRIC_DISPLAY[key];
  let shown = 'n/a';
  if (value !== null) {
    const quiet = ZERO_BY_CONSTRUCTION.has(key) && Math.abs(value) < ROUNDING_NOISE ? 0 : value;
    const scaled = display ? quiet / display.divisor : quiet;
    const unitText = display ? humanUnit(display.label) : info?.unit && info.unit !== 'count' ? info.unit : '';
    shown = `${formatNumber(scaled)}${unitText ? ` ${unitText}` : ''}`;
  }
  return `  ${label.padEnd(58, ' ')} ${shown}`;
}

/** The report as text. */
export function formatReport(file: string, evaluation: Evaluation): string {
  const out: string[] = [`coilfront evaluation of ${file}`, ''];
  const listed = new Set<string>();
  for (const group of GROUPS) {
    const present = group.keys.filter((key) => key in evaluation.metrics);
    for (const key of group.keys) listed.add(key);
    if (present.every((key) => evaluation.metrics[key] === null)) continue;
    out.push(group.title);
    for (const key of present) if (evaluation.metrics[key] !== null) out.push(line(key, evaluation.metrics[key]));
    if (group.note) out.push(`  (${group.note})`);
    out.push('');
  }
  if (evaluation.profile) {
    const row = (values: number[]) => values.map((v) => v.toFixed(2)).join(' ');
    out.push('Fundamental along the winding, base to top, every tenth of its length');
    out.push(`  ${'voltage (1 at the top)'.padEnd(28, ' ')} ${row(evaluation.profile.voltage)}`);
    out.push(`  ${'current (1 at its largest)'.padEnd(28, ' ')} ${row(evaluation.profile.current)}`);
    out.push('');
  }
  const others = Object.keys(evaluation.metrics).filter((key) => !listed.has(key) && evaluation.metrics[key] !== null);
  if (others.length > 0) {
    out.push('Other');
    for (const key of others) out.push(line(key, evaluation.metrics[key]));
    out.push('');
  }
  out.push(evaluation.warnings.length > 0 ? 'Warnings' : 'Warnings: none');
  for (const warning of evaluation.warnings) out.push(`  - ${warning.message} [${warning.key}]`);
  out.push('', safetyBlock(), '');
  return out.join('\n');
}
