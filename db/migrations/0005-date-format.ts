/**
 * The clinic's date format for screens and sheets. Settings saved before keep year-month-day,
 * the form dates are stored in, so nothing changes until the clinic chooses.
 */
export const dateFormatMigration = {
  version: 5,
  name: 'clinic date format',
  sql: `
    ALTER TABLE clinic_settings ADD COLUMN date_format TEXT NOT NULL DEFAULT 'YYYY-MM-DD'
      CHECK (date_format IN ('YYYY-MM-DD', 'DD/MM/YYYY', 'MM/DD/YYYY', 'D MMM YYYY'));
  `,
  postgresql: `
    ALTER TABLE clinic_settings ADD COLUMN date_format text NOT NULL DEFAULT 'YYYY-MM-DD'
      CHECK (date_format IN ('YYYY-MM-DD', 'DD/MM/YYYY', 'MM/DD/YYYY', 'D MMM YYYY'));
  `,
} as const;
