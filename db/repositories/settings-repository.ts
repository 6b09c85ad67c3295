import type { ClinicSettings, StoredSettings } from '../../app/contract/settings.js';
import { defaultDateFormat, type DateFormat } from '../../app/core/date-format.js';
import type { TidewingDatabase } from '../connection.js';

type SettingsRow = {
  clinic_name: string;
  address_line: string;
  mass_unit: ClinicSettings['massUnit'];
  pressure_unit: ClinicSettings['pressureUnit'];
  temperature_unit: ClinicSettings['temperatureUnit'];
  default_agent: ClinicSettings['defaultAgent'];
  paper_size: ClinicSettings['paperSize'];
  date_format: DateFormat;
  updated_at: string;
};

/** All SQL for the clinic_settings table. */
export function createSettingsRepository(db: TidewingDatabase) {
  const select = db.prepare<[], SettingsRow>(
    `SELECT clinic_name, address_line, mass_unit, pressure_unit, temperature_unit, default_agent, paper_size, date_format, updated_at
       FROM clinic_settings WHERE id = 1`,
  );
  const upsert = db.prepare(
    `INSERT INTO clinic_settings (id, clinic_name, address_line, mass_unit, pressure_unit, temperature_unit, default_agent, paper_size, date_format, updated_at)
     VALUES (1, @clinicName, @addressLine, @massUnit, @pressureUnit, @temperatureUnit, @defaultAgent, @paperSize, @dateFormat, @updatedAt)
     ON CONFLICT (id) DO UPDATE SET
       clinic_name = excluded.clinic_name, address_line = excluded.address_line, mass_unit = excluded.mass_unit,
       pressure_unit = excluded.pressure_unit, temperature_unit = excluded.temperature_unit,
       default_agent = excluded.default_agent, paper_size = excluded.paper_size, date_format = excluded.date_format,
       updated_at = excluded.updated_at`,
  );

  return {
    get(): StoredSettings {
      const row = select.get();
      if (row === undefined) return { settings: null, updatedAt: null };
      return {
        settings: {
          clinicName: row.clinic_name,
          addressLine: row.address_line,
          massUnit: row.mass_unit,
          pressureUnit: row.pressure_unit,
          temperatureUnit: row.temperature_unit,
          defaultAgent: row.default_agent,
          paperSize: row.paper_size,
          dateFormat: row.date_format,
        },
        updatedAt: row.updated_at,
      };
    },
    save(settings: ClinicSettings, updatedAt: Date): StoredSettings {
      upsert.run({
        ...settings,
        dateFormat: settings.dateFormat ?? defaultDateFormat,
        updatedAt: updatedAt.toISOString(),
      });
      return this.get();
    },
  };
}

export type SettingsRepository = ReturnType<typeof createSettingsRepository>;
