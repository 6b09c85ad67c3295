import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';

/** One stored row of the clinic view, with the key it was computed for. */
export type CachedEvidenceRow = { readonly key: string; readonly rowJson: string };

/**
 * All SQL for evidence_prediction_cache: derived rows, replaced when stale. Reading and writing
 * here never touches a clinical table; a write that fails (a read-only or busy file) is skipped,
 * since the rows can always be computed again.
 */
export function createEvidenceCacheRepository(db: TidewingDatabase) {
  const all = db.prepare<[], { record_id: number; cache_key: string; row_json: string }>(
    'SELECT record_id, cache_key, row_json FROM evidence_prediction_cache',
  );
  const upsert = db.prepare(
    `INSERT INTO evidence_prediction_cache (record_id, cache_key, row_json, computed_at) VALUES (?, ?, ?, ?)
     ON CONFLICT (record_id) DO UPDATE SET cache_key = excluded.cache_key, row_json = excluded.row_json,
       computed_at = excluded.computed_at`,
  );
  return {
    /** Every stored row by record id. */
    all(): Map<number, CachedEvidenceRow> {
      return new Map(all.all().map((row) => [row.record_id, { key: row.cache_key, rowJson: row.row_json }]));
    },
    /** Stores (or replaces) computed rows in one transaction; false when the file refused the write. */
    store(rows: readonly { recordId: number; key: string; rowJson: string }[], at: Date): boolean {
      if (rows.length === 0) return true;
      const stamp = at.toISOString();
      try {
        writeTransaction(db, () => {
          for (const row of rows) upsert.run(row.recordId, row.key, row.rowJson, stamp);
        });
        return true;
      } catch {
        return false;
      }
    },
  };
}
