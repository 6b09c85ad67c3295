import { sql, type RawBuilder } from 'kysely';
import { describe, expect, it } from 'vitest';
import type { ClinicDb } from '../../db/clinic-db.js';
import { constraintError } from '../../main/back-end/constraint-errors.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';

const at = '2026-12-01T09:30:00.000Z';

/** What the database threw for `query`; fails the test when it was accepted. */
async function thrownBy(db: ClinicDb, query: RawBuilder<unknown>): Promise<unknown> {
  try {
    await query.execute(db.kysely);
  } catch (error) {
    return error;
  }
  throw new Error(`Accepted: ${query.compile(db.kysely).sql}`);
}

async function patientWithWeight(db: ClinicDb): Promise<void> {
  await sql`INSERT INTO species (species_key, origin, common_name, mass_min_g, mass_max_g, mass_basis, entered_at, entered_by)
    VALUES ('testbird', 'clinic', 'Test bird', 10, 20, 'test row', ${at}, 'RW')`.execute(db.kysely);
  await sql`INSERT INTO patients (created_at) VALUES (${at})`.execute(db.kysely);
  await sql`INSERT INTO patient_versions (patient_id, name, species_key, sex, entered_at, entered_by)
    VALUES (1, 'Pip', 'testbird', 'female', ${at}, 'RW')`.execute(db.kysely);
  await sql`INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by)
    VALUES (1, '2026-12-01', 350, ${at}, 'RW')`.execute(db.kysely);
}

// The same refusal on either engine becomes the same contract error: the database's own wording
// never reaches the clinic.
describe.each(testEngines)('database refusals as contract errors on %s', (engine) => {
  it('a missing record behind a foreign key points at the field the channel names', async (context) => {
    const db = await openTestClinic(engine, context);
    const error = await thrownBy(
      db,
      sql`INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by) VALUES (99, '2026-12-01', 350, ${at}, 'RW')`,
    );
    expect(constraintError('weights:add', error, { patientId: 99, massG: 350 })).toEqual({
      code: 'invalid-request',
      message:
        'Patient refers to a record that is not in the clinic database (it may have been opened from an old link); choose it again.',
      field: 'patientId',
    });
  });

  it('a second correction of the same row is a conflict on the corrected record', async (context) => {
    const db = await openTestClinic(engine, context);
    await patientWithWeight(db);
    const correct = sql`INSERT INTO weights (patient_id, corrects_id, weighed_on, mass_g, entered_at, entered_by, reason)
      VALUES (1, 1, '2026-12-01', 355, ${at}, 'RW', 'typing error')`;
    await correct.execute(db.kysely);
    const error = await thrownBy(db, correct);
    expect(constraintError('weights:correct', error, { id: 1, values: { massG: 355 } })).toEqual({
      code: 'conflict',
      message:
        'This record was corrected by someone else since you opened it; open its newest version and correct that.',
      field: 'id',
    });
  });

  it('a key already used names its field', async (context) => {
    const db = await openTestClinic(engine, context);
    await patientWithWeight(db);
    const error = await thrownBy(
      db,
      sql`INSERT INTO species (species_key, origin, common_name, mass_min_g, mass_max_g, mass_basis, entered_at, entered_by)
        VALUES ('testbird', 'clinic', 'Other bird', 10, 20, 'test row', ${at}, 'RW')`,
    );
    expect(constraintError('species:add', error, { values: { speciesKey: 'testbird' } })).toEqual({
      code: 'conflict',
      message: 'Species is already used by another record; choose another.',
      field: 'values.speciesKey',
    });
  });

  it('an UPDATE or DELETE of a record is refused as a correction to make instead', async (context) => {
    const db = await openTestClinic(engine, context);
    await patientWithWeight(db);
    const expected = {
      code: 'conflict',
      message:
        'Saved records are never changed or deleted in place; save a correction with a reason instead.',
      field: 'id',
    };
    for (const query of [sql`UPDATE weights SET mass_g = 1`, sql`DELETE FROM weights`])
      expect(constraintError('weights:correct', await thrownBy(db, query), { id: 1 })).toEqual(expected);
  });

  it('a CHECK names the field of its first column, and a missing value is asked for', async (context) => {
    const db = await openTestClinic(engine, context);
    await patientWithWeight(db);
    const weight = sql`INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by) VALUES (1, '2026-12-01', -5, ${at}, 'RW')`;
    expect(
      constraintError('weights:add', await thrownBy(db, weight), {
        patientId: 1,
        massG: -5,
        weighedOn: '2026-12-01',
      }),
    ).toEqual({
      code: 'invalid-request',
      message: 'Weight has a value the clinic database does not accept; check it and save again.',
      field: 'massG',
    });
    const species = sql`INSERT INTO species (species_key, origin, common_name, mass_min_g, mass_max_g, mass_basis, heart_rate_min_per_min, entered_at, entered_by)
      VALUES ('otherbird', 'clinic', 'Other bird', 10, 20, 'test row', 200, ${at}, 'RW')`;
    expect(
      constraintError('species:add', await thrownBy(db, species), {
        values: { heartRateMinPerMin: 200, heartRateBasis: null },
      }),
    ).toMatchObject({ code: 'invalid-request', field: 'values.heartRateMinPerMin' });
    const event = sql`INSERT INTO procedure_entries (record_id, at, kind, entered_at, entered_by) VALUES (1, ${at}, 'event', ${at}, 'RW')`;
    await sql`INSERT INTO procedure_records (patient_id, created_at) VALUES (1, ${at})`.execute(db.kysely);
    expect(
      constraintError('entries:add', await thrownBy(db, event), {
        recordId: 1,
        entry: { kind: 'event', eventType: null },
      }),
    ).toMatchObject({ code: 'invalid-request', field: 'entry.kind' });
    const missing = sql`INSERT INTO procedure_entries (record_id, at, kind, entered_at) VALUES (1, ${at}, 'vitals', ${at})`;
    expect(
      constraintError('entries:add', await thrownBy(db, missing), { recordId: 1, meta: { enteredBy: '' } }),
    ).toEqual({
      code: 'invalid-request',
      message: 'Name or initials is required; fill it in and save again.',
      field: 'meta.enteredBy',
    });
  });

  it('is null for what is not a constraint failure', async (context) => {
    const db = await openTestClinic(engine, context);
    const error = await thrownBy(db, sql`SELECT nonsense FROM missing_table`);
    expect(constraintError('weights:add', error, {})).toBeNull();
    expect(constraintError('weights:add', new Error('something else'), {})).toBeNull();
  });
});
