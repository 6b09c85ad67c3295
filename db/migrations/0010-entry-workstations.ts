/**
 * Entries carry their workstation: each procedure log row names the workstation that wrote it
 * (the id made once in that computer's data folder, `workstation.json`), so the log shows which
 * computer each row came from when several share one clinic database. The name is read by id
 * from `workstations` when shown, so a renamed workstation shows its current name. No foreign
 * key: a workstation that never saved its settings has no row there, and an entry must still be
 * saved. Rows written before this migration have none (NULL). Adding a column changes no row,
 * so the append-only triggers on procedure_entries stay as they are.
 */
export const entryWorkstationsMigration = {
  version: 10,
  name: 'entries carry their workstation',
  sql: `
    ALTER TABLE procedure_entries ADD COLUMN workstation_id TEXT
      CHECK (workstation_id IS NULL OR length(workstation_id) BETWEEN 8 AND 64);
  `,
  postgresql: `
    ALTER TABLE procedure_entries ADD COLUMN workstation_id text
      CHECK (workstation_id IS NULL OR length(workstation_id) BETWEEN 8 AND 64);
  `,
} as const;
