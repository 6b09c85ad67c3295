/**
 * Patient search for one- and two-letter queries: no trigram index can serve them, so they
 * match the start of the current name, ring number or microchip number (case folded as the
 * engine's lower() folds it) through an index on each, read as a range ("pi" up to "pj"), and
 * never scan every patient. Three or more letters still find the text anywhere (the trigram
 * index). PostgreSQL's indexes compare with the "C" collation, code point by code point as
 * SQLite's BINARY does, so the same range holds the same names on both engines. Indexes only:
 * no row changes, so the append-only triggers stay as they are.
 */
export const patientSearchStartsMigration = {
  version: 13,
  name: 'patient search by the start of name, ring and microchip',
  sql: `
    CREATE INDEX patient_versions_name_start ON patient_versions (lower(name));
    CREATE INDEX patient_versions_ring_start ON patient_versions (lower(ring_id));
    CREATE INDEX patient_versions_chip_start ON patient_versions (lower(microchip_id));
  `,
  postgresql: `
    CREATE INDEX patient_versions_name_start ON patient_versions ((lower(name) COLLATE "C"));
    CREATE INDEX patient_versions_ring_start ON patient_versions ((lower(ring_id) COLLATE "C"));
    CREATE INDEX patient_versions_chip_start ON patient_versions ((lower(microchip_id) COLLATE "C"));
  `,
} as const;
