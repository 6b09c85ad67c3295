/**
 * Bad dates, numbers, links, times and ids on every record channel: each case names the exact
 * field refused, and the database is byte-for-byte the same afterwards.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  correction,
  corpusToday,
  daysFromToday,
  expectRefused,
  fingerprint,
  meta,
  minutesFromNow,
  openClinic,
  pipPlanInput,
  validChecklist,
  validDrug,
  validEvent,
  validPatient,
  validRecord,
  validSpecies,
  validVitals,
  validWeight,
  type Clinic,
  type Refusal,
} from './clinic-fixture.js';

type Ids = Clinic['ids'];
type Case = readonly [label: string, channel: string, payload: (ids: Ids) => unknown, refusal: Refusal];

/** Dates that are not on the calendar, or not dates at all (ISO 8601, Gregorian calendar). */
const notCalendarDates: readonly unknown[] = [
  '2023-02-30',
  '2024-13-45',
  '0000-00-00',
  '2023-02-29',
  '2023-04-31',
  '2024-00-10',
  '2023-2-3',
  '03/04/2024',
  '2024-01-01T00:00:00Z',
  ' 2024-01-01',
  '',
  20240101,
  null,
];
/** Real calendar dates outside 1900 to 2100. */
const outOfRangeDates = ['1899-12-31', '0001-01-01', '2101-01-01', '9999-12-31'];
const notDateTimes: readonly unknown[] = [
  '2023-02-30T10:00:00Z',
  '2024-13-01T10:00:00Z',
  '0000-01-01T00:00:00Z',
  '1899-12-31T23:00:00Z',
  '2026-06-15 10:00',
  '2026-06-15T10:00:00',
  '2026-06-15T25:00:00Z',
  'now',
  1781524800000,
];
/** Not a body mass Tidewing keeps: outside 0.5 g to 200 kg, not finite, or not a number. */
const badMasses: readonly unknown[] = [
  0,
  -1,
  0.49,
  5e-324,
  200_000.5,
  1e308,
  Number.POSITIVE_INFINITY,
  Number.NEGATIVE_INFINITY,
  Number.NaN,
  '32',
  null,
  true,
];
const badIds: readonly unknown[] = [0, -1, 1.5, '1', null, Number.NaN];

const planFields = (patientId: number | null, plannedFor = corpusToday) => ({
  patientId,
  plannedFor,
  label: 'Beak trim',
  input: pipPlanInput,
  checklist: validChecklist,
});

const cases: Case[] = [
  // Hatch dates ---------------------------------------------------------------------------------
  ...[...notCalendarDates.filter((value) => value !== null), ...outOfRangeDates].map((hatchDate): Case => [
    `hatch date ${JSON.stringify(hatchDate)}`,
    'patients:create',
    () => ({ values: { ...validPatient, hatchDate }, meta }),
    { code: 'invalid-request', field: 'values.hatchDate', says: 'Hatch date' },
  ]),
  [
    'hatch date 2023-02-30 on a correction',
    'patients:correct',
    (ids) => ({ id: ids.pip, values: { ...validPatient, hatchDate: '2023-02-30' }, meta: correction }),
    { code: 'invalid-request', field: 'values.hatchDate', says: 'Hatch date "2023-02-30" is not a date' },
  ],
  [
    'hatch date tomorrow',
    'patients:create',
    () => ({ values: { ...validPatient, hatchDate: daysFromToday(1) }, meta }),
    { code: 'invalid-request', field: 'values.hatchDate', says: 'is after today' },
  ],
  [
    'hatch date next year on a correction with a reason',
    'patients:correct',
    (ids) => ({ id: ids.pip, values: { ...validPatient, hatchDate: daysFromToday(365) }, meta: correction }),
    { code: 'invalid-request', field: 'values.hatchDate', says: 'is after today' },
  ],
  [
    'an unknown species',
    'patients:create',
    () => ({ values: { ...validPatient, speciesKey: 'dodo' }, meta }),
    { code: 'invalid-request', field: 'values.speciesKey', says: 'no species "dodo"' },
  ],
  ...['', 'x'.repeat(61), 42].map((speciesKey): Case => [
    `species key ${JSON.stringify(speciesKey)}`,
    'patients:create',
    () => ({ values: { ...validPatient, speciesKey }, meta }),
    { code: 'invalid-request', field: 'values.speciesKey' },
  ]),
  ...['bird', 'F', null].map((sex): Case => [
    `sex ${JSON.stringify(sex)}`,
    'patients:create',
    () => ({ values: { ...validPatient, sex }, meta }),
    { code: 'invalid-request', field: 'values.sex' },
  ]),

  // Weights -------------------------------------------------------------------------------------
  ...[...notCalendarDates, ...outOfRangeDates].map((weighedOn): Case => [
    `weighing date ${JSON.stringify(weighedOn)}`,
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: { ...validWeight, weighedOn }, meta }),
    { code: 'invalid-request', field: 'values.weighedOn', says: 'Weighing date' },
  ]),
  [
    'weighing date tomorrow',
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: { ...validWeight, weighedOn: daysFromToday(1) }, meta }),
    { code: 'invalid-request', field: 'values.weighedOn', says: 'is after today' },
  ],
  [
    'weighing date tomorrow, even with a reason',
    'weights:add',
    (ids) => ({
      patientId: ids.pip,
      values: { ...validWeight, weighedOn: daysFromToday(1) },
      meta: correction,
    }),
    { code: 'invalid-request', field: 'values.weighedOn', says: 'is after today' },
  ],
  [
    'weighing date more than a year ago without a reason',
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: { ...validWeight, weighedOn: daysFromToday(-400) }, meta }),
    { code: 'invalid-request', field: 'values.weighedOn', says: 'more than a year ago' },
  ],
  [
    'weighing date next month on a correction',
    'weights:correct',
    (ids) => ({ id: ids.weight, values: { ...validWeight, weighedOn: daysFromToday(30) }, meta: correction }),
    { code: 'invalid-request', field: 'values.weighedOn', says: 'is after today' },
  ],
  ...badMasses.map((massG): Case => [
    `weight ${String(massG)}`,
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: { ...validWeight, massG }, meta }),
    { code: 'invalid-request', field: 'values.massG', says: /weight/i },
  ]),
  ...badMasses
    .slice(0, 6)
    .map((massG): Case => [
      `weight ${String(massG)} on a correction`,
      'weights:correct',
      (ids) => ({ id: ids.weight, values: { ...validWeight, massG }, meta: correction }),
      { code: 'invalid-request', field: 'values.massG', says: 'between 0.5 g and 200000 g' },
    ]),
  ...['fat', 'IDEAL', null].map((bodyCondition): Case => [
    `body condition ${JSON.stringify(bodyCondition)}`,
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: { ...validWeight, bodyCondition }, meta }),
    { code: 'invalid-request', field: 'values.bodyCondition' },
  ]),

  // Plans ---------------------------------------------------------------------------------------
  ...[...notCalendarDates, ...outOfRangeDates].map((plannedFor): Case => [
    `planned date ${JSON.stringify(plannedFor)}`,
    'plans:save',
    (ids) => ({ fields: planFields(ids.pip, plannedFor as string), meta }),
    { code: 'invalid-request', field: 'fields.plannedFor', says: 'Planned date' },
  ]),
  [
    'planned date more than a year ahead without a reason',
    'plans:save',
    (ids) => ({ fields: planFields(ids.pip, daysFromToday(400)), meta }),
    { code: 'invalid-request', field: 'fields.plannedFor', says: 'more than a year ahead' },
  ],
  [
    'planned date more than a year ago without a reason',
    'plans:correct',
    (ids) => ({ id: ids.pipPlan, fields: planFields(ids.pip, daysFromToday(-400)), meta }),
    { code: 'invalid-request', field: 'fields.plannedFor', says: 'more than a year ago' },
  ],
  [
    'a plan for a patient that does not exist',
    'plans:save',
    () => ({ fields: planFields(999_999), meta }),
    { code: 'not-found', field: 'fields.patientId' },
  ],
  [
    'a day that is not on the calendar',
    'plans:day',
    () => ({ date: '2023-02-30' }),
    { code: 'invalid-request', field: 'date' },
  ],
  ['a day as a number', 'plans:day', () => ({ date: 20260615 }), { code: 'invalid-request', field: 'date' }],

  // Procedure records -------------------------------------------------------------------------
  ...notDateTimes.map((startedAt): Case => [
    `start ${JSON.stringify(startedAt)}`,
    'procedures:create',
    (ids) => ({ patientId: ids.pip, values: { ...validRecord, startedAt }, meta }),
    { code: 'invalid-request', field: 'values.startedAt', says: 'Start' },
  ]),
  ...notDateTimes.map((endedAt): Case => [
    `end ${JSON.stringify(endedAt)}`,
    'procedures:create',
    (ids) => ({ patientId: ids.pip, values: { ...validRecord, endedAt }, meta }),
    { code: 'invalid-request', field: 'values.endedAt', says: 'End' },
  ]),
  ...[-1, 0, -60 * 24 * 365 * 3].map((minutes): Case => [
    `end ${String(minutes)} min after the start`,
    'procedures:create',
    (ids) => ({
      patientId: ids.pip,
      values: {
        ...validRecord,
        endedAt: new Date(Date.parse(validRecord.startedAt) + minutes * 60_000).toISOString(),
      },
      meta,
    }),
    { code: 'invalid-request', field: 'values.endedAt', says: 'End must be after the start' },
  ]),
  [
    'an end before the start on a correction',
    'procedures:correct',
    (ids) => ({
      id: ids.record,
      values: { ...validRecord, endedAt: minutesFromNow(-121) },
      meta: correction,
    }),
    { code: 'invalid-request', field: 'values.endedAt', says: 'End must be after the start' },
  ],
  [
    'a linked plan that does not exist',
    'procedures:create',
    (ids) => ({ patientId: ids.pip, values: { ...validRecord, planId: 999_999 }, meta }),
    { code: 'invalid-request', field: 'values.planId', says: 'Plan 999999 is not in the clinic database' },
  ],
  [
    "another bird's plan",
    'procedures:create',
    (ids) => ({ patientId: ids.pip, values: { ...validRecord, planId: ids.kiwiPlan }, meta }),
    { code: 'invalid-request', field: 'values.planId', says: 'is not a plan for this bird' },
  ],
  [
    "another bird's plan on a correction",
    'procedures:correct',
    (ids) => ({ id: ids.record, values: { ...validRecord, planId: ids.kiwiPlan }, meta: correction }),
    { code: 'invalid-request', field: 'values.planId', says: 'is not a plan for this bird' },
  ],
  [
    'a linked plan that does not exist on a correction',
    'procedures:correct',
    (ids) => ({ id: ids.record, values: { ...validRecord, planId: 123_456 }, meta: correction }),
    { code: 'invalid-request', field: 'values.planId', says: 'not in the clinic database' },
  ],
  ...[0, -3, 2.5, '1'].map((planId): Case => [
    `linked plan id ${JSON.stringify(planId)}`,
    'procedures:create',
    (ids) => ({ patientId: ids.pip, values: { ...validRecord, planId }, meta }),
    { code: 'invalid-request', field: 'values.planId' },
  ]),
  [
    'a start moved after an entry already logged',
    'procedures:correct',
    (ids) => ({ id: ids.record, values: { ...validRecord, startedAt: minutesFromNow(5) }, meta: correction }),
    { code: 'invalid-request', field: 'values.startedAt', says: 'outside the procedure with this start' },
  ],
  ...[
    ['ASA grade 6', { asaGrade: 6 }, 'values.asaGrade'],
    ['ASA grade 2.5', { asaGrade: 2.5 }, 'values.asaGrade'],
    ['tube size 0.5 mm', { tubeSizeMm: 0.5 }, 'values.tubeSizeMm'],
    ['tube size Infinity', { tubeSizeMm: Number.POSITIVE_INFINITY }, 'values.tubeSizeMm'],
    ['prompt interval 0', { promptIntervalMin: 0 }, 'values.promptIntervalMin'],
    ['prompt interval NaN', { promptIntervalMin: Number.NaN }, 'values.promptIntervalMin'],
    ['airway "beak"', { airway: 'beak' }, 'values.airway'],
    ['circuit "open"', { circuit: 'open' }, 'values.circuit'],
    ['crop "full"', { cropChecked: 'full' }, 'values.cropChecked'],
  ].map(([label, change, field]): Case => [
    label as string,
    'procedures:create',
    (ids) => ({ patientId: ids.pip, values: { ...validRecord, ...(change as object) }, meta }),
    { code: 'invalid-request', field: field as string },
  ]),

  // Entries -------------------------------------------------------------------------------------
  ...notDateTimes.map((at): Case => [
    `entry time ${JSON.stringify(at)}`,
    'entries:add',
    (ids) => ({ recordId: ids.record, values: { ...validVitals, at }, meta }),
    { code: 'invalid-request', field: 'values.at', says: 'Time' },
  ]),
  ...[
    ['years before its record', '2019-06-15T10:00:00.000Z', 'before the procedure started'],
    ['61 min before the start', minutesFromNow(-181), 'before the procedure started'],
    ['30 min in the future while the record runs', minutesFromNow(30), 'in the future'],
  ].map(([label, at, says]): Case => [
    `an entry ${label}`,
    'entries:add',
    (ids) => ({ recordId: ids.record, values: { ...validVitals, at }, meta }),
    { code: 'invalid-request', field: 'values.at', says },
  ]),
  ...[
    ['7 h after the end', minutesFromNow(-16 * 60), 'after the procedure ended'],
    ['a day before the start', minutesFromNow(-48 * 60), 'before the procedure started'],
  ].map(([label, at, says]): Case => [
    `an entry ${label} of an ended record`,
    'entries:add',
    (ids) => ({
      recordId: ids.endedRecord,
      values: { ...validEvent, eventType: 'standing', drugName: '', at },
      meta,
    }),
    { code: 'invalid-request', field: 'values.at', says },
  ]),
  [
    'an entry moved years back on a correction',
    'entries:correct',
    (ids) => ({
      id: ids.entry,
      values: { ...validVitals, at: '2020-01-01T00:00:00.000Z' },
      meta: correction,
    }),
    { code: 'invalid-request', field: 'values.at', says: 'before the procedure started' },
  ],
  ...[
    ['heartRatePerMin', -1],
    ['heartRatePerMin', 1201],
    ['heartRatePerMin', Number.NaN],
    ['heartRatePerMin', Number.POSITIVE_INFINITY],
    ['heartRatePerMin', '400'],
    ['breathsPerMin', 301],
    ['temperatureC', 19.9],
    ['temperatureC', 46.1],
    ['spo2Pct', 101],
    ['etco2Mmhg', -0.1],
    ['vaporPct', 10.5],
    ['oxygenLpm', 1e300],
  ].map(([reading, value]): Case => [
    `${String(reading)} ${String(value)}`,
    'entries:add',
    (ids) => ({ recordId: ids.record, values: { ...validVitals, [reading as string]: value }, meta }),
    { code: 'invalid-request', field: `values.${String(reading)}` },
  ]),
  [
    'a vitals row without readings',
    'entries:add',
    (ids) => ({ recordId: ids.record, values: { at: validVitals.at, kind: 'vitals' }, meta }),
    { code: 'invalid-request', field: 'values.heartRatePerMin', says: 'at least one reading' },
  ],
  [
    'an event without a type',
    'entries:add',
    (ids) => ({ recordId: ids.record, values: { ...validEvent, eventType: null }, meta }),
    { code: 'invalid-request', field: 'values.eventType' },
  ],
  [
    'a drug given without a name',
    'entries:add',
    (ids) => ({ recordId: ids.record, values: { ...validEvent, drugName: '' }, meta }),
    { code: 'invalid-request', field: 'values.drugName', says: 'Name the drug' },
  ],

  // Species and drugs -------------------------------------------------------------------------
  ...[
    ['massMinG', 0],
    ['massMinG', -5],
    ['massMinG', Number.POSITIVE_INFINITY],
    ['massMaxG', 20_001],
    ['massMaxG', 5],
    ['massMaxG', Number.NaN],
  ].map(([name, value]): Case => [
    `species ${String(name)} ${String(value)}`,
    'species:add',
    () => ({ values: { ...validSpecies, [name as string]: value }, meta }),
    { code: 'invalid-request', field: `values.${String(name)}` },
  ]),
  ...[
    ['concentrationMgPerMl', 0],
    ['concentrationMgPerMl', Number.POSITIVE_INFINITY],
    ['doseLowMgPerKg', -1],
    ['doseLowMgPerKg', 1001],
    ['doseHighMgPerKg', 0.1],
    ['doseHighMgPerKg', Number.NaN],
  ].map(([name, value]): Case => [
    `drug ${String(name)} ${String(value)}`,
    'drugs:add',
    () => ({ values: { ...validDrug, [name as string]: value }, meta }),
    { code: 'invalid-request', field: `values.${String(name)}` },
  ]),

  // Ids -----------------------------------------------------------------------------------------
  ...(
    [
      ['weights:add', (patientId: unknown) => ({ patientId, values: validWeight, meta }), 'patientId'],
      ['procedures:create', (patientId: unknown) => ({ patientId, values: validRecord, meta }), 'patientId'],
      ['entries:add', (recordId: unknown) => ({ recordId, values: validVitals, meta }), 'recordId'],
      ['patients:correct', (id: unknown) => ({ id, values: validPatient, meta: correction }), 'id'],
      ['weights:correct', (id: unknown) => ({ id, values: validWeight, meta: correction }), 'id'],
      ['weights:void', (id: unknown) => ({ id, meta: correction }), 'id'],
      ['procedures:correct', (id: unknown) => ({ id, values: validRecord, meta: correction }), 'id'],
      ['entries:correct', (id: unknown) => ({ id, values: validVitals, meta: correction }), 'id'],
      ['entries:void', (id: unknown) => ({ id, meta: correction }), 'id'],
      ['drugs:correct', (id: unknown) => ({ id, values: validDrug, meta: correction }), 'id'],
      ['drugs:void', (id: unknown) => ({ id, meta: correction }), 'id'],
      ['plans:correct', (id: unknown) => ({ id, fields: planFields(null), meta }), 'id'],
      [
        'evidence:exclude',
        (recordId: unknown) => ({ recordId, excluded: true, meta: correction }),
        'recordId',
      ],
    ] as const
  ).flatMap(([channel, payload, field]): Case[] => [
    ...badIds.map((id): Case => [
      `${channel} with id ${String(id)}`,
      channel,
      () => payload(id),
      { code: 'invalid-request', field },
    ]),
    [
      `${channel} with an id that is not in the database`,
      channel,
      () => payload(999_999),
      { code: 'not-found', field },
    ],
  ]),
  ...[...notCalendarDates, ...outOfRangeDates].flatMap((date): Case[] =>
    (['from', 'to'] as const).map((field): Case => [
      `evidence list ${field} ${String(date)}`,
      'evidence:list',
      () => ({ [field]: date }),
      { code: 'invalid-request', field },
    ]),
  ),
  [
    'an evidence list whose range ends before it starts',
    'evidence:list',
    () => ({ from: '2026-11-02', to: '2026-11-01' }),
    { code: 'invalid-request', field: 'to' },
  ],
  [
    'correcting a species that does not exist',
    'species:correct',
    () => ({ key: 'dodo', values: validSpecies, meta: correction }),
    { code: 'not-found', field: 'key' },
  ],
];

describe('bad records are refused, naming the field, with the database unchanged', () => {
  let clinic: Clinic;
  beforeAll(async () => {
    clinic = await openClinic();
  });
  afterAll(() => clinic.close());

  it('holds enough cases to cover every record channel', () => {
    expect(cases.length).toBeGreaterThan(200);
  });

  it.each(cases.map((entry) => [entry[1], entry[0], entry] as const))(
    '%s: %s',
    async (_channel, _label, entry) => {
      const [, channel, payload, refusal] = entry;
      await expectRefused(clinic, channel, payload(clinic.ids), refusal);
    },
  );

  it('keeps an old date and an entry after the end when the rules allow them', async () => {
    const old = await clinic.dispatch('weights:add', {
      patientId: clinic.ids.kiwi,
      values: { ...validWeight, weighedOn: daysFromToday(-400) },
      meta: { enteredBy: 'RW', reason: 'Copied from the paper record' },
    });
    expect(old.ok).toBe(true);
    const late = await clinic.dispatch('entries:add', {
      recordId: clinic.ids.endedRecord,
      values: { ...validEvent, eventType: 'standing', drugName: '', at: minutesFromNow(-18 * 60) },
      meta,
    });
    expect(late.ok).toBe(true);
    const farPlan = await clinic.dispatch('plans:save', {
      fields: planFields(clinic.ids.kiwi, daysFromToday(500)),
      meta: { enteredBy: 'RW', reason: 'Annual check booked early' },
    });
    expect(farPlan.ok).toBe(true);
  });

  it('refuses to correct a weight version that was already corrected, naming the id', async () => {
    const corrected = await clinic.dispatch('weights:correct', {
      id: clinic.ids.weight,
      values: { ...validWeight, massG: 31 },
      meta: correction,
    });
    expect(corrected.ok).toBe(true);
    const before = fingerprint(clinic.db);
    await expectRefused(
      clinic,
      'weights:correct',
      { id: clinic.ids.weight, values: validWeight, meta: correction },
      { code: 'conflict', field: 'id', says: 'already corrected by' },
    );
    expect(fingerprint(clinic.db)).toBe(before);
  });
});
