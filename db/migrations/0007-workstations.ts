/**
 * Workstations: each computer that opens the clinic's data folder keeps its own name, screen
 * theme and the initials of whoever is at its keyboard, under a stable id made once in the data
 * folder (`workstation.json`). Unlike the record tables these are preferences, not evidence:
 * a row is replaced when the workstation's settings change.
 */
export const workstationsMigration = {
  version: 7,
  name: 'workstations',
  sql: `
    CREATE TABLE workstations (
      id TEXT PRIMARY KEY CHECK (length(id) BETWEEN 8 AND 64),
      name TEXT NOT NULL CHECK (length(trim(name)) BETWEEN 1 AND 80),
      theme TEXT NOT NULL DEFAULT 'system' CHECK (theme IN ('system', 'light', 'dim')),
      initials TEXT NOT NULL DEFAULT '' CHECK (length(initials) <= 40),
      updated_at TEXT NOT NULL CHECK (length(updated_at) >= 20)
    ) STRICT;
  `,
  postgresql: `
    CREATE TABLE workstations (
      id text PRIMARY KEY CHECK (length(id) BETWEEN 8 AND 64),
      name text NOT NULL CHECK (length(trim(name)) BETWEEN 1 AND 80),
      theme text NOT NULL DEFAULT 'system' CHECK (theme IN ('system', 'light', 'dim')),
      initials text NOT NULL DEFAULT '' CHECK (length(initials) <= 40),
      updated_at text NOT NULL CHECK (length(updated_at) >= 20)
    );
  `,
} as const;
