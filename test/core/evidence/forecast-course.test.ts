// The forecast that follows the log and the clinic's observed-beside-predicted rows read the
// model's course only (computePlanCourse): the same numbers as the whole plan (computePlan), on
// invented logs with intubation, IPPV, an air-sac tube, a chamber and many dial changes.
import { describe, expect, it } from 'vitest';
import { forecastPlan, readForecast } from '../../../app/core/evidence/forecast.js';
import { compareWithLog, recordEvidence } from '../../../app/core/evidence/observed.js';
import { planInputFromLog, type LoggedEntry, type RecordLog } from '../../../app/core/evidence/record-log.js';
import { computePlan, computePlanCourse } from '../../../app/core/model/compute-plan.js';
import type { PlanResult } from '../../../app/core/model/plan-types.js';
import { seededRandom } from '../../../app/core/model/uncertainty.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { at, event, row } from '../../support/logged-entries.js';

const tables = { species: speciesReference };

/** The whole plan's milestones but the air-sac wash times (a tracer's, not the agent's course). */
function agentMilestones(milestones: PlanResult['milestones']): Record<string, unknown> {
  return Object.fromEntries(Object.entries(milestones).filter(([key]) => !key.startsWith('airSacWash')));
}

/** An invented 3-h cockatiel record: a row every 5 min, the dial between 1.5 and 3 %, intubated at 4 min. */
function threeHourLog(): RecordLog {
  const random = seededRandom(3);
  const entries: LoggedEntry[] = [];
  for (let minute = 0; minute <= 180; minute += 5)
    entries.push(
      row(minute, {
        vaporPct: minute === 0 ? 4 : Math.round((1.5 + random() * 1.5) * 4) / 4,
        oxygenLpm: 0.8,
        heartRatePerMin: 300 + Math.round(random() * 60),
        breathsPerMin: 20,
      }),
    );
  entries.push(event(4, 'intubation'));
  return {
    startedAtMs: at(0),
    endedAtMs: null,
    airway: 'endotracheal',
    circuit: 'nonRebreathing',
    bird: { bodyMassG: 95, speciesId: 'cockatiel', agent: 'isoflurane', agentBasis: 'invented' },
    entries,
  };
}

/** An invented African grey on an air-sac tube after a chamber induction, with IPPV from 12 min. */
const airSacTubeLog: RecordLog = {
  startedAtMs: at(-1),
  endedAtMs: null,
  airway: 'airSacTube',
  circuit: 'nonRebreathing',
  inductionRoute: 'chamber',
  chamberVolumeL: 3,
  bird: { bodyMassG: 450, speciesId: 'african-grey-parrot', agent: 'isoflurane', agentBasis: 'invented' },
  entries: [
    row(0, { vaporPct: 5, oxygenLpm: 2, heartRatePerMin: 220 }),
    event(6, 'intubation'),
    row(7, { vaporPct: 2.5, oxygenLpm: 1, breathsPerMin: 10 }),
    event(12, 'ippvOn'),
    row(15, { vaporPct: 2, breathsPerMin: 8, heartRatePerMin: 200 }),
    row(30, { vaporPct: 1.75 }),
    event(38, 'ippvOff'),
    row(45, { vaporPct: 2.25, heartRatePerMin: 190 }),
  ],
};

/** An invented budgerigar kept on a mask with sevoflurane and a flow change. */
const maskLog: RecordLog = {
  startedAtMs: at(0),
  endedAtMs: null,
  airway: 'mask',
  circuit: 'nonRebreathing',
  bird: { bodyMassG: 35, speciesId: 'budgerigar', agent: 'sevoflurane', agentBasis: 'invented' },
  entries: [
    row(0, { vaporPct: 6, oxygenLpm: 1 }),
    row(3, { vaporPct: 4, oxygenLpm: 0.6 }),
    row(9, { vaporPct: 3.5 }),
    row(17, { vaporPct: 3, heartRatePerMin: 420 }),
  ],
};

/** An invented cockatiel intubated with IPPV whose vaporiser is already off (off at 40 min). */
const alreadyOffLog: RecordLog = {
  startedAtMs: at(-2),
  endedAtMs: null,
  airway: 'endotracheal',
  circuit: 'nonRebreathing',
  bird: { bodyMassG: 95, speciesId: 'cockatiel', agent: 'isoflurane', agentBasis: 'invented' },
  entries: [
    row(0, { vaporPct: 4, oxygenLpm: 1, heartRatePerMin: 300 }),
    event(4, 'intubation'),
    row(5, { vaporPct: 3, oxygenLpm: 0.8, breathsPerMin: 20 }),
    event(8, 'ippvOn'),
    row(10, { vaporPct: 2, breathsPerMin: 12 }),
    event(20, 'ippvOff'),
    event(40, 'vaporiserOff'),
  ],
};

/** Each log with the times at which the forecast is asked (after saved rows, and between them). */
const cases: readonly { name: string; log: RecordLog; asked: readonly number[] }[] = [
  {
    name: '3-h record with intubation and a dial change every 5 min',
    log: threeHourLog(),
    asked: [3, 31, 92, 181],
  },
  { name: 'air-sac tube after a chamber, IPPV on and off', log: airSacTubeLog, asked: [5, 13, 40, 46] },
  { name: 'mask throughout, flow changed', log: maskLog, asked: [2, 10, 18] },
  { name: 'vaporiser already off, IPPV', log: alreadyOffLog, asked: [41, 55, 70] },
];

describe('the forecast reads the same numbers from the course as from the whole plan', () => {
  for (const { name, log, asked } of cases) {
    it(`${name}: course fields and forecast equal`, () => {
      for (const minutes of asked) {
        const nowMs = at(minutes);
        const plan = forecastPlan(log, nowMs);
        if (!plan.ok) throw new Error(plan.missing);
        const whole = computePlan(plan.input, tables);
        const course = computePlanCourse(plan.input, tables);
        expect(course.mac).toEqual(whole.mac);
        expect(course.milestones).toEqual(agentMilestones(whole.milestones));
        expect(course.timeline).toEqual(whole.timeline);
        expect(course.uncertainty).toEqual(whole.uncertainty);
        const fromCourse = readForecast(plan, course, nowMs);
        expect(fromCourse).toEqual(readForecast(plan, whole, nowMs));
        // The forecast is not empty: a depth now and, once the vaporiser is off, a standing time.
        expect(fromCourse.depthNowMac).toBeGreaterThan(0);
        expect(fromCourse.standingAtMs).toBeGreaterThan(fromCourse.offAtMs);
      }
    });
  }

  it('with uncertainty samples (the band): the same band and milestone percentiles', () => {
    const log = threeHourLog();
    const nowMs = at(92);
    const plan = forecastPlan(log, nowMs, 12);
    if (!plan.ok) throw new Error(plan.missing);
    const whole = computePlan(plan.input, tables);
    const course = computePlanCourse(plan.input, tables);
    expect(course.uncertainty).toEqual(whole.uncertainty);
    const forecast = readForecast(plan, course, nowMs);
    expect(forecast).toEqual(readForecast(plan, whole, nowMs));
    expect(forecast.depthBandMac).not.toBeNull();
    expect(forecast.standingBandMin).not.toBeNull();
  });

  it("the clinic's observed-beside-predicted row is the same from the course", () => {
    const completed: RecordLog = {
      ...alreadyOffLog,
      endedAtMs: at(70),
      entries: [
        ...alreadyOffLog.entries,
        event(1.5, 'induction'),
        event(45, 'firstMovement'),
        event(52, 'standing'),
      ],
    };
    const plan = planInputFromLog(completed);
    if (!plan.ok) throw new Error(plan.missing);
    const fromWhole = compareWithLog(completed, plan, computePlan(plan.input, tables));
    const evidence = recordEvidence(completed, tables);
    expect(evidence).toEqual(fromWhole);
    expect(fromWhole.milestones.filter((milestone) => 'predictedMin' in milestone)).toHaveLength(4);
  });
});
