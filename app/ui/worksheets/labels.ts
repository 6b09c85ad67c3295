import { roundToSignificant } from '../../core/units.js';

/** Labels and units of the model's estimates, in the order printed. */
export const estimateRows = [
  { key: 'tidalVolumeMl', label: 'Tidal volume', unit: 'mL' },
  { key: 'breathsPerMin', label: 'Breathing rate', unit: 'breaths/min' },
  { key: 'minuteVentilationMlMin', label: 'Minute ventilation', unit: 'mL/min' },
  { key: 'trachealDeadSpaceMl', label: 'Tracheal dead space', unit: 'mL' },
  { key: 'lungVolumeMl', label: 'Lung volume', unit: 'mL' },
  { key: 'posteriorSacsMl', label: 'Posterior (caudal) air sacs', unit: 'mL' },
  { key: 'anteriorSacsMl', label: 'Anterior (cranial) air sacs', unit: 'mL' },
  { key: 'airSacVolumeMl', label: 'All air sacs', unit: 'mL' },
  { key: 'heartRatePerMin', label: 'Heart rate', unit: 'beats/min' },
  { key: 'cardiacOutputMlMin', label: 'Cardiac output', unit: 'mL/min' },
] as const;

/** A number rounded for print: `digits` significant figures, whole units kept (1234.5 -> 1235). */
export function figure(value: number, digits = 3): string {
  if (!Number.isFinite(value)) return '-';
  if (value === 0) return '0';
  const whole = Math.max(1, Math.floor(Math.log10(Math.abs(value))) + 1);
  return String(roundToSignificant(value, Math.max(digits, whole)));
}
