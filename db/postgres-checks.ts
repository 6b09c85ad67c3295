import pg from 'pg';
import type { ClinicDb } from './clinic-db.js';
import { migrations as allMigrations, type Migration } from './migrations/index.js';
import { openPostgresClinic, PostgresSchemaTooNewError } from './postgres-connection.js';
import {
  planPostgresConnection,
  postgresGuide,
  PostgresAddressError,
  type PostgresConnectionPlan,
  type ResolveOptions,
} from './postgres-options.js';

/** What went wrong when connecting, for tests and for screens that want to point at a field. */
export type ConnectionFailureKind =
  | 'address'
  | 'not running'
  | 'unknown host'
  | 'timeout'
  | 'no password'
  | 'wrong password'
  | 'not allowed'
  | 'no database'
  | 'server has no TLS'
  | 'server requires TLS'
  | 'certificate'
  | 'superuser'
  | 'schema too new'
  | 'server busy'
  | 'other';

/** A connection Tidewing could not make or will not use; the message says what happened and what to do. */
export class PostgresConnectionError extends Error {
  readonly kind: ConnectionFailureKind;
  constructor(kind: ConnectionFailureKind, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'PostgresConnectionError';
    this.kind = kind;
  }
}

const tlsCertificateCodes = new Set([
  'SELF_SIGNED_CERT_IN_CHAIN',
  'DEPTH_ZERO_SELF_SIGNED_CERT',
  'UNABLE_TO_VERIFY_LEAF_SIGNATURE',
  'UNABLE_TO_GET_ISSUER_CERT',
  'UNABLE_TO_GET_ISSUER_CERT_LOCALLY',
  'CERT_HAS_EXPIRED',
  'CERT_NOT_YET_VALID',
  'CERT_UNTRUSTED',
]);

/**
 * Turns anything pg, Node or the checks below throw while connecting into one plain message
 * that names the server and says what to do.
 */
export function describeConnectionFailure(
  error: unknown,
  plan: Pick<PostgresConnectionPlan, 'address' | 'passwordOrigin'>,
): PostgresConnectionError {
  if (error instanceof PostgresConnectionError) return error;
  const { address } = plan;
  const where = `${address.host}:${String(address.port)}`;
  const fail = (kind: ConnectionFailureKind, message: string) =>
    new PostgresConnectionError(kind, message, { cause: error });
  if (error instanceof PostgresAddressError) return fail('address', error.message);
  if (error instanceof PostgresSchemaTooNewError) return fail('schema too new', error.message);
  const code = typeof error === 'object' && error !== null ? (error as { code?: unknown }).code : undefined;
  const text = error instanceof Error ? error.message : String(error);
  switch (code) {
    case 'ECONNREFUSED':
      return fail(
        'not running',
        `No database server answered at ${where}. Check that the PostgreSQL server is running and that the server name and port in the address are right; if they are, ask the clinic's IT whether the server listens on the clinic network (listen_addresses) and whether a firewall is in the way.`,
      );
    case 'ENOTFOUND':
    case 'EAI_AGAIN':
      return fail(
        'unknown host',
        `The server name "${address.host}" is not known on this network. Check the spelling in the address, or use the server's IP address.`,
      );
    case 'ETIMEDOUT':
    case 'EHOSTUNREACH':
    case 'ENETUNREACH':
      return fail(
        'timeout',
        `The database server at ${where} could not be reached (${String(code)}). Check that this computer is on the clinic network and that the server is switched on.`,
      );
    case '28P01':
      return plan.passwordOrigin === 'none'
        ? fail(
            'no password',
            `The server asks role "${address.user}" for a password and none was found. Put it in the password file (PGPASSFILE or ~/.pgpass) or in PGPASSWORD; see ${postgresGuide}.`,
          )
        : fail(
            'wrong password',
            `The server refused role "${address.user}": the password (from the ${plan.passwordOrigin}) is wrong, or the role does not exist. Check both with the clinic's IT.`,
          );
    case '28000':
      if (/no encryption/i.test(text))
        return fail(
          'server requires TLS',
          `The server at ${where} accepts only encrypted connections. Add sslmode=verify-full to the address (with sslrootcert= the clinic's root certificate); see ${postgresGuide}.`,
        );
      if (/pg_hba/i.test(text))
        return fail(
          'not allowed',
          `The server at ${where} does not accept role "${address.user}" on database "${address.database}" from this computer. Ask the clinic's IT to allow it in pg_hba.conf; see ${postgresGuide}.`,
        );
      return fail(
        'not allowed',
        `The server refused role "${address.user}" (${text}). Check the role name in the address with the clinic's IT.`,
      );
    case '3D000':
      return fail(
        'no database',
        `The server at ${where} has no database named "${address.database}". Check the name in the address, or ask the clinic's IT to create it; see ${postgresGuide}.`,
      );
    case '53300':
    case '57P03':
      return fail(
        'server busy',
        `The server at ${where} cannot take a connection now (${text}). Try again in a minute; if it persists, tell the clinic's IT.`,
      );
    case 'ERR_TLS_CERT_ALTNAME_INVALID':
      return fail(
        'certificate',
        `The server's certificate is not for "${address.host}", the name in the address (sslmode=verify-full checks it). Use the server name written in its certificate, or ask the clinic's IT for a certificate naming this one.`,
      );
  }
  if (typeof code === 'string' && tlsCertificateCodes.has(code))
    return fail(
      'certificate',
      `The server's certificate could not be trusted (${code}). Check that sslrootcert in the address names the clinic's root certificate file; see ${postgresGuide}.`,
    );
  if (/does not support SSL/i.test(text))
    return fail(
      'server has no TLS',
      `The server at ${where} does not offer encrypted connections, and the address asks for them (sslmode=${address.sslMode}). Ask the clinic's IT to turn on TLS on the server (see ${postgresGuide}); only on a network you trust, sslmode=disable connects unencrypted.`,
    );
  if (/password must be a (non-empty )?string/i.test(text))
    return fail(
      'no password',
      `The server asks role "${address.user}" for a password and none was found. Put it in the password file (PGPASSFILE or ~/.pgpass) or in PGPASSWORD; see ${postgresGuide}.`,
    );
  if (/timeout/i.test(text))
    return fail(
      'timeout',
      `The database server at ${where} did not answer in time. Check that this computer is on the clinic network and that the server is running.`,
    );
  return fail('other', `Could not connect to the database at ${address.display}: ${text}`);
}

/** What a connection check found on the server. */
export type PostgresServerFacts = {
  /** The address without its password. */
  readonly location: string;
  /** `server_version`, e.g. "15.14 (Debian 15.14-0+deb12u1)". */
  readonly serverVersion: string;
  /** The clinic schema's version (0 for an empty database). */
  readonly schemaVersion: number;
  /** The schema version this Tidewing brings its database up to. */
  readonly supportedSchemaVersion: number;
};

async function probe(
  config: pg.PoolConfig,
): Promise<{ superuser: boolean; serverVersion: string; schemaVersion: number }> {
  const client = new pg.Client(config);
  // A connection dropped later would otherwise be an unhandled 'error' event.
  client.on('error', () => undefined);
  try {
    await client.connect();
  } catch (error) {
    // pg leaves the socket open when it gives up during authentication (no password to send);
    // the server's half-authenticated session would hold up DROP/CREATE DATABASE until its timeout.
    await client.end().catch(() => undefined);
    throw error;
  }
  try {
    const role = await client.query<{ rolsuper: boolean }>(
      'SELECT rolsuper FROM pg_roles WHERE rolname = current_user',
    );
    const version = await client.query<{ server_version: string }>('SHOW server_version');
    const table = await client.query<{ found: string | null }>(
      "SELECT to_regclass('tidewing_schema')::text AS found",
    );
    let schemaVersion = 0;
    if (table.rows[0]?.found !== null && table.rows[0] !== undefined) {
      const row = await client.query<{ version: number }>('SELECT version FROM tidewing_schema');
      schemaVersion = row.rows[0]?.version ?? 0;
    }
    return {
      superuser: role.rows[0]?.rolsuper === true,
      serverVersion: version.rows[0]?.server_version ?? 'unknown',
      schemaVersion,
    };
  } finally {
    await client.end();
  }
}

/**
 * Connects once with the plan's settings; for sslmode=prefer a server without TLS is tried
 * again unencrypted (libpq's prefer). Returns the settings that worked and what the server said.
 */
async function connectPlan(
  plan: PostgresConnectionPlan,
): Promise<{ config: pg.PoolConfig; superuser: boolean; serverVersion: string; schemaVersion: number }> {
  try {
    return { config: plan.config, ...(await probe(plan.config)) };
  } catch (error) {
    const message = error instanceof Error ? error.message : '';
    if (plan.address.sslMode !== 'prefer' || !/does not support SSL/i.test(message)) throw error;
    const plain = { ...plan.config, ssl: false };
    return { config: plain, ...(await probe(plain)) };
  }
}

function superuserRefusal(user: string): PostgresConnectionError {
  return new PostgresConnectionError(
    'superuser',
    `The role "${user}" is a superuser on the database server, and Tidewing refuses to run as a superuser (one mistake could damage every database on the server). ` +
      `Create a role with only the rights Tidewing needs, as ${postgresGuide} ("A role for Tidewing") shows, and put that role in the address.`,
  );
}

export type CheckOptions = ResolveOptions & {
  /** Migrations this Tidewing knows; tests pass their own lists. */
  readonly migrations?: readonly Migration[];
  /** The pool's application_name, so this back end can tell its own change notices apart. */
  readonly applicationName?: string;
};

/**
 * Tests an address without changing anything on the server: connects, refuses a superuser role
 * and a schema newer than this Tidewing, and answers the server and schema versions. Every
 * failure is a PostgresConnectionError with a plain message.
 */
export async function checkPostgresConnection(
  text: string,
  options: CheckOptions,
): Promise<PostgresServerFacts> {
  let plan: PostgresConnectionPlan;
  try {
    plan = planPostgresConnection(text, options);
  } catch (error) {
    if (error instanceof PostgresAddressError) throw new PostgresConnectionError('address', error.message);
    throw error;
  }
  const supported = (options.migrations ?? allMigrations).length;
  let found;
  try {
    found = await connectPlan(plan);
  } catch (error) {
    throw describeConnectionFailure(error, plan);
  }
  if (found.superuser) throw superuserRefusal(plan.address.user);
  if (found.schemaVersion > supported)
    throw describeConnectionFailure(
      new PostgresSchemaTooNewError(plan.address.display, found.schemaVersion, supported),
      plan,
    );
  return {
    location: plan.address.display,
    serverVersion: found.serverVersion,
    schemaVersion: found.schemaVersion,
    supportedSchemaVersion: supported,
  };
}

/** An opened PostgreSQL clinic and what the checks before it found. */
export type CheckedPostgresClinic = {
  readonly clinic: ClinicDb;
  readonly serverVersion: string;
  readonly warnings: readonly string[];
  readonly location: string;
  /** The connection settings the pool uses (password resolved), for a listening connection. */
  readonly config: pg.PoolConfig;
};

/**
 * Opens a clinic database on a PostgreSQL server for the app: the address and password are
 * resolved (see `planPostgresConnection`), one connection checks the server (refusing a
 * superuser role before anything is written), then `openPostgresClinic` migrates the schema
 * (refusing a newer one). Every failure is a PostgresConnectionError with a plain message.
 */
export async function openCheckedPostgresClinic(
  text: string,
  options: CheckOptions,
): Promise<CheckedPostgresClinic> {
  let plan: PostgresConnectionPlan;
  try {
    plan = planPostgresConnection(text, options);
  } catch (error) {
    if (error instanceof PostgresAddressError) throw new PostgresConnectionError('address', error.message);
    throw error;
  }
  let found;
  try {
    found = await connectPlan(plan);
  } catch (error) {
    throw describeConnectionFailure(error, plan);
  }
  if (found.superuser) throw superuserRefusal(plan.address.user);
  try {
    const clinic = await openPostgresClinic(plan.address.display, {
      ...(options.migrations === undefined ? {} : { migrations: options.migrations }),
      pool: {
        ...found.config,
        ...(options.applicationName === undefined ? {} : { application_name: options.applicationName }),
      },
    });
    return {
      clinic,
      config: found.config,
      serverVersion: found.serverVersion,
      warnings: plan.warnings,
      location: plan.address.display,
    };
  } catch (error) {
    throw describeConnectionFailure(error, plan);
  }
}
