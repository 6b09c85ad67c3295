import pg from 'pg';
import { postgresClinicDb, type ClinicDb } from './clinic-db.js';
import { redactedUrl } from './postgres-connection.js';

/**
 * Connects to a clinic database on a PostgreSQL server for reading only (export, check,
 * backup): no migration runs, so a command that only reads never changes the server's schema.
 * Throws the driver's error when the server cannot be reached or refuses the login.
 */
export async function connectPostgresForReading(url: string, pool: pg.PoolConfig = {}): Promise<ClinicDb> {
  const db = postgresClinicDb(new pg.Pool({ connectionString: url, max: 2, ...pool }), redactedUrl(url));
  try {
    // Reach the server now, so that a wrong address or password is reported before any work.
    await db.kysely.connection().execute(async () => undefined);
    return db;
  } catch (error) {
    await db.close();
    throw error;
  }
}
