/**
 * The model against published birds: every row of test/validation/published-observations.ts runs
 * through the same runner as `npm run validate`, and its model / published ratio must stay inside
 * the band stated for it in docs/validation.md.
 *
 * How the bands are stated (docs/validation.md, "Stated bands"): the target is x1.5 (0.67-1.5);
 * each band always contains the target, and on the side where today's model misses it, it reaches
 * today's ratio widened by x1.25. A change that brings a row nearer the published time passes; a
 * change that moves it further away by more than a quarter fails. These bands are today's honesty,
 * not the goal: they are tightened towards 0.67-1.5 as the model improves.
 *
 * Model 2.0.0: each endpoint maps onto the milestone its definition describes (`endpointMilestones`):
 * undefined induction -> loss of righting, intubation -> planned surgical depth, undefined
 * recovery -> standing or perching, first reflex -> first movement. Bands moved with that mapping
 * (docs/validation.md, "What changed with the milestone mapping"); rows whose mapping did not change
 * (intubation, first reflex) keep their band.
 */
import { describe, expect, it } from 'vitest';
import { planInputSchema } from '../../app/contract/plan.js';
import { publishedObservations } from './published-observations.js';
import {
  runObservation,
  targetRatioFactor,
  validationChartSvg,
  type ValidationOutcome,
} from './validation-runner.js';

/** Stated ratio bands (model / published), each beside the source of the published time. */
const statedBands: Readonly<Record<string, readonly [low: number, high: number]>> = {
  // Deori et al. 2017 (Vet World 10:493): chicken, isoflurane mask induction, 5.83 min at 3.5 %
  'deori-2017-chicken-iso-3.5-induction': [0.2, 1.5],
  // Deori et al. 2017: 2.37 min at 4 %
  'deori-2017-chicken-iso-4-induction': [0.44, 1.5],
  // Deori et al. 2017: 0.87 min at 5 %
  'deori-2017-chicken-iso-5-induction': [0.66, 1.5],
  // Deori et al. 2017: recovery 15.33 min after 60 min at 1.5 %
  'deori-2017-chicken-iso-1.5-recovery': [0.66, 1.5],
  // Deori et al. 2017: recovery 18.83 min after 60 min at 2 %
  'deori-2017-chicken-iso-2-recovery': [0.66, 1.5],
  // Deori et al. 2017: recovery 26.50 min after 60 min at 2.5 %
  'deori-2017-chicken-iso-2.5-recovery': [0.66, 1.5],
  // Klaphake et al. 2006 (J Avian Med Surg 20:2): Hispaniolan Amazon, sevoflurane mask, 38 ± 8 s
  'klaphake-2006-amazon-sevo-induction': [0.66, 1.5],
  // Botman et al. 2016 (Vet Rec): pigeon, sevoflurane, time to intubation 2.5 ± 0.7 min
  'botman-2016-pigeon-sevo-intubation': [0.66, 1.5],
  // Botman et al. 2016: recovery 6.4 ± 1.7 min after 40 min at 1 MAC
  'botman-2016-pigeon-sevo-recovery': [0.66, 1.5],
  // Langlois et al. 2003 (J Avian Med Surg 17:4): Hispaniolan Amazon, isoflurane, 58 ± 15 s
  'langlois-2003-amazon-iso-induction': [0.5, 1.5],
  // Chemonges 2014 (Vet Med Int 2014:250523): cockatoo, body jerk reflex 126 ± 27 s after isoflurane
  'chemonges-2014-cockatoo-iso-first-reflex': [0.66, 1.5],
};

const outcomes = new Map<string, ValidationOutcome>(
  publishedObservations.map((row) => [row.id, runObservation(row)]),
);

function predicted(id: string): number {
  const minutes = outcomes.get(id)?.predictedMin;
  if (minutes === undefined || minutes === null)
    throw new Error(`${id}: the model does not reach the milestone`);
  return minutes;
}

describe('model against published avian induction and recovery times', () => {
  it('has a stated band for every row and a row for every stated band', () => {
    expect(Object.keys(statedBands).sort()).toEqual(publishedObservations.map((row) => row.id).sort());
  });

  it('keeps at least 10 rows from at least 5 papers, both splits and both phases (issue 11)', () => {
    expect(publishedObservations.length).toBeGreaterThanOrEqual(10);
    expect(new Set(publishedObservations.map((row) => row.source)).size).toBeGreaterThanOrEqual(5);
    expect(new Set(publishedObservations.map((row) => row.split))).toEqual(new Set(['fit', 'judge']));
    const phases = new Set([...outcomes.values()].map((outcome) => outcome.phase));
    expect(phases).toEqual(new Set(['induction', 'recovery']));
  });

  it('every stated band contains the x1.5 target, so improvements never fail', () => {
    for (const [low, high] of Object.values(statedBands)) {
      expect(low).toBeLessThanOrEqual(1 / targetRatioFactor);
      expect(high).toBeGreaterThanOrEqual(targetRatioFactor);
    }
  });

  it.each(publishedObservations.map((row) => [row.id, row.source] as const))(
    '%s (%s): model / published ratio within the stated band',
    (id) => {
      const outcome = outcomes.get(id);
      const band = statedBands[id];
      expect(band).toBeDefined();
      expect(outcome?.ratio).not.toBeNull();
      const ratio = outcome?.ratio ?? Number.NaN;
      expect(ratio).toBeGreaterThanOrEqual(band?.[0] ?? Number.POSITIVE_INFINITY);
      expect(ratio).toBeLessThanOrEqual(band?.[1] ?? Number.NEGATIVE_INFINITY);
    },
  );

  it('a higher induction dial induces faster (Deori et al. 2017: 5.83, 2.37, 0.87 min at 3.5, 4, 5 %)', () => {
    const at35 = predicted('deori-2017-chicken-iso-3.5-induction');
    const at4 = predicted('deori-2017-chicken-iso-4-induction');
    const at5 = predicted('deori-2017-chicken-iso-5-induction');
    expect(at35).toBeGreaterThan(at4);
    expect(at4).toBeGreaterThan(at5);
  });

  it('a higher maintenance dial recovers more slowly (Deori et al. 2017: 15.33, 18.83, 26.50 min after 1.5, 2, 2.5 %)', () => {
    const after15 = predicted('deori-2017-chicken-iso-1.5-recovery');
    const after2 = predicted('deori-2017-chicken-iso-2-recovery');
    const after25 = predicted('deori-2017-chicken-iso-2.5-recovery');
    expect(after15).toBeLessThan(after2);
    expect(after2).toBeLessThan(after25);
  });

  it('keeps the ostrich observation out: the plan refuses a 115 kg bird (Al-Sobayil et al. 2009: 100-130 kg ostriches)', () => {
    const parsed = planInputSchema.safeParse({
      bodyMassG: 115000,
      agent: 'isoflurane',
      route: 'endotracheal',
      freshGasLpm: 5,
      schedule: [{ atMin: 0, vaporPct: 2 }],
    });
    expect(parsed.success).toBe(false);
  });

  it('the chart plots one marker per reached row and names the rows the model never reaches', () => {
    const reached = [...outcomes.values()];
    const first = reached[0];
    if (first === undefined) throw new Error('no rows');
    const withMiss: ValidationOutcome[] = [
      ...reached.slice(1),
      { ...first, predictedMin: null, ratio: null, withinTarget: false },
    ];
    const svg = validationChartSvg(withMiss);
    expect(svg.match(/data-row="/g)?.length).toBe(reached.length - 1);
    expect(svg).not.toContain(`data-row="${first.row.id}"`);
    expect(svg).toContain(
      `Not reached by the model (not plotted): ${String(withMiss.length)}. ${first.row.id}`,
    );
  });
});
