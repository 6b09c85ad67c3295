/**
 * Optimistic concurrency for corrections, on both engines: two workstations correcting the same
 * version, the second refused with who, where, when and why, and nothing overwritten.
 */
import { describe, expect, it } from 'vitest';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { laterVersion } from '../../db/repositories/version-chain.js';
import {
  ConcurrentChangeError,
  concurrentChangeMessage,
  isCorrectionClash,
  refuseConcurrentChange,
} from '../../main/back-end/concurrent-change.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';
import { cropBiopsy, insertPatient, insertWorkstation, vitalsAt } from '../db/support/clinic-rows.js';

const theatre = '0c6f1a52-8d1e-4f7b-9a43-2b1f0e9d7c11';
const prep = '5d2e7b90-1f3c-4a8e-b6d4-9e0f1a2b3c4d';
const opened = new Date('2026-12-01T08:00:00.000Z');
const firstAt = new Date('2026-12-01T10:42:00.000Z');
const secondAt = new Date('2026-12-01T10:43:00.000Z');

/** "at 10:42" as the back end's clock shows an instant (the workstation's time zone). */
const localClock = (at: Date) =>
  `at ${String(at.getHours()).padStart(2, '0')}:${String(at.getMinutes()).padStart(2, '0')}`;

describe.each(testEngines)('corrections of the same version from two workstations on %s', (engine) => {
  /** A record with one vitals row, logged on the theatre workstation; both workstations named. */
  async function clinicWithRow(context: { skip: (note?: string) => never }) {
    const db = await openTestClinic(engine, context);
    await insertWorkstation(db, theatre, 'Theatre 1');
    await insertWorkstation(db, prep, 'Prep room');
    const record = await createProcedureRecordRepository(db).create(
      await insertPatient(db),
      cropBiopsy,
      { enteredBy: 'RW', reason: '' },
      opened,
    );
    const entries = createProcedureEntryRepository(db);
    const row = await entries.add(
      record.id,
      vitalsAt('2026-12-01T08:35:00.000Z', { heartRatePerMin: 42 }),
      { enteredBy: 'RW', reason: '', workstationId: theatre },
      opened,
    );
    /** A correction of the row's first version as the entry handler runs it. */
    const correct = (
      heartRatePerMin: number,
      enteredBy: string,
      reason: string,
      workstationId: string,
      at: Date,
    ) =>
      refuseConcurrentChange({
        noun: 'entry',
        now: () => at,
        write: () =>
          entries.correct(
            row.id,
            { ...row.values, heartRatePerMin },
            { enteredBy, reason, workstationId },
            at,
          ),
        later: () => laterVersion(db, 'procedure_entries', row.id),
      });
    return { db, record, entries, row, correct };
  }

  it('refuses the second correction, saying who corrected it first, on which workstation, when and why', async (context) => {
    const { entries, row, correct } = await clinicWithRow(context);
    const first = await correct(420, 'RW', 'Heart rate missed a digit', theatre, firstAt);
    const refusal = await correct(400, 'MK', 'Recounted', prep, secondAt).then(
      () => expect.fail('the second correction was saved'),
      (error: unknown) => error,
    );
    expect(refusal).toBeInstanceOf(ConcurrentChangeError);
    expect((refusal as ConcurrentChangeError).message).toBe(
      `Not saved: this entry was already corrected by RW on Theatre 1 ${localClock(firstAt)} (reason: Heart rate missed a digit). Your change was not applied; reload to see the current entry.`,
    );
    expect((refusal as ConcurrentChangeError).later).toMatchObject({
      versionId: first?.id,
      enteredBy: 'RW',
      enteredAt: firstAt.toISOString(),
      voided: false,
      workstationName: 'Theatre 1',
    });
    // Nothing overwritten, nothing added: the first correction is the current row.
    expect((await entries.list(row.recordId)).map((entry) => entry.values.heartRatePerMin)).toEqual([420]);
    expect((await entries.history(row.id)).map((entry) => entry.stamp.enteredBy)).toEqual(['RW', 'RW']);
  });

  it('saves exactly one of two corrections begun at the same moment and refuses the other with who and when', async (context) => {
    const { entries, row, correct } = await clinicWithRow(context);
    const results = await Promise.allSettled([
      correct(420, 'RW', 'Heart rate missed a digit', theatre, firstAt),
      correct(400, 'MK', 'Recounted', prep, firstAt),
    ]);
    const saved = results.filter((result) => result.status === 'fulfilled');
    const refused = results.flatMap((result) =>
      result.status === 'rejected' ? [result.reason as unknown] : [],
    );
    expect(saved).toHaveLength(1);
    expect(refused).toHaveLength(1);
    expect(refused[0]).toBeInstanceOf(ConcurrentChangeError);
    const winner = (await entries.list(row.recordId))[0];
    const who = winner?.stamp.enteredBy === 'RW' ? 'RW on Theatre 1' : 'MK on Prep room';
    expect((refused[0] as Error).message).toContain(`already corrected by ${who} ${localClock(firstAt)}`);
    expect(await entries.history(row.id)).toHaveLength(2);
  });

  it('says so when the other workstation voided the version first', async (context) => {
    const { entries, row, correct } = await clinicWithRow(context);
    await entries.void(
      row.id,
      { enteredBy: 'JS', reason: 'Probe off the bird', workstationId: prep },
      firstAt,
    );
    await expect(correct(400, 'MK', 'Recounted', theatre, secondAt)).rejects.toThrow(
      `Not saved: this entry was already voided by JS on Prep room ${localClock(firstAt)} (reason: Probe off the bird).`,
    );
  });

  it('tells a correction clash from every other refusal', async (context) => {
    const { db, record, row } = await clinicWithRow(context);
    const entries = createProcedureEntryRepository(db);
    await entries.correct(row.id, row.values, { enteredBy: 'RW', reason: 'a' }, firstAt);
    const clash = await entries
      .correct(row.id, row.values, { enteredBy: 'MK', reason: 'b' }, secondAt)
      .catch((error: unknown) => error);
    expect(isCorrectionClash(clash)).toBe(true);
    // Another UNIQUE key (a workstation's id) and a CHECK are not correction clashes.
    const duplicate = await insertWorkstation(db, theatre, 'Again').catch((error: unknown) => error);
    expect(duplicate).toBeInstanceOf(Error);
    expect(isCorrectionClash(duplicate)).toBe(false);
    const check = await entries
      .add(
        record.id,
        vitalsAt(row.values.at, { heartRatePerMin: 5000 }),
        { enteredBy: 'RW', reason: '' },
        firstAt,
      )
      .catch((error: unknown) => error);
    expect(check).toBeInstanceOf(Error);
    expect(isCorrectionClash(check)).toBe(false);
    expect(isCorrectionClash(new Error('corrects_id'))).toBe(false);
    // The record's details have no workstation: the message leaves it out.
    expect(await laterVersion(db, 'procedure_record_versions', record.stamp.versionId)).toBeNull();
  });
});

describe('the conflict message', () => {
  it('gives the date when the other change was not made today, and leaves out an empty reason', () => {
    const later = {
      versionId: 7,
      enteredBy: 'MK',
      enteredAt: '2026-11-30T16:05:00.000Z',
      reason: ' ',
      voided: false,
      workstationName: null,
    };
    const at = new Date(later.enteredAt);
    const day = `${at.getFullYear()}-${String(at.getMonth() + 1).padStart(2, '0')}-${String(at.getDate()).padStart(2, '0')}`;
    expect(concurrentChangeMessage('weight', later, new Date('2026-12-03T12:00:00.000Z'))).toBe(
      `Not saved: this weight was already corrected by MK ${localClock(at)} on ${day}. Your change was not applied; reload to see the current weight.`,
    );
    expect(concurrentChangeMessage('weight', null, new Date())).toBe(
      'Not saved: this weight was changed on another workstation first. Your change was not applied; reload to see the current weight.',
    );
  });
});
