import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { latestSchemaVersion } from '../../db/migrations/index.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { heronLaneSettings } from '../support/clinic-settings.js';

const open: ChannelHarness[] = [];
afterEach(() => open.splice(0).forEach((harness) => harness.close()));
function harness(options: { automaticBackup?: boolean } = {}): ChannelHarness {
  const opened = openChannelHarness(options);
  open.push(opened);
  return opened;
}

describe('app, safety and settings channels', () => {
  it('app:info names the data folder it opened and the desktop-or-browser host', async () => {
    const api = harness();
    expect(await api.answer('app:info', {})).toEqual({
      appVersion: '9.8.7',
      schemaVersion: latestSchemaVersion,
      dataDirectory: api.dataDirectory,
      host: 'browser',
    });
  });

  it('safety:acknowledge names the field when the name is blank', async () => {
    const error = await harness().refusal('safety:acknowledge', { acknowledgedBy: '  ', accepted: true });
    expect(error).toMatchObject({
      code: 'invalid-request',
      field: 'acknowledgedBy',
      message: 'Enter your name or initials so the acknowledgement is attributable.',
    });
  });

  it('safety:status stays acknowledged for this version once acknowledged', async () => {
    const api = harness();
    await api.answer('safety:acknowledge', { acknowledgedBy: 'R.W.', accepted: true });
    api.clock.set('2026-12-02T08:00:00.000Z');
    expect(await api.answer('safety:status', {})).toEqual({
      acknowledged: true,
      appVersion: '9.8.7',
      last: { acknowledgedAt: '2026-12-01T09:30:00.000Z', appVersion: '9.8.7', acknowledgedBy: 'R.W.' },
    });
  });

  it('settings:save replaces the one settings row and stamps the time of the later save', async () => {
    const api = harness();
    await api.answer('settings:save', heronLaneSettings);
    api.clock.set('2026-12-03T10:00:00.000Z');
    await api.answer('settings:save', { ...heronLaneSettings, paperSize: 'Letter', massUnit: 'kg' });
    expect(await api.answer('settings:get', {})).toEqual({
      // Saved without a date format: the stored default, year-month-day.
      settings: { ...heronLaneSettings, paperSize: 'Letter', massUnit: 'kg', dateFormat: 'YYYY-MM-DD' },
      updatedAt: '2026-12-03T10:00:00.000Z',
    });
  });

  it('settings:save refuses a paper size other than A4 or Letter and names the field', async () => {
    const error = await harness().refusal('settings:save', { ...heronLaneSettings, paperSize: 'A5' });
    expect(error.code).toBe('invalid-request');
    expect(error.field).toBe('paperSize');
  });
});

describe('database channels', () => {
  it('database:export-json exports every table with the saved settings, named by the time of export', async () => {
    const api = harness();
    await api.answer('settings:save', heronLaneSettings);
    const exported = await api.answer('database:export-json', {});
    expect(exported.fileName).toBe('tidewing-database-2026-12-01-09-30-00.json');
    const parsed = JSON.parse(exported.json) as {
      format: string;
      appVersion: string;
      schemaVersion: number;
      exportedAt: string;
      tables: Record<string, { rows: Record<string, unknown>[] }>;
    };
    expect(parsed).toMatchObject({
      format: 'tidewing-database-export',
      appVersion: '9.8.7',
      schemaVersion: latestSchemaVersion,
      exportedAt: '2026-12-01T09:30:00.000Z',
    });
    expect(parsed.tables['clinic_settings']?.rows).toEqual([
      expect.objectContaining({ clinic_name: 'Heron Lane Bird Clinic', paper_size: 'A4' }),
    ]);
    // The species reference is seeded at every start, so the export already holds it.
    expect(parsed.tables['species']?.rows.length).toBeGreaterThan(0);
  });

  it('database:export-json takes no arguments and names the request as the culprit', async () => {
    const error = await harness().refusal('database:export-json', { file: '/tmp/elsewhere.json' });
    expect(error).toMatchObject({ code: 'invalid-request', field: '(request)' });
  });

  it('database:backups lists the backup made at start, with its time and size', async () => {
    const api = harness({ automaticBackup: true });
    await api.backEnd.backupSettled;
    const listed = await api.answer('database:backups', {});
    const folder = path.join(api.dataDirectory, 'backups');
    expect(listed.folder).toBe(folder);
    expect(listed.backups).toHaveLength(1);
    const [backup] = listed.backups;
    expect(backup?.file).toBe(path.join(folder, 'tidewing-backup-2026-12-01T09-30-00.000Z.db'));
    expect(backup?.takenAt).toBe('2026-12-01T09:30:00.000Z');
    expect(backup?.sizeBytes).toBe(fs.statSync(backup?.file ?? '').size);
  });

  it('database:backups answers an empty list when no backup was ever made', async () => {
    const api = harness();
    expect(await api.answer('database:backups', {})).toEqual({
      folder: path.join(api.dataDirectory, 'backups'),
      backups: [],
    });
    expect((await api.refusal('database:backups', { folder: '/' })).code).toBe('invalid-request');
  });
});
