import type { ChannelName, ParsedRequestOf, ResponseOf } from '../../app/contract/channels.js';
import type { recordChannels } from '../../app/contract/record-channels.js';
import {
  entryTimeProblem,
  hatchDateProblem,
  localDateOf,
  recordAgentProblem,
  weighingDateProblem,
} from '../../app/contract/input-rules.js';
import type { ProcedureRecordValues } from '../../app/contract/records.js';
import { procedureCsv } from '../../app/core/procedure-csv.js';
import { localTimeWithOffset } from '../../app/core/procedure-events.js';
import { weightTrend } from '../../app/core/weight-trend.js';
import {
  createPatientRepository,
  PatientVersionMismatchError,
} from '../../db/repositories/patient-repository.js';
import { createPlanRepository } from '../../db/repositories/plan-repository.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import {
  createProcedureRecordRepository,
  RecordVersionMismatchError,
} from '../../db/repositories/procedure-record-repository.js';
import { laterVersion } from '../../db/repositories/version-chain.js';
import {
  createSpeciesRepository,
  SpeciesVersionMismatchError,
} from '../../db/repositories/species-repository.js';
import { createWeightRepository, WeightCorrectionError } from '../../db/repositories/weight-repository.js';
import type { ClinicDb } from '../../db/clinic-db.js';
import { refuseConcurrentChange } from './concurrent-change.js';

type RecordChannel = keyof typeof recordChannels & ChannelName;
type RecordHandlerTable = {
  [C in RecordChannel]: (request: ParsedRequestOf<C>) => ResponseOf<C> | Promise<ResponseOf<C>>;
};

/** A failure the dispatcher reports as `{ code, message, field? }`. */
export class RecordError extends Error {
  readonly code: 'not-found' | 'conflict' | 'invalid-request';
  readonly field: string | undefined;
  constructor(code: 'not-found' | 'conflict' | 'invalid-request', message: string, field?: string) {
    super(message);
    this.code = code;
    this.field = field;
  }
}

/**
 * The value, or a not-found error naming `field`, the request's id that pointed at nothing.
 */
function found<T>(value: T | null, what: string, field = 'id'): T {
  if (value === null)
    throw new RecordError(
      'not-found',
      `${what} was not found; it may have been opened from an old link.`,
      field,
    );
  return value;
}

/** Refuses a value with a field error when `problem` is a message, so the screen shows it beside the field. */
function refuse(problem: string | null, field: string): void {
  if (problem !== null) throw new RecordError('invalid-request', problem, field);
}

/** Handlers for species, patients, weights, procedure records and entries. */
export function createRecordHandlers(
  now: () => Date,
  clinic: ClinicDb,
  /** This workstation's id, stamped on each entry it writes (null when it cannot be read). */
  workstationId: () => string | null = () => null,
): RecordHandlerTable {
  const species = createSpeciesRepository(clinic);
  const patients = createPatientRepository(clinic);
  const weights = createWeightRepository(clinic);
  const procedures = createProcedureRecordRepository(clinic);
  const entries = createProcedureEntryRepository(clinic);
  const plans = createPlanRepository(clinic);
  /** Today on the back end's clock: the date the clinic is living in. */
  const today = () => localDateOf(now());

  /** A linked plan must exist and be a plan for this record's bird. */
  async function requireOwnPlan(planId: number | null, patientId: number) {
    if (planId === null) return;
    const plan = await plans.get(planId);
    if (plan === null)
      throw new RecordError(
        'invalid-request',
        `Plan ${String(planId)} is not in the clinic database; choose one of this bird's saved plans, or no plan.`,
        'values.planId',
      );
    if (plan.patientId !== patientId)
      throw new RecordError(
        'invalid-request',
        `Plan ${String(planId)} is not a plan for this bird; choose one of this bird's saved plans, or no plan.`,
        'values.planId',
      );
  }

  /** A record's new start and end must still hold every entry already logged in it. */
  async function requireEntriesWithin(recordId: number, values: ProcedureRecordValues) {
    const outside = (await entries.list(recordId)).find(
      (entry) => entryTimeProblem(entry.values.at, values, now()) !== null,
    );
    if (outside === undefined) return;
    const early = Date.parse(outside.values.at) < Date.parse(values.startedAt);
    throw new RecordError(
      'invalid-request',
      `An entry at ${outside.values.at} would lie outside the procedure with this ${early ? 'start' : 'end'}; check the ${early ? 'start' : 'end'}, or correct that entry first.`,
      early ? 'values.startedAt' : 'values.endedAt',
    );
  }

  /** An entry's time must lie within its record's span, with the stated tolerances. */
  async function requireEntryWithinRecord(recordId: number, at: string) {
    const record = found(await procedures.get(recordId), `Procedure record ${String(recordId)}`, 'recordId');
    refuse(entryTimeProblem(at, record.values, now()), 'values.at');
  }

  async function requireSpecies(key: string) {
    if ((await species.get(key)) === null)
      throw new RecordError(
        'invalid-request',
        `There is no species "${key}" in the reference; choose one from the list or add it first.`,
        'values.speciesKey',
      );
  }

  async function patientDetail(id: number) {
    const patient = found(await patients.get(id), `Patient ${id}`);
    const speciesRecord = await species.get(patient.values.speciesKey);
    const list = await weights.list(id);
    const range =
      speciesRecord === null
        ? null
        : {
            minG: speciesRecord.values.massMinG,
            maxG: speciesRecord.values.massMaxG,
            speciesName: speciesRecord.values.commonName,
          };
    return {
      patient,
      history: await patients.history(id),
      species: speciesRecord,
      weights: list,
      trend: weightTrend(
        list.map((weight) => ({ weighedOn: weight.values.weighedOn, massG: weight.values.massG })),
        range,
      ),
      procedures: await procedures.listForPatient(id),
    };
  }

  async function procedureDetail(id: number) {
    const record = found(await procedures.get(id), `Procedure record ${id}`);
    const patient = found(await patients.get(record.patientId), `Patient ${record.patientId}`);
    const latest = (await weights.list(patient.id)).at(-1) ?? null;
    return {
      record,
      patient,
      species: await species.get(patient.values.speciesKey),
      latestMassG: latest?.values.massG ?? null,
      entries: await entries.list(id),
    };
  }

  return {
    'species:list': () => species.list(),
    'species:history': (request) => species.history(request.key),
    'species:add': (request) => species.add(request.values, request.meta, now()),
    'species:correct': async (request) => {
      const { versionId } = request;
      const corrected = await refuseConcurrentChange({
        noun: 'species',
        now,
        isStale: (error) => error instanceof SpeciesVersionMismatchError,
        write: () => species.correct(request.key, request.values, request.meta, now(), versionId),
        later: async () =>
          // Only a version of this species names who came first.
          versionId !== undefined &&
          (await species.history(request.key)).some((version) => version.stamp.versionId === versionId)
            ? laterVersion(clinic, 'species', versionId)
            : null,
      });
      return found(corrected, `Species ${request.key}`, 'key');
    },

    'patients:search': async (request) => ({
      patients: await patients.search(request.query, request.limit),
      total: await patients.count(),
    }),
    'patients:get': (request) => patientDetail(request.id),
    'patients:create': async (request) => {
      await requireSpecies(request.values.speciesKey);
      refuse(hatchDateProblem(request.values.hatchDate, today()), 'values.hatchDate');
      return patients.create(request.values, request.meta, now());
    },
    'patients:correct': async (request) => {
      await requireSpecies(request.values.speciesKey);
      refuse(hatchDateProblem(request.values.hatchDate, today()), 'values.hatchDate');
      const corrected = await refuseConcurrentChange({
        noun: 'patient',
        now,
        isStale: (error) => error instanceof PatientVersionMismatchError,
        write: () => patients.correct(request.id, request.values, request.meta, now(), request.versionId),
        later: () =>
          request.versionId === undefined
            ? Promise.resolve(null)
            : laterVersion(clinic, 'patient_versions', request.versionId),
      });
      return found(corrected, `Patient ${request.id}`);
    },

    'weights:add': async (request) => {
      found(await patients.get(request.patientId), `Patient ${request.patientId}`, 'patientId');
      refuse(
        weighingDateProblem(request.values.weighedOn, today(), request.meta.reason !== ''),
        'values.weighedOn',
      );
      return weights.add(request.patientId, request.values, request.meta, now());
    },
    'weights:correct': async (request) => {
      // A correction always carries a reason, which is what lets an old date stand.
      refuse(weighingDateProblem(request.values.weighedOn, today(), true), 'values.weighedOn');
      const corrected = await refuseConcurrentChange({
        noun: 'weight',
        now,
        isStale: (error) => error instanceof WeightCorrectionError,
        write: () => weights.correct(request.id, request.values, request.meta, now()),
        later: () => laterVersion(clinic, 'weights', request.id),
      });
      return found(corrected, `Weight ${request.id}`);
    },
    'weights:void': async (request) => {
      const voided = await refuseConcurrentChange({
        noun: 'weight',
        now,
        isStale: (error) => error instanceof WeightCorrectionError,
        write: () => weights.void(request.id, request.meta, now()),
        later: () => laterVersion(clinic, 'weights', request.id),
      });
      return found(voided, `Weight ${request.id}`);
    },
    'weights:history': (request) => weights.history(request.id),

    'procedures:create': async (request) => {
      found(await patients.get(request.patientId), `Patient ${request.patientId}`, 'patientId');
      await requireOwnPlan(request.values.planId, request.patientId);
      return procedures.create(request.patientId, request.values, request.meta, now());
    },
    'procedures:correct': async (request) => {
      const record = found(await procedures.get(request.id), `Procedure record ${request.id}`);
      await requireOwnPlan(request.values.planId, record.patientId);
      refuse(recordAgentProblem(record.values.agent, request.values.agent), 'values.agent');
      await requireEntriesWithin(request.id, request.values);
      const versionId = request.versionId ?? record.stamp.versionId;
      const corrected = await refuseConcurrentChange({
        noun: 'record',
        now,
        write: () => procedures.correct(request.id, request.values, request.meta, now(), versionId),
        later: () => laterVersion(clinic, 'procedure_record_versions', versionId),
      }).catch((error: unknown) => {
        if (error instanceof RecordVersionMismatchError)
          throw new RecordError('invalid-request', error.message, 'versionId');
        throw error;
      });
      return found(corrected, `Procedure record ${request.id}`);
    },
    'procedures:recent': async (request) =>
      Promise.all(
        (await procedures.listRecent(request.limit)).map(async (record) => {
          const patient = await patients.get(record.patientId);
          return {
            record,
            patientName: patient?.values.name ?? `Patient ${record.patientId}`,
            speciesName:
              patient === null
                ? null
                : ((await species.get(patient.values.speciesKey))?.values.commonName ?? null),
          };
        }),
      ),
    'procedures:get': (request) => procedureDetail(request.id),
    'procedures:history': (request) => procedures.history(request.id),
    'procedures:export-csv': async (request) => {
      const detail = await procedureDetail(request.id);
      // The workstation's time zone, as the clinic reads its wall clock (east of UTC positive).
      const utcOffsetMinAt = (iso: string) => -new Date(iso).getTimezoneOffset();
      const csv = procedureCsv({
        utcOffsetMinAt,
        startedAt: detail.record.values.startedAt,
        title: [
          ['patient', detail.patient.values.name],
          ['species', detail.species?.values.commonName ?? detail.patient.values.speciesKey],
          ['procedure', detail.record.values.procedureName],
          [
            'started',
            localTimeWithOffset(
              detail.record.values.startedAt,
              utcOffsetMinAt(detail.record.values.startedAt),
            ),
          ],
          [
            'ASA grade',
            detail.record.values.asaGrade === null
              ? 'not graded'
              : `${detail.record.values.asaGrade}${detail.record.values.emergency ? 'E' : ''}`,
          ],
          ['airway', detail.record.values.airway],
          ['agent', detail.record.values.agent ?? 'not recorded'],
          ['staff', detail.record.values.staffInitials],
        ],
        agent: detail.record.values.agent,
        entries: detail.entries.map((entry) => ({
          ...entry.values,
          enteredBy: entry.stamp.enteredBy,
          enteredAt: entry.stamp.enteredAt,
          corrected: entry.corrected,
          workstationName: entry.workstationName,
        })),
      });
      const day = detail.record.values.startedAt.slice(0, 10);
      const safeName =
        detail.patient.values.name.replace(/[^A-Za-z0-9-]+/g, '-').replace(/^-|-$/g, '') || 'patient';
      return { fileName: `tidewing-procedure-${request.id}-${safeName}-${day}.csv`, csv };
    },

    'entries:add': async (request) => {
      await requireEntryWithinRecord(request.recordId, request.values.at);
      return entries.add(
        request.recordId,
        request.values,
        { ...request.meta, workstationId: workstationId() },
        now(),
      );
    },
    'entries:correct': async (request) => {
      const entry = found((await entries.history(request.id))[0] ?? null, `Entry ${request.id}`);
      await requireEntryWithinRecord(entry.recordId, request.values.at);
      const corrected = await refuseConcurrentChange({
        noun: 'entry',
        now,
        write: () =>
          entries.correct(
            request.id,
            request.values,
            { ...request.meta, workstationId: workstationId() },
            now(),
          ),
        later: () => laterVersion(clinic, 'procedure_entries', request.id),
      });
      return found(corrected, `Entry ${request.id}`);
    },
    'entries:void': async (request) => {
      const voided = await refuseConcurrentChange({
        noun: 'entry',
        now,
        write: () => entries.void(request.id, { ...request.meta, workstationId: workstationId() }, now()),
        later: () => laterVersion(clinic, 'procedure_entries', request.id),
      });
      return found(voided, `Entry ${request.id}`);
    },
    'entries:history': (request) => entries.history(request.id),
    'entries:voided': (request) => entries.voided(request.recordId),
  };
}
