import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { sqliteClinicDb } from '../../db/clinic-db.js';
import { openDatabase } from '../../db/connection.js';
import { createSafetyAcknowledgementRepository } from '../../db/repositories/safety-acknowledgement-repository.js';
import { createSettingsRepository } from '../../db/repositories/settings-repository.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';
import { temporaryFolder } from '../support/temporary-folder.js';

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

describe.each(testEngines)('settings repository on %s', (engine) => {
  it('has no settings before the clinic saves any', async (context) => {
    const clinic = await openTestClinic(engine, context);
    expect(await createSettingsRepository(clinic).get()).toEqual({ settings: null, updatedAt: null });
  });

  it('saves and overwrites the single row', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const repository = createSettingsRepository(clinic);
    await repository.save({ ...settings, clinicName: 'First name' }, new Date('2026-11-30T09:00:00Z'));
    expect(await repository.save(settings, new Date('2026-12-01T10:00:00Z'))).toEqual({
      settings,
      updatedAt: '2026-12-01T10:00:00.000Z',
    });
    const rows = await clinic.kysely
      .withTables<{ clinic_settings: { id: number } }>()
      .selectFrom('clinic_settings')
      .select('id')
      .execute();
    expect(rows).toEqual([{ id: 1 }]);
    expect(await createSettingsRepository(clinic).get()).toEqual({
      settings,
      updatedAt: '2026-12-01T10:00:00.000Z',
    });
  });
});

describe('settings repository on an SQLite file', () => {
  it('reads the saved settings back after the file is closed and reopened', async () => {
    const temp = temporaryFolder();
    try {
      const file = path.join(temp.folder, 'tidewing.db');
      const first = sqliteClinicDb(openDatabase(file));
      await createSettingsRepository(first).save(settings, new Date('2026-12-01T10:00:00Z'));
      await first.close();
      const reopened = sqliteClinicDb(openDatabase(file));
      try {
        expect(await createSettingsRepository(reopened).get()).toEqual({
          settings,
          updatedAt: '2026-12-01T10:00:00.000Z',
        });
      } finally {
        await reopened.close();
      }
    } finally {
      temp.remove();
    }
  });
});

describe.each(testEngines)('safety acknowledgement repository on %s', (engine) => {
  it('records who acknowledged which version and when, keeping every acknowledgement', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const repository = createSafetyAcknowledgementRepository(clinic);
    expect(await repository.isAcknowledged('0.1.0')).toBe(false);
    expect(await repository.latest()).toBeNull();
    await repository.record('0.1.0', 'R.W.', new Date('2026-12-01T08:00:00Z'));
    await repository.record('0.2.0', 'M.K.', new Date('2026-12-02T08:00:00Z'));
    expect(await repository.isAcknowledged('0.1.0')).toBe(true);
    expect(await repository.isAcknowledged('0.3.0')).toBe(false);
    expect(await repository.latest()).toEqual({
      acknowledgedAt: '2026-12-02T08:00:00.000Z',
      appVersion: '0.2.0',
      acknowledgedBy: 'M.K.',
    });
    const rows = await clinic.kysely
      .withTables<{ safety_acknowledgements: { app_version: string } }>()
      .selectFrom('safety_acknowledgements')
      .select('app_version')
      .execute();
    expect(rows).toHaveLength(2);
  });
});
