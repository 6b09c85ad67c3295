/**
 * `npm run validate`: runs every published observation as a plan and prints model / published
 * ratios per row, summary lines (all rows, fit and judge splits, induction and recovery) and
 * writes an SVG chart of predicted against published times to test-artifacts/validation/.
 * `npm run validate -- --explore` also prints how the ratios move with the two milestone
 * thresholds a plan can set, per split, so a fit on the fit split can be judged on the other.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { excludedObservations, publishedObservations } from './published-observations.js';
import type { PublishedObservation } from './published-observations.js';
import {
  endpointMilestones,
  runObservation,
  summaries,
  summarise,
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

function exploreLines(rows: readonly PublishedObservation[]): string[] {
  const sweeps = [
    {
      phase: 'induction' as const,
      name: 'targetMacMultiple',
      values: [1.2, 1, 0.8, 0.7, 0.6],
    },
    {
      phase: 'recovery' as const,
      name: 'recoveryMacFraction',
      values: [0.4, 0.3, 0.25, 0.2, 0.15],
    },
  ];
  const lines = ['', 'Exploration (not adopted): ratios as one plan threshold changes'];
  for (const sweep of sweeps) {
    const phaseRows = rows.filter((row) => endpointMilestones[row.endpoint].phase === sweep.phase);
    lines.push(`${sweep.phase}: ${sweep.name} -> ${phaseRows.map((row) => row.id).join(', ')}`);
    for (const value of sweep.values) {
      const outcomes = phaseRows.map((row) => runObservation(row, { [sweep.name]: value }));
      const fit = summarise(
        'fit',
        outcomes.filter((outcome) => outcome.row.split === 'fit'),
      );
      const judge = summarise(
        'judge',
        outcomes.filter((outcome) => outcome.row.split === 'judge'),
      );
      lines.push(
        `  ${String(value).padEnd(4)}  ratios ${outcomes.map((outcome) => fixed(outcome.ratio, 2)).join(' ')}  |  fit gm ${fixed(fit.geometricMeanRatio, 2)} (${(fit.shareWithinTarget * 100).toFixed(0)} % within)  judge gm ${fixed(judge.geometricMeanRatio, 2)} (${(judge.shareWithinTarget * 100).toFixed(0)} % within)`,
      );
    }
  }
  return lines;
}

function main(): void {
  const outcomes = publishedObservations.map((row) => runObservation(row));
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
    ...(process.argv.includes('--explore') ? exploreLines(publishedObservations) : []),
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
