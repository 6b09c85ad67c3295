/**
 * The database's own constraints behind the handlers: when one fires, the answer names the field
 * in plain words and the database is unchanged. The handlers check links and values first, so
 * these cases reach the database by writing through the repositories or raw SQL directly, as a
 * race or a future handler without its check would.
 */
import { afterAll, beforeAll, describe, it } from 'vitest';
import { procedureRecordValuesSchema } from '../../app/contract/records.js';
import { createDispatcher, createHandlers } from '../../main/back-end/handlers.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { createWeightRepository } from '../../db/repositories/weight-repository.js';
import {
  corpusNow,
  corpusToday,
  correction,
  expectRefused,
  meta,
  openClinic,
  pipPlanInput,
  validChecklist,
  validPatient,
  validRecord,
  validVitals,
  validWeight,
  type Clinic,
  type Refusal,
} from './clinic-fixture.js';

type Override = (clinic: Clinic) => (request: never) => unknown;
type Case = readonly [
  label: string,
  channel: string,
  payload: (ids: Clinic['ids']) => unknown,
  run: Override,
  refusal: Refusal,
];

const rawWeight = (columns: string, values: string) => (clinic: Clinic) => () =>
  clinic.db
    .prepare(
      `INSERT INTO weights (patient_id, weighed_on, entered_at, entered_by${columns}) VALUES (${String(clinic.ids.pip)}, '2026-06-14', '2026-06-15T12:00:00.000Z', 'RW'${values})`,
    )
    .run();

/** The record values as the contract's schema would hand them to the repository. */
const recordValues = procedureRecordValuesSchema.parse(validRecord);
const cases: Case[] = [
  [
    'FOREIGN KEY: a linked plan removed between the check and the write',
    'procedures:create',
    (ids) => ({ patientId: ids.pip, values: validRecord, meta }),
    (clinic) => () =>
      createProcedureRecordRepository(clinic.backEnd.clinic).create(
        clinic.ids.pip,
        { ...recordValues, planId: 999_999 },
        meta,
        corpusNow,
      ),
    {
      code: 'invalid-request',
      field: 'values.planId',
      says: 'Linked plan refers to a record that is not in the clinic database',
    },
  ],
  [
    'FOREIGN KEY: a weight for a patient that is gone',
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: validWeight, meta }),
    (clinic) => () =>
      createWeightRepository(clinic.backEnd.clinic).add(
        999_999,
        { ...validWeight, bodyCondition: 'ideal' },
        meta,
        corpusNow,
      ),
    { code: 'invalid-request', field: 'patientId', says: 'Patient refers to a record' },
  ],
  [
    'FOREIGN KEY: an entry for a record that is gone',
    'entries:add',
    (ids) => ({ recordId: ids.record, values: validVitals, meta }),
    (clinic) => () =>
      createProcedureEntryRepository(clinic.backEnd.clinic).add(
        999_999,
        {
          ...validVitals,
          kind: 'vitals',
          vaporPct: null,
          oxygenLpm: null,
          temperatureC: null,
          etco2Mmhg: null,
          spo2Pct: null,
          eventType: null,
          eventNote: '',
          drugName: '',
          drugDose: '',
        },
        meta,
        corpusNow,
      ),
    { code: 'invalid-request', field: 'recordId', says: 'Procedure record refers to a record' },
  ],
  [
    'FOREIGN KEY: a plan for a patient that is gone',
    'plans:save',
    (ids) => ({
      fields: {
        patientId: ids.pip,
        plannedFor: corpusToday,
        label: '',
        input: pipPlanInput,
        checklist: validChecklist,
      },
      meta,
    }),
    (clinic) => () =>
      clinic.db
        .prepare(
          "INSERT INTO plans (patient_id, planned_for, input_json, result_json, model_version, entered_at, entered_by) VALUES (999999, '2026-06-15', '{}', '{}', 'test', '2026-06-15T12:00:00.000Z', 'RW')",
        )
        .run(),
    { code: 'invalid-request', field: 'fields.patientId' },
  ],
  [
    'CHECK: a weight above what the table holds',
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: validWeight, meta }),
    rawWeight(', mass_g', ', 250000'),
    {
      code: 'invalid-request',
      field: 'values.massG',
      says: 'Weight has a value the clinic database does not accept',
    },
  ],
  [
    'CHECK: initials of spaces only',
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: validWeight, meta }),
    (clinic) => () =>
      clinic.db
        .prepare(
          `INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by) VALUES (${String(clinic.ids.pip)}, '2026-06-14', 30, '2026-06-15T12:00:00.000Z', '   ')`,
        )
        .run(),
    { code: 'invalid-request', field: 'meta.enteredBy', says: 'Name or initials has a value' },
  ],
  [
    'NOT NULL: a weight without a mass',
    'weights:add',
    (ids) => ({ patientId: ids.pip, values: validWeight, meta }),
    rawWeight(', mass_g', ', NULL'),
    { code: 'invalid-request', field: 'values.massG', says: 'Weight is required' },
  ],
  [
    'UNIQUE: a second correction of the same weight version',
    'weights:correct',
    (ids) => ({ id: ids.weight, values: validWeight, meta: correction }),
    (clinic) => () =>
      clinic.db
        .prepare(
          `INSERT INTO weights (patient_id, corrects_id, weighed_on, mass_g, entered_at, entered_by, reason) VALUES (${String(clinic.ids.pip)}, ${String(clinic.ids.weight)}, '2026-06-14', 30, '2026-06-15T12:00:00.000Z', 'RW', 'again')`,
        )
        .run(),
    { code: 'conflict', field: 'id', says: 'corrected by someone else' },
  ],
  [
    'TRIGGER: a patient version changed in place',
    'patients:correct',
    (ids) => ({ id: ids.pip, values: validPatient, meta: correction }),
    (clinic) => () => clinic.db.prepare("UPDATE patient_versions SET name = 'Changed'").run(),
    { code: 'conflict', field: 'id', says: 'save a correction with a reason instead' },
  ],
  [
    'TRIGGER: a weight deleted',
    'weights:void',
    (ids) => ({ id: ids.weight, meta: correction }),
    (clinic) => () => clinic.db.prepare('DELETE FROM weights').run(),
    { code: 'conflict', field: 'id', says: 'never changed or deleted in place' },
  ],
];

describe('database constraint failures become field errors', () => {
  let clinic: Clinic;
  beforeAll(async () => {
    clinic = await openClinic();
    // The UNIQUE case needs a weight version that has been corrected once already.
    const first = await clinic.dispatch('weights:correct', {
      id: clinic.ids.weight,
      values: { ...validWeight, massG: 31 },
      meta: correction,
    });
    if (!first.ok) throw new Error('the first correction failed');
  });
  afterAll(() => clinic.close());

  it.each(cases.map((entry) => [entry[0], entry] as const))(
    '%s',
    async (_label, [, channel, payload, run, refusal]) => {
      const handlers = createHandlers({
        clinic: clinic.backEnd.clinic,
        appVersion: '9.8.7',
        dataDirectory: '/nonexistent',
        host: 'browser',
        now: () => corpusNow,
      });
      const dispatch = createDispatcher({ ...handlers, [channel]: run(clinic) } as typeof handlers);
      await expectRefused({ ...clinic, dispatch }, channel, payload(clinic.ids), refusal);
    },
  );
});
