import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { writeTransaction, type Sql } from '../../db/clinic-db.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';

type Notes = { notes: { id: number; body: string } };
const notes = (db: Sql) => db.kysely.withTables<Notes>();

describe.each(testEngines)('the shared query layer on %s', (engine) => {
  it('commits a write transaction and rolls one back when it throws', async (context) => {
    const db = await openTestClinic(engine, context, { migrations: [] });
    await sql`CREATE TABLE notes (id integer PRIMARY KEY, body text NOT NULL)`.execute(db.kysely);
    await writeTransaction(db, async (tx) => {
      await notes(tx).insertInto('notes').values({ id: 1, body: 'kept' }).execute();
    });
    await expect(
      writeTransaction(db, async (tx) => {
        await notes(tx).insertInto('notes').values({ id: 2, body: 'lost' }).execute();
        throw new Error('stop');
      }),
    ).rejects.toThrow('stop');
    expect(await notes(db).selectFrom('notes').select(['id', 'body']).orderBy('id').execute()).toEqual([
      { id: 1, body: 'kept' },
    ]);
    const count = await notes(db)
      .selectFrom('notes')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .executeTakeFirstOrThrow();
    expect(count.n).toBe(1);
  });

  it('joins an open transaction instead of nesting one', async (context) => {
    const db = await openTestClinic(engine, context, { migrations: [] });
    await sql`CREATE TABLE notes (id integer PRIMARY KEY, body text NOT NULL)`.execute(db.kysely);
    await expect(
      writeTransaction(db, async (outer) => {
        await notes(outer).insertInto('notes').values({ id: 1, body: 'outer' }).execute();
        await writeTransaction(outer, async (inner) => {
          await notes(inner).insertInto('notes').values({ id: 2, body: 'inner' }).execute();
        });
        throw new Error('stop');
      }),
    ).rejects.toThrow('stop');
    expect(await notes(db).selectFrom('notes').selectAll().execute()).toEqual([]);
  });
});
