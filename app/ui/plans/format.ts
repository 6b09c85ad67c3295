/** Number with a sensible precision for the screen: 3 significant figures, no trailing zeros. */
export function figure(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(value)));
  const decimals = Math.max(0, Math.min(4, digits - 1 - magnitude));
  return String(Number(value.toFixed(decimals)));
}

/** Minutes as "4.2 min", or a plain statement when the milestone is not reached. */
export function minutes(value: number | null | undefined, notReached = 'not reached'): string {
  return value === null || value === undefined ? notReached : `${figure(value, 2)} min`;
}

/** A p5-p95 range in minutes. */
export function range(percentiles: { p5: number; p95: number } | null | undefined): string {
  return percentiles === null || percentiles === undefined
    ? 'range not available'
    : `${figure(percentiles.p5, 2)}-${figure(percentiles.p95, 2)} min`;
}

/** Plain names of the waste-gas sources the budget reports (`source` in the plan result). */
const wasteGasSourceLabels: Readonly<Record<string, string>> = {
  maskLeak: 'Mask leak',
  chamberOpened: 'Chamber opened',
  exhaust: 'Exhaust reaching the room',
};

export function wasteGasSourceLabel(source: string): string {
  return wasteGasSourceLabels[source] ?? source;
}
