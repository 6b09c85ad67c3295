import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import type { Sql } from '../../db/clinic-db.js';
import {
  canonicalValue,
  describeClinicTables,
  parentsFirst,
  schemaOfMigrations,
  tableChecksum,
  tableRows,
  type TableShape,
} from '../../db/clinic-tables.js';
import { openTestClinic } from '../support/clinic-engines.js';

// Values chosen to trip number formatting between the engines: REAL against double precision,
// whole numbers stored as REAL, the largest 32-bit integer, a tiny and a large fraction, NULL
// beside '' and '0', text in several scripts and text keys whose order depends on collation.
const trickyRows: readonly (readonly [string, number | null, number | null, string | null])[] = [
  ['a', 1, 0.1, 'plain'],
  ['B', 2147483647, 1 / 3, ''],
  ['Z', -5, 2.5, null],
  ['é', 0, 1e-7, 'Grünfink • 緑'],
  ['ä', null, 123456789.123, '0'],
  ['a b', 7, 5, 'line\nbreak "quoted"'],
  ['10', 10, -0.000001, '5'],
  ['9', 9, 1e21, 'tab\there'],
];

async function makeTricky(db: Sql, order: readonly number[]): Promise<void> {
  // Column types as the PostgreSQL migrations mirror SQLite's: integer, double precision, text.
  const real = db.engine === 'postgresql' ? sql.raw('double precision') : sql.raw('REAL');
  await sql`CREATE TABLE tricky (key text PRIMARY KEY, whole integer, fraction ${real}, note text)`.execute(
    db.kysely,
  );
  for (const index of order) {
    const [key, whole, fraction, note] = trickyRows[index] ?? [];
    await sql`INSERT INTO tricky (key, whole, fraction, note) VALUES (${key}, ${whole}, ${fraction}, ${note})`.execute(
      db.kysely,
    );
  }
}

const trickyShape = async (db: Sql): Promise<TableShape> => {
  const found = (await describeClinicTables(db)).tables.find((table) => table.name === 'tricky');
  if (found === undefined) throw new Error('tricky table not described');
  return found;
};

describe('the clinic tables as the schema describes them', () => {
  it('lists every ordinary table of a migrated SQLite clinic with its columns and key, and the search index apart', async (context) => {
    const db = await openTestClinic('sqlite', context);
    const handle = db.sqlite;
    if (handle === null) throw new Error('SQLite expected');
    const described = await describeClinicTables(db);
    const ordinary = handle
      .prepare(
        "SELECT name FROM pragma_table_list WHERE schema = 'main' AND type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name",
      )
      .pluck()
      .all() as string[];
    expect(described.tables.map((table) => table.name)).toEqual(ordinary);
    for (const table of described.tables)
      expect(table.columns, table.name).toEqual(
        handle.prepare('SELECT name FROM pragma_table_info(?)').pluck().all(table.name),
      );
    const byName = new Map(described.tables.map((table) => [table.name, table]));
    expect(byName.get('procedure_entries')).toMatchObject({ key: ['id'], parents: ['procedure_records'] });
    expect(byName.get('patient_current')).toMatchObject({
      key: ['patient_id'],
      parents: ['patient_versions', 'patients'],
    });
    expect(byName.get('workstations')).toMatchObject({ key: ['id'], textKeys: ['id'] });
    expect(described.searchIndexes).toEqual([
      {
        name: 'patient_search',
        columns: ['rowid', 'search_text'],
        key: ['rowid'],
        textKeys: [],
        parents: [],
      },
    ]);
    expect(described.derivedNames).toContain('patient_search');
    expect(
      described.derivedNames.filter((name) => name.startsWith('patient_search_')).length,
    ).toBeGreaterThan(0);
  });

  it('orders the tables parents first, so that every foreign key finds its row', async () => {
    const schema = await schemaOfMigrations();
    const ordered = parentsFirst(schema.tables);
    expect(ordered.map((table) => table.name).sort()).toEqual(schema.tables.map((table) => table.name));
    ordered.forEach((table, index) => {
      for (const parent of table.parents)
        expect(
          ordered.findIndex((other) => other.name === parent),
          `${parent} before ${table.name}`,
        ).toBeLessThan(index);
    });
    expect(() =>
      parentsFirst([
        { name: 'a', columns: ['id'], key: ['id'], textKeys: [], parents: ['b'] },
        { name: 'b', columns: ['id'], key: ['id'], textKeys: [], parents: ['a'] },
      ]),
    ).toThrow(/cycle/);
  });

  it('knows from the migrations which tables are append-only and which only derived', async () => {
    const schema = await schemaOfMigrations();
    expect(schema.appendOnly).toEqual(
      expect.arrayContaining([
        'species',
        'patients',
        'patient_versions',
        'weights',
        'plans',
        'plan_choices',
        'procedure_records',
        'procedure_record_versions',
        'procedure_entries',
        'emergency_drugs',
        'evidence_exclusions',
        'evidence_calibration_switch',
      ]),
    );
    for (const kept of ['clinic_settings', 'workstations', 'patient_current', 'evidence_prediction_cache'])
      expect(schema.appendOnly).not.toContain(kept);
    expect(schema.searchIndexes.map((table) => table.name)).toEqual(['patient_search']);
    // At schema 1 only the settings tables existed.
    expect((await schemaOfMigrations(1)).tables.map((table) => table.name)).toEqual([
      'clinic_settings',
      'safety_acknowledgements',
    ]);
  });
});

describe('table checksums', () => {
  it('writes numbers, text and NULL apart from each other', () => {
    expect(canonicalValue(5)).not.toBe(canonicalValue('5'));
    expect(canonicalValue(null)).not.toBe(canonicalValue(''));
    expect(canonicalValue(2.5)).toBe(canonicalValue(25e-1));
    expect(canonicalValue(BigInt(7))).toBe(canonicalValue(7));
    expect(canonicalValue(0)).not.toBe(canonicalValue(-0));
    expect(() => canonicalValue({})).toThrow(/unexpected kind/);
  });

  it('gives the same checksum for the same rows whatever order they were written in, and another when one value differs', async (context) => {
    const first = await openTestClinic('sqlite', context, { migrations: [] });
    const second = await openTestClinic('sqlite', context, { migrations: [] });
    await makeTricky(first, [0, 1, 2, 3, 4, 5, 6, 7]);
    await makeTricky(second, [7, 6, 5, 4, 3, 2, 1, 0]);
    const sum = await tableChecksum(first, await trickyShape(first));
    expect(sum.rows).toBe(trickyRows.length);
    expect(await tableChecksum(second, await trickyShape(second))).toEqual(sum);

    // One value in one row: 2.5 becomes 2.5000000000000004 (the next double up).
    await sql`UPDATE tricky SET fraction = ${2.5000000000000004} WHERE key = 'Z'`.execute(second.kysely);
    const changed = await tableChecksum(second, await trickyShape(second));
    expect(changed.rows).toBe(sum.rows);
    expect(changed.sha256).not.toBe(sum.sha256);
    // NULL where there was ''.
    await sql`UPDATE tricky SET fraction = 2.5, note = NULL WHERE key = 'B'`.execute(second.kysely);
    expect((await tableChecksum(second, await trickyShape(second))).sha256).not.toBe(sum.sha256);
  });

  it('reads a large table in pages, every row once, in key order', async (context) => {
    const db = await openTestClinic('sqlite', context, { migrations: [] });
    await sql`CREATE TABLE numbers (id integer PRIMARY KEY, doubled integer NOT NULL)`.execute(db.kysely);
    const handle = db.sqlite;
    if (handle === null) throw new Error('SQLite expected');
    const insert = handle.prepare('INSERT INTO numbers (id, doubled) VALUES (?, ?)');
    handle.transaction(() => {
      for (let id = 1; id <= 1234; id += 1) insert.run(id * 3, id * 6);
    })();
    const shape = (await describeClinicTables(db)).tables.find((table) => table.name === 'numbers');
    if (shape === undefined) throw new Error('numbers not described');
    const pages: number[] = [];
    const ids: number[] = [];
    for await (const page of tableRows(db, shape, { batchRows: 100 })) {
      pages.push(page.length);
      ids.push(...page.map((row) => row['id'] as number));
    }
    expect(pages.length).toBe(13);
    expect(ids).toEqual(Array.from({ length: 1234 }, (_, index) => (index + 1) * 3));
  });
});

describe('table checksums across the engines', () => {
  it('describes a migrated PostgreSQL clinic as it describes the SQLite one: tables, keys, links, columns', async (context) => {
    const sqlite = await describeClinicTables(await openTestClinic('sqlite', context));
    const postgres = await describeClinicTables(await openTestClinic('postgresql', context));
    const shape = (tables: readonly TableShape[]) =>
      tables.map((table) => ({ ...table, columns: [...table.columns].sort() }));
    expect(shape(postgres.tables)).toEqual(shape(sqlite.tables));
    expect(postgres.searchIndexes.map((table) => table.name)).toEqual(
      sqlite.searchIndexes.map((table) => table.name),
    );
    expect(postgres.derivedNames).toEqual(['patient_search']);
  });

  it('gives SQLite and PostgreSQL the same checksum for the same rows (REAL and double precision, integers, NULLs, text keys in byte order)', async (context) => {
    const sqlite = await openTestClinic('sqlite', context, { migrations: [] });
    const postgres = await openTestClinic('postgresql', context, { migrations: [] });
    await makeTricky(sqlite, [0, 1, 2, 3, 4, 5, 6, 7]);
    await makeTricky(postgres, [3, 1, 7, 5, 0, 2, 6, 4]);
    const onSqlite = await trickyShape(sqlite);
    const onPostgres = await trickyShape(postgres);
    expect(onPostgres).toEqual(onSqlite);
    const keysOf = async (db: Sql, shape: TableShape) => {
      const keys: unknown[] = [];
      for await (const page of tableRows(db, shape, { batchRows: 3 }))
        keys.push(...page.map((row) => row['key']));
      return keys;
    };
    // Byte order (SQLite's BINARY, PostgreSQL's "C"), whatever the server's own collation.
    const expected = trickyRows
      .map((row) => row[0])
      .sort((a, b) => Buffer.compare(Buffer.from(a), Buffer.from(b)));
    expect(await keysOf(sqlite, onSqlite)).toEqual(expected);
    expect(await keysOf(postgres, onPostgres)).toEqual(expected);
    expect(await tableChecksum(postgres, onPostgres)).toEqual(await tableChecksum(sqlite, onSqlite));

    await sql`UPDATE tricky SET whole = 8 WHERE key = 'a b'`.execute(postgres.kysely);
    expect((await tableChecksum(postgres, onPostgres)).sha256).not.toBe(
      (await tableChecksum(sqlite, onSqlite)).sha256,
    );
  });
});
