import { afterEach, describe, expect, it } from 'vitest';
import { procedureCsvHeaders } from '../../app/core/procedure-csv.js';
import { localTimeWithOffset } from '../../app/core/procedure-events.js';

/** An instant as the workstation's wall clock shows it, with its offset (the export's rule). */
const wallClock = (iso: string) => localTimeWithOffset(iso, -new Date(iso).getTimezoneOffset());
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import {
  correctionBy,
  enteredByRw,
  kiwiValues,
  pipInductionValues,
  pipRadiographValues,
  pipValues,
  pipVitalsValues,
} from '../support/clinic-birds.js';

const open: ChannelHarness[] = [];
afterEach(() => open.splice(0).forEach((harness) => harness.close()));

/** "at 10:06" as the back end's clock shows an instant (the workstation's time zone). */
const localClock = (iso: string) => {
  const at = new Date(iso);
  return `at ${String(at.getHours()).padStart(2, '0')}:${String(at.getMinutes()).padStart(2, '0')}`;
};

/** A back end holding Pip (weighed at 38 g) and one procedure record for him. */
async function withPipRecord() {
  const api = openChannelHarness();
  open.push(api);
  const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
  await api.answer('weights:add', {
    patientId: pip.id,
    values: { weighedOn: '2026-12-01', massG: 38, bodyCondition: 'ideal', weighedBy: 'RW' },
    meta: enteredByRw,
  });
  const record = await api.answer('procedures:create', {
    patientId: pip.id,
    values: pipRadiographValues,
    meta: enteredByRw,
  });
  // The record was opened before the bird arrived; rows are entered as the procedure runs (the
  // back end refuses a row more than a few minutes in the future).
  api.clock.set('2026-12-01T10:05:30.000Z');
  return { api, pip, record };
}

describe('procedure record channels', () => {
  it('procedures:create opens a record; procedures:get shows it with the patient, species and latest weight', async () => {
    const { api, pip, record } = await withPipRecord();
    expect(record).toMatchObject({
      patientId: pip.id,
      values: pipRadiographValues,
      stamp: { enteredBy: 'RW', enteredAt: '2026-12-01T09:30:00.000Z', correctsId: null },
    });
    const detail = await api.answer('procedures:get', { id: record.id });
    expect(detail).toMatchObject({ record, patient: pip, latestMassG: 38, entries: [] });
    expect(detail.species?.key).toBe('budgerigar');
    expect((await api.answer('patients:get', { id: pip.id })).procedures).toEqual([record]);
  });

  it('procedures:create keeps the agent given; an agent not in the list is refused on its field', async () => {
    const { api, pip } = await withPipRecord();
    const record = await api.answer('procedures:create', {
      patientId: pip.id,
      values: { ...pipRadiographValues, agent: 'sevoflurane' },
      meta: enteredByRw,
    });
    expect(record.values.agent).toBe('sevoflurane');
    expect((await api.answer('procedures:get', { id: record.id })).record.values.agent).toBe('sevoflurane');
    // Not given: the record does not name its agent (null), nothing is filled in for it.
    const without = await api.answer('procedures:create', {
      patientId: pip.id,
      values: pipRadiographValues,
      meta: enteredByRw,
    });
    expect(without.values.agent).toBeNull();
    for (const agent of ['halothane', 'Sevoflurane', ''])
      expect(
        await api.refusal('procedures:create', {
          patientId: pip.id,
          values: { ...pipRadiographValues, agent },
          meta: enteredByRw,
        }),
      ).toMatchObject({
        code: 'invalid-request',
        field: 'values.agent',
        message: 'Choose the anaesthetic agent given: isoflurane, sevoflurane or desflurane.',
      });
  });

  it('procedures:correct changes a recorded agent with a reason, never removes it; an old record may stay without', async () => {
    const { api, pip, record: older } = await withPipRecord();
    const record = await api.answer('procedures:create', {
      patientId: pip.id,
      values: { ...pipRadiographValues, agent: 'sevoflurane' },
      meta: enteredByRw,
    });
    const corrected = await api.answer('procedures:correct', {
      id: record.id,
      values: { ...pipRadiographValues, agent: 'isoflurane' },
      meta: correctionBy('RW', 'Isoflurane vaporiser was on the machine'),
    });
    expect(corrected.values.agent).toBe('isoflurane');
    expect((await api.answer('procedures:history', { id: record.id })).map((v) => v.values.agent)).toEqual([
      'isoflurane',
      'sevoflurane',
    ]);
    expect(
      await api.refusal('procedures:correct', {
        id: record.id,
        values: { ...pipRadiographValues, agent: null },
        meta: correctionBy('RW', 'Not sure'),
      }),
    ).toEqual({
      code: 'invalid-request',
      field: 'values.agent',
      message:
        'The record names Isoflurane as the agent given; choose the agent given (a recorded agent can be corrected, not removed).',
    });
    // A record that never named its agent is corrected without one, or given one.
    const kept = await api.answer('procedures:correct', {
      id: older.id,
      values: { ...pipRadiographValues, procedureName: 'Wing radiographs' },
      meta: correctionBy('RW', 'Both wings'),
    });
    expect(kept.values.agent).toBeNull();
    const named = await api.answer('procedures:correct', {
      id: older.id,
      values: { ...pipRadiographValues, agent: 'desflurane' },
      meta: correctionBy('RW', 'Agent found on the paper sheet'),
    });
    expect(named.values.agent).toBe('desflurane');
  });

  it('procedures:create names the airway field when the airway is not one of the four, and needs a patient', async () => {
    const { api, pip } = await withPipRecord();
    const airway = await api.refusal('procedures:create', {
      patientId: pip.id,
      values: { ...pipRadiographValues, airway: 'nasal' },
      meta: enteredByRw,
    });
    expect(airway).toMatchObject({
      code: 'invalid-request',
      field: 'values.airway',
      message: 'Choose mask, chamber, endotracheal tube or air-sac tube.',
    });
    const start = await api.refusal('procedures:create', {
      patientId: pip.id,
      values: { ...pipRadiographValues, startedAt: 'ten o’clock' },
      meta: enteredByRw,
    });
    expect(start).toMatchObject({
      field: 'values.startedAt',
      message: 'Start must be a real date and time, e.g. 2024-03-15T09:30:00Z.',
    });
    const nobody = await api.refusal('procedures:create', {
      patientId: pip.id + 1,
      values: pipRadiographValues,
      meta: enteredByRw,
    });
    expect(nobody.code).toBe('not-found');
  });

  it('procedures:correct adds a version with its reason; procedures:history lists both newest first', async () => {
    const { api, record } = await withPipRecord();
    api.clock.set('2026-12-01T10:40:00.000Z');
    const ended = await api.answer('procedures:correct', {
      id: record.id,
      values: { ...pipRadiographValues, endedAt: '2026-12-01T10:35:00.000Z' },
      meta: correctionBy('RW', 'Procedure finished'),
    });
    expect(ended).toMatchObject({
      id: record.id,
      values: { endedAt: '2026-12-01T10:35:00.000Z' },
      stamp: { reason: 'Procedure finished', correctsId: record.stamp.versionId },
    });
    const history = await api.answer('procedures:history', { id: record.id });
    expect(history.map((version) => version.values.endedAt)).toEqual(['2026-12-01T10:35:00.000Z', null]);
    expect(await api.answer('procedures:history', { id: record.id + 1 })).toEqual([]);
  });

  it('procedures:correct needs a reason and a record that exists', async () => {
    const { api, record } = await withPipRecord();
    const noReason = await api.refusal('procedures:correct', {
      id: record.id,
      values: pipRadiographValues,
      meta: enteredByRw,
    });
    expect(noReason).toMatchObject({ code: 'invalid-request', field: 'meta.reason' });
    const missing = await api.refusal('procedures:correct', {
      id: record.id + 1,
      values: pipRadiographValues,
      meta: correctionBy('RW', 'Typo'),
    });
    expect(missing.code).toBe('not-found');
    const badHistory = await api.refusal('procedures:history', { id: 0 });
    expect(badHistory).toMatchObject({ code: 'invalid-request', field: 'id' });
  });

  it('procedures:recent lists the newest start first with patient and species names', async () => {
    const { api, record } = await withPipRecord();
    const kiwi = await api.answer('patients:create', { values: kiwiValues, meta: enteredByRw });
    const later = await api.answer('procedures:create', {
      patientId: kiwi.id,
      values: { ...pipRadiographValues, startedAt: '2026-12-01T14:00:00.000Z', procedureName: 'Beak trim' },
      meta: enteredByRw,
    });
    const recent = await api.answer('procedures:recent', {});
    expect(recent).toEqual([
      { record: later, patientName: 'Kiwi', speciesName: 'Cockatiel' },
      { record, patientName: 'Pip', speciesName: 'Budgerigar' },
    ]);
    expect(await api.answer('procedures:recent', { limit: 1 })).toHaveLength(1);
    const error = await api.refusal('procedures:recent', { limit: 0 });
    expect(error).toMatchObject({ code: 'invalid-request', field: 'limit' });
  });

  it('procedures:get says a missing record was not found', async () => {
    const { api, record } = await withPipRecord();
    const error = await api.refusal('procedures:get', { id: record.id + 1 });
    expect(error.code).toBe('not-found');
    expect(error.message).toMatch(/^Procedure record \d+ was not found/);
  });

  it('procedures:export-csv writes RFC 4180 rows in time order, minutes from the start and a file name', async () => {
    const { api, record } = await withPipRecord();
    // Entered out of order: the vitals row first, then the induction four minutes earlier.
    await api.answer('entries:add', { recordId: record.id, values: pipVitalsValues, meta: enteredByRw });
    await api.answer('entries:add', { recordId: record.id, values: pipInductionValues, meta: enteredByRw });
    const exported = await api.answer('procedures:export-csv', { id: record.id });
    expect(exported.fileName).toBe(`tidewing-procedure-${record.id}-Pip-2026-12-01.csv`);
    const lines = exported.csv.split('\r\n');
    expect(lines.slice(0, 9)).toEqual([
      'patient,Pip',
      'species,Budgerigar',
      'procedure,Wing radiograph',
      `started,${wallClock('2026-12-01T10:00:00.000Z')}`,
      'ASA grade,2',
      'airway,mask',
      // Pip's record does not name its agent (as every record made before records carried one).
      'agent,not recorded',
      'staff,RW',
      '',
    ]);
    // A header holding a comma is quoted (RFC 4180).
    expect(lines[9]).toBe(procedureCsvHeaders.map((h) => (h.includes(',') ? `"${h}"` : h)).join(','));
    expect(lines.slice(10)).toEqual([
      `${wallClock('2026-12-01T10:01:00.000Z')},1,event,,,,,,,,,Induction,"Smooth, no struggling",,,RW,,${wallClock('2026-12-01T10:05:30.000Z')},no`,
      `${wallClock('2026-12-01T10:05:00.000Z')},5,vitals,,2,1,420,40,40.1,,,,,,,RW,,${wallClock('2026-12-01T10:05:30.000Z')},no`,
      '',
    ]);
  });

  it('procedures:export-csv names the record’s agent and each row’s workstation', async () => {
    const { api, pip } = await withPipRecord();
    const record = await api.answer('procedures:create', {
      patientId: pip.id,
      values: { ...pipRadiographValues, agent: 'sevoflurane' },
      meta: enteredByRw,
    });
    await api.answer('entries:add', { recordId: record.id, values: pipInductionValues, meta: enteredByRw });
    await api.answer('workstation:save', { name: 'Theatre 1' });
    await api.answer('entries:add', { recordId: record.id, values: pipVitalsValues, meta: enteredByRw });
    const exported = await api.answer('procedures:export-csv', { id: record.id });
    const lines = exported.csv.split('\r\n');
    expect(lines).toContain('agent,sevoflurane');
    const header = lines.indexOf(procedureCsvHeaders.map((h) => (h.includes(',') ? `"${h}"` : h)).join(','));
    const rows = lines.slice(header + 1, -1).map((line) => line.replace(/"[^"]*"/g, 'quoted').split(','));
    const column = (name: (typeof procedureCsvHeaders)[number]) => procedureCsvHeaders.indexOf(name);
    expect(
      rows.map((row) => [row[column('kind')], row[column('agent')], row[column('workstation')]]),
    ).toEqual([
      // By the workstation's current name (the rows carry its id).
      ['event', 'sevoflurane', 'Theatre 1'],
      ['vitals', 'sevoflurane', 'Theatre 1'],
    ]);
  });

  it('procedures:export-csv defuses a note a spreadsheet would run as a formula', async () => {
    const { api, record } = await withPipRecord();
    await api.answer('entries:add', {
      recordId: record.id,
      values: { ...pipInductionValues, eventType: 'note', eventNote: '=1+1' },
      meta: enteredByRw,
    });
    const exported = await api.answer('procedures:export-csv', { id: record.id });
    // Leading = is prefixed with an apostrophe (OWASP CSV injection guidance, common practice).
    expect(exported.csv).toContain(",Note,'=1+1,");
    const missing = await api.refusal('procedures:export-csv', { id: record.id + 1 });
    expect(missing.code).toBe('not-found');
  });
});

describe('procedure entry channels', () => {
  it('entries:add stores a vitals row and an event, listed in time order by procedures:get', async () => {
    const { api, record } = await withPipRecord();
    const vitals = await api.answer('entries:add', {
      recordId: record.id,
      values: pipVitalsValues,
      meta: enteredByRw,
    });
    expect(vitals).toMatchObject({ recordId: record.id, values: pipVitalsValues, voided: false });
    await api.answer('entries:add', { recordId: record.id, values: pipInductionValues, meta: enteredByRw });
    const detail = await api.answer('procedures:get', { id: record.id });
    expect(detail.entries.map((entry) => [entry.values.eventType, entry.corrected])).toEqual([
      ['induction', false],
      [null, false],
    ]);
  });

  it('entries:add names the field for an out-of-range reading, an empty row, an unnamed drug and a missing record', async () => {
    const { api, record } = await withPipRecord();
    const add = (values: unknown, recordId = record.id) =>
      api.refusal('entries:add', { recordId, values, meta: enteredByRw });
    expect(await add({ ...pipVitalsValues, heartRatePerMin: 1300 })).toMatchObject({
      code: 'invalid-request',
      field: 'values.heartRatePerMin',
      message: 'Heart rate must be 0 to 1200 /min.',
    });
    expect(
      await add({
        ...pipVitalsValues,
        vaporPct: null,
        oxygenLpm: null,
        heartRatePerMin: null,
        breathsPerMin: null,
        temperatureC: null,
      }),
    ).toMatchObject({ field: 'values.heartRatePerMin', message: 'Enter at least one reading in the row.' });
    expect(await add({ ...pipInductionValues, eventType: 'drugGiven', drugName: '' })).toMatchObject({
      field: 'values.drugName',
      message: 'Name the drug given.',
    });
    expect(await add({ ...pipInductionValues, eventType: null })).toMatchObject({
      field: 'values.eventType',
      message: 'An event needs an event type; a vitals row has none.',
    });
    expect((await add(pipVitalsValues, record.id + 1)).code).toBe('not-found');
    expect((await api.answer('procedures:get', { id: record.id })).entries).toEqual([]);
  });

  it('entries:correct replaces a row and marks it corrected; entries:history lists the chain; a stale correction conflicts', async () => {
    const { api, record } = await withPipRecord();
    const typo = await api.answer('entries:add', {
      recordId: record.id,
      values: { ...pipVitalsValues, heartRatePerMin: 42 },
      meta: enteredByRw,
    });
    api.clock.set('2026-12-01T10:06:00.000Z');
    const fixed = await api.answer('entries:correct', {
      id: typo.id,
      values: pipVitalsValues,
      meta: correctionBy('RW', 'Heart rate missed a digit'),
    });
    expect(fixed).toMatchObject({
      recordId: record.id,
      values: { heartRatePerMin: 420 },
      stamp: { correctsId: typo.id, enteredAt: '2026-12-01T10:06:00.000Z' },
    });
    const detail = await api.answer('procedures:get', { id: record.id });
    expect(detail.entries.map((entry) => [entry.id, entry.corrected])).toEqual([[fixed.id, true]]);
    const history = await api.answer('entries:history', { id: fixed.id });
    expect(history.map((entry) => entry.values.heartRatePerMin)).toEqual([420, 42]);
    const stale = await api.refusal('entries:correct', {
      id: typo.id,
      values: pipVitalsValues,
      meta: correctionBy('MK', 'Again'),
    });
    expect(stale).toEqual({
      code: 'conflict',
      field: 'id',
      message: `Not saved: this entry was already corrected by RW ${localClock('2026-12-01T10:06:00.000Z')} (reason: Heart rate missed a digit). Your change was not applied; reload to see the current entry.`,
    });
    const noReason = await api.refusal('entries:correct', {
      id: fixed.id,
      values: pipVitalsValues,
      meta: enteredByRw,
    });
    expect(noReason).toMatchObject({ code: 'invalid-request', field: 'meta.reason' });
  });

  it('entries:void withdraws a row, kept in its history marked void', async () => {
    const { api, record } = await withPipRecord();
    const wrong = await api.answer('entries:add', {
      recordId: record.id,
      values: pipVitalsValues,
      meta: enteredByRw,
    });
    const voided = await api.answer('entries:void', {
      id: wrong.id,
      meta: correctionBy('RW', 'Entered on the wrong record'),
    });
    expect(voided).toMatchObject({ voided: true, values: pipVitalsValues, stamp: { correctsId: wrong.id } });
    expect((await api.answer('procedures:get', { id: record.id })).entries).toEqual([]);
    expect((await api.answer('entries:history', { id: voided.id })).map((entry) => entry.voided)).toEqual([
      true,
      false,
    ]);
    expect((await api.refusal('entries:void', { id: wrong.id, meta: correctionBy('RW', 'x') })).code).toBe(
      'conflict',
    );
    expect((await api.refusal('entries:void', { id: 999, meta: correctionBy('RW', 'x') })).code).toBe(
      'not-found',
    );
    const noReason = await api.refusal('entries:void', { id: voided.id, meta: enteredByRw });
    expect(noReason).toMatchObject({ code: 'invalid-request', field: 'meta.reason' });
  });

  it('entries:voided lists the voided rows of one record with who voided them and why, for the printed record', async () => {
    const { api, record } = await withPipRecord();
    const kept = await api.answer('entries:add', {
      recordId: record.id,
      values: pipVitalsValues,
      meta: enteredByRw,
    });
    const wrong = await api.answer('entries:add', {
      recordId: record.id,
      values: { ...pipVitalsValues, heartRatePerMin: 60 },
      meta: enteredByRw,
    });
    expect(await api.answer('entries:voided', { recordId: record.id })).toEqual([]);
    api.clock.set('2026-12-01T10:07:00.000Z');
    const voided = await api.answer('entries:void', {
      id: wrong.id,
      meta: correctionBy('JS', 'Probe off the bird'),
    });
    const listed = await api.answer('entries:voided', { recordId: record.id });
    expect(listed).toEqual([voided]);
    expect(listed[0]).toMatchObject({
      voided: true,
      values: { heartRatePerMin: 60 },
      stamp: { enteredBy: 'JS', reason: 'Probe off the bird', enteredAt: '2026-12-01T10:07:00.000Z' },
    });
    expect(listed.map((entry) => entry.id)).not.toContain(kept.id);
    expect(await api.answer('entries:voided', { recordId: 4321 })).toEqual([]);
    expect(await api.refusal('entries:voided', { recordId: 0 })).toMatchObject({ field: 'recordId' });
  });

  it('a second correction or void of an entry version is refused with who, where, when and why, and nothing is overwritten', async () => {
    const { api, record } = await withPipRecord();
    await api.answer('workstation:save', { name: 'Theatre 1' });
    const row = await api.answer('entries:add', {
      recordId: record.id,
      values: { ...pipVitalsValues, heartRatePerMin: 42 },
      meta: enteredByRw,
    });
    // Each entry names the workstation that wrote it, by its current name.
    expect(row.workstationName).toBe('Theatre 1');
    api.clock.set('2026-12-01T10:42:00.000Z');
    const first = await api.answer('entries:correct', {
      id: row.id,
      values: pipVitalsValues,
      meta: correctionBy('RW', 'Heart rate missed a digit'),
    });
    expect(first.workstationName).toBe('Theatre 1');
    const told = `already corrected by RW on Theatre 1 ${localClock('2026-12-01T10:42:00.000Z')} (reason: Heart rate missed a digit). Your change was not applied; reload to see the current entry.`;
    const second = await api.refusal('entries:correct', {
      id: row.id,
      values: { ...pipVitalsValues, heartRatePerMin: 400 },
      meta: correctionBy('MK', 'Recounted'),
    });
    expect(second).toEqual({ code: 'conflict', field: 'id', message: `Not saved: this entry was ${told}` });
    const voiding = await api.refusal('entries:void', { id: row.id, meta: correctionBy('MK', 'Wrong bird') });
    expect(voiding.message).toBe(`Not saved: this entry was ${told}`);
    // The first correction stands, and the history holds only the two saved versions.
    const detail = await api.answer('procedures:get', { id: record.id });
    expect(detail.entries.map((entry) => [entry.id, entry.values.heartRatePerMin])).toEqual([
      [first.id, 420],
    ]);
    expect(
      (await api.answer('entries:history', { id: first.id })).map((entry) => entry.stamp.enteredBy),
    ).toEqual(['RW', 'RW']);
    // Voided first: the same refusal says so.
    const voided = await api.answer('entries:void', { id: first.id, meta: correctionBy('JS', 'Probe off') });
    const late = await api.refusal('entries:correct', {
      id: first.id,
      values: pipVitalsValues,
      meta: correctionBy('MK', 'Recounted'),
    });
    expect(late.message).toBe(
      `Not saved: this entry was already voided by JS on Theatre 1 ${localClock(voided.stamp.enteredAt)} (reason: Probe off). Your change was not applied; reload to see the current entry.`,
    );
  });

  it('procedures:correct naming a version someone corrected first is refused with who and when; without a version it corrects the current one', async () => {
    const { api, record } = await withPipRecord();
    api.clock.set('2026-12-01T10:40:00.000Z');
    const fasting = await api.answer('procedures:correct', {
      id: record.id,
      versionId: record.stamp.versionId,
      values: { ...pipRadiographValues, fasting: '2 h' },
      meta: correctionBy('RW', 'Fasted longer'),
    });
    const stale = await api.refusal('procedures:correct', {
      id: record.id,
      versionId: record.stamp.versionId,
      values: { ...pipRadiographValues, procedureName: 'Wing and leg radiographs' },
      meta: correctionBy('MK', 'Both views'),
    });
    expect(stale).toEqual({
      code: 'conflict',
      field: 'id',
      message: `Not saved: this record was already corrected by RW ${localClock('2026-12-01T10:40:00.000Z')} (reason: Fasted longer). Your change was not applied; reload to see the current record.`,
    });
    expect((await api.answer('procedures:get', { id: record.id })).record).toEqual(fasting);
    const otherRecord = await api.answer('procedures:create', {
      patientId: record.patientId,
      values: pipRadiographValues,
      meta: enteredByRw,
    });
    expect(
      await api.refusal('procedures:correct', {
        id: record.id,
        versionId: otherRecord.stamp.versionId,
        values: pipRadiographValues,
        meta: correctionBy('MK', 'Both views'),
      }),
    ).toMatchObject({ code: 'invalid-request', field: 'versionId' });
    const current = await api.answer('procedures:correct', {
      id: record.id,
      values: { ...fasting.values, procedureName: 'Wing and leg radiographs' },
      meta: correctionBy('MK', 'Both views'),
    });
    expect(current.stamp.correctsId).toBe(fasting.stamp.versionId);
  });

  it('entries:history answers an empty chain for an unknown id and refuses a text id', async () => {
    const { api } = await withPipRecord();
    expect(await api.answer('entries:history', { id: 4321 })).toEqual([]);
    expect(await api.refusal('entries:history', { id: 'first' })).toMatchObject({
      field: 'id',
      message: 'An id must be a number.',
    });
  });
});
