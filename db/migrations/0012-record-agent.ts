/**
 * Procedure records carry their anaesthetic agent: each version of a record's details may name
 * the inhalant given (one of app/core/agents.ts's ids, listed here as the stored CHECK; a new
 * agent needs a new migration, as with migration 2's lists). Records written before this
 * migration have none (NULL) and keep none: the agent is never guessed into the stored record;
 * the evidence reads those from the linked plan or the clinic's default agent and says so.
 * Adding a column changes no row, so the append-only triggers on procedure_record_versions stay
 * as they are, and a correction of the agent is a new version like any other.
 */
export const recordAgentMigration = {
  version: 12,
  name: 'procedure records carry their agent',
  sql: `
    ALTER TABLE procedure_record_versions ADD COLUMN agent TEXT CHECK (agent IS NULL OR agent IN ('isoflurane', 'sevoflurane', 'desflurane'));
  `,
  postgresql: `
    ALTER TABLE procedure_record_versions ADD COLUMN agent text CHECK (agent IS NULL OR agent IN ('isoflurane', 'sevoflurane', 'desflurane'));
  `,
} as const;
