import { sql as query } from 'kysely';
import type { Sql } from './clinic-db.js';
import { describeClinicTables, rowCount, schemaOfMigrations, storedSchemaVersion } from './clinic-tables.js';
import { migrations as defaultMigrations, type Migration } from './migrations/index.js';

/** Rows whose foreign key names a row that does not exist. */
export type PostgresOrphans = {
  readonly table: string;
  readonly columns: readonly string[];
  readonly parentTable: string;
  readonly rows: number;
};

export type PostgresCheck = {
  readonly location: string;
  readonly ok: boolean;
  /** One sentence per problem found; empty when sound. */
  readonly problems: readonly string[];
  readonly schemaVersion: number;
  readonly supportedSchemaVersion: number;
  /** Tables the schema version should have but the database lacks. */
  readonly missingTables: readonly string[];
  /** Record tables (append-only by the migrations) and whether an enabled trigger refuses UPDATE and DELETE on each. */
  readonly appendOnly: readonly {
    readonly table: string;
    readonly update: boolean;
    readonly delete: boolean;
  }[];
  readonly orphans: readonly PostgresOrphans[];
  readonly rowCounts: readonly { readonly table: string; readonly rows: number }[];
  readonly role: string;
  readonly superuser: boolean;
};

// pg_trigger.tgtype bits (PostgreSQL's catalog/pg_trigger.h).
const triggerOnDelete = 8;
const triggerOnUpdate = 16;

/**
 * Checks a clinic database on a PostgreSQL server without changing it: the schema version
 * against this program's, the tables that version should have, that every record table (the
 * migrations' append-only tables) has enabled triggers refusing UPDATE and DELETE, rows whose
 * foreign keys point at missing rows (none expected: the server enforces them, unless a
 * constraint was disabled or left unvalidated), row counts, and that the role in use is not a
 * superuser (the app should run with only the rights it needs).
 */
export async function checkPostgresClinic(
  db: Sql & { readonly location: string },
  list: readonly Migration[] = defaultMigrations,
): Promise<PostgresCheck> {
  const problems: string[] = [];
  const schemaVersion = await storedSchemaVersion(db);
  const supportedSchemaVersion = list.length;
  const roleRow = (
    await query<{ role: string; superuser: boolean }>`
      SELECT current_user AS role, rolsuper AS superuser FROM pg_roles WHERE rolname = current_user`.execute(
      db.kysely,
    )
  ).rows[0];
  const role = roleRow?.role ?? '(unknown)';
  const superuser = roleRow?.superuser ?? false;
  if (superuser)
    problems.push(
      `the role ${role} is a superuser; the app should connect as a role with only the rights it needs (see docs/moving-to-postgresql.md).`,
    );
  if (schemaVersion === 0) problems.push('the database holds no Tidewing schema.');
  if (schemaVersion > supportedSchemaVersion)
    problems.push(
      `the schema (${String(schemaVersion)}) is newer than this version of Tidewing understands (${String(supportedSchemaVersion)}); check it with the newer Tidewing.`,
    );
  const expected = await schemaOfMigrations(Math.min(schemaVersion, supportedSchemaVersion), list);
  const described = await describeClinicTables(db);
  const present = new Set([...described.tables, ...described.searchIndexes].map((table) => table.name));
  const missingTables = expected.tables.map((table) => table.name).filter((name) => !present.has(name));
  if (missingTables.length > 0) problems.push(`the tables ${missingTables.join(', ')} are missing.`);

  const triggers = (
    await query<{ table_name: string; tgtype: number; tgenabled: string }>`
      SELECT c.relname AS table_name, t.tgtype::integer AS tgtype, t.tgenabled::text AS tgenabled
      FROM pg_trigger t JOIN pg_class c ON c.oid = t.tgrelid
      WHERE NOT t.tgisinternal AND c.relnamespace = current_schema()::regnamespace`.execute(db.kysely)
  ).rows.filter((trigger) => trigger.tgenabled !== 'D');
  const covers = (table: string, bit: number) =>
    triggers.some((trigger) => trigger.table_name === table && (trigger.tgtype & bit) !== 0);
  const appendOnly = expected.appendOnly
    .filter((table) => present.has(table))
    .map((table) => ({
      table,
      update: covers(table, triggerOnUpdate),
      delete: covers(table, triggerOnDelete),
    }));
  const unguarded = appendOnly.filter((table) => !table.update || !table.delete).map((table) => table.table);
  if (unguarded.length > 0)
    problems.push(
      `the record tables ${unguarded.join(', ')} lack an enabled trigger refusing changes or deletions, so their history is not protected.`,
    );

  const constraints = (
    await query<{ child: string; parent: string; columns: string[]; parent_columns: string[] }>`
      SELECT c.relname AS child, p.relname AS parent,
        array(SELECT a.attname::text FROM unnest(k.conkey) WITH ORDINALITY u(n, i)
              JOIN pg_attribute a ON a.attrelid = k.conrelid AND a.attnum = u.n ORDER BY u.i) AS columns,
        array(SELECT a.attname::text FROM unnest(k.confkey) WITH ORDINALITY u(n, i)
              JOIN pg_attribute a ON a.attrelid = k.confrelid AND a.attnum = u.n ORDER BY u.i) AS parent_columns
      FROM pg_constraint k JOIN pg_class c ON c.oid = k.conrelid JOIN pg_class p ON p.oid = k.confrelid
      WHERE k.contype = 'f' AND c.relnamespace = current_schema()::regnamespace
      ORDER BY c.relname, k.conname`.execute(db.kysely)
  ).rows;
  const orphans: PostgresOrphans[] = [];
  for (const constraint of constraints) {
    const child = query.table(constraint.child);
    const parent = query.table(constraint.parent);
    const set = query.join(
      constraint.columns.map((column) => query`x.${query.ref(column)} IS NOT NULL`),
      query` AND `,
    );
    const match = query.join(
      constraint.columns.map(
        (column, index) =>
          query`y.${query.ref(constraint.parent_columns[index] ?? column)} = x.${query.ref(column)}`,
      ),
      query` AND `,
    );
    const counted = await query<{ count: number }>`
      SELECT count(*) AS count FROM ${child} AS x WHERE ${set}
      AND NOT EXISTS (SELECT 1 FROM ${parent} AS y WHERE ${match})`.execute(db.kysely);
    const rows = Number(counted.rows[0]?.count ?? 0);
    if (rows > 0)
      orphans.push({
        table: constraint.child,
        columns: constraint.columns,
        parentTable: constraint.parent,
        rows,
      });
  }
  if (orphans.length > 0)
    problems.push(
      `${String(orphans.reduce((sum, orphan) => sum + orphan.rows, 0))} rows point at rows that do not exist (in ${[...new Set(orphans.map((orphan) => orphan.table))].join(', ')}).`,
    );

  const rowCounts: { table: string; rows: number }[] = [];
  for (const table of [...described.tables, ...described.searchIndexes].sort((a, b) =>
    a.name < b.name ? -1 : a.name > b.name ? 1 : 0,
  ))
    rowCounts.push({ table: table.name, rows: await rowCount(db, table.name) });

  return {
    location: db.location,
    ok: problems.length === 0,
    problems,
    schemaVersion,
    supportedSchemaVersion,
    missingTables,
    appendOnly,
    orphans,
    rowCounts,
    role,
    superuser,
  };
}
