import type { ClinicSettings, StoredSettings } from '../../app/contract/settings.js';
import { defaultDateFormat, type DateFormat } from '../../app/core/date-format.js';
import type { Sql } from '../clinic-db.js';

type SettingsRow = {
  id: number;
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

type Tables = { clinic_settings: SettingsRow };

/** All SQL for the clinic_settings table. */
export function createSettingsRepository(sql: Sql) {
  const db = sql.kysely.withTables<Tables>();

  async function get(): Promise<StoredSettings> {
    const row = await db
      .selectFrom('clinic_settings')
      .select([
        'clinic_name',
        'address_line',
        'mass_unit',
        'pressure_unit',
        'temperature_unit',
        'default_agent',
        'paper_size',
        'date_format',
        'updated_at',
      ])
      .where('id', '=', 1)
      .executeTakeFirst();
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
  }

  return {
    get,
    async save(settings: ClinicSettings, updatedAt: Date): Promise<StoredSettings> {
      const row = {
        clinic_name: settings.clinicName,
        address_line: settings.addressLine,
        mass_unit: settings.massUnit,
        pressure_unit: settings.pressureUnit,
        temperature_unit: settings.temperatureUnit,
        default_agent: settings.defaultAgent,
        paper_size: settings.paperSize,
        date_format: settings.dateFormat ?? defaultDateFormat,
        updated_at: updatedAt.toISOString(),
      };
      await db
        .insertInto('clinic_settings')
        .values({ id: 1, ...row })
        .onConflict((conflict) => conflict.column('id').doUpdateSet(row))
        .execute();
      return get();
    },
  };
}

export type SettingsRepository = ReturnType<typeof createSettingsRepository>;
