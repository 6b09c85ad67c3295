/** Median of a sample (ms or any unit); the sample is copied, not sorted in place. */
export function median(values: readonly number[]): number {
  return quantile(values, 0.5);
}

/** Linear-interpolated quantile, q in [0, 1]. */
export function quantile(values: readonly number[], q: number): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const position = (sorted.length - 1) * q;
  const lower = Math.floor(position);
  const upper = Math.ceil(position);
  const low = sorted[lower] ?? Number.NaN;
  const high = sorted[upper] ?? Number.NaN;
  return low + (high - low) * (position - lower);
}

export type Figure = {
  readonly name: string;
  readonly value: number;
  readonly unit: string;
  readonly note?: string;
};

/** Prints figures as an aligned table, one per line. */
export function printFigures(title: string, figures: readonly Figure[]): void {
  process.stdout.write(`\n${title}\n`);
  const width = Math.max(...figures.map((figure) => figure.name.length));
  for (const figure of figures) {
    const value = Number.isInteger(figure.value)
      ? String(figure.value)
      : figure.value.toFixed(figure.value < 1 ? 4 : 2);
    process.stdout.write(
      `  ${figure.name.padEnd(width)}  ${value.padStart(10)} ${figure.unit}${figure.note === undefined ? '' : `  (${figure.note})`}\n`,
    );
  }
}
