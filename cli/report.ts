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
    title: 'Outcome',
    keys: ['overall_height', 'spark_length', 'headroom_needed', 'warning_count'],
    note: 'spark length: common practice rule of thumb from input power, not a physical model',
  },
];

/** Short labels for the report (the metric descriptions in core/metrics.ts say more). */
const LABELS: Record<string, string> = {
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
};

function line(key: string, value: number | null): string {
  const info = METRICS.find((m) => m.key === key);
  const label = LABELS[key] ?? info?.description ?? key;
  const display = METRIC_DISPLAY[key];
  let shown = 'n/a';
  if (value !== null) {
    const scaled = display ? value / display.divisor : value;
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
