import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import type { ClinicDb } from '../../db/clinic-db.js';
import { createEvidenceCacheRepository } from '../../db/repositories/evidence-cache-repository.js';
import { createEvidenceRepository } from '../../db/repositories/evidence-repository.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';

const t0 = new Date('2026-12-01T08:00:00.000Z');
const t1 = new Date('2026-12-01T09:00:00.000Z');
const stamp = t0.toISOString();

async function insertedId(clinic: ClinicDb, query: ReturnType<typeof sql<{ id: number }>>): Promise<number> {
  const result = await query.execute(clinic.kysely);
  return result.rows[0]?.id as number;
}

/**
 * Rows of the record tables the fingerprints read, written directly (those tables' own modules
 * write real ones): a patient with a version, and a procedure record with its first version.
 */
async function addRecord(clinic: ClinicDb, endedAt: string | null) {
  const patientId = await insertedId(
    clinic,
    sql`INSERT INTO patients (created_at) VALUES (${stamp}) RETURNING id`,
  );
  const patientVersionId = await addPatientVersion(clinic, patientId);
  const recordId = await insertedId(
    clinic,
    sql`INSERT INTO procedure_records (patient_id, created_at) VALUES (${patientId}, ${stamp}) RETURNING id`,
  );
  const versionId = await addRecordVersion(clinic, recordId, null, endedAt);
  return { patientId, patientVersionId, recordId, versionId };
}

function addPatientVersion(clinic: ClinicDb, patientId: number): Promise<number> {
  return insertedId(
    clinic,
    sql`INSERT INTO patient_versions (patient_id, name, species_key, sex, entered_at, entered_by)
        VALUES (${patientId}, 'Pip', 'budgerigar', 'female', ${stamp}, 'RW') RETURNING id`,
  );
}

function addRecordVersion(
  clinic: ClinicDb,
  recordId: number,
  correctsId: number | null,
  endedAt: string | null,
): Promise<number> {
  return insertedId(
    clinic,
    sql`INSERT INTO procedure_record_versions (record_id, corrects_id, started_at, ended_at, procedure_name, airway, circuit, staff_initials, entered_at, entered_by)
        VALUES (${recordId}, ${correctsId}, '2026-12-01T08:00:00.000Z', ${endedAt}, 'Wing radiograph', 'mask', 'nonRebreathing', 'RW', ${stamp}, 'RW')
        RETURNING id`,
  );
}

function addEntry(clinic: ClinicDb, recordId: number): Promise<number> {
  return insertedId(
    clinic,
    sql`INSERT INTO procedure_entries (record_id, at, kind, vapor_pct, entered_at, entered_by)
        VALUES (${recordId}, '2026-12-01T08:05:00.000Z', 'vitals', 2, ${stamp}, 'RW') RETURNING id`,
  );
}

function addWeight(clinic: ClinicDb, patientId: number): Promise<number> {
  return insertedId(
    clinic,
    sql`INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by)
        VALUES (${patientId}, '2026-12-01', 32, ${stamp}, 'RW') RETURNING id`,
  );
}

describe.each(testEngines)('evidence repository on %s', (engine) => {
  it('keeps every exclusion decision; the newest per record decides', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const evidence = createEvidenceRepository(clinic);
    const a = await addRecord(clinic, '2026-12-01T08:40:00.000Z');
    const b = await addRecord(clinic, '2026-12-01T08:40:00.000Z');
    expect(await evidence.exclusions()).toEqual(new Map());
    expect(
      await evidence.setExcluded(a.recordId, true, { enteredBy: 'RW', reason: 'Mask leaked' }, t0),
    ).toEqual({
      recordId: a.recordId,
      excluded: true,
      reason: 'Mask leaked',
      enteredAt: t0.toISOString(),
      enteredBy: 'RW',
    });
    await evidence.setExcluded(b.recordId, true, { enteredBy: 'RW', reason: 'Wrong agent logged' }, t0);
    await evidence.setExcluded(a.recordId, false, { enteredBy: 'CD', reason: 'Leak was small' }, t1);
    expect(await evidence.exclusions()).toEqual(
      new Map([
        [
          a.recordId,
          {
            recordId: a.recordId,
            excluded: false,
            reason: 'Leak was small',
            enteredAt: t1.toISOString(),
            enteredBy: 'CD',
          },
        ],
        [
          b.recordId,
          {
            recordId: b.recordId,
            excluded: true,
            reason: 'Wrong agent logged',
            enteredAt: t0.toISOString(),
            enteredBy: 'RW',
          },
        ],
      ]),
    );
    await expect(sql`UPDATE evidence_exclusions SET excluded = 0`.execute(clinic.kysely)).rejects.toThrow(
      /never changed in place/,
    );
    await expect(sql`DELETE FROM evidence_exclusions`.execute(clinic.kysely)).rejects.toThrow(
      /never deleted/,
    );
  });

  it('the calibration is on until switched; the newest switch decides', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const evidence = createEvidenceRepository(clinic);
    expect(await evidence.calibrationSwitch()).toEqual({
      on: true,
      enteredAt: null,
      enteredBy: null,
      reason: '',
    });
    await evidence.setCalibration(false, { enteredBy: 'RW', reason: 'Too few records' }, t0);
    expect(await evidence.calibrationSwitch()).toEqual({
      on: false,
      enteredAt: t0.toISOString(),
      enteredBy: 'RW',
      reason: 'Too few records',
    });
    expect(await evidence.setCalibration(true, { enteredBy: 'CD', reason: '' }, t1)).toEqual({
      on: true,
      enteredAt: t1.toISOString(),
      enteredBy: 'CD',
      reason: '',
    });
    expect((await evidence.calibrationSwitch()).enteredBy).toBe('CD');
    await expect(sql`DELETE FROM evidence_calibration_switch`.execute(clinic.kysely)).rejects.toThrow(
      /never deleted/,
    );
  });

  it("a record's fingerprint names its newest version, entries, weight and patient version, and changes with each", async (context) => {
    const clinic = await openTestClinic(engine, context);
    const evidence = createEvidenceRepository(clinic);
    expect(await evidence.recordFingerprints()).toEqual([]);
    const open = await addRecord(clinic, null);
    const fingerprintOf = async (recordId: number) =>
      (await evidence.recordFingerprints()).find((entry) => entry.recordId === recordId);
    expect(await fingerprintOf(open.recordId)).toEqual({
      recordId: open.recordId,
      ended: false,
      key: `${open.versionId}|0:0|null|${open.patientVersionId}`,
    });
    const ended = await addRecordVersion(clinic, open.recordId, open.versionId, '2026-12-01T08:40:00.000Z');
    const firstEntry = await addEntry(clinic, open.recordId);
    const secondEntry = await addEntry(clinic, open.recordId);
    const weight = await addWeight(clinic, open.patientId);
    const patientVersion = await addPatientVersion(clinic, open.patientId);
    expect(firstEntry).toBeLessThan(secondEntry);
    expect(await fingerprintOf(open.recordId)).toEqual({
      recordId: open.recordId,
      ended: true,
      key: `${ended}|2:${secondEntry}|${weight}|${patientVersion}`,
    });
    // One row per record, the other record untouched by these writes.
    const other = await addRecord(clinic, '2026-12-01T09:00:00.000Z');
    const all = await evidence.recordFingerprints();
    expect(all.map((entry) => entry.recordId).sort((x, y) => x - y)).toEqual([open.recordId, other.recordId]);
    expect(all.find((entry) => entry.recordId === other.recordId)?.key).toBe(
      `${other.versionId}|0:0|null|${other.patientVersionId}`,
    );
    // Narrowed to some records or to one bird's: the same fingerprints, only those.
    expect(await evidence.recordFingerprints({ recordIds: [other.recordId] })).toEqual(
      all.filter((entry) => entry.recordId === other.recordId),
    );
    expect(await evidence.recordFingerprints({ recordIds: [] })).toEqual([]);
    expect(await evidence.recordFingerprints({ patientId: open.patientId })).toEqual(
      all.filter((entry) => entry.recordId === open.recordId),
    );
  });
});

describe.each(testEngines)('evidence prediction cache on %s', (engine) => {
  it('stores rows by record id and replaces a stale row, in batches larger than one statement', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const cache = createEvidenceCacheRepository(clinic);
    expect(await cache.all()).toEqual(new Map());
    expect(await cache.store([], t0)).toBe(true);
    const rows = Array.from({ length: 600 }, (_, index) => ({
      recordId: index + 1,
      key: `k1|${index}`,
      rowJson: JSON.stringify({ recordId: index + 1 }),
    }));
    expect(await cache.store(rows, t0)).toBe(true);
    const stored = await cache.all();
    expect(stored.size).toBe(600);
    expect(stored.get(600)).toEqual({ key: 'k1|599', rowJson: '{"recordId":600}' });

    expect(
      await cache.store([{ recordId: 600, key: 'k2|599', rowJson: '{"recordId":600,"again":true}' }], t1),
    ).toBe(true);
    const replaced = await cache.all();
    expect(replaced.size).toBe(600);
    expect(replaced.get(600)).toEqual({ key: 'k2|599', rowJson: '{"recordId":600,"again":true}' });
    expect(replaced.get(1)).toEqual({ key: 'k1|0', rowJson: '{"recordId":1}' });
    // The stored rows of some records only (a record without one is left out).
    expect(await cache.rowsFor([1, 600, 601])).toEqual(
      new Map([
        [1, { key: 'k1|0', rowJson: '{"recordId":1}' }],
        [600, { key: 'k2|599', rowJson: '{"recordId":600,"again":true}' }],
      ]),
    );
    expect(await cache.rowsFor([])).toEqual(new Map());
    const computedAt = await sql<{
      record_id: number;
      computed_at: string;
    }>`SELECT record_id, computed_at FROM evidence_prediction_cache WHERE record_id IN (1, 600) ORDER BY record_id`.execute(
      clinic.kysely,
    );
    expect(computedAt.rows).toEqual([
      { record_id: 1, computed_at: t0.toISOString() },
      { record_id: 600, computed_at: t1.toISOString() },
    ]);
  });

  it('a write the database refuses is skipped whole: false, and the stored rows stay as they were', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const cache = createEvidenceCacheRepository(clinic);
    expect(await cache.store([{ recordId: 1, key: 'k1', rowJson: '{"recordId":1}' }], t0)).toBe(true);
    // The table refuses a row that is not JSON; the good rows written with it are rolled back.
    const refused = [
      { recordId: 1, key: 'k2', rowJson: '{"recordId":1,"again":true}' },
      { recordId: 2, key: 'k2', rowJson: '{"recordId":2}' },
      { recordId: 3, key: 'k2', rowJson: '{not json' },
    ];
    expect(await cache.store(refused, t1)).toBe(false);
    expect(await cache.all()).toEqual(new Map([[1, { key: 'k1', rowJson: '{"recordId":1}' }]]));
  });
});
