/**
 * The stored cache of the clinic view's rows (observed vs what the model predicts for what was
 * given), so that after a restart only new or changed records are run through the model again.
 * One row per procedure record, keyed by the record's id, with the key it was computed for
 * (the model version, the clinic's default agent and species versions, and the newest ids of the
 * record's version, entries, weights and patient version) and the computed row as JSON.
 *
 * Derived data, not evidence: unlike the clinical tables (append-only, with triggers that refuse
 * UPDATE and DELETE) a row here is replaced when its key no longer matches, and the whole table
 * may be emptied at any time. So there are deliberately no triggers forbidding replacement, and
 * no foreign key to procedure_records: nothing here may ever block or alter a clinical record.
 */
export const evidencePredictionCacheMigration = {
  version: 9,
  name: 'evidence prediction cache',
  sql: `
    CREATE TABLE evidence_prediction_cache (
      record_id INTEGER PRIMARY KEY,
      cache_key TEXT NOT NULL CHECK (length(cache_key) > 0),
      row_json TEXT NOT NULL CHECK (json_valid(row_json)),
      computed_at TEXT NOT NULL CHECK (length(computed_at) >= 20)
    ) STRICT;
  `,
  postgresql: `
    CREATE TABLE evidence_prediction_cache (
      record_id integer PRIMARY KEY,
      cache_key text NOT NULL CHECK (length(cache_key) > 0),
      row_json text NOT NULL CHECK (tidewing_is_json(row_json)),
      computed_at text NOT NULL CHECK (length(computed_at) >= 20)
    );
  `,
} as const;
