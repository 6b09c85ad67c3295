import type { ThemeChoice, Workstation } from '../../app/contract/workstation.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';

type WorkstationRow = { id: string; name: string; theme: ThemeChoice; initials: string; updated_at: string };

/** What a workstation without a saved row shows: its default name, the system theme, no initials. */
export type WorkstationDefaults = { readonly id: string; readonly name: string };

/** All SQL for the workstations table (one row per workstation id, replaced on save). */
export function createWorkstationRepository(db: TidewingDatabase) {
  const select = db.prepare<[string], WorkstationRow>(
    'SELECT id, name, theme, initials, updated_at FROM workstations WHERE id = ?',
  );
  const selectNames = db.prepare<[], { id: string; name: string }>('SELECT id, name FROM workstations');
  const upsert = db.prepare(
    `INSERT INTO workstations (id, name, theme, initials, updated_at)
     VALUES (@id, @name, @theme, @initials, @updatedAt)
     ON CONFLICT (id) DO UPDATE SET
       name = excluded.name, theme = excluded.theme, initials = excluded.initials, updated_at = excluded.updated_at`,
  );

  function get(defaults: WorkstationDefaults): Workstation {
    const row = select.get(defaults.id);
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
    get,
    /** Applies the fields given over the stored ones (or the defaults), in one write transaction. */
    save(
      defaults: WorkstationDefaults,
      change: { readonly name?: string; readonly theme?: ThemeChoice; readonly initials?: string },
      at: Date,
    ): Workstation {
      return writeTransaction(db, () => {
        const current = get(defaults);
        upsert.run({
          id: defaults.id,
          name: change.name ?? current.name,
          theme: change.theme ?? current.theme,
          initials: change.initials ?? current.initials,
          updatedAt: at.toISOString(),
        });
        return get(defaults);
      });
    },
    /** Every saved workstation's name by id. */
    names(): ReadonlyMap<string, string> {
      return new Map(selectNames.all().map((row) => [row.id, row.name]));
    },
  };
}

export type WorkstationRepository = ReturnType<typeof createWorkstationRepository>;
