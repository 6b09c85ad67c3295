import type { TidewingDatabase } from '../../db/connection.js';
import { HandlerError } from './handlers.js';

/**
 * Transitional, while the repositories move to the shared query layer: what the handler table
 * gets as its raw SQLite handle when the clinic is on PostgreSQL. Statements can be prepared
 * (the unconverted repositories prepare theirs when the table is built) but running one refuses
 * the request with a plain `unavailable` answer, so the parts already converted work and the rest
 * say so instead of failing on a missing file. Removed with `HandlerContext.db`.
 */
export function sqliteOnlyHandle(location: string): TidewingDatabase {
  const refuse = (): never => {
    throw new HandlerError(
      'unavailable',
      `This part of Tidewing does not work yet with a clinic database on a PostgreSQL server (${location}). Start without --database to use the file in the data folder.`,
    );
  };
  const statement = new Proxy(
    {},
    {
      get: (_target, property) => (property === 'then' ? undefined : refuse),
    },
  );
  const handle = new Proxy(
    {},
    {
      get: (_target, property) => {
        switch (property) {
          case 'prepare':
            return () => statement;
          case 'transaction':
            return () => refuse;
          case 'open':
            return false;
          case 'name':
            return location;
          case 'then':
            return undefined;
          default:
            return refuse;
        }
      },
    },
  );
  return handle as TidewingDatabase;
}
