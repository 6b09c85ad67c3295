import fs from 'node:fs';
import path from 'node:path';
import { sql } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import type { ChannelName, RequestOf, ResponseOf } from '../../app/contract/channels.js';
import { startBackEnd, type BackEnd } from '../../main/back-end/back-end.js';
import { generateDemoClinic } from '../../app/core/evidence/demo-clinic.js';
import { speciesReference } from '../../app/core/species-reference.js';
import { demoSeed, writeDemoClinic, writeDemoRecords } from '../../main/back-end/demo-clinic.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import {
  correctionBy,
  enteredByRw,
  openChecklist,
  pipInductionValues,
  pipRadiographValues,
  pipValues,
  pipVitalsValues,
} from '../support/clinic-birds.js';

/** Pip's plan from examples/plans: a mask induction with isoflurane. */
const pipIsofluranePlan = JSON.parse(
  fs.readFileSync(
    path.join(findProjectRoot(), 'examples', 'plans', 'pip-budgerigar-mask-isoflurane.json'),
    'utf8',
  ),
) as RequestOf<'plans:save'>['fields']['input'];

const open: ChannelHarness[] = [];
const restarted: BackEnd[] = [];
afterEach(() => {
  restarted.splice(0).forEach((backEnd) => backEnd.close());
  open.splice(0).forEach((harness) => harness.close());
});
function harness(): ChannelHarness {
  const opened = openChannelHarness();
  open.push(opened);
  return opened;
}

/**
 * A harness holding the invented demo clinic (60 completed records), written straight into the
 * database as records that ended before their rows were kept, with the rows then filled by the
 * back-fill.
 */
async function demoHarness(): Promise<ChannelHarness> {
  const api = harness();
  await api.backEnd.ready;
  expect(await writeDemoClinic(api.backEnd.clinic, api.clock.now)).toBe(60);
  expect(await api.backEnd.evidenceBackfill.run()).toBe(60);
  return api;
}

describe('evidence channels', () => {
  it('evidence:list answers every completed record with observed, predicted and ratio, and counts the skipped', async () => {
    const api = await demoHarness();
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
    // The demo clinic writes the agent on each of its records.
    expect(row?.agentBasis).toMatch(/^(Isoflurane|Sevoflurane), logged on the record$/);
  });

  it('evidence:list filters by the agent logged on each record', async () => {
    const api = await demoHarness();
    // The invented practice gives its budgerigars (12 records) and hens (8) sevoflurane.
    const sevoflurane = await api.answer('evidence:list', { agent: 'sevoflurane' });
    expect(sevoflurane.rows).toHaveLength(20);
    expect(new Set(sevoflurane.rows.map((row) => row.speciesKey))).toEqual(
      new Set(['budgerigar', 'chicken']),
    );
    expect(sevoflurane.rows.every((row) => row.agentBasis === 'Sevoflurane, logged on the record')).toBe(
      true,
    );
    expect(sevoflurane.counts.compared).toBe(20);
    const isoflurane = await api.answer('evidence:list', { agent: 'isoflurane' });
    expect(isoflurane.rows).toHaveLength(40);
    expect(isoflurane.rows.some((row) => row.speciesKey === 'budgerigar')).toBe(false);
    expect((await api.answer('evidence:list', { agent: 'desflurane' })).rows).toEqual([]);
    const recordId = sevoflurane.rows[0]?.recordId as number;
    expect((await api.answer('procedures:get', { id: recordId })).record.values.agent).toBe('sevoflurane');
  });

  it('a record started with sevoflurane is read with sevoflurane; one that names no agent falls back and says so', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    await api.answer('weights:add', {
      patientId: pip.id,
      values: { weighedOn: '2026-12-01', massG: 38, bodyCondition: 'ideal', weighedBy: 'RW' },
      meta: enteredByRw,
    });
    const plan = await api.answer('plans:save', {
      fields: {
        patientId: pip.id,
        plannedFor: '2026-12-01',
        input: pipIsofluranePlan,
        checklist: openChecklist,
      },
      meta: enteredByRw,
    });
    expect(plan.input.agent).toBe('isoflurane');
    api.clock.set('2026-12-01T12:00:00.000Z');
    /** A completed record of Pip's, started at `hour`, with the events of a whole anaesthetic. */
    const completed = async (hour: string, values: Partial<RequestOf<'procedures:create'>['values']>) => {
      const at = (minute: string) => `2026-12-01T${hour}:${minute}:00.000Z`;
      const record = await api.answer('procedures:create', {
        patientId: pip.id,
        values: { ...pipRadiographValues, startedAt: at('00'), ...values },
        meta: enteredByRw,
      });
      const vitals = (minute: string, vaporPct: number) => ({
        ...pipVitalsValues,
        at: at(minute),
        vaporPct,
      });
      const event = (
        minute: string,
        eventType: 'induction' | 'vaporiserOff' | 'firstMovement' | 'standing',
      ) => ({
        ...pipInductionValues,
        at: at(minute),
        eventType,
        eventNote: '',
      });
      for (const values of [
        vitals('02', 5),
        event('04', 'induction'),
        vitals('08', 3.5),
        event('20', 'vaporiserOff'),
        event('24', 'firstMovement'),
        event('30', 'standing'),
      ])
        await api.answer('entries:add', { recordId: record.id, values, meta: enteredByRw });
      return api.answer('procedures:correct', {
        id: record.id,
        values: { ...record.values, endedAt: at('40') },
        meta: correctionBy('RW', 'Procedure ended'),
      });
    };
    const sevo = await completed('09', { agent: 'sevoflurane', planId: plan.id });
    const planOnly = await completed('10', { planId: plan.id });
    const neither = await completed('11', {});
    // The record shows the agent it was started with; the others name none.
    expect((await api.answer('procedures:get', { id: sevo.id })).record.values.agent).toBe('sevoflurane');
    expect([planOnly.values.agent, neither.values.agent]).toEqual([null, null]);

    const rows = (await api.answer('evidence:list', {})).rows;
    const rowOf = (id: number) => rows.find((row) => row.recordId === id);
    // Logged on the record: it wins over the linked plan's isoflurane.
    expect(rowOf(sevo.id)).toMatchObject({
      agent: 'sevoflurane',
      agentBasis: 'Sevoflurane, logged on the record',
      skipped: null,
    });
    expect(rowOf(sevo.id)?.notes[0]).toBe('Agent: Sevoflurane, logged on the record.');
    // No agent on the record: the linked plan's, else the clinic's default, each saying so.
    expect(rowOf(planOnly.id)).toMatchObject({
      agent: 'isoflurane',
      agentBasis: 'Isoflurane, from the linked plan',
    });
    expect(rowOf(neither.id)).toMatchObject({
      agent: 'isoflurane',
      agentBasis: "Isoflurane, the clinic's default agent (no plan is linked to the record)",
    });
    // The same bird and log, read with sevoflurane, wakes sooner than with isoflurane (lower
    // blood/gas partition coefficient, agents.ts).
    const firstMovement = (id: number) =>
      rowOf(id)?.milestones.find((milestone) => milestone.id === 'firstMovement')?.predictedMin ?? NaN;
    expect(firstMovement(sevo.id)).toBeLessThan(firstMovement(neither.id));
    // The filter by agent reads the record's agent.
    expect(
      (await api.answer('evidence:list', { agent: 'sevoflurane' })).rows.map((row) => row.recordId),
    ).toEqual([sevo.id]);
    expect(
      (await api.answer('evidence:list', { agent: 'isoflurane' })).rows.map((row) => row.recordId).sort(),
    ).toEqual([planOnly.id, neither.id].sort());
  });

  it('evidence:list filters by species, route, staff and dates, and refuses a reversed date range', async () => {
    const api = await demoHarness();
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
    const api = await demoHarness();
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
    const api = await demoHarness();
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
    const api = await demoHarness();
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

  it('evidence:list keeps its rows in the stored cache: after a restart none is run through the model again, a corrected record is', async () => {
    const api = await demoHarness();
    const first = await api.answer('evidence:list', {});
    const storedAt = () =>
      new Map(
        (restarted[0]?.db ?? api.backEnd.db)
          .prepare<[], { record_id: number; computed_at: string }>(
            'SELECT record_id, computed_at FROM evidence_prediction_cache',
          )
          .all()
          .map((row) => [row.record_id, row.computed_at]),
      );
    // Every completed record computed once (by the back-fill), at the harness's clock.
    expect([...storedAt().values()]).toEqual(Array.from({ length: 60 }, () => '2026-12-01T09:30:00.000Z'));
    api.backEnd.close();

    // A restart, later: a second back end on the same folder answers the same rows from the store.
    const later = new Date('2026-12-02T08:00:00.000Z');
    const second = startBackEnd({
      dataDirectory: api.dataDirectory,
      appVersion: '9.8.7',
      host: 'browser',
      now: () => later,
    });
    restarted.push(second);
    const ask = async <C extends ChannelName>(channel: C, request: RequestOf<C>): Promise<ResponseOf<C>> => {
      const result = await second.dispatch(channel, request);
      if (!result.ok) expect.fail(`${channel} was refused: ${JSON.stringify(result.error)}`);
      return result.value as ResponseOf<C>;
    };
    const answer = (request: RequestOf<'evidence:list'>) => ask('evidence:list', request);
    expect(await answer({})).toEqual(first);
    expect(new Set(storedAt().values())).toEqual(new Set(['2026-12-01T09:30:00.000Z']));

    // A corrected record (new staff initials) is recomputed by the correction and its stored row
    // replaced; no other is.
    const recordId = first.rows[0]?.recordId as number;
    const detail = await ask('procedures:get', { id: recordId });
    await ask('procedures:correct', {
      id: recordId,
      values: { ...detail.record.values, staffInitials: 'ZQ' },
      meta: correctionBy('RW', 'Initials entered wrongly'),
    });
    const afterCorrection = await answer({});
    expect(afterCorrection.rows.find((row) => row.recordId === recordId)?.staffInitials).toBe('ZQ');
    const stamps = storedAt();
    expect(stamps.get(recordId)).toBe('2026-12-02T08:00:00.000Z');
    expect(
      [...stamps].filter(([id]) => id !== recordId).every(([, at]) => at === '2026-12-01T09:30:00.000Z'),
    ).toBe(true);
    expect(afterCorrection.rows.filter((row) => row.recordId !== recordId)).toEqual(
      first.rows.filter((row) => row.recordId !== recordId),
    );
    // The clinical record itself keeps both versions; the cache never alters it.
    const history = await ask('procedures:history', { id: recordId });
    expect(history.map((version) => version.values.staffInitials)).toEqual([
      'ZQ',
      first.rows[0]?.staffInitials,
    ]);
  });
});

describe('evidence:list over many records', () => {
  it('reads stored rows with as many statements for 120 records as for 60: no query per record', async () => {
    const api = harness();
    api.backEnd.close();
    const statements: string[] = [];
    const openBackEnd = async () => {
      const backEnd = startBackEnd({
        dataDirectory: api.dataDirectory,
        appVersion: '9.8.7',
        host: 'browser',
        now: () => api.clock.now,
        openOptions: { trace: (text) => statements.push(text) },
      });
      restarted.push(backEnd);
      await backEnd.ready;
      return backEnd;
    };
    /** The statements one evidence:list runs. */
    const counted = async (backEnd: BackEnd) => {
      statements.length = 0;
      const answer = await backEnd.dispatch('evidence:list', {});
      expect(answer.ok).toBe(true);
      return statements.length;
    };
    const demo = generateDemoClinic(demoSeed, '2026-12-01', { species: speciesReference });
    const first = await openBackEnd();
    expect(await writeDemoRecords(first.clinic, demo, api.clock.now)).toBe(60);
    await first.evidenceBackfill.run();
    await counted(first);
    const again60 = await counted(first);
    first.close();
    const restart60 = await counted(await openBackEnd());

    const second = await openBackEnd();
    expect(await writeDemoRecords(second.clinic, demo, api.clock.now)).toBe(60);
    await second.evidenceBackfill.run();
    await counted(second);
    expect(await counted(second)).toBe(again60);
    second.close();
    expect(await counted(await openBackEnd())).toBe(restart60);
    // Species, settings, exclusions and the fingerprints at least; the stored rows after a restart.
    expect(again60).toBeGreaterThanOrEqual(4);
    expect(restart60).toBeGreaterThan(again60);
    expect(restart60).toBeLessThan(20);
  });
});

describe('the demo clinic (--demo)', () => {
  const rowsIn = async (api: ChannelHarness, table: 'patients' | 'weights' | 'procedure_records') => {
    const result = await sql<{ n: number }>`SELECT count(*) AS n FROM ${sql.table(table)}`.execute(
      api.backEnd.clinic.kysely,
    );
    return Number(result.rows[0]?.n);
  };

  it('is written by the back end before it serves, once, and never into a clinic with patients', async () => {
    const api = harness();
    const messages: string[] = [];
    api.backEnd.close();
    const demoStart = startBackEnd({
      dataDirectory: api.dataDirectory,
      appVersion: '9.8.7',
      host: 'browser',
      now: () => api.clock.now,
      demoClinic: true,
      log: (message) => messages.push(message),
    });
    restarted.push(demoStart);
    // The first request waits for the demo clinic; its rows are computed in the background.
    const list = await demoStart.dispatch('evidence:list', {});
    expect(messages).toEqual(['Demo clinic: 60 invented procedure records written.']);
    expect(list.ok && (list.value as ResponseOf<'evidence:list'>).counts.pending).toBe(60);
    await demoStart.evidenceBackfill.run();
    const filled = await demoStart.dispatch('evidence:list', {});
    expect(filled.ok && (filled.value as ResponseOf<'evidence:list'>).counts).toMatchObject({
      completed: 60,
      pending: 0,
    });
    expect(await writeDemoClinic(demoStart.clinic, api.clock.now)).toBe(0);
  });

  it('writes its patients, weights, records and entries in one transaction: a failure leaves none', async () => {
    const api = harness();
    await api.backEnd.ready;
    const demo = generateDemoClinic(demoSeed, '2026-12-01', { species: speciesReference });
    const first = demo.records[0];
    if (first === undefined) throw new Error('the demo clinic has no record');
    // The last record names a bird the demo does not have: the whole write is refused.
    const broken = { ...demo, records: [...demo.records, { ...first, patientIndex: demo.patients.length }] };
    await expect(writeDemoRecords(api.backEnd.clinic, broken, api.clock.now)).rejects.toThrow();
    expect(await rowsIn(api, 'patients')).toBe(0);
    expect(await rowsIn(api, 'weights')).toBe(0);
    expect(await rowsIn(api, 'procedure_records')).toBe(0);
    expect(await writeDemoRecords(api.backEnd.clinic, demo, api.clock.now)).toBe(60);
    expect(await rowsIn(api, 'procedure_records')).toBe(60);
  });
});
