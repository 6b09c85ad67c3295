/** Clinic settings (one row) and the record of safety acknowledgements. */
export const clinicSettingsMigration = {
  version: 1,
  name: 'clinic settings and safety acknowledgement',
  sql: `
    CREATE TABLE clinic_settings (
      id INTEGER PRIMARY KEY CHECK (id = 1),
      clinic_name TEXT NOT NULL CHECK (length(trim(clinic_name)) BETWEEN 1 AND 120),
      address_line TEXT NOT NULL DEFAULT '' CHECK (length(address_line) <= 200),
      mass_unit TEXT NOT NULL CHECK (mass_unit IN ('g', 'kg')),
      pressure_unit TEXT NOT NULL CHECK (pressure_unit IN ('mmHg', 'kPa')),
      temperature_unit TEXT NOT NULL CHECK (temperature_unit IN ('C', 'F')),
      default_agent TEXT NOT NULL CHECK (default_agent IN ('isoflurane', 'sevoflurane', 'desflurane')),
      paper_size TEXT NOT NULL CHECK (paper_size IN ('A4', 'Letter')),
      updated_at TEXT NOT NULL
    ) STRICT;

    CREATE TABLE safety_acknowledgements (
      id INTEGER PRIMARY KEY,
      acknowledged_at TEXT NOT NULL,
      app_version TEXT NOT NULL CHECK (length(app_version) > 0),
      acknowledged_by TEXT NOT NULL CHECK (length(trim(acknowledged_by)) BETWEEN 1 AND 80)
    ) STRICT;
  `,
} as const;
