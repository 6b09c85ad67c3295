/**
 * `npm run validate`: runs every published observation as a plan and prints model / published
 * ratios per row, summary lines (all rows, fit and judge splits, induction and recovery) and
 * writes an SVG chart of predicted against published times to test-artifacts/validation/.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { excludedObservations, publishedObservations } from './published-observations.js';
import {
  runObservation,
  summaries,
  targetRatioFactor,
  validationChartSvg,
  type ValidationSummary,
} from './validation-runner.js';

function fixed(value: number | null, digits: number): string {
  return value === null ? 'not reached' : value.toFixed(digits);
}

function summaryLine(summary: ValidationSummary): string {
  return `${summary.label.padEnd(12)} rows ${String(summary.rows).padStart(2)}, reached ${String(summary.reached).padStart(2)}, geometric mean ratio ${fixed(summary.geometricMeanRatio, 2)}, within x${String(targetRatioFactor)}: ${(summary.shareWithinTarget * 100).toFixed(0)} %`;
}

function main(): void {
  const outcomes = publishedObservations.map(runObservation);
  const idWidth = Math.max(...outcomes.map((outcome) => outcome.row.id.length));
  const lines = [
    `Validation against published birds (${String(outcomes.length)} rows; target: model / published within x${String(targetRatioFactor)})`,
    `${'row'.padEnd(idWidth)}  split  endpoint              published  model   ratio`,
    ...outcomes.map(
      (outcome) =>
        `${outcome.row.id.padEnd(idWidth)}  ${outcome.row.split.padEnd(5)}  ${outcome.row.endpoint.padEnd(20)}  ${outcome.row.observedMin.toFixed(2).padStart(9)}  ${fixed(outcome.predictedMin, 2).padStart(6)}  ${fixed(outcome.ratio, 2).padStart(6)}${outcome.withinTarget ? '' : '  outside target'}`,
    ),
    '',
    ...summaries(outcomes).map(summaryLine),
    '',
    `Not run: ${String(excludedObservations.length)} published observation(s) kept out (see docs/validation.md).`,
  ];
  const folder = join('test-artifacts', 'validation');
  mkdirSync(folder, { recursive: true });
  const chartPath = join(folder, 'predicted-vs-published.svg');
  writeFileSync(chartPath, validationChartSvg(outcomes));
  process.stdout.write(`${lines.join('\n')}\nChart: ${chartPath}\n`);
}

try {
  main();
} catch (error: unknown) {
  process.stderr.write(
    `validate failed: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`,
  );
  process.exitCode = 1;
}
