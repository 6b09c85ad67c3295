import { sql } from 'kysely';
import type { Sql } from '../clinic-db.js';

/**
 * Record tables keep every version: a correction is a new row whose `corrects_id` names the row
 * it replaces. These helpers read such chains for any record table; the table name is ours,
 * never user input.
 */
export type ChainTable =
  'species' | 'patient_versions' | 'weights' | 'plans' | 'procedure_record_versions' | 'procedure_entries';

/** Every row id in the chain containing `id`, newest first. */
export async function chainIds(db: Sql, table: ChainTable, id: number): Promise<number[]> {
  // A recursive CTE, which the query builder cannot say; the table name comes only from ChainTable.
  const t = sql.table(table);
  const result = await sql<{ id: number }>`
    WITH RECURSIVE earlier(id, corrects_id) AS (
      SELECT id, corrects_id FROM ${t} WHERE id = ${id}
      UNION ALL
      SELECT t.id, t.corrects_id FROM ${t} t JOIN earlier ON t.id = earlier.corrects_id
    ),
    root AS (SELECT id FROM earlier WHERE corrects_id IS NULL),
    later(id) AS (
      SELECT id FROM root
      UNION ALL
      SELECT t.id FROM ${t} t JOIN later ON t.corrects_id = later.id
    )
    SELECT id FROM later ORDER BY id DESC`.execute(db.kysely);
  return result.rows.map((row) => row.id);
}

/**
 * The row that corrects (or voids) version `id` of a record table, with who, when and why, and
 * the name of the workstation that wrote it where the table keeps one; null when nothing
 * corrects it yet. What a refused concurrent correction tells the user.
 */
export async function laterVersion(db: Sql, table: ChainTable, id: number): Promise<LaterVersion | null> {
  // `SELECT *`: only some record tables have `voided` and `workstation_id`.
  const result = await sql<Record<string, unknown>>`
    SELECT * FROM ${sql.table(table)} WHERE corrects_id = ${id}`.execute(db.kysely);
  const row = result.rows[0];
  if (row === undefined) return null;
  const workstationId = typeof row['workstation_id'] === 'string' ? row['workstation_id'] : null;
  let workstationName: string | null = null;
  if (workstationId !== null) {
    const named = await sql<{ name: string }>`
      SELECT name FROM workstations WHERE id = ${workstationId}`.execute(db.kysely);
    workstationName = named.rows[0]?.name ?? null;
  }
  return {
    versionId: Number(row['id']),
    enteredBy: String(row['entered_by']),
    enteredAt: String(row['entered_at']),
    reason: String(row['reason']),
    voided: Number(row['voided'] ?? 0) === 1,
    workstationName,
  };
}

/** A version saved on top of the one a correction named: who, when, why, and from which workstation. */
export type LaterVersion = {
  readonly versionId: number;
  readonly enteredBy: string;
  readonly enteredAt: string;
  readonly reason: string;
  /** True when the later version voided the row. */
  readonly voided: boolean;
  /** The current name of the workstation that wrote it; null when the table keeps none or it is unknown. */
  readonly workstationName: string | null;
};

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
