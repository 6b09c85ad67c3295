import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { ConnectionOptions } from 'node:tls';
import type pg from 'pg';
import pgpass from 'pgpass/lib/helper.js';

/** Where the clinic's PostgreSQL guide lives, named in messages that send the reader there. */
export const postgresGuide = 'docs/postgresql.md';

/**
 * libpq's TLS modes that Tidewing supports. `prefer` (the default, as in libpq): encrypted when
 * the server offers TLS, without checking its certificate, otherwise plain. `require`: encrypted,
 * certificate not checked. `verify-ca`: encrypted, the certificate signed by the trusted root.
 * `verify-full`: as verify-ca, and the certificate names the host in the address.
 */
export const sslModes = ['disable', 'prefer', 'require', 'verify-ca', 'verify-full'] as const;
export type SslMode = (typeof sslModes)[number];

/** Where an address came from; a password written in the address is only accepted from the first two. */
export type AddressSource = 'command line' | 'environment' | 'saved';

/** A PostgreSQL address Tidewing can use, read from `postgresql://user@host:port/dbname?sslmode=...`. */
export type PostgresAddress = {
  readonly host: string;
  readonly port: number;
  readonly database: string;
  readonly user: string;
  /** The password written in the address, if any (see `AddressSource`). */
  readonly password: string | null;
  readonly sslMode: SslMode;
  /** `sslrootcert`: the file of trusted root certificates for verify-ca and verify-full. */
  readonly sslRootCert: string | null;
  /** `connect_timeout` in seconds (10 when not given). */
  readonly connectTimeoutSeconds: number;
  /** The address without its password, for screens, logs and messages. */
  readonly display: string;
};

/** An address or a password file Tidewing cannot use; the message says what to change. */
export class PostgresAddressError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PostgresAddressError';
  }
}

const knownParameters = ['sslmode', 'sslrootcert', 'connect_timeout'] as const;

/**
 * Reads a PostgreSQL address. The user, host and database must be written out (no defaults from
 * the computer's user name), the port defaults to 5432 and sslmode to `prefer`. Parameters other
 * than sslmode, sslrootcert and connect_timeout are refused rather than silently ignored.
 */
export function parsePostgresAddress(text: string): PostgresAddress {
  const trimmed = text.trim();
  let url: URL;
  try {
    url = new URL(trimmed);
  } catch {
    throw new PostgresAddressError(
      'This is not a database address. Write it as postgresql://user@host:5432/database (for example postgresql://tidewing@clinic-server:5432/tidewing?sslmode=verify-full).',
    );
  }
  if (url.protocol !== 'postgresql:' && url.protocol !== 'postgres:')
    throw new PostgresAddressError(
      `A database address starts with postgresql:// (this one starts with ${url.protocol}//).`,
    );
  const host = url.hostname.replace(/^\[(.*)\]$/, '$1');
  if (host === '')
    throw new PostgresAddressError(
      'The address names no server. Write it as postgresql://user@host:5432/database.',
    );
  const user = decodeURIComponent(url.username);
  if (user === '')
    throw new PostgresAddressError(
      'The address names no database role. Write the role before the server: postgresql://tidewing@host:5432/database.',
    );
  const database = decodeURIComponent(url.pathname.replace(/^\//, ''));
  if (database === '' || database.includes('/'))
    throw new PostgresAddressError(
      'The address names no database. Write it after the server: postgresql://user@host:5432/tidewing.',
    );
  const port = url.port === '' ? 5432 : Number(url.port);
  for (const key of url.searchParams.keys()) {
    if (!(knownParameters as readonly string[]).includes(key))
      throw new PostgresAddressError(
        `The address has a setting Tidewing does not use: ${key}. Settings it understands: ${knownParameters.join(', ')}.`,
      );
  }
  const modeText = url.searchParams.get('sslmode') ?? 'prefer';
  if (modeText === 'allow')
    throw new PostgresAddressError(
      'sslmode=allow is not supported: use prefer (encrypted when the server offers it), or verify-full on a clinic network.',
    );
  if (!(sslModes as readonly string[]).includes(modeText))
    throw new PostgresAddressError(`sslmode must be one of ${sslModes.join(', ')}; got "${modeText}".`);
  const sslMode = modeText as SslMode;
  const sslRootCert = url.searchParams.get('sslrootcert');
  const timeoutText = url.searchParams.get('connect_timeout');
  let connectTimeoutSeconds = 10;
  if (timeoutText !== null) {
    const value = Number(timeoutText);
    if (!Number.isInteger(value) || value < 1 || value > 600)
      throw new PostgresAddressError(
        `connect_timeout is a whole number of seconds from 1 to 600; got "${timeoutText}".`,
      );
    connectTimeoutSeconds = value;
  }
  const password = url.password === '' ? null : decodeURIComponent(url.password);
  const shown = new URL(url.toString());
  shown.password = '';
  return {
    host,
    port,
    database,
    user,
    password,
    sslMode,
    sslRootCert,
    connectTimeoutSeconds,
    display: shown.toString(),
  };
}

/** One entry of a password file. */
export type PasswordFileEntry = {
  readonly host: string;
  readonly port: string;
  readonly database: string;
  readonly user: string;
  readonly password: string;
};

/**
 * Reads a password file in the standard format (`host:port:database:username:password`, one a
 * line, `*` matching anything, `\:` and `\\` escaping, `#` starting a comment), with the
 * `pgpass` package's parser. Lines that are not full entries are skipped, as libpq does.
 */
export function parsePasswordFile(text: string): PasswordFileEntry[] {
  const entries: PasswordFileEntry[] = [];
  for (const raw of text.split(/\r?\n/)) {
    const line = raw.trimEnd();
    if (line.trimStart().startsWith('#')) continue;
    const entry = pgpass.parseLine(line);
    if (entry !== null && pgpass.isValidEntry(entry)) entries.push(entry);
  }
  return entries;
}

/** The password of the first entry that matches the address (libpq's rule: the first match wins). */
export function passwordFor(
  entries: readonly PasswordFileEntry[],
  address: Pick<PostgresAddress, 'host' | 'port' | 'database' | 'user'>,
): string | null {
  const connection = {
    host: address.host,
    port: address.port,
    database: address.database,
    user: address.user,
  };
  return entries.find((entry) => pgpass.match(connection, { ...entry }))?.password ?? null;
}

/** The password file libpq would read: PGPASSFILE, else ~/.pgpass (%APPDATA%\postgresql\pgpass.conf on Windows). */
export function passwordFilePath(
  env: NodeJS.ProcessEnv,
  homeDirectory: string = os.homedir(),
  platform: NodeJS.Platform = process.platform,
): string {
  const chosen = env['PGPASSFILE'];
  if (chosen !== undefined && chosen !== '') return chosen;
  if (platform === 'win32') return path.join(env['APPDATA'] ?? homeDirectory, 'postgresql', 'pgpass.conf');
  return path.join(homeDirectory, '.pgpass');
}

/**
 * The entries of the password file, or null when there is none. A file that others may read is
 * refused (libpq ignores it with a warning; Tidewing stops and says how to fix it, so a clinic
 * never runs with a password left open to the computer's other users).
 */
export function readPasswordFile(
  file: string,
  platform: NodeJS.Platform = process.platform,
): PasswordFileEntry[] | null {
  let stat: fs.Stats;
  try {
    stat = fs.statSync(file);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw new PostgresAddressError(`The password file ${file} cannot be read (${(error as Error).message}).`);
  }
  if (!stat.isFile())
    throw new PostgresAddressError(
      `The password file ${file} is not a plain file; put the password file there.`,
    );
  if (platform !== 'win32' && (stat.mode & 0o077) !== 0)
    throw new PostgresAddressError(
      `The password file ${file} can be read by other users of this computer, so Tidewing will not use it. ` +
        `Make it private with: chmod 600 ${file}`,
    );
  return parsePasswordFile(fs.readFileSync(file, 'utf8'));
}

export type PasswordOrigin = 'address' | 'desktop keychain' | 'PGPASSWORD' | 'password file' | 'none';

export type ResolveOptions = {
  readonly source: AddressSource;
  readonly env?: NodeJS.ProcessEnv;
  readonly homeDirectory?: string;
  readonly platform?: NodeJS.Platform;
  /** A password kept by the desktop window (Electron's safeStorage), tried after the address's own. */
  readonly keptPassword?: string | null;
};

/** The pg settings for one address, where its password came from, and warnings for the log. */
export type PostgresConnectionPlan = {
  readonly address: PostgresAddress;
  readonly config: pg.PoolConfig;
  readonly passwordOrigin: PasswordOrigin;
  readonly warnings: readonly string[];
};

/** The warning given when the password is written in the address on the command line or in the environment. */
export const passwordInAddressWarning =
  'The database address holds a password. Other users of this computer can see it (in the list of running programs, and in the shell history). ' +
  `Put it in a password file instead (PGPASSFILE or ~/.pgpass, readable only by you), or in PGPASSWORD; see ${postgresGuide}.`;

function readCertificate(file: string): string {
  try {
    return fs.readFileSync(file, 'utf8');
  } catch (error) {
    throw new PostgresAddressError(
      `The root certificate file ${file} (sslrootcert) cannot be read: ${(error as Error).message}.`,
    );
  }
}

/** pg's TLS settings for a mode; `prefer` starts as `require` and falls back to plain (see `connectPlan`). */
export function tlsSettings(
  address: PostgresAddress,
  homeDirectory: string = os.homedir(),
): boolean | ConnectionOptions {
  switch (address.sslMode) {
    case 'disable':
      return false;
    case 'prefer':
    case 'require':
      return { rejectUnauthorized: false };
    case 'verify-ca':
    case 'verify-full': {
      // libpq's default root file; without one, the computer's trusted authorities.
      const defaultRoot = path.join(homeDirectory, '.postgresql', 'root.crt');
      const rootFile = address.sslRootCert ?? (fs.existsSync(defaultRoot) ? defaultRoot : null);
      const ca = rootFile === null || rootFile === 'system' ? undefined : readCertificate(rootFile);
      return {
        rejectUnauthorized: true,
        ...(ca === undefined ? {} : { ca }),
        // verify-ca trusts any name on a certificate the root signed; verify-full (Node's own check) needs the host.
        ...(address.sslMode === 'verify-ca' ? { checkServerIdentity: () => undefined } : {}),
      };
    }
  }
}

/**
 * Builds the pg settings for an address: the password (from the address when typed on the
 * command line or set in the environment, else the desktop's kept password, PGPASSWORD, or the
 * password file), TLS and the connection timeout. Never reads pg's own environment defaults, so
 * what is used is what the address says.
 */
export function planPostgresConnection(text: string, options: ResolveOptions): PostgresConnectionPlan {
  const address = parsePostgresAddress(text);
  const env = options.env ?? process.env;
  const warnings: string[] = [];
  let password: string | null = null;
  let passwordOrigin: PasswordOrigin = 'none';
  if (address.password !== null) {
    if (options.source === 'saved')
      throw new PostgresAddressError(
        'A saved database address may not hold a password: the data folder is not the place for it. ' +
          `Remove the password from the address and put it in a password file (PGPASSFILE or ~/.pgpass) or in PGPASSWORD; see ${postgresGuide}.`,
      );
    warnings.push(passwordInAddressWarning);
    password = address.password;
    passwordOrigin = 'address';
  } else if (
    options.keptPassword !== undefined &&
    options.keptPassword !== null &&
    options.keptPassword !== ''
  ) {
    password = options.keptPassword;
    passwordOrigin = 'desktop keychain';
  } else if (env['PGPASSWORD'] !== undefined && env['PGPASSWORD'] !== '') {
    password = env['PGPASSWORD'];
    passwordOrigin = 'PGPASSWORD';
  } else {
    const file = passwordFilePath(env, options.homeDirectory, options.platform);
    const entries = readPasswordFile(file, options.platform);
    const found = entries === null ? null : passwordFor(entries, address);
    if (found !== null) {
      password = found;
      passwordOrigin = 'password file';
    }
  }
  const config: pg.PoolConfig = {
    // No connection string: every setting below is explicit, and pg reads no PG* variables for them.
    connectionString: undefined,
    host: address.host,
    port: address.port,
    database: address.database,
    user: address.user,
    // Without a password, a function answering an empty one: given none (or ''), pg would fall
    // back to PGPASSWORD and read the password file itself, past the permission check above.
    // A server that asks for a password then refuses, and the message says none was found.
    password: password ?? (() => ''),
    ssl: tlsSettings(address, options.homeDirectory),
    connectionTimeoutMillis: address.connectTimeoutSeconds * 1000,
    application_name: 'Tidewing',
  };
  return { address, config, passwordOrigin, warnings };
}
