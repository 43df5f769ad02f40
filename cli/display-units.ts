/**
 * Practical units for people: the unit each metric and each design field is shown in, in reports and
 * in CSV column names (`resonant_frequency_kHz`, `wire_length_m`, `form_diameter_mm`). Values are
 * SI everywhere else; this is the only place they are scaled.
 */
import type { DisplayUnit, QuantityKind } from './units.ts';

const unit = (label: string, divisor: number): DisplayUnit => ({ label, divisor });

/** Display unit of each metric (metrics not listed are shown in their SI unit). */
export const METRIC_DISPLAY: Record<string, DisplayUnit> = {
  winding_length: unit('mm', 1e-3),
  wire_length: unit('m', 1),
  wire_mass: unit('kg', 1),
  secondary_dc_resistance: unit('ohm', 1),
  secondary_ac_resistance: unit('ohm', 1),
  secondary_inductance: unit('mH', 1e-3),
  secondary_inductance_filament: unit('mH', 1e-3),
  secondary_self_capacitance: unit('pF', 1e-12),
  secondary_self_capacitance_medhurst: unit('pF', 1e-12),
  topload_capacitance: unit('pF', 1e-12),
  total_capacitance: unit('pF', 1e-12),
  resonant_frequency: unit('kHz', 1e3),
  loaded_resonant_frequency: unit('kHz', 1e3),
  resonant_frequency_lumped: unit('kHz', 1e3),
  overtone_frequency: unit('kHz', 1e3),
  effective_inductance: unit('mH', 1e-3),
  effective_capacitance: unit('pF', 1e-12),
  topload_field_per_volt: unit('per_m', 1),
  topload_peak_field_angle: unit('deg', Math.PI / 180),
  topload_underside_field_per_volt: unit('per_m', 1),
  winding_top_field_per_volt: unit('per_m', 1),
  topload_onset_field: unit('kV_per_cm', 1e5),
  breakout_voltage: unit('kV', 1e3),
  primary_inductance: unit('uH', 1e-6),
  primary_full_inductance: unit('uH', 1e-6),
  primary_frequency: unit('kHz', 1e3),
  mutual_inductance: unit('uH', 1e-6),
  primary_outer_diameter: unit('mm', 1e-3),
  primary_resistance: unit('ohm', 1),
  mode_frequency_low: unit('kHz', 1e3),
  mode_frequency_high: unit('kHz', 1e3),
  transfer_time: unit('us', 1e-6),
  energy_per_shot: unit('J', 1),
  input_power: unit('W', 1),
  peak_voltage: unit('kV', 1e3),
  topload_peak_field: unit('kV_per_cm', 1e5),
  axial_gradient: unit('kV_per_m', 1e3),
  overall_height: unit('m', 1),
  spark_length: unit('m', 1),
  headroom_needed: unit('m', 1),
  // --- appended: supply, tank bank, safety gap ---
  supply_resonant_capacitance: unit('nF', 1e-9),
  supply_charge_limit: unit('kV', 1e3),
  supply_charge_voltage: unit('kV', 1e3),
  tank_bank_capacitance: unit('nF', 1e-9),
  tank_bank_part_voltage: unit('kV', 1e3),
  tank_bank_bleeder_resistance: unit('Mohm', 1e6),
  safety_gap_voltage: unit('kV', 1e3),
  safety_gap_spacing: unit('mm', 1e-3),
  // --- appended: three-coil systems ---
  resonator_effective_inductance: unit('mH', 1e-3),
  resonator_effective_capacitance: unit('pF', 1e-12),
  resonator_frequency: unit('kHz', 1e3),
  line_capacitance: unit('pF', 1e-12),
  line_inductance: unit('uH', 1e-6),
  junction_capacitance: unit('pF', 1e-12),
  three_coil_mode_frequency_low: unit('kHz', 1e3),
  three_coil_mode_frequency_mid: unit('kHz', 1e3),
  three_coil_mode_frequency_high: unit('kHz', 1e3),
  resonator_transfer_time: unit('us', 1e-6),
  resonator_peak_voltage: unit('kV', 1e3),
  junction_peak_voltage: unit('kV', 1e3),
  resonator_ac_resistance: unit('ohm', 1),
  resonator_separation_needed: unit('m', 1),
  line_length_for_ratios: unit('m', 1),
  breakout_point_length: unit('mm', 1e-3),
  breakout_point_base_field_per_volt: unit('per_m', 1),
  breakout_point_onset_field: unit('kV_per_cm', 1e5),
  breakout_point_voltage: unit('kV', 1e3),
  peak_voltage_without_point: unit('kV', 1e3),
  support_peak_field_per_volt: unit('per_m', 1),
  support_peak_field: unit('kV_per_cm', 1e5),
  topload_low_field_angle: unit('deg', Math.PI / 180),
  topload_low_field_per_volt: unit('per_m', 1),
};

/** Display unit of each kind of design quantity. */
export const KIND_DISPLAY: Record<QuantityKind, DisplayUnit> = {
  length: unit('mm', 1e-3),
  capacitance: unit('nF', 1e-9),
  inductance: unit('uH', 1e-6),
  voltage: unit('kV', 1e3),
  current: unit('A', 1),
  frequency: unit('Hz', 1),
  power: unit('W', 1),
  angle: unit('deg', Math.PI / 180),
  temperature: unit('K', 1),
  time: unit('us', 1e-6),
  resistance: unit('ohm', 1),
  mass: unit('kg', 1),
  energy: unit('J', 1),
  field: unit('kV_per_cm', 1e5),
  inverse_length: unit('per_m', 1),
  dimensionless: unit('', 1),
};

/** Human spelling of a display label: 'kV_per_cm' → 'kV/cm', 'us' → 'µs', 'per_m' → '/m'. */
export function humanUnit(label: string): string {
  return label.replace(/^per_/, '/').replace(/_per_/g, '/').replace(/^us$/, 'µs').replace(/^uH$/, 'µH');
}

/** A number with a few significant digits for reports: 44.40, 0.1234, 1.235e+6. */
export function formatNumber(value: number, digits = 4): string {
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e7 || magnitude < 1e-4) return value.toExponential(digits - 1);
  return String(Number(value.toPrecision(digits)));
}

// --- appended: one rule for lengths in the human-readable views ---

/**
 * Design fields whose lengths are of the site, not of the machine: shown in metres whatever their
 * size (an altitude in millimetres reads as a slip). Other lengths follow `lengthDisplay`.
 */
export const SITE_LENGTH_FIELDS: ReadonlySet<string> = new Set(['environment.altitude']);

const MILLIMETRES = unit('mm', 1e-3);
const METRES = unit('m', 1);
const KILOMETRES = unit('km', 1e3);

/**
 * The unit a builder reads a length in, from the largest of the values shown together (a row of
 * `compare`, one figure of a drawing or a sheet): millimetres below 10 m (forms, wire, rings, gaps,
 * heights of a bench machine), metres from 10 m (wire to buy, site lengths), kilometres from 10 km.
 * A site field (SITE_LENGTH_FIELDS) is in metres at least. One rule for every human-readable view;
 * CSV columns keep their fixed units (KIND_DISPLAY, METRIC_DISPLAY) so a column never changes unit.
 */
export function lengthDisplay(metres: readonly number[], field?: string): DisplayUnit {
  const largest = Math.max(0, ...metres.filter(Number.isFinite).map(Math.abs));
  if (largest >= 1e4) return KILOMETRES;
  if (largest >= 10 || (field !== undefined && SITE_LENGTH_FIELDS.has(field))) return METRES;
  return MILLIMETRES;
}

/** A length as text in the unit `lengthDisplay` picks for it: '160 mm', '312.5 m', '1500 m'. */
export function lengthText(metres: number, digits = 4, field?: string): string {
  const display = lengthDisplay([metres], field);
  return `${formatNumber(metres / display.divisor, digits)} ${display.label}`;
}

/**
 * The unit a design field of a given kind is shown in, in the human-readable views (compare, show,
 * sheet): lengths by `lengthDisplay` over the values shown together, every other kind by
 * KIND_DISPLAY.
 */
export function fieldDisplay(field: string, kind: QuantityKind, values: readonly number[]): DisplayUnit {
  return kind === 'length' ? lengthDisplay(values, field) : KIND_DISPLAY[kind];
}
