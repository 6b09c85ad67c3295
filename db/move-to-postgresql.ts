import { sql as query } from 'kysely';
import type { Sql } from './clinic-db.js';
import {
  describeClinicTables,
  parentsFirst,
  readSnapshot,
  rowCount,
  storedSchemaVersion,
  tableChecksum,
  tableRows,
  type TableChecksum,
  type TableShape,
} from './clinic-tables.js';

/** The move was refused before anything was copied; the message says why and what to do. */
export class MoveRefusedError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'MoveRefusedError';
  }
}

/** One table of the source and where its rows go, column for column. */
export type TablePair = {
  readonly source: TableShape;
  readonly target: TableShape;
  /** Source columns and the target columns they are written to, position for position. */
  readonly sourceColumns: readonly string[];
  readonly targetColumns: readonly string[];
  /** A search index, carried over as it stands (its rows are derived from the patients). */
  readonly searchIndex: boolean;
};

export type TableComparison = {
  readonly table: string;
  readonly source: TableChecksum;
  readonly target: TableChecksum;
  readonly same: boolean;
};

export type MoveProgress =
  | { readonly step: 'copy'; readonly table: string; readonly rowsDone: number; readonly rowsTotal: number }
  | {
      readonly step: 'verify';
      readonly table: string;
      readonly tablesDone: number;
      readonly tablesTotal: number;
    };

export type MoveResult = {
  /** True when every table's count and checksum agree; the copy was committed only then. */
  readonly ok: boolean;
  readonly schemaVersion: number;
  readonly tables: readonly TableComparison[];
  /** Tables only the PostgreSQL schema has; they are left empty. */
  readonly targetOnly: readonly string[];
  /** What happened to each search index (copied, or left to the server's own index). */
  readonly searchIndexes: readonly string[];
  readonly rowsCopied: number;
};

function sameSet(a: readonly string[], b: readonly string[]): boolean {
  return a.length === b.length && a.every((item) => b.includes(item));
}

/**
 * Pairs each source table with the target table of the same name, checking that both have the
 * same columns. A search index (SQLite's full-text table: its row id and text) goes to a target
 * table of the same name whose one-column key takes the row id; a target without such a table
 * indexes the rows itself, and nothing is carried. Refuses (MoveRefusedError) any other mismatch.
 */
export function pairTables(
  source: { readonly tables: readonly TableShape[]; readonly searchIndexes: readonly TableShape[] },
  target: { readonly tables: readonly TableShape[]; readonly searchIndexes: readonly TableShape[] },
): { pairs: TablePair[]; targetOnly: TableShape[]; indexNotes: string[] } {
  const targets = new Map([...target.tables, ...target.searchIndexes].map((table) => [table.name, table]));
  const problems: string[] = [];
  const pairs: TablePair[] = [];
  for (const table of source.tables) {
    const found = targets.get(table.name);
    if (found === undefined) {
      problems.push(`the PostgreSQL database has no table ${table.name}`);
      continue;
    }
    if (!sameSet(table.columns, found.columns)) {
      const missing = table.columns.filter((column) => !found.columns.includes(column));
      const extra = found.columns.filter((column) => !table.columns.includes(column));
      problems.push(
        `${table.name} differs: ${[missing.length > 0 ? `PostgreSQL lacks ${missing.join(', ')}` : '', extra.length > 0 ? `PostgreSQL also has ${extra.join(', ')}` : ''].filter((part) => part !== '').join('; ')}`,
      );
      continue;
    }
    if (table.key.join(',') !== found.key.join(','))
      problems.push(
        `${table.name} has the key (${table.key.join(', ')}) but on PostgreSQL (${found.key.join(', ')})`,
      );
    pairs.push({
      source: table,
      target: found,
      sourceColumns: table.columns,
      targetColumns: table.columns,
      searchIndex: false,
    });
  }
  const indexNotes: string[] = [];
  for (const index of source.searchIndexes) {
    const found = targets.get(index.name);
    if (found === undefined) {
      indexNotes.push(`${index.name}: not copied; PostgreSQL builds its own search from the patients`);
      continue;
    }
    const textColumns = index.columns.filter((column) => column !== 'rowid');
    const keyColumn = found.key.length === 1 ? found.key[0] : undefined;
    if (
      keyColumn === undefined ||
      !sameSet([keyColumn, ...textColumns], found.columns) ||
      textColumns.includes(keyColumn)
    ) {
      problems.push(
        `the search index ${index.name} (${textColumns.join(', ')} by row id) does not fit PostgreSQL's ${found.name} (${found.columns.join(', ')})`,
      );
      continue;
    }
    pairs.push({
      source: index,
      target: found,
      sourceColumns: index.columns,
      targetColumns: [keyColumn, ...textColumns],
      searchIndex: true,
    });
    indexNotes.push(`${index.name}: copied as it stands (the search text of each patient's current version)`);
  }
  if (problems.length > 0)
    throw new MoveRefusedError(
      `The PostgreSQL database's tables do not match the clinic's: ${problems.join('; ')}. Nothing was copied.`,
    );
  const paired = new Set(pairs.map((pair) => pair.target.name));
  const targetOnly = [...target.tables, ...target.searchIndexes].filter((table) => !paired.has(table.name));
  return { pairs, targetOnly, indexNotes };
}

/** Compares one pair by count and checksum, each side read by the same function. */
export async function comparePair(source: Sql, target: Sql, pair: TablePair): Promise<TableComparison> {
  const sourceSum = await tableChecksum(source, pair.source, pair.sourceColumns);
  const targetSum = await tableChecksum(target, pair.target, pair.targetColumns);
  return {
    table: pair.source.name,
    source: sourceSum,
    target: targetSum,
    same: sourceSum.rows === targetSum.rows && sourceSum.sha256 === targetSum.sha256,
  };
}

/**
 * Compares a clinic on SQLite with its copy on PostgreSQL table by table: row counts and the
 * SHA-256 of every row in key order (`tableChecksum`, the one function for both engines).
 */
export async function compareClinics(source: Sql, target: Sql): Promise<TableComparison[]> {
  const { pairs } = pairTables(await describeClinicTables(source), await describeClinicTables(target));
  const compared: TableComparison[] = [];
  for (const pair of pairs) compared.push(await comparePair(source, target, pair));
  return compared;
}

/** Rows per INSERT: enough to be quick, few enough to stay far below PostgreSQL's 65,535 parameters. */
function rowsPerInsert(columns: number): number {
  return Math.max(1, Math.min(1000, Math.floor(30_000 / Math.max(1, columns))));
}

async function insertRows(
  target: Sql,
  pair: TablePair,
  rows: readonly Record<string, unknown>[],
): Promise<void> {
  const columnList = query.join(pair.targetColumns.map((column) => query.ref(column)));
  const values = query.join(
    rows.map((row) => query`(${query.join(pair.sourceColumns.map((column) => row[column] ?? null))})`),
  );
  await query`INSERT INTO ${query.table(pair.target.name)} (${columnList}) VALUES ${values}`.execute(
    target.kysely,
  );
}

/** Moves each identity (or serial) sequence past the largest id now stored, so new rows get new ids. */
async function advanceSequences(target: Sql): Promise<void> {
  const sequences = (
    await query<{ table_name: string; column_name: string; sequence: string }>`
      SELECT c.relname AS table_name, a.attname AS column_name,
        pg_get_serial_sequence(quote_ident(c.relname), a.attname) AS sequence
      FROM pg_attribute a JOIN pg_class c ON c.oid = a.attrelid
      WHERE c.relnamespace = current_schema()::regnamespace AND c.relkind = 'r' AND a.attnum > 0
        AND NOT a.attisdropped AND pg_get_serial_sequence(quote_ident(c.relname), a.attname) IS NOT NULL`.execute(
      target.kysely,
    )
  ).rows;
  for (const found of sequences)
    await query`SELECT setval(${found.sequence}::regclass, coalesce(max(${query.ref(found.column_name)}), 0) + 1, false) FROM ${query.table(found.table_name)}`.execute(
      target.kysely,
    );
}

/** Thrown inside the copy's transaction when a table differs, so that nothing is committed. */
class VerificationFailed extends Error {
  constructor(readonly tables: readonly TableComparison[]) {
    super('The copy differs from the clinic.');
  }
}

/**
 * Copies a whole clinic from SQLite (`source`, read in one snapshot and never written) into an
 * empty, migrated PostgreSQL database (`target`), keeping every id, then compares every table by
 * count and checksum. Everything happens in one PostgreSQL transaction: tables are locked and
 * found empty, filled parents first (foreign keys) in key order (corrections point at earlier
 * rows), identity sequences moved past the largest id, every table compared, and the whole is
 * committed only when every table agrees (otherwise rolled back; `ok` is false and the tables
 * say which differ). Refuses (MoveRefusedError) a target holding rows, or a schema other than
 * the source's. The prediction cache (derived) is copied like any table, so the clinic view
 * need not recompute; the patient search index is carried over as it stands (see `pairTables`).
 */
export async function moveClinic(
  source: Sql,
  target: Sql,
  options: { readonly onProgress?: (progress: MoveProgress) => void } = {},
): Promise<MoveResult> {
  if (source.engine !== 'sqlite' || target.engine !== 'postgresql')
    throw new Error('A move goes from an SQLite clinic to a PostgreSQL database.');
  return readSnapshot(source, async (snapshot) => {
    const sourceVersion = await storedSchemaVersion(snapshot);
    const targetVersion = await storedSchemaVersion(target);
    if (sourceVersion !== targetVersion)
      throw new MoveRefusedError(
        sourceVersion < targetVersion
          ? `The clinic's file is at schema ${String(sourceVersion)} and the PostgreSQL database at ${String(targetVersion)}. Start Tidewing once on the clinic's folder (npm start -- --data DIR), which brings the file up to date, close it, then move again. Nothing was copied.`
          : `The clinic's file is at schema ${String(sourceVersion)}, newer than this Tidewing's PostgreSQL database (${String(targetVersion)}). Move it with the version of Tidewing that wrote it. Nothing was copied.`,
      );
    const { pairs, targetOnly, indexNotes } = pairTables(
      await describeClinicTables(snapshot),
      await describeClinicTables(target),
    );
    const ordered = [
      ...parentsFirst(pairs.filter((pair) => !pair.searchIndex).map((pair) => pair.source)).map(
        (table) => pairs.find((pair) => pair.source.name === table.name && !pair.searchIndex) as TablePair,
      ),
      ...pairs.filter((pair) => pair.searchIndex),
    ];
    const totals = new Map<string, number>();
    for (const pair of ordered) totals.set(pair.source.name, await rowCount(snapshot, pair.source.name));
    const rowsTotal = [...totals.values()].reduce((sum, count) => sum + count, 0);

    try {
      return await target.kysely.transaction().execute(async (trx) => {
        const tx: Sql = { engine: target.engine, kysely: trx };
        const everyTarget = [
          ...ordered.map((pair) => pair.target.name),
          ...targetOnly.map((table) => table.name),
        ];
        // No workstation may write while the clinic is poured in: the whole schema is locked
        // against writers (readers still see the empty tables until the commit).
        await query`LOCK TABLE ${query.join(everyTarget.map((name) => query.table(name)))} IN EXCLUSIVE MODE`.execute(
          trx,
        );
        const holding: string[] = [];
        for (const name of everyTarget) {
          const count = await rowCount(tx, name);
          if (count > 0) holding.push(`${name} (${String(count)} row${count === 1 ? '' : 's'})`);
        }
        if (holding.length > 0)
          throw new MoveRefusedError(
            `The PostgreSQL database already holds Tidewing data: ${holding.join(', ')}. A clinic is moved only into an empty database; create a new one (see docs/moving-to-postgresql.md). Nothing was copied.`,
          );

        let rowsDone = 0;
        for (const pair of ordered) {
          options.onProgress?.({ step: 'copy', table: pair.source.name, rowsDone, rowsTotal });
          const batchRows = rowsPerInsert(pair.sourceColumns.length);
          for await (const batch of tableRows(snapshot, pair.source, {
            columns: pair.sourceColumns,
            batchRows,
          })) {
            await insertRows(tx, pair, batch);
            rowsDone += batch.length;
            options.onProgress?.({ step: 'copy', table: pair.source.name, rowsDone, rowsTotal });
          }
        }
        await advanceSequences(tx);

        const tables: TableComparison[] = [];
        for (const [index, pair] of ordered.entries()) {
          options.onProgress?.({
            step: 'verify',
            table: pair.source.name,
            tablesDone: index,
            tablesTotal: ordered.length,
          });
          tables.push(await comparePair(snapshot, tx, pair));
        }
        const sorted = [...tables].sort((a, b) => (a.table < b.table ? -1 : a.table > b.table ? 1 : 0));
        if (sorted.some((table) => !table.same)) throw new VerificationFailed(sorted);
        return {
          ok: true,
          schemaVersion: sourceVersion,
          tables: sorted,
          targetOnly: targetOnly.map((table) => table.name),
          searchIndexes: indexNotes,
          rowsCopied: rowsDone,
        };
      });
    } catch (error) {
      if (!(error instanceof VerificationFailed)) throw error;
      return {
        ok: false,
        schemaVersion: sourceVersion,
        tables: error.tables,
        targetOnly: targetOnly.map((table) => table.name),
        searchIndexes: indexNotes,
        rowsCopied: 0,
      };
    }
  });
}
