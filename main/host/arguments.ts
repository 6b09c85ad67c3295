export type StartArguments = {
  readonly port: number;
  readonly dataDirectory: string | null;
  readonly open: boolean;
  readonly forceBrowser: boolean;
  /** `--new-clinic`: start an empty clinic although `backups/` holds backups with records. */
  readonly newClinic: boolean;
  /** `--demo`: an empty clinic is filled with the invented demo clinic. */
  readonly demo: boolean;
  /**
   * `--database postgresql://...` or TIDEWING_DATABASE_URL (the option wins): the clinic
   * database on a PostgreSQL server; null for the embedded SQLite file (or the address saved in
   * Settings, which start.ts reads from the data folder).
   */
  readonly database: { readonly url: string; readonly source: 'command line' | 'environment' } | null;
};

/** The environment variable naming a PostgreSQL clinic database. */
export const databaseUrlVariable = 'TIDEWING_DATABASE_URL';

export class ArgumentError extends Error {}

/**
 * Parses `npm start -- [--port N] [--data DIR] [--no-open] [--browser] [--new-clinic] [--demo]
 * [--database postgresql://user@host:port/dbname]`.
 * `--port 0` (the default) takes any free port.
 */
export function parseStartArguments(argv: readonly string[], env: NodeJS.ProcessEnv = {}): StartArguments {
  let port = 0;
  let dataDirectory: string | null = null;
  let open = env['CI'] === undefined || env['CI'] === '' || env['CI'] === 'false';
  let forceBrowser = false;
  let newClinic = false;
  let demo = false;
  const fromEnvironment = env[databaseUrlVariable];
  let database: StartArguments['database'] =
    fromEnvironment === undefined || fromEnvironment.trim() === ''
      ? null
      : { url: fromEnvironment.trim(), source: 'environment' };
  for (let index = 0; index < argv.length; index += 1) {
    const argument = argv[index];
    const next = () => {
      const value = argv[index + 1];
      if (value === undefined || value.startsWith('--'))
        throw new ArgumentError(`${argument} needs a value.`);
      index += 1;
      return value;
    };
    switch (argument) {
      case '--port': {
        const text = next();
        const value = Number(text);
        if (!Number.isInteger(value) || value < 0 || value > 65535)
          throw new ArgumentError(
            `--port must be a whole number from 0 to 65535 (0 = any free port); got "${text}".`,
          );
        port = value;
        break;
      }
      case '--data':
        dataDirectory = next();
        break;
      case '--no-open':
        open = false;
        break;
      case '--browser':
        forceBrowser = true;
        break;
      case '--new-clinic':
        newClinic = true;
        break;
      case '--demo':
        demo = true;
        break;
      case '--database': {
        const url = next();
        if (!/^postgres(ql)?:\/\//.test(url))
          throw new ArgumentError(
            `--database takes a PostgreSQL address, postgresql://user@host:5432/database; got "${url}". Without --database the clinic is the file in the data folder.`,
          );
        database = { url, source: 'command line' };
        break;
      }
      default:
        throw new ArgumentError(
          `Unknown option "${String(argument)}". Options: --port N, --data DIR, --no-open, --browser, --new-clinic, --demo, --database postgresql://user@host:5432/database.`,
        );
    }
  }
  return { port, dataDirectory, open, forceBrowser, newClinic, demo, database };
}
