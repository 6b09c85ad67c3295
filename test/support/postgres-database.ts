import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { inject } from 'vitest';

/** Fails under CI and skips elsewhere when the run has no PostgreSQL cluster, saying why. */
export function needPostgres(context: { skip: (note?: string) => never }): {
  adminUrl: string;
  appUrl: string;
} {
  const provided = inject('postgres');
  if ('missing' in provided) {
    if (process.env['CI'] !== undefined && process.env['CI'] !== '' && process.env['CI'] !== 'false')
      throw new Error(provided.missing);
    return context.skip(provided.missing);
  }
  return provided;
}

/** `url` with its database name replaced. */
export function withDatabase(url: string, database: string): string {
  const parsed = new URL(url);
  parsed.pathname = `/${database}`;
  return parsed.toString();
}

/**
 * A new, empty database owned by the test role, and a function that drops it. Each test gets
 * its own, so suites run in parallel without seeing each other's rows.
 */
export async function scratchPostgresDatabase(
  appUrl: string,
): Promise<{ url: string; drop: () => Promise<void> }> {
  const name = `tw_${randomBytes(6).toString('hex')}`;
  const client = new pg.Client({ connectionString: appUrl });
  await client.connect();
  try {
    await client.query(`CREATE DATABASE ${name}`);
  } finally {
    await client.end();
  }
  return {
    url: withDatabase(appUrl, name),
    drop: async () => {
      const dropper = new pg.Client({ connectionString: appUrl });
      await dropper.connect();
      try {
        await dropper.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      } finally {
        await dropper.end();
      }
    },
  };
}
