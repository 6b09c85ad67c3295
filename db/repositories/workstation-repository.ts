import type { ThemeChoice, Workstation } from '../../app/contract/workstation.js';
import { writeTransaction, type Sql } from '../clinic-db.js';

type WorkstationRow = { id: string; name: string; theme: ThemeChoice; initials: string; updated_at: string };

type Tables = { workstations: WorkstationRow };

/** What a workstation without a saved row shows: its default name, the system theme, no initials. */
export type WorkstationDefaults = { readonly id: string; readonly name: string };

/** All SQL for the workstations table (one row per workstation id, replaced on save). */
export function createWorkstationRepository(sql: Sql) {
  async function get(defaults: WorkstationDefaults, on: Sql = sql): Promise<Workstation> {
    const row = await on.kysely
      .withTables<Tables>()
      .selectFrom('workstations')
      .select(['id', 'name', 'theme', 'initials', 'updated_at'])
      .where('id', '=', defaults.id)
      .executeTakeFirst();
    if (row === undefined)
      return { id: defaults.id, name: defaults.name, theme: 'system', initials: '', updatedAt: null };
    return {
      id: row.id,
      name: row.name,
      theme: row.theme,
      initials: row.initials,
      updatedAt: row.updated_at,
    };
  }

  return {
    get: (defaults: WorkstationDefaults) => get(defaults),
    /** Applies the fields given over the stored ones (or the defaults), in one write transaction. */
    save(
      defaults: WorkstationDefaults,
      change: { readonly name?: string; readonly theme?: ThemeChoice; readonly initials?: string },
      at: Date,
    ): Promise<Workstation> {
      return writeTransaction(sql, async (tx) => {
        const current = await get(defaults, tx);
        const row = {
          name: change.name ?? current.name,
          theme: change.theme ?? current.theme,
          initials: change.initials ?? current.initials,
          updated_at: at.toISOString(),
        };
        await tx.kysely
          .withTables<Tables>()
          .insertInto('workstations')
          .values({ id: defaults.id, ...row })
          .onConflict((conflict) => conflict.column('id').doUpdateSet(row))
          .execute();
        return get(defaults, tx);
      });
    },
    /** Every saved workstation's name by id. */
    async names(): Promise<ReadonlyMap<string, string>> {
      const rows = await sql.kysely
        .withTables<Tables>()
        .selectFrom('workstations')
        .select(['id', 'name'])
        .execute();
      return new Map(rows.map((row) => [row.id, row.name]));
    },
  };
}

export type WorkstationRepository = ReturnType<typeof createWorkstationRepository>;
