import { afterEach, describe, expect, it } from 'vitest';
import { writeDemoClinic } from '../../main/back-end/demo-clinic.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { enteredByRw, pipRadiographValues, pipValues } from '../support/clinic-birds.js';

const open: ChannelHarness[] = [];
afterEach(() => open.splice(0).forEach((harness) => harness.close()));
function harness(): ChannelHarness {
  const opened = openChannelHarness();
  open.push(opened);
  return opened;
}

/** A harness holding the invented demo clinic (60 completed records). */
function demoHarness(): ChannelHarness {
  const api = harness();
  expect(writeDemoClinic(api.backEnd.db, api.clock.now)).toBe(60);
  return api;
}

describe('evidence channels', () => {
  it('evidence:list answers every completed record with observed, predicted and ratio, and counts the skipped', async () => {
    const api = demoHarness();
    const list = await api.answer('evidence:list', {});
    expect(list.counts.completed).toBe(60);
    expect(list.rows).toHaveLength(60);
    expect(list.counts.compared).toBe(60);
    // One record in twelve of the demo has no standing event: counted, never filled in.
    expect(list.counts.skippedByMilestone.standing).toBeGreaterThan(0);
    const withoutStanding = list.rows.find(
      (row) => row.milestones.find((milestone) => milestone.id === 'standing')?.ratio === null,
    );
    expect(withoutStanding?.milestones.find((milestone) => milestone.id === 'standing')).toMatchObject({
      observedMin: null,
      predictedMin: null,
      skipped: 'no standing / perching event logged',
    });
    const row = list.rows[0];
    const firstMovement = row?.milestones.find((milestone) => milestone.id === 'firstMovement');
    expect(firstMovement?.ratio).toBeCloseTo(
      (firstMovement?.observedMin ?? 0) / (firstMovement?.predictedMin ?? 1),
      1,
    );
    expect(row?.agentBasis).toContain("the clinic's default agent");
  });

  it('evidence:list filters by species, route, staff and dates, and refuses a reversed date range', async () => {
    const api = demoHarness();
    const cockatiels = await api.answer('evidence:list', { speciesKey: 'cockatiel' });
    expect(cockatiels.rows.length).toBe(16);
    expect(cockatiels.rows.every((row) => row.speciesKey === 'cockatiel')).toBe(true);
    const masks = await api.answer('evidence:list', { route: 'mask' });
    expect(masks.rows.every((row) => row.airway === 'mask')).toBe(true);
    const ak = await api.answer('evidence:list', { staffInitials: 'ak' });
    expect(ak.rows.every((row) => row.staffInitials === 'AK')).toBe(true);
    expect((await api.answer('evidence:list', { from: '2030-01-01' })).rows).toEqual([]);
    expect(await api.refusal('evidence:list', { from: '2026-11-01', to: '2026-10-01' })).toMatchObject({
      code: 'invalid-request',
      field: 'to',
    });
    expect(await api.refusal('evidence:list', { from: '2026-02-30' })).toMatchObject({
      code: 'invalid-request',
      field: 'from',
    });
  });

  it('evidence:export-csv gives one row per completed record after the header', async () => {
    const api = demoHarness();
    const exported = await api.answer('evidence:export-csv', {});
    const lines = exported.csv.trimEnd().split('\r\n');
    expect(exported.rows).toBe(60);
    expect(lines).toHaveLength(61);
    expect(lines[0]).toContain('Standing / perching observed / predicted');
    expect(exported.fileName).toBe('tidewing-observed-vs-predicted-2026-12-01.csv');
    expect(await api.refusal('evidence:export-csv', { agent: 'halothane' })).toMatchObject({
      code: 'invalid-request',
      field: 'agent',
    });
  });

  it('evidence:calibration answers each milestone per species with its band and the records it rests on', async () => {
    const api = demoHarness();
    const calibration = await api.answer('evidence:calibration', {});
    expect(calibration.on).toBe(true);
    const standing = calibration.milestones.find((milestone) => milestone.id === 'standing');
    const cockatiel = standing?.species.find((entry) => entry.speciesKey === 'cockatiel');
    expect(cockatiel?.speciesRecords).toBeGreaterThan(10);
    // The demo clinic's invented cockatiels stand x1.4 later than the model: the calibration
    // moves towards it and its 90 % band holds it.
    expect(cockatiel?.factor).toBeGreaterThan(1.15);
    expect(cockatiel?.band90.low).toBeLessThan(1.4);
    expect(cockatiel?.band90.high).toBeGreaterThan(1.4);
    expect(calibration.recordsIn.length).toBe(60);
    expect(await api.refusal('evidence:calibration', { species: 'cockatiel' })).toMatchObject({
      code: 'invalid-request',
    });
  });

  it('evidence:exclude leaves a record out with a reason, and the calibration no longer counts it', async () => {
    const api = demoHarness();
    const before = await api.answer('evidence:calibration', {});
    const list = await api.answer('evidence:list', {});
    const recordId = list.rows[0]?.recordId as number;
    const excluded = await api.answer('evidence:exclude', {
      recordId,
      excluded: true,
      meta: { enteredBy: 'RW', reason: 'premedicated with butorphanol' },
    });
    expect(excluded).toMatchObject({ recordId, excluded: true, reason: 'premedicated with butorphanol' });
    const after = await api.answer('evidence:calibration', {});
    expect(after.recordsIn.length).toBe(before.recordsIn.length - 1);
    expect((await api.answer('evidence:list', { recordId })).rows[0]?.exclusion).toMatchObject({
      reason: 'premedicated with butorphanol',
      enteredBy: 'RW',
    });
    expect(
      await api.refusal('evidence:exclude', {
        recordId,
        excluded: true,
        meta: { enteredBy: 'RW', reason: '' },
      }),
    ).toMatchObject({ code: 'invalid-request', field: 'meta.reason' });
    expect(
      await api.refusal('evidence:exclude', {
        recordId: 9999,
        excluded: true,
        meta: { enteredBy: 'RW', reason: 'x' },
      }),
    ).toMatchObject({ code: 'not-found', field: 'recordId' });
  });

  it('evidence:exclude refuses a record still running', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const record = await api.answer('procedures:create', {
      patientId: pip.id,
      values: pipRadiographValues,
      meta: enteredByRw,
    });
    expect(
      await api.refusal('evidence:exclude', {
        recordId: record.id,
        excluded: true,
        meta: { enteredBy: 'RW', reason: 'test' },
      }),
    ).toMatchObject({ code: 'invalid-request', field: 'recordId' });
    expect((await api.answer('evidence:list', {})).counts.inProgress).toBe(1);
  });

  it('evidence:set-calibration switches calibration off and on, keeping who and why', async () => {
    const api = harness();
    const off = await api.answer('evidence:set-calibration', {
      on: false,
      meta: { enteredBy: 'RW', reason: 'checking the population model alone' },
    });
    expect(off).toEqual({
      on: false,
      enteredAt: '2026-12-01T09:30:00.000Z',
      enteredBy: 'RW',
      reason: 'checking the population model alone',
    });
    expect((await api.answer('evidence:calibration', {})).on).toBe(false);
    expect(
      await api.refusal('evidence:set-calibration', { on: 'yes', meta: { enteredBy: 'RW' } }),
    ).toMatchObject({
      code: 'invalid-request',
      field: 'on',
    });
  });
});
