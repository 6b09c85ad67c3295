// Types for the parts of `pgpass` (the .pgpass reader that pg itself depends on) that Tidewing
// uses: the line parser, the field rules and the matcher. The package ships no types.
declare module 'pgpass/lib/helper.js' {
  type PassEntry = {
    host: string;
    port: string;
    database: string;
    user: string;
    password: string;
  };
  type PassConnection = {
    host: string;
    port: number | string;
    database: string;
    user: string;
  };
  const helper: {
    /** One line of a password file (`\:` and `\\` unescaped), or null when it is not a full entry. */
    parseLine(line: string): PassEntry | null;
    /** Whether every field is present and the port is `*` or a whole number. */
    isValidEntry(entry: PassEntry): boolean;
    /** Whether an entry applies to a connection (`*` matches anything). */
    match(connection: PassConnection, entry: PassEntry): boolean;
  };
  export = helper;
}
