import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import pg from 'pg';
import { describe, expect, it, onTestFinished, type TestContext } from 'vitest';
import type { Migration } from '../../db/migrations/index.js';
import {
  checkPostgresConnection,
  describeConnectionFailure,
  openCheckedPostgresClinic,
  PostgresConnectionError,
  type ConnectionFailureKind,
} from '../../db/postgres-checks.js';
import { parsePostgresAddress } from '../../db/postgres-options.js';
import { needPostgres, scratchPostgresDatabase, withDatabase } from '../support/postgres-database.js';
import { temporaryFolder } from '../support/temporary-folder.js';

// A one-table schema: these tests are about connecting, not about the clinic's tables.
const testMigrations: readonly Migration[] = [
  {
    version: 1,
    name: '0001-connection-test',
    sql: 'CREATE TABLE connection_test (id INTEGER PRIMARY KEY)',
    postgresql: 'CREATE TABLE connection_test (id integer PRIMARY KEY)',
  },
];

/** No password file and no PGPASSWORD: only what each test gives. */
const bareEnv = { PGPASSFILE: '/nonexistent/tidewing-pgpass' };

async function failure(promise: Promise<unknown>): Promise<PostgresConnectionError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof PostgresConnectionError) return error;
    throw error;
  }
  throw new Error('expected the connection to be refused');
}

async function closedPort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address !== null ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

function withoutPassword(url: string): string {
  const parsed = new URL(url);
  parsed.password = '';
  return parsed.toString();
}

async function scratch(context: TestContext): Promise<string> {
  const { appUrl } = needPostgres(context);
  const database = await scratchPostgresDatabase(appUrl);
  onTestFinished(database.drop);
  return database.url;
}

describe('checking a PostgreSQL address against the run cluster', () => {
  it('answers the server and schema versions and the address without its password', async (context) => {
    const url = await scratch(context);
    const facts = await checkPostgresConnection(url, {
      source: 'command line',
      env: bareEnv,
      migrations: testMigrations,
    });
    expect(facts.serverVersion).toMatch(/^\d+\.\d+/);
    expect(facts).toMatchObject({ schemaVersion: 0, supportedSchemaVersion: 1 });
    expect(facts.location).not.toContain('tidewing-test-password');
    expect(facts.location).toContain('tidewing_test@127.0.0.1');
  });

  it('opens and migrates with the password from a private password file, and then reports the schema', async (context) => {
    const url = await scratch(context);
    const folder = temporaryFolder('tidewing-pgpass-');
    onTestFinished(folder.remove);
    const passFile = path.join(folder.folder, 'pgpass');
    const address = parsePostgresAddress(url);
    fs.writeFileSync(
      passFile,
      `# the test cluster\n127.0.0.1:${String(address.port)}:*:${address.user}:${address.password ?? ''}\n`,
      { mode: 0o600 },
    );
    const opened = await openCheckedPostgresClinic(withoutPassword(url), {
      source: 'saved',
      env: { PGPASSFILE: passFile },
      migrations: testMigrations,
    });
    onTestFinished(() => opened.clinic.close());
    expect(opened.warnings).toEqual([]);
    expect(opened.clinic.engine).toBe('postgresql');
    const facts = await checkPostgresConnection(withoutPassword(url), {
      source: 'saved',
      env: { PGPASSFILE: passFile },
      migrations: testMigrations,
    });
    expect(facts.schemaVersion).toBe(1);
  });

  it('warns that a password in a typed address is visible to other users', async (context) => {
    const url = await scratch(context);
    const opened = await openCheckedPostgresClinic(url, {
      source: 'command line',
      env: bareEnv,
      migrations: testMigrations,
    });
    onTestFinished(() => opened.clinic.close());
    expect(opened.warnings.join(' ')).toMatch(/Other users of this computer can see it.*password file/);
  });

  it('with sslmode=prefer, connects unencrypted to a server without TLS', async (context) => {
    const url = await scratch(context);
    const facts = await checkPostgresConnection(`${url}?sslmode=prefer`, {
      source: 'command line',
      env: bareEnv,
      migrations: testMigrations,
    });
    expect(facts.schemaVersion).toBe(0);
  });

  const refusals: [
    string,
    ConnectionFailureKind,
    RegExp,
    (urls: { appUrl: string; adminUrl: string; port: number }) => string,
  ][] = [
    [
      'a closed port (server not running)',
      'not running',
      /No database server answered at 127\.0\.0\.1:\d+\. Check that the PostgreSQL server is running/,
      ({ appUrl, port }) => {
        const parsed = new URL(appUrl);
        parsed.port = String(port);
        return parsed.toString();
      },
    ],
    [
      'a wrong password',
      'wrong password',
      /refused role "tidewing_test": the password \(from the address\) is wrong, or the role does not exist/,
      ({ appUrl }) => {
        const parsed = new URL(appUrl);
        parsed.password = 'not-the-password';
        return parsed.toString();
      },
    ],
    [
      'an unknown role',
      'wrong password',
      /refused role "no_such_role"/,
      ({ appUrl }) => {
        const parsed = new URL(appUrl);
        parsed.username = 'no_such_role';
        return parsed.toString();
      },
    ],
    [
      'no password anywhere',
      'no password',
      /asks role "tidewing_test" for a password and none was found\. Put it in the password file \(PGPASSFILE or ~\/\.pgpass\) or in PGPASSWORD/,
      ({ appUrl }) => withoutPassword(appUrl),
    ],
    [
      'a missing database',
      'no database',
      /has no database named "no_such_clinic"\. Check the name in the address, or ask the clinic's IT to create it/,
      ({ appUrl }) => withDatabase(appUrl, 'no_such_clinic'),
    ],
    [
      'sslmode=require on a server without TLS',
      'server has no TLS',
      /does not offer encrypted connections, and the address asks for them \(sslmode=require\)\. Ask the clinic's IT to turn on TLS/,
      ({ appUrl }) => `${appUrl}?sslmode=require`,
    ],
    [
      'a superuser role',
      'superuser',
      /The role "postgres" is a superuser.*refuses to run as a superuser.*docs\/postgresql\.md \("A role for Tidewing"\)/,
      ({ adminUrl }) => adminUrl,
    ],
  ];

  it.for(refusals)(
    'refuses %s with a plain message saying what to do',
    async ([, kind, message, make], context) => {
      const urls = { ...needPostgres(context), port: await closedPort() };
      const url = make(urls);
      const options = { source: 'command line' as const, env: bareEnv, migrations: testMigrations };
      for (const attempt of [checkPostgresConnection, openCheckedPostgresClinic]) {
        const refused = await failure(attempt(url, options));
        expect(refused.kind).toBe(kind);
        expect(refused.message).toMatch(message);
        expect(refused.message).not.toContain('tidewing-test-password');
      }
    },
  );

  it('refuses a schema newer than this Tidewing and leaves the database as found', async (context) => {
    const url = await scratch(context);
    const client = new pg.Client({ connectionString: url });
    client.on('error', () => undefined);
    await client.connect();
    // Ended here, not at the test's end: dropping the database would cut it off first.
    try {
      await client.query(
        'CREATE TABLE tidewing_schema (only_row boolean PRIMARY KEY DEFAULT true, version integer NOT NULL)',
      );
      await client.query('INSERT INTO tidewing_schema (version) VALUES (7)');
      const options = { source: 'command line' as const, env: bareEnv, migrations: testMigrations };
      for (const attempt of [checkPostgresConnection, openCheckedPostgresClinic]) {
        const refused = await failure(attempt(url, options));
        expect(refused.kind).toBe('schema too new');
        expect(refused.message).toMatch(
          /written by a newer version of Tidewing \(schema 7; this version understands up to 1\)\. Install the newer version/,
        );
      }
      const tables = await client.query(
        "SELECT count(*) AS n FROM pg_tables WHERE tablename = 'connection_test'",
      );
      expect(tables.rows[0]).toEqual({ n: 0 });
    } finally {
      await client.end();
    }
  });

  it('refuses a group-readable password file before connecting', async (context) => {
    const url = await scratch(context);
    const folder = temporaryFolder('tidewing-pgpass-');
    onTestFinished(folder.remove);
    const passFile = path.join(folder.folder, 'pgpass');
    fs.writeFileSync(passFile, '*:*:*:*:whatever\n');
    fs.chmodSync(passFile, 0o640);
    const refused = await failure(
      checkPostgresConnection(withoutPassword(url), { source: 'saved', env: { PGPASSFILE: passFile } }),
    );
    expect(refused.kind).toBe('address');
    expect(refused.message).toMatch(/can be read by other users of this computer.*chmod 600/);
  });
});

describe('describeConnectionFailure for failures the loopback cluster cannot produce', () => {
  const plan = {
    address: parsePostgresAddress('postgresql://tidewing@clinic-server:5432/heron_lane?sslmode=verify-full'),
    passwordOrigin: 'password file' as const,
  };
  // Shapes as pg and Node's tls and dns modules raise them.
  const errorWith = (code: string, message: string) => Object.assign(new Error(message), { code });

  it.each<[string, Error, ConnectionFailureKind, RegExp]>([
    [
      'an unknown server name',
      errorWith('ENOTFOUND', 'getaddrinfo ENOTFOUND clinic-server'),
      'unknown host',
      /"clinic-server" is not known on this network/,
    ],
    [
      'an unreachable network',
      errorWith('EHOSTUNREACH', 'connect EHOSTUNREACH'),
      'timeout',
      /could not be reached \(EHOSTUNREACH\)\. Check that this computer is on the clinic network/,
    ],
    [
      "pg's connection timeout",
      new Error('Connection terminated due to connection timeout'),
      'timeout',
      /did not answer in time/,
    ],
    [
      'a server that accepts only TLS',
      errorWith(
        '28000',
        'no pg_hba.conf entry for host "10.0.0.7", user "tidewing", database "heron_lane", no encryption',
      ),
      'server requires TLS',
      /accepts only encrypted connections\. Add sslmode=verify-full/,
    ],
    [
      'a computer pg_hba.conf does not allow',
      errorWith(
        '28000',
        'no pg_hba.conf entry for host "10.0.0.7", user "tidewing", database "heron_lane", SSL encryption',
      ),
      'not allowed',
      /does not accept role "tidewing" on database "heron_lane" from this computer\. Ask the clinic's IT to allow it in pg_hba\.conf/,
    ],
    [
      'a certificate for another name',
      errorWith('ERR_TLS_CERT_ALTNAME_INVALID', "Hostname/IP does not match certificate's altnames"),
      'certificate',
      /certificate is not for "clinic-server", the name in the address \(sslmode=verify-full checks it\)/,
    ],
    [
      'a certificate from an unknown authority',
      errorWith('SELF_SIGNED_CERT_IN_CHAIN', 'self-signed certificate in certificate chain'),
      'certificate',
      /could not be trusted \(SELF_SIGNED_CERT_IN_CHAIN\)\. Check that sslrootcert/,
    ],
    [
      'a full server',
      errorWith('53300', 'sorry, too many clients already'),
      'server busy',
      /cannot take a connection now/,
    ],
  ])('explains %s', (_name, error, kind, message) => {
    const described = describeConnectionFailure(error, plan);
    expect(described.kind).toBe(kind);
    expect(described.message).toMatch(message);
  });
});
