import { writeTransaction, type Sql } from '../clinic-db.js';

type Tables = {
  evidence_prediction_cache: { record_id: number; cache_key: string; row_json: string; computed_at: string };
};

/** One stored row of the clinic view, with the key it was computed for. */
export type CachedEvidenceRow = { readonly key: string; readonly rowJson: string };

/** Rows per INSERT: 4 bound values each, well inside both engines' limits on bound values. */
const rowsPerInsert = 250;

/**
 * All SQL for evidence_prediction_cache: derived rows, replaced when stale. Reading and writing
 * here never touches a clinical table; a write that fails (a read-only or busy file) is skipped,
 * since the rows can always be computed again. Works on SQLite and PostgreSQL alike.
 */
export function createEvidenceCacheRepository(sql: Sql) {
  const db = sql.kysely.withTables<Tables>();
  return {
    /** Every stored row by record id (one query). */
    async all(): Promise<Map<number, CachedEvidenceRow>> {
      const rows = await db
        .selectFrom('evidence_prediction_cache')
        .select(['record_id', 'cache_key', 'row_json'])
        .execute();
      return new Map(rows.map((row) => [row.record_id, { key: row.cache_key, rowJson: row.row_json }]));
    },
    /** The stored rows of these records (those that have one), e.g. rows another workstation stored. */
    async rowsFor(recordIds: readonly number[]): Promise<Map<number, CachedEvidenceRow>> {
      if (recordIds.length === 0) return new Map();
      const rows = await db
        .selectFrom('evidence_prediction_cache')
        .select(['record_id', 'cache_key', 'row_json'])
        .where('record_id', 'in', recordIds)
        .execute();
      return new Map(rows.map((row) => [row.record_id, { key: row.cache_key, rowJson: row.row_json }]));
    },
    /** Stores (or replaces) computed rows in one transaction; false when the database refused the write. */
    async store(
      rows: readonly { recordId: number; key: string; rowJson: string }[],
      at: Date,
    ): Promise<boolean> {
      if (rows.length === 0) return true;
      const stamp = at.toISOString();
      try {
        await writeTransaction(sql, async (tx) => {
          const inTx = tx.kysely.withTables<Tables>();
          for (let start = 0; start < rows.length; start += rowsPerInsert)
            await inTx
              .insertInto('evidence_prediction_cache')
              .values(
                rows.slice(start, start + rowsPerInsert).map((row) => ({
                  record_id: row.recordId,
                  cache_key: row.key,
                  row_json: row.rowJson,
                  computed_at: stamp,
                })),
              )
              .onConflict((conflict) =>
                conflict.column('record_id').doUpdateSet((eb) => ({
                  cache_key: eb.ref('excluded.cache_key'),
                  row_json: eb.ref('excluded.row_json'),
                  computed_at: eb.ref('excluded.computed_at'),
                })),
              )
              .execute();
        });
        return true;
      } catch {
        return false;
      }
    },
  };
}
