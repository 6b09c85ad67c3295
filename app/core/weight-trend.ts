/**
 * Weight trend of one bird: change since the previous and the first weight, with the weight-loss
 * bands <5, <10, <15, <20 and >20 % used for pain scoring in birds (IVAPM pain scale for birds),
 * and warnings for a weight outside the species' typical range or one that looks like a unit slip.
 */
import type { CautionSeverity } from './cautions.js';
import { checkMassAgainstRange, unitSlipRule } from './mass-check.js';

export type WeightPoint = { readonly weighedOn: string; readonly massG: number };

export type LossBand = 'no loss' | '<5 %' | '5-10 %' | '10-15 %' | '15-20 %' | '>20 %';

export type WeightFlag = {
  readonly code: string;
  readonly severity: CautionSeverity;
  readonly message: string;
  readonly reason: string;
};

export type WeightChange = { readonly grams: number; readonly percent: number; readonly lossBand: LossBand };

export type WeightTrend = {
  readonly latest: WeightPoint | null;
  readonly sinceLast: WeightChange | null;
  readonly sinceFirst: WeightChange | null;
  readonly flags: WeightFlag[];
};

export const lossBandBasis = 'Weight-loss bands <5, <10, <15, <20, >20 % (IVAPM pain scale for birds)';

/** Band of a weight loss given as a positive percentage of the earlier weight. */
export function lossBand(lossPct: number): LossBand {
  if (!(lossPct > 0)) return 'no loss';
  if (lossPct < 5) return '<5 %';
  if (lossPct < 10) return '5-10 %';
  if (lossPct < 15) return '10-15 %';
  if (lossPct < 20) return '15-20 %';
  return '>20 %';
}

/**
 * Change from one mass to another (g), or null when it cannot be expressed as finite numbers: a
 * mass saved before the 0.5 g lower bound existed (e.g. 5e-324 g) would make the percentage
 * Infinity, which no screen or answer can show.
 */
function change(from: number, to: number): WeightChange | null {
  const grams = to - from;
  const percent = (grams / from) * 100;
  if (!(from > 0) || !Number.isFinite(grams) || !Number.isFinite(percent)) return null;
  return { grams, percent, lossBand: lossBand(-percent) };
}

const bandSeverity: Readonly<Record<LossBand, WeightFlag['severity'] | null>> = {
  'no loss': null,
  '<5 %': null,
  '5-10 %': 'notice',
  '10-15 %': 'warning',
  '15-20 %': 'danger',
  '>20 %': 'danger',
};

/**
 * Flags for one mass against a species' typical adult range (g), by the one rule the plan's
 * cautions use (./mass-check.ts). Returns an empty list when the range is unknown.
 */
export function massRangeFlags(
  massG: number,
  range: { readonly minG: number; readonly maxG: number; readonly speciesName: string } | null,
): WeightFlag[] {
  if (range === null || !(massG > 0)) return [];
  const rangeText = `${range.minG}-${range.maxG} g`;
  const check = checkMassAgainstRange(massG, range);
  if (check.verdict === 'unit-slip') {
    const hint =
      check.slip === 'g-as-kg'
        ? `Was ${massG} kg meant (${check.meantG} g)?`
        : `Was ${check.meantG} kg entered as grams?`;
    return [
      {
        code: 'weight-unit-slip',
        severity: check.severity,
        message: `${massG} g is far outside the typical ${range.speciesName} range (${rangeText}): probably a unit slip. ${hint}`,
        reason: unitSlipRule.toleranceFactor.basis,
      },
    ];
  }
  if (check.verdict === 'outside') {
    return [
      {
        code: 'weight-outside-species-range',
        severity: check.severity,
        message: `${massG} g is outside the typical ${range.speciesName} range (${rangeText}). Check the scale and the species.`,
        reason: unitSlipRule.rangeBasis,
      },
    ];
  }
  return [];
}

/**
 * Trend of a bird's weights, given in any order (sorted here by date). Losses are flagged by
 * IVAPM band; the latest weight is checked against the species' typical range.
 */
export function weightTrend(
  points: readonly WeightPoint[],
  range: { readonly minG: number; readonly maxG: number; readonly speciesName: string } | null,
): WeightTrend {
  const sorted = [...points].sort((a, b) => a.weighedOn.localeCompare(b.weighedOn));
  const latest = sorted.at(-1) ?? null;
  const previous = sorted.length >= 2 ? (sorted.at(-2) ?? null) : null;
  const first = sorted.length >= 2 ? (sorted[0] ?? null) : null;
  const sinceLast = latest !== null && previous !== null ? change(previous.massG, latest.massG) : null;
  const sinceFirst = latest !== null && first !== null ? change(first.massG, latest.massG) : null;
  const flags: WeightFlag[] = [];
  const uncomparable = [previous, first].find(
    (point) => point !== null && latest !== null && change(point.massG, latest.massG) === null,
  );
  if (uncomparable !== undefined && uncomparable !== null)
    flags.push({
      code: 'weight-change-not-computable',
      severity: 'warning',
      message: `The weight of ${String(uncomparable.massG)} g on ${uncomparable.weighedOn} cannot be compared with the latest; correct or void that weight.`,
      reason: 'A change needs two weights above 0 g whose ratio is a finite number',
    });
  for (const [label, value] of [
    ['since the previous weight', sinceLast],
    ['since the first weight', sinceFirst],
  ] as const) {
    // With two weights the previous one is the first: one flag says it all.
    if (value === null || (label === 'since the first weight' && sorted.length === 2)) continue;
    const severity = bandSeverity[value.lossBand];
    if (severity === null) continue;
    flags.push({
      code: label === 'since the previous weight' ? 'weight-loss-since-last' : 'weight-loss-since-first',
      severity,
      message: `Lost ${Math.abs(value.grams).toFixed(1)} g (${Math.abs(value.percent).toFixed(1)} %) ${label}: band ${value.lossBand}.`,
      reason: lossBandBasis,
    });
  }
  if (latest !== null) flags.push(...massRangeFlags(latest.massG, range));
  return { latest, sinceLast, sinceFirst, flags };
}

/**
 * A change between two weighings beyond this fraction is more often a typing slip than the bird:
 * asked to be confirmed before saving (assumption; the IVAPM bands put a loss above 20 % in the
 * worst band).
 */
export const weightSlipFraction = 0.2;

/**
 * Why a weight about to be saved should be confirmed first: far from the last weight (more than
 * `weightSlipFraction` either way), or outside the species' typical range. Empty when it looks
 * ordinary. Plain words, naming the numbers, for the clinic.
 * @param massG the weight typed, g, above 0
 * @param last the latest weight on file, or null
 * @param range the species' typical adult range, or null when unknown
 */
export function weightSlipReasons(
  massG: number,
  last: WeightPoint | null,
  range: { readonly minG: number; readonly maxG: number; readonly speciesName: string } | null,
): string[] {
  const reasons: string[] = [];
  if (last !== null && last.massG > 0) {
    const fraction = (massG - last.massG) / last.massG;
    if (Math.abs(fraction) > weightSlipFraction)
      reasons.push(
        `${massG} g is ${Math.abs(fraction * 100).toFixed(0)} % ${fraction > 0 ? 'more' : 'less'} than the last weight, ${last.massG} g on ${last.weighedOn}.`,
      );
  }
  for (const flag of massRangeFlags(massG, range)) reasons.push(flag.message);
  return reasons;
}
