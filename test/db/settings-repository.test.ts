import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { openDatabase } from '../../db/connection.js';
import { createSafetyAcknowledgementRepository } from '../../db/repositories/safety-acknowledgement-repository.js';
import { createSettingsRepository } from '../../db/repositories/settings-repository.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

function openFresh() {
  const temp = temporaryFolder();
  cleanups.push(temp.remove);
  const file = path.join(temp.folder, 'tidewing.db');
  const db = openDatabase(file);
  cleanups.unshift(() => db.open && db.close());
  return { db, file };
}

const settings = {
  clinicName: 'Heron Lane Bird Clinic',
  addressLine: '4 Heron Lane, Marshfield',
  massUnit: 'kg',
  pressureUnit: 'kPa',
  temperatureUnit: 'F',
  defaultAgent: 'sevoflurane',
  paperSize: 'Letter',
  dateFormat: 'DD/MM/YYYY',
} as const;

describe('settings repository', () => {
  it('has no settings before the clinic saves any', () => {
    const { db } = openFresh();
    expect(createSettingsRepository(db).get()).toEqual({ settings: null, updatedAt: null });
  });

  it('saves, overwrites the single row and reads back after reopening the file', () => {
    const { db, file } = openFresh();
    const repository = createSettingsRepository(db);
    repository.save({ ...settings, clinicName: 'First name' }, new Date('2026-11-30T09:00:00Z'));
    repository.save(settings, new Date('2026-12-01T10:00:00Z'));
    expect(db.prepare('SELECT count(*) FROM clinic_settings').pluck().get()).toBe(1);
    db.close();
    const reopened = openDatabase(file);
    cleanups.unshift(() => reopened.close());
    expect(createSettingsRepository(reopened).get()).toEqual({
      settings,
      updatedAt: '2026-12-01T10:00:00.000Z',
    });
  });
});

describe('safety acknowledgement repository', () => {
  it('records who acknowledged which version and when, keeping every acknowledgement', () => {
    const { db } = openFresh();
    const repository = createSafetyAcknowledgementRepository(db);
    expect(repository.isAcknowledged('0.1.0')).toBe(false);
    repository.record('0.1.0', 'R.W.', new Date('2026-12-01T08:00:00Z'));
    repository.record('0.2.0', 'M.K.', new Date('2026-12-02T08:00:00Z'));
    expect(repository.isAcknowledged('0.1.0')).toBe(true);
    expect(repository.isAcknowledged('0.3.0')).toBe(false);
    expect(repository.latest()).toEqual({
      acknowledgedAt: '2026-12-02T08:00:00.000Z',
      appVersion: '0.2.0',
      acknowledgedBy: 'M.K.',
    });
    expect(db.prepare('SELECT count(*) FROM safety_acknowledgements').pluck().get()).toBe(2);
  });
});
