import { afterEach, describe, expect, it } from 'vitest';
import { latestSchemaVersion } from '../../db/migrations/index.js';
import { startBackEnd, type BackEnd } from '../../main/back-end/back-end.js';
import { createDispatcher } from '../../main/back-end/handlers.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

function backEnd(now = new Date('2026-12-01T09:30:00Z')): BackEnd {
  const temp = temporaryFolder();
  const started = startBackEnd({
    dataDirectory: temp.folder,
    appVersion: '9.8.7',
    host: 'browser',
    now: () => now,
  });
  cleanups.push(() => {
    started.close();
    temp.remove();
  });
  return started;
}

const validSettings = {
  clinicName: '  Heron Lane Bird Clinic ',
  addressLine: '',
  massUnit: 'g',
  pressureUnit: 'mmHg',
  temperatureUnit: 'C',
  defaultAgent: 'isoflurane',
  paperSize: 'A4',
};

describe('contract dispatcher', () => {
  it('refuses an unknown channel without throwing', async () => {
    const result = await backEnd().dispatch('patients:drop-all', {});
    expect(result).toEqual({
      ok: false,
      error: { code: 'unknown-channel', message: 'There is no channel called patients:drop-all.' },
    });
  });

  it('names the bad field and why when a payload fails its schema', async () => {
    const result = await backEnd().dispatch('settings:save', {
      ...validSettings,
      clinicName: '   ',
      massUnit: 'lb',
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error.code).toBe('invalid-request');
    expect(result.error.field).toBe('clinicName');
    expect(result.error.issues).toEqual([
      { field: 'clinicName', message: 'Enter the clinic name; it heads every printed worksheet.' },
      { field: 'massUnit', message: 'Choose g or kg for body mass.' },
    ]);
  });

  it('refuses extra fields on empty requests', async () => {
    const result = await backEnd().dispatch('settings:get', { sneaky: 1 });
    expect(result.ok).toBe(false);
  });

  it('saves trimmed settings with the time of saving and reads them back', async () => {
    const api = backEnd();
    expect(await api.dispatch('settings:get', {})).toEqual({
      ok: true,
      value: { settings: null, updatedAt: null },
    });
    const saved = await api.dispatch('settings:save', validSettings);
    expect(saved).toEqual({
      ok: true,
      value: {
        // Saved without a date format: the stored default, year-month-day.
        settings: { ...validSettings, clinicName: 'Heron Lane Bird Clinic', dateFormat: 'YYYY-MM-DD' },
        updatedAt: '2026-12-01T09:30:00.000Z',
      },
    });
    expect(await api.dispatch('settings:get', {})).toEqual(saved);
  });

  it('requires a named acknowledgement of the cautions and records the app version', async () => {
    const api = backEnd();
    expect(await api.dispatch('safety:status', {})).toEqual({
      ok: true,
      value: { acknowledged: false, appVersion: '9.8.7', last: null },
    });
    const refused = await api.dispatch('safety:acknowledge', { acknowledgedBy: 'R.W.', accepted: false });
    expect(refused.ok).toBe(false);
    const accepted = await api.dispatch('safety:acknowledge', { acknowledgedBy: 'R.W.', accepted: true });
    expect(accepted).toEqual({
      ok: true,
      value: {
        acknowledged: true,
        appVersion: '9.8.7',
        last: { acknowledgedAt: '2026-12-01T09:30:00.000Z', appVersion: '9.8.7', acknowledgedBy: 'R.W.' },
      },
    });
  });

  it('reports the app and schema version and the data folder', async () => {
    const result = await backEnd().dispatch('app:info', {});
    expect(result.ok && result.value).toMatchObject({
      appVersion: '9.8.7',
      schemaVersion: latestSchemaVersion,
      host: 'browser',
    });
  });

  it('runs no handler before the start-up writes have settled, and answers their failure when they fail', async () => {
    const started = backEnd();
    await started.ready;
    // The species reference is seeded before the first answer.
    const species = await started.dispatch('species:list', {});
    expect(species.ok && Array.isArray(species.value) && species.value.length > 0).toBe(true);

    const calls: string[] = [];
    const logged: string[] = [];
    let fail: (error: Error) => void = () => undefined;
    const ready = new Promise<void>((_resolve, reject) => {
      fail = reject;
    });
    const dispatch = createDispatcher(
      {
        ...started.handlers,
        'settings:get': () => (calls.push('settings:get'), started.handlers['settings:get']({})),
      },
      (message) => logged.push(message),
      ready,
    );
    const answer = dispatch('settings:get', {});
    await new Promise((resolve) => setTimeout(resolve, 10));
    expect(calls).toEqual([]);
    fail(new Error('the species reference could not be written'));
    expect(await answer).toEqual({
      ok: false,
      error: {
        code: 'internal',
        message: 'Something went wrong: the species reference could not be written',
      },
    });
    expect(calls).toEqual([]);
    expect(logged).toEqual(['Handler settings:get failed: the species reference could not be written']);
  });
});
