import type { ChannelName, ParsedRequestOf, ResponseOf } from '../../app/contract/channels.js';
import type { recordChannels } from '../../app/contract/record-channels.js';
import { procedureCsv } from '../../app/core/procedure-csv.js';
import { localTimeWithOffset } from '../../app/core/procedure-events.js';
import { weightTrend } from '../../app/core/weight-trend.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import {
  createProcedureEntryRepository,
  EntryCorrectionError,
} from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { createWeightRepository, WeightCorrectionError } from '../../db/repositories/weight-repository.js';
import type { TidewingDatabase } from '../../db/connection.js';

type RecordChannel = keyof typeof recordChannels & ChannelName;
type RecordHandlerTable = { [C in RecordChannel]: (request: ParsedRequestOf<C>) => ResponseOf<C> };

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

function found<T>(value: T | null, what: string): T {
  if (value === null)
    throw new RecordError('not-found', `${what} was not found; it may have been opened from an old link.`);
  return value;
}

function conflictOnStaleCorrection<T>(write: () => T): T {
  try {
    return write();
  } catch (error) {
    if (error instanceof WeightCorrectionError || error instanceof EntryCorrectionError)
      throw new RecordError('conflict', error.message);
    throw error;
  }
}

/** Handlers for species, patients, weights, procedure records and entries. */
export function createRecordHandlers(db: TidewingDatabase, now: () => Date): RecordHandlerTable {
  const species = createSpeciesRepository(db);
  const patients = createPatientRepository(db);
  const weights = createWeightRepository(db);
  const procedures = createProcedureRecordRepository(db);
  const entries = createProcedureEntryRepository(db);

  function requireSpecies(key: string) {
    if (species.get(key) === null)
      throw new RecordError(
        'invalid-request',
        `There is no species "${key}" in the reference; choose one from the list or add it first.`,
        'values.speciesKey',
      );
  }

  function patientDetail(id: number) {
    const patient = found(patients.get(id), `Patient ${id}`);
    const speciesRecord = species.get(patient.values.speciesKey);
    const list = weights.list(id);
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
      history: patients.history(id),
      species: speciesRecord,
      weights: list,
      trend: weightTrend(
        list.map((weight) => ({ weighedOn: weight.values.weighedOn, massG: weight.values.massG })),
        range,
      ),
      procedures: procedures.listForPatient(id),
    };
  }

  function procedureDetail(id: number) {
    const record = found(procedures.get(id), `Procedure record ${id}`);
    const patient = found(patients.get(record.patientId), `Patient ${record.patientId}`);
    const latest = weights.list(patient.id).at(-1) ?? null;
    return {
      record,
      patient,
      species: species.get(patient.values.speciesKey),
      latestMassG: latest?.values.massG ?? null,
      entries: entries.list(id),
    };
  }

  return {
    'species:list': () => species.list(),
    'species:history': (request) => species.history(request.key),
    'species:add': (request) => species.add(request.values, request.meta, now()),
    'species:correct': (request) =>
      found(species.correct(request.key, request.values, request.meta, now()), `Species ${request.key}`),

    'patients:search': (request) => ({
      patients: patients.search(request.query, request.limit),
      total: patients.count(),
    }),
    'patients:get': (request) => patientDetail(request.id),
    'patients:create': (request) => {
      requireSpecies(request.values.speciesKey);
      return patients.create(request.values, request.meta, now());
    },
    'patients:correct': (request) => {
      requireSpecies(request.values.speciesKey);
      return found(
        patients.correct(request.id, request.values, request.meta, now()),
        `Patient ${request.id}`,
      );
    },

    'weights:add': (request) => {
      found(patients.get(request.patientId), `Patient ${request.patientId}`);
      return weights.add(request.patientId, request.values, request.meta, now());
    },
    'weights:correct': (request) =>
      conflictOnStaleCorrection(() =>
        found(weights.correct(request.id, request.values, request.meta, now()), `Weight ${request.id}`),
      ),
    'weights:void': (request) =>
      conflictOnStaleCorrection(() =>
        found(weights.void(request.id, request.meta, now()), `Weight ${request.id}`),
      ),
    'weights:history': (request) => weights.history(request.id),

    'procedures:create': (request) => {
      found(patients.get(request.patientId), `Patient ${request.patientId}`);
      return procedures.create(request.patientId, request.values, request.meta, now());
    },
    'procedures:correct': (request) =>
      found(
        procedures.correct(request.id, request.values, request.meta, now()),
        `Procedure record ${request.id}`,
      ),
    'procedures:recent': (request) =>
      procedures.listRecent(request.limit).map((record) => {
        const patient = patients.get(record.patientId);
        return {
          record,
          patientName: patient?.values.name ?? `Patient ${record.patientId}`,
          speciesName:
            patient === null ? null : (species.get(patient.values.speciesKey)?.values.commonName ?? null),
        };
      }),
    'procedures:get': (request) => procedureDetail(request.id),
    'procedures:history': (request) => procedures.history(request.id),
    'procedures:export-csv': (request) => {
      const detail = procedureDetail(request.id);
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
          ['staff', detail.record.values.staffInitials],
        ],
        entries: detail.entries.map((entry) => ({
          ...entry.values,
          enteredBy: entry.stamp.enteredBy,
          enteredAt: entry.stamp.enteredAt,
          corrected: entry.corrected,
        })),
      });
      const day = detail.record.values.startedAt.slice(0, 10);
      const safeName =
        detail.patient.values.name.replace(/[^A-Za-z0-9-]+/g, '-').replace(/^-|-$/g, '') || 'patient';
      return { fileName: `tidewing-procedure-${request.id}-${safeName}-${day}.csv`, csv };
    },

    'entries:add': (request) => {
      found(procedures.get(request.recordId), `Procedure record ${request.recordId}`);
      return entries.add(request.recordId, request.values, request.meta, now());
    },
    'entries:correct': (request) =>
      conflictOnStaleCorrection(() =>
        found(entries.correct(request.id, request.values, request.meta, now()), `Entry ${request.id}`),
      ),
    'entries:void': (request) =>
      conflictOnStaleCorrection(() =>
        found(entries.void(request.id, request.meta, now()), `Entry ${request.id}`),
      ),
    'entries:history': (request) => entries.history(request.id),
  };
}
