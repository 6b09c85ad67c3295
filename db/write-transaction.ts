import type { TidewingDatabase } from './connection.js';

/**
 * Runs `fn` as one write transaction begun with BEGIN IMMEDIATE and returns its result. The
 * write lock is taken before the first statement, waiting up to the connection's busy timeout
 * (5 s) while another connection (a second Tidewing on the same folder, a backup) writes. A
 * deferred transaction that reads before it writes cannot wait: when another writer committed
 * in between, SQLite refuses the upgrade at once with "database is locked". Inside another
 * transaction it becomes a savepoint. `fn` must be synchronous; it is rolled back if it throws.
 */
export function writeTransaction<T>(db: TidewingDatabase, fn: () => T): T {
  return db.transaction(fn).immediate();
}
