/**
 * The clinic view's rows kept when records end and in the background: a record's row is stored
 * by the write that ends it (or corrects it after), on both engines; the view never computes,
 * it lists the rows ready and counts those still being compared; the back-fill fills the rest,
 * writes only the evidence cache, and lets requests in while it runs.
 */
import { sql } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import type { ChangeNotice } from '../../app/contract/change-notices.js';
import type { ChannelName, RequestOf, ResponseOf } from '../../app/contract/channels.js';
import { speciesReference } from '../../app/core/species-reference.js';
import type { Engine } from '../../db/clinic-db.js';
import { describeClinicTables } from '../../db/clinic-tables.js';
import { createEvidenceCacheRepository } from '../../db/repositories/evidence-cache-repository.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { startBackEnd, type BackEnd } from '../../main/back-end/back-end.js';
import { writeDemoClinic } from '../../main/back-end/demo-clinic.js';
import { createBackEndParts, createDispatcher } from '../../main/back-end/handlers.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';
import {
  correctionBy,
  enteredByRw,
  pipRadiographValues,
  pipValues,
  pipVitalsValues,
} from '../support/clinic-birds.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => {
  for (const cleanup of cleanups.splice(0).reverse()) cleanup();
});

const at = new Date('2026-12-01T12:00:00.000Z');

/** A back end's handler table on `engine`, reached through the one dispatcher; the back-fill manual. */
async function clinicOn(engine: Engine, context: { skip: (note?: string) => never }) {
  const clinic = await openTestClinic(engine, context);
  await createSpeciesRepository(clinic).seedReference(speciesReference, at);
  const parts = createBackEndParts({
    clinic,
    appVersion: '9.8.7',
    dataDirectory: temporaryFolder().folder,
    host: 'browser',
    now: () => at,
  });
  const dispatch = createDispatcher(parts.handlers);
  const answer = async <C extends ChannelName>(channel: C, request: RequestOf<C>): Promise<ResponseOf<C>> => {
    const result = await dispatch(channel, request);
    if (!result.ok) expect.fail(`${channel} was refused: ${JSON.stringify(result.error)}`);
    return result.value as ResponseOf<C>;
  };
  const stored = async () => createEvidenceCacheRepository(clinic).all();
  return { clinic, answer, stored, backfill: parts.evidenceBackfill };
}

/** Pip's wing radiograph with a logged dial, flow, induction, vaporiser off and standing (still running). */
async function pipRecord(answer: Awaited<ReturnType<typeof clinicOn>>['answer']) {
  const pip = await answer('patients:create', { values: pipValues, meta: enteredByRw });
  await answer('weights:add', {
    patientId: pip.id,
    values: { weighedOn: '2026-11-30', massG: 38, bodyCondition: 'ideal', weighedBy: 'RW' },
    meta: enteredByRw,
  });
  const record = await answer('procedures:create', {
    patientId: pip.id,
    values: pipRadiographValues,
    meta: enteredByRw,
  });
  const log = async (minute: number, values: Record<string, unknown>) =>
    answer('entries:add', {
      recordId: record.id,
      values: {
        ...pipVitalsValues,
        at: new Date(Date.parse(pipRadiographValues.startedAt) + minute * 60_000).toISOString(),
        ...values,
      } as RequestOf<'entries:add'>['values'],
      meta: enteredByRw,
    });
  const event = (minute: number, eventType: string) =>
    log(minute, {
      kind: 'event',
      vaporPct: null,
      oxygenLpm: null,
      heartRatePerMin: null,
      breathsPerMin: null,
      temperatureC: null,
      eventType,
      eventNote: '',
    } as never);
  await log(0, { vaporPct: 4 });
  await event(2, 'induction');
  const vitals = await log(5, { vaporPct: 2 });
  await event(20, 'vaporiserOff');
  await event(31, 'standing');
  return { pip, record, vitals };
}

describe.each(testEngines)('a record’s row is stored by the write that ends it, on %s', (engine) => {
  it('stores the row when the record ends, none while it runs, and a new row when the ended record is corrected', async (context) => {
    const { answer, stored, backfill } = await clinicOn(engine, context);
    const { record, vitals } = await pipRecord(answer);
    // Running: rows logged in theatre compute nothing.
    expect((await stored()).size).toBe(0);
    expect((await answer('evidence:list', {})).counts).toMatchObject({ inProgress: 1, pending: 0 });

    // The record ends through its channel: its row is stored before the answer.
    const ended = await answer('procedures:correct', {
      id: record.id,
      values: { ...pipRadiographValues, endedAt: '2026-12-01T10:40:00.000Z' },
      meta: correctionBy('RW', 'Procedure ended'),
    });
    expect(ended.values.endedAt).toBe('2026-12-01T10:40:00.000Z');
    const afterEnd = await stored();
    expect([...afterEnd.keys()]).toEqual([record.id]);
    const firstKey = afterEnd.get(record.id)?.key;
    // The view lists it without computing (the back-fill never ran) and nothing is pending.
    const list = await answer('evidence:list', {});
    expect(list.counts).toMatchObject({ completed: 1, pending: 0, inProgress: 0 });
    const row = list.rows[0];
    expect(row?.recordId).toBe(record.id);
    expect(row?.skipped).toBeNull();
    const standing = row?.milestones.find((milestone) => milestone.id === 'standing');
    // Standing logged 11 min after the vaporiser off (minute 20 to 31).
    expect(standing?.observedMin).toBeCloseTo(11, 6);
    expect(standing?.ratio).toBeGreaterThan(0);

    // A logged row of the ended record corrected: a new row under a new key, at once.
    await answer('entries:correct', {
      id: vitals.id,
      values: { ...vitals.values, heartRatePerMin: 380 },
      meta: correctionBy('RW', 'Heart rate misread'),
    });
    const afterEntry = (await stored()).get(record.id);
    expect(afterEntry?.key).not.toBe(firstKey);
    // Its details corrected (staff initials): the row says so at once.
    await answer('procedures:correct', {
      id: record.id,
      values: { ...ended.values, staffInitials: 'ZQ' },
      meta: correctionBy('RW', 'Initials entered wrongly'),
    });
    const afterDetails = await answer('evidence:list', { recordId: record.id });
    expect(afterDetails.rows[0]?.staffInitials).toBe('ZQ');
    expect(afterDetails.counts.pending).toBe(0);
    expect((await stored()).get(record.id)?.key).not.toBe(afterEntry?.key);
    // Nothing was left for the back-fill.
    expect(await backfill.run()).toBe(0);
  });

  it('a record entered after the fact, ended at creation, has its row at once', async (context) => {
    const { answer, stored } = await clinicOn(engine, context);
    const pip = await answer('patients:create', { values: pipValues, meta: enteredByRw });
    const record = await answer('procedures:create', {
      patientId: pip.id,
      values: { ...pipRadiographValues, endedAt: '2026-12-01T10:40:00.000Z' },
      meta: enteredByRw,
    });
    expect([...(await stored()).keys()]).toEqual([record.id]);
    // No body mass and nothing logged: listed, skipped whole with its reason.
    const list = await answer('evidence:list', {});
    expect(list.rows[0]?.skipped).toBe('no body mass is known (no weight and no plan)');
    expect(list.counts).toMatchObject({ completed: 1, skipped: 1, pending: 0 });
  });
});

/** A correction of the budgerigar's species entry, checked and kept as it was (a new species version: every row's key changes). */
async function editSpecies(api: ChannelHarness): Promise<void> {
  const budgie = (await api.answer('species:list', {})).find((entry) => entry.key === 'budgerigar');
  if (budgie === undefined) throw new Error('no budgerigar in the reference');
  await api.answer('species:correct', {
    key: budgie.key,
    values: budgie.values,
    meta: correctionBy('RW', 'Checked against the reference'),
  });
}

describe('the back-fill of rows of records that ended before', () => {
  const open: ChannelHarness[] = [];
  const backEnds: BackEnd[] = [];
  afterEach(() => {
    backEnds.splice(0).forEach((backEnd) => backEnd.close());
    open.splice(0).forEach((harness) => harness.close());
  });

  /** A harness whose clinic holds the 60 demo records, written straight into the database (no rows yet). */
  async function demoWithoutRows(): Promise<ChannelHarness> {
    const api = openChannelHarness();
    open.push(api);
    await api.backEnd.ready;
    expect(await writeDemoClinic(api.backEnd.clinic, api.clock.now)).toBe(60);
    return api;
  }

  it('the view lists the rows ready and counts those still being compared, then the whole set after the back-fill', async () => {
    const api = await demoWithoutRows();
    const notices: ChangeNotice[] = [];
    cleanups.push(api.backEnd.changes.subscribe((notice) => notices.push(notice)));
    const before = await api.answer('evidence:list', {});
    expect(before.rows).toEqual([]);
    expect(before.counts).toMatchObject({ completed: 0, compared: 0, pending: 60, inProgress: 0 });
    // Filtered or for one record: the clinic's pending count, or whether that record waits.
    expect((await api.answer('evidence:list', { speciesKey: 'cockatiel' })).counts.pending).toBe(60);
    const calibration = await api.answer('evidence:calibration', {});
    expect(calibration.pending).toBe(60);
    expect(calibration.recordsIn).toEqual([]);
    const exported = await api.answer('evidence:export-csv', {});
    expect(exported).toMatchObject({ rows: 0, pending: 60 });

    expect(await api.backEnd.evidenceBackfill.run()).toBe(60);
    const after = await api.answer('evidence:list', {});
    expect(after.rows).toHaveLength(60);
    expect(after.counts).toMatchObject({ completed: 60, compared: 60, pending: 0 });
    expect((await api.answer('evidence:calibration', {})).pending).toBe(0);
    expect((await api.answer('evidence:calibration', {})).recordsIn).toHaveLength(60);
    // The open screens are told the rows are ready.
    expect(notices.filter((notice) => notice.kind === 'evidence').length).toBeGreaterThan(0);
    // A second pass has nothing to do.
    expect(await api.backEnd.evidenceBackfill.run()).toBe(0);

    // A species edit makes every row stale: pending again (never listed stale), then filled again.
    await editSpecies(api);
    expect((await api.answer('evidence:list', {})).counts).toMatchObject({ completed: 0, pending: 60 });
    await api.backEnd.evidenceBackfill.run();
    const refilled = await api.answer('evidence:list', {});
    expect(refilled.counts.pending).toBe(0);
    expect(refilled.rows).toEqual(after.rows);
  });

  it('answers requests while it runs (it yields between slices) and writes no clinical table', async () => {
    const api = openChannelHarness();
    open.push(api);
    api.backEnd.close();
    const statements: string[] = [];
    const backEnd = startBackEnd({
      dataDirectory: api.dataDirectory,
      appVersion: '9.8.7',
      host: 'browser',
      now: () => api.clock.now,
      openOptions: { trace: (text) => statements.push(text) },
    });
    backEnds.push(backEnd);
    await backEnd.ready;
    expect(await writeDemoClinic(backEnd.clinic, api.clock.now)).toBe(60);
    const tables = (await describeClinicTables(backEnd.clinic)).tables.map((table) => table.name);
    expect(tables).toContain('procedure_entries');
    const counts = async () =>
      Object.fromEntries(
        await Promise.all(
          tables
            .filter((table) => table !== 'evidence_prediction_cache')
            .map(async (table) => {
              const result = await sql<{
                n: number;
              }>`SELECT count(*) AS n FROM ${sql.table(table)}`.execute(backEnd.clinic.kysely);
              return [table, Number(result.rows[0]?.n)] as const;
            }),
        ),
      );
    const before = await counts();
    statements.length = 0;
    let finished = false;
    const running = backEnd.evidenceBackfill.run().then((stored) => {
      finished = true;
      return stored;
    });
    // A request made after the back-fill started is answered before it ends.
    const settings = await backEnd.dispatch('settings:get', {});
    expect(settings.ok).toBe(true);
    expect(finished).toBe(false);
    expect(await running).toBe(60);
    const writes = statements.filter((text) =>
      /^\s*(insert|update|delete|replace|drop|alter|create)\b/i.test(text),
    );
    expect(writes.length).toBeGreaterThan(0);
    expect(writes.every((text) => /^\s*insert into "evidence_prediction_cache"/i.test(text))).toBe(true);
    expect(await counts()).toEqual(before);
  });

  it('an automatic start fills stale rows in the background and destroys nothing: records, exclusions, switch', async () => {
    const api = await demoWithoutRows();
    await api.backEnd.evidenceBackfill.run();
    const first = await api.answer('evidence:list', {});
    const recordId = first.rows[0]?.recordId as number;
    await api.answer('evidence:exclude', {
      recordId,
      excluded: true,
      meta: { enteredBy: 'RW', reason: 'premedicated' },
    });
    await api.answer('evidence:set-calibration', {
      on: false,
      meta: { enteredBy: 'RW', reason: 'checking' },
    });
    // A species edit: every stored row is stale at the next start.
    await editSpecies(api);
    api.backEnd.close();

    const stale = startBackEnd({
      dataDirectory: api.dataDirectory,
      appVersion: '9.8.7',
      host: 'browser',
      now: () => api.clock.now,
      evidenceBackfill: 'automatic',
    });
    backEnds.push(stale);
    // The back-fill starts by itself once the start-up writes are done, and says when rows are ready.
    const ready = new Promise<void>((resolve) => {
      const stop = stale.changes.subscribe((notice) => {
        if (notice.kind !== 'evidence') return;
        stop();
        resolve();
      });
    });
    await ready;
    await stale.evidenceBackfill.idle();
    const ask = async <C extends ChannelName>(channel: C, request: RequestOf<C>) => {
      const result = await stale.dispatch(channel, request);
      if (!result.ok) expect.fail(`${channel} was refused: ${JSON.stringify(result.error)}`);
      return result.value as ResponseOf<C>;
    };
    const list = await ask('evidence:list', {});
    expect(list.counts).toMatchObject({ completed: 60, pending: 0, excluded: 1 });
    expect(list.rows.find((row) => row.recordId === recordId)?.exclusion?.reason).toBe('premedicated');
    expect((await ask('evidence:calibration', {})).on).toBe(false);
    const records = await sql<{ n: number }>`SELECT count(*) AS n FROM procedure_records`.execute(
      stale.clinic.kysely,
    );
    expect(Number(records.rows[0]?.n)).toBe(60);
  });
});
