/**
 * Records saved before the input rules existed (written here with raw SQL, as an older Tidewing
 * could have) still open and can be corrected: answers are checked for shape only.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { correction, daysFromToday, openClinic, validWeight, type Clinic } from './clinic-fixture.js';

describe('records saved before the rules', () => {
  let clinic: Clinic;
  beforeAll(async () => {
    clinic = await openClinic();
  });
  afterAll(() => clinic.close());

  it('opens a patient whose weights include 5e-324 g and 9999-12-31, and lets the odd weight be corrected', async () => {
    const insert = clinic.db.prepare(
      `INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by) VALUES (?, ?, ?, '2026-06-01T08:00:00.000Z', 'RW')`,
    );
    insert.run(clinic.ids.pip, daysFromToday(-10), 5e-324);
    const future = Number(insert.run(clinic.ids.pip, '9999-12-31', 30).lastInsertRowid);

    const opened = await clinic.dispatch('patients:get', { id: clinic.ids.pip });
    expect(opened.ok).toBe(true);
    const trend = (opened.value as { trend: { latest: unknown; flags: { code: string }[] } }).trend;
    expect(trend.latest).toEqual({ weighedOn: '9999-12-31', massG: 30 });

    const corrected = await clinic.dispatch('weights:correct', {
      id: future,
      values: { ...validWeight, weighedOn: daysFromToday(-1), massG: 30 },
      meta: correction,
    });
    expect(corrected.ok).toBe(true);
    const reopened = await clinic.dispatch('patients:get', { id: clinic.ids.pip });
    expect(reopened.ok).toBe(true);
    const after = (reopened.value as { trend: { latest: unknown; flags: { code: string }[] } }).trend;
    expect(after.latest).toEqual({ weighedOn: daysFromToday(-1), massG: 30 });
    // The 5e-324 g weight is now the first by date: no change is worked out from it, and it is flagged.
    expect(after.flags.map((flag) => flag.code)).toContain('weight-change-not-computable');
  });
});
