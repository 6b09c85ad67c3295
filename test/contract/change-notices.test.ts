import { describe, expect, it } from 'vitest';
import {
  changeNoticesFor,
  changeNoticesOf,
  changeNoticeSchema,
  isWriteChannel,
} from '../../app/contract/change-notices.js';
import { channelNames } from '../../app/contract/channels.js';

/** Verbs of channels that change clinic data; such a channel may never be marked read-only. */
const writeVerbs =
  /:(add|create|correct|void|save|save-comparison|save-variant|choose|exclude|set-[a-z-]+|acknowledge)$/;
/**
 * Channels with a write verb that change nothing in the clinic database: a PDF file, and this
 * workstation's own choice of database for its next start (workstation.json).
 */
const writesNoClinicData = new Set(['worksheets:save-pdf', 'database:save-address']);

const stamp = {
  versionId: 7,
  enteredAt: '2026-12-01T09:30:00.000Z',
  enteredBy: 'AB',
  reason: '',
  correctsId: null,
};

describe('the channel to change-notice table', () => {
  it('names every channel of the contract, and nothing else', () => {
    expect(Object.keys(changeNoticesOf).sort()).toEqual([...channelNames].sort());
  });

  it('gives every channel with a write verb notices (so a new write channel cannot be left read-only)', () => {
    const readOnlyWrites = channelNames.filter(
      (name) => writeVerbs.test(name) && !writesNoClinicData.has(name) && !isWriteChannel(name),
    );
    expect(readOnlyWrites).toEqual([]);
  });

  it('marks only write channels as writes', () => {
    const writes = channelNames.filter((name) => isWriteChannel(name));
    for (const name of writes) expect(name, name).toMatch(writeVerbs);
    expect(writes.length).toBeGreaterThan(15);
  });

  it('says which patient a weight belongs to', () => {
    const notices = changeNoticesFor('weights:add', {
      id: 12,
      patientId: 3,
      values: { weighedOn: '2026-12-01', massG: 412, bodyCondition: '', weighedBy: '' },
      voided: false,
      stamp,
    });
    expect(notices).toEqual([{ kind: 'weights', patientId: 3, elsewhere: false }]);
  });

  it('says which record a log row belongs to', () => {
    const [notice] = changeNoticesFor('entries:void', {
      id: 40,
      recordId: 9,
      values: {
        at: '2026-12-01T09:35:00.000Z',
        kind: 'event',
        vaporPct: null,
        oxygenLpm: null,
        heartRatePerMin: null,
        breathsPerMin: null,
        temperatureC: null,
        etco2Mmhg: null,
        spo2Pct: null,
        eventType: 'note',
        eventNote: 'x',
        drugName: '',
        drugDose: '',
      },
      voided: true,
      stamp,
      workstationName: null,
    });
    expect(notice).toEqual({ kind: 'procedure-entries', recordId: 9, elsewhere: false });
  });

  it('gives both plans of a saved comparison with their day, and a quick plan without a patient', () => {
    const plan = (id: number, patientId: number | null) =>
      ({ id, patientId, plannedFor: '2026-12-03' }) as Parameters<typeof changeNoticesFor<'plans:save'>>[1];
    expect(changeNoticesFor('plans:save-comparison', { plan: plan(5, 2), variant: plan(6, 2) })).toEqual([
      { kind: 'plans', planId: 5, patientId: 2, plannedFor: '2026-12-03', elsewhere: false },
      { kind: 'plans', planId: 6, patientId: 2, plannedFor: '2026-12-03', elsewhere: false },
    ]);
    expect(changeNoticesFor('plans:save-variant', plan(7, 2))).toEqual([
      { kind: 'plans', planId: 7, patientId: 2, plannedFor: '2026-12-03', elsewhere: false },
    ]);
    expect(changeNoticesFor('plans:save', plan(8, null))).toEqual([
      { kind: 'plans', planId: 8, plannedFor: '2026-12-03', elsewhere: false },
    ]);
  });

  it('gives a read-only channel no notices', () => {
    expect(changeNoticesFor('settings:get', { settings: null, updatedAt: null } as never)).toEqual([]);
  });

  it('keeps notices small and refuses unknown fields or kinds', () => {
    expect(changeNoticeSchema.safeParse({ kind: 'weights', patientId: 3, massG: 400 }).success).toBe(false);
    expect(changeNoticeSchema.safeParse({ kind: 'everything' }).success).toBe(false);
    expect(changeNoticeSchema.safeParse({ kind: 'plans', plannedFor: 'tomorrow' }).success).toBe(false);
  });
});
