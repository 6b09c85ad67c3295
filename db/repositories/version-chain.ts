import type { TidewingDatabase } from '../connection.js';

/**
 * Record tables keep every version: a correction is a new row whose `corrects_id` names the row
 * it replaces. These helpers read such chains for any record table; the table name is ours,
 * never user input.
 */
export type ChainTable =
  'species' | 'patient_versions' | 'weights' | 'plans' | 'procedure_record_versions' | 'procedure_entries';

/** Every row id in the chain containing `id`, newest first. */
export function chainIds(db: TidewingDatabase, table: ChainTable, id: number): number[] {
  const rows = db
    .prepare<[number], { id: number }>(
      `WITH RECURSIVE earlier(id, corrects_id) AS (
         SELECT id, corrects_id FROM ${table} WHERE id = ?
         UNION ALL
         SELECT t.id, t.corrects_id FROM ${table} t JOIN earlier ON t.id = earlier.corrects_id
       ),
       root AS (SELECT id FROM earlier WHERE corrects_id IS NULL),
       later(id) AS (
         SELECT id FROM root
         UNION ALL
         SELECT t.id FROM ${table} t JOIN later ON t.corrects_id = later.id
       )
       SELECT id FROM later ORDER BY id DESC`,
    )
    .all(id);
  return rows.map((row) => row.id);
}

export type StampRow = {
  id: number;
  entered_at: string;
  entered_by: string;
  reason: string;
  corrects_id: number | null;
};

/** The provenance part of a row, as the contract's `recordStamp`. */
export function stampOf(row: StampRow) {
  return {
    versionId: row.id,
    enteredAt: row.entered_at,
    enteredBy: row.entered_by,
    reason: row.reason,
    correctsId: row.corrects_id,
  };
}

// The async chain reader over the shared query layer (kept together at the end of this module).
import { sql as kyselySql } from 'kysely';
import type { Sql } from '../clinic-db.js';

/**
 * Every row id in the chain containing `id`, newest first, through the shared query layer
 * (SQLite or PostgreSQL): the async form of `chainIds`. The table name is one of ours.
 */
export async function readChainIds(sql: Sql, table: ChainTable, id: number): Promise<number[]> {
  const result = await kyselySql<{ id: number }>`
    WITH RECURSIVE earlier(id, corrects_id) AS (
      SELECT id, corrects_id FROM ${kyselySql.table(table)} WHERE id = ${id}
      UNION ALL
      SELECT t.id, t.corrects_id FROM ${kyselySql.table(table)} t JOIN earlier ON t.id = earlier.corrects_id
    ),
    root AS (SELECT id FROM earlier WHERE corrects_id IS NULL),
    later(id) AS (
      SELECT id FROM root
      UNION ALL
      SELECT t.id FROM ${kyselySql.table(table)} t JOIN later ON t.corrects_id = later.id
    )
    SELECT id FROM later ORDER BY id DESC`.execute(sql.kysely);
  return result.rows.map((row) => row.id);
}
