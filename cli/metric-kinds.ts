/**
 * Which kind of quantity each metric is, so that constraint bounds and reference points in sweep files
 * can be written with units ("250 kHz", "2.4 m") and checked for the right kind.
 */
import { METRICS } from '../core/metrics.ts';
import type { QuantityKind } from './units.ts';

const KIND_OF_SI_UNIT: Record<string, QuantityKind> = {
  m: 'length',
  F: 'capacitance',
  H: 'inductance',
  V: 'voltage',
  Hz: 'frequency',
  ohm: 'resistance',
  s: 'time',
  W: 'power',
  kg: 'mass',
  J: 'energy',
  'V/m': 'field',
  '1/m': 'inverse_length',
  '': 'dimensionless',
  count: 'dimensionless',
  A: 'current',
};

/** The kind of a metric's value, or undefined for an unknown metric. */
export function metricKind(key: string): QuantityKind | undefined {
  const info = METRICS.find((m) => m.key === key);
  return info ? (KIND_OF_SI_UNIT[info.unit] ?? 'dimensionless') : undefined;
}
