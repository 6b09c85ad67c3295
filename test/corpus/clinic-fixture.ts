/**
 * A small invented clinic in a real temporary database, driven only through the contract's
 * dispatcher, and a fingerprint of the whole database to prove that a refused request changed
 * nothing.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { expect } from 'vitest';
import { addDays, localDateOf } from '../../app/contract/input-rules.js';
import type { TidewingDatabase } from '../../db/connection.js';
import { startBackEnd, type BackEnd } from '../../main/back-end/back-end.js';
import { heronLaneSettings } from '../support/clinic-settings.js';
import { temporaryFolder } from '../support/temporary-folder.js';

/** The corpus's fixed clock: the back end reads no other. */
export const corpusNow = new Date('2026-06-15T12:00:00.000Z');
/** Today on that clock, in the local time zone of the machine running the tests. */
export const corpusToday = localDateOf(corpusNow);
export const minutesFromNow = (minutes: number) =>
  new Date(corpusNow.getTime() + minutes * 60_000).toISOString();
export const daysFromToday = (days: number) => addDays(corpusToday, days);

export const meta = { enteredBy: 'RW', reason: '' };
export const correction = { enteredBy: 'RW', reason: 'Typing error' };

export const pipPlanInput = JSON.parse(
  fs.readFileSync(
    path.join(import.meta.dirname, '../../examples/plans/pip-budgerigar-mask-isoflurane.json'),
    'utf8',
  ),
) as Record<string, unknown>;

export const validPatient = {
  name: 'Pip',
  speciesKey: 'budgerigar',
  sex: 'male',
  hatchDate: '2022-04-02',
  ageText: '',
  ringId: 'HL-22-014',
  microchipId: '',
  ownerReference: 'Marsh family',
  notes: 'Hand tame.\nBites when restrained.',
};
export const validWeight = {
  weighedOn: daysFromToday(-3),
  massG: 32,
  bodyCondition: 'ideal',
  weighedBy: 'RW',
};
export const validRecord = {
  planId: null as number | null,
  startedAt: minutesFromNow(-120),
  endedAt: null as string | null,
  procedureName: 'Beak trim',
  fasting: '1 h',
  airway: 'mask',
  circuit: 'nonRebreathing',
  staffInitials: 'RW',
};
export const validVitals = {
  at: minutesFromNow(-60),
  kind: 'vitals',
  heartRatePerMin: 420,
  breathsPerMin: 60,
};
export const validEvent = {
  at: minutesFromNow(-50),
  kind: 'event',
  eventType: 'drugGiven',
  eventNote: 'slow bolus',
  drugName: 'Drug A',
  drugDose: '0.02 mL',
};
export const validDrug = {
  name: 'Drug A',
  concentrationMgPerMl: 1,
  doseLowMgPerKg: 0.5,
  doseHighMgPerKg: 1,
  route: 'IV',
  doseSource: 'Clinic protocol 2026',
  notes: '',
};
export const validSpecies = {
  commonName: 'Marsh warbler',
  scientificName: 'Acrocephalus palustris',
  massMinG: 10,
  massMaxG: 15,
  massBasis: 'assumption',
};
export const validChecklist = { asaGrade: 2 };

export type Clinic = {
  readonly backEnd: BackEnd;
  readonly db: TidewingDatabase;
  dispatch(channel: string, payload: unknown): Promise<{ ok: boolean; value?: unknown; error?: unknown }>;
  readonly ids: {
    readonly pip: number;
    readonly kiwi: number;
    readonly weight: number;
    readonly pipPlan: number;
    readonly kiwiPlan: number;
    readonly record: number;
    readonly endedRecord: number;
    readonly entry: number;
    readonly drug: number;
  };
  close(): void;
};

async function must<T>(backEnd: BackEnd, channel: string, payload: unknown): Promise<T> {
  const answer = await backEnd.dispatch(channel, payload);
  if (!answer.ok) throw new Error(`${channel} failed while seeding: ${JSON.stringify(answer.error)}`);
  return answer.value as T;
}

/** Opens a new clinic database on the fixed clock and fills it through the contract. */
export async function openClinic(): Promise<Clinic> {
  const temp = temporaryFolder('tidewing-corpus-');
  const backEnd = startBackEnd({
    dataDirectory: temp.folder,
    appVersion: '9.8.7',
    host: 'browser',
    now: () => corpusNow,
  });
  await must(backEnd, 'settings:save', heronLaneSettings);
  await must(backEnd, 'safety:acknowledge', { acknowledgedBy: 'RW', accepted: true });
  const pip = await must<{ id: number }>(backEnd, 'patients:create', { values: validPatient, meta });
  const kiwi = await must<{ id: number }>(backEnd, 'patients:create', {
    values: { ...validPatient, name: 'Kiwi', speciesKey: 'cockatiel', ringId: '' },
    meta,
  });
  const weight = await must<{ id: number }>(backEnd, 'weights:add', {
    patientId: pip.id,
    values: validWeight,
    meta,
  });
  const plan = (patientId: number) =>
    must<{ id: number }>(backEnd, 'plans:save', {
      fields: {
        patientId,
        plannedFor: corpusToday,
        label: 'Beak trim',
        input: pipPlanInput,
        checklist: validChecklist,
      },
      meta,
    });
  const pipPlan = await plan(pip.id);
  const kiwiPlan = await plan(kiwi.id);
  const record = await must<{ id: number }>(backEnd, 'procedures:create', {
    patientId: pip.id,
    values: { ...validRecord, planId: pipPlan.id },
    meta,
  });
  const endedRecord = await must<{ id: number }>(backEnd, 'procedures:create', {
    patientId: kiwi.id,
    values: { ...validRecord, startedAt: minutesFromNow(-24 * 60), endedAt: minutesFromNow(-23 * 60) },
    meta,
  });
  const entry = await must<{ id: number }>(backEnd, 'entries:add', {
    recordId: record.id,
    values: validVitals,
    meta,
  });
  const drug = await must<{ id: number }>(backEnd, 'drugs:add', { values: validDrug, meta });
  return {
    backEnd,
    db: backEnd.db,
    dispatch: (channel, payload) => backEnd.dispatch(channel, payload),
    ids: {
      pip: pip.id,
      kiwi: kiwi.id,
      weight: weight.id,
      pipPlan: pipPlan.id,
      kiwiPlan: kiwiPlan.id,
      record: record.id,
      endedRecord: endedRecord.id,
      entry: entry.id,
      drug: drug.id,
    },
    close: () => {
      backEnd.close();
      temp.remove();
    },
  };
}

/**
 * Row count and SHA-256 of every row of every table (schema included), in rowid order: equal
 * fingerprints mean the database holds exactly the same data.
 */
export function fingerprint(db: TidewingDatabase): string {
  const hash = crypto.createHash('sha256');
  const tables = db
    .prepare<[], { name: string; sql: string | null }>(
      "SELECT name, sql FROM sqlite_schema WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name",
    )
    .all();
  for (const table of tables) {
    hash.update(`${table.name}\n${table.sql ?? ''}\n`);
    const virtual = /^CREATE VIRTUAL/i.test(table.sql ?? '');
    const rows = db
      .prepare(`SELECT ${virtual ? 'rowid, *' : '*'} FROM "${table.name}"`)
      .raw()
      .all();
    hash.update(`${String(rows.length)}\n`);
    // Integers come back as numbers (no safeIntegers), so JSON holds every value exactly.
    hash.update(JSON.stringify(rows));
  }
  hash.update(String(db.pragma('user_version', { simple: true })));
  return hash.digest('hex');
}

export type Refusal = {
  readonly code: 'invalid-request' | 'not-found' | 'conflict';
  readonly field: string;
  /** A fragment the message must contain, when the case is about one message. */
  readonly says?: string | RegExp;
};

/** Sends a request that must be refused, and checks the refusal and that nothing changed. */
export async function expectRefused(
  clinic: Clinic,
  channel: string,
  payload: unknown,
  refusal: Refusal,
): Promise<void> {
  const before = fingerprint(clinic.db);
  const answer = await clinic.dispatch(channel, payload);
  expect(answer.ok, `${channel} should have been refused`).toBe(false);
  const error = answer.error as { code: string; field?: string; message: string };
  expect({ code: error.code, field: error.field }).toEqual({ code: refusal.code, field: refusal.field });
  expect(error.message.length).toBeGreaterThan(10);
  // Never the database's own words: the clinic user gets the field and what to do.
  expect(error.message).not.toMatch(/constraint failed|SQLITE|SqliteError/i);
  if (refusal.says !== undefined) {
    if (typeof refusal.says === 'string') expect(error.message).toContain(refusal.says);
    else expect(error.message).toMatch(refusal.says);
  }
  expect(fingerprint(clinic.db), `${channel} changed the database while refusing`).toBe(before);
}
