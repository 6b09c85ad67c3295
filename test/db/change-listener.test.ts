import pg from 'pg';
import { describe, expect, it, onTestFinished } from 'vitest';
import type { ChangeNoticeInput } from '../../app/contract/change-notices.js';
import { changeKinds } from '../../app/contract/change-notices.js';
import {
  backEndApplicationName,
  changeKindOfTable,
  listenerApplicationName,
  listenForChanges,
  noticeFromPayload,
} from '../../db/change-listener.js';
import {
  changeNoticesMigration,
  noticeTablesOnInsert,
  noticeTablesOnWrite,
} from '../../db/migrations/0011-change-notices.js';
import { migrations } from '../../db/migrations/index.js';
import { openPostgresClinic } from '../../db/postgres-connection.js';
import { openTestClinic } from '../support/clinic-engines.js';
import { needPostgres, scratchPostgresDatabase } from '../support/postgres-database.js';

/** Notices as they arrive, and a way to wait for the next few. */
function noticeQueue() {
  const received: ChangeNoticeInput[] = [];
  let waiting: { count: number; resolve: () => void } | null = null;
  return {
    received,
    publish(notice: ChangeNoticeInput) {
      received.push(notice);
      if (waiting !== null && received.length >= waiting.count) waiting.resolve();
    },
    until(count: number): Promise<ChangeNoticeInput[]> {
      if (received.length >= count) return Promise.resolve(received.slice(0, count));
      return new Promise((resolve) => {
        waiting = { count, resolve: () => resolve(received.slice(0, count)) };
      });
    },
  };
}

async function client(url: string, applicationName: string): Promise<pg.Client> {
  const connected = new pg.Client({ connectionString: url, application_name: applicationName });
  await connected.connect();
  onTestFinished(() => connected.end());
  return connected;
}

async function scratch(context: { skip: (note?: string) => never }): Promise<string> {
  const { appUrl } = needPostgres(context);
  const database = await scratchPostgresDatabase(appUrl);
  onTestFinished(database.drop);
  return database.url;
}

describe('reading a change notice payload', () => {
  it('maps every notice table of migration 11 to a change kind', () => {
    const tables = [...noticeTablesOnInsert, ...noticeTablesOnWrite].sort();
    expect(Object.keys(changeKindOfTable).sort()).toEqual(tables);
    for (const kind of Object.values(changeKindOfTable)) expect(changeKinds).toContain(kind);
  });

  it('names each back end apart, within the 63 bytes PostgreSQL keeps of an application_name', () => {
    const a = backEndApplicationName();
    const b = backEndApplicationName();
    expect(a).not.toBe(b);
    expect(Buffer.byteLength(a)).toBeLessThanOrEqual(63);
    expect(a).not.toBe(listenerApplicationName);
  });

  it('reads the ids and who wrote it, and refuses text from no table of ours', () => {
    expect(
      noticeFromPayload('{"table":"plans","patient":2,"plan":5,"day":"2026-12-03","by":"ws-a"}'),
    ).toEqual({
      notice: { kind: 'plans', patientId: 2, planId: 5, plannedFor: '2026-12-03', elsewhere: true },
      by: 'ws-a',
    });
    expect(noticeFromPayload('{"table":"pg_class"}')).toBeNull();
    expect(noticeFromPayload('not json')).toBeNull();
    expect(noticeFromPayload('{"table":"weights","patient":"3"}')).toBeNull();
  });
});

describe('migration 11 on SQLite', () => {
  it('changes nothing in the schema: one writer host publishes its own changes', async (context) => {
    const schemaOf = async (list: typeof migrations) => {
      const db = await openTestClinic('sqlite', context, { migrations: list });
      return db.sqlite?.prepare('SELECT type, name, sql FROM sqlite_schema ORDER BY name').all();
    };
    const index = changeNoticesMigration.version - 1;
    expect(migrations[index]).toBe(changeNoticesMigration);
    const before = await schemaOf(migrations.slice(0, index));
    const after = await schemaOf(migrations.slice(0, index + 1));
    expect(after).toEqual(before);
    expect(before?.length).toBeGreaterThan(20);
  });
});

describe('listening for other workstations’ changes on PostgreSQL', () => {
  it('publishes a notice sent on tidewing_changes by another connection, and not those of its own pool', async (context) => {
    const url = await scratch(context);
    const queue = noticeQueue();
    const logged: string[] = [];
    const listening = listenForChanges(url, (notice) => queue.publish(notice), {
      ownApplicationName: 'tidewing ws-own',
      log: (message) => logged.push(message),
    });
    onTestFinished(() => listening.close());
    await listening.ready;
    const other = await client(url, 'tidewing ws-other');
    const notify = (payload: string) =>
      other.query('SELECT pg_notify($1, $2)', ['tidewing_changes', payload]);
    await notify('{"table":"weights","patient":3,"by":"tidewing ws-own"}');
    await notify('not a notice');
    await notify('{"table":"procedure_entries","record":9,"by":"tidewing ws-other"}');
    expect(await queue.until(1)).toEqual([{ kind: 'procedure-entries', recordId: 9, elsewhere: true }]);
    expect(logged.join('\n')).toContain('not understood');
  });

  it('gets a notice from the trigger of migration 11 for each row added, after its transaction commits', async (context) => {
    const url = await scratch(context);
    const writer = await client(url, 'tidewing ws-other');
    // Stand-ins with the columns the trigger reads (the full tables come from migrations 1 to 10).
    await writer.query(`
      CREATE TABLE species (id integer PRIMARY KEY);
      CREATE TABLE patients (id integer PRIMARY KEY);
      CREATE TABLE patient_versions (id integer PRIMARY KEY, patient_id integer NOT NULL);
      CREATE TABLE weights (id integer PRIMARY KEY, patient_id integer NOT NULL);
      CREATE TABLE plans (id integer PRIMARY KEY, patient_id integer, planned_for text NOT NULL);
      CREATE TABLE plan_choices (id integer PRIMARY KEY, comparison_id integer NOT NULL, chosen_id integer NOT NULL);
      CREATE TABLE procedure_records (id integer PRIMARY KEY, patient_id integer NOT NULL);
      CREATE TABLE procedure_record_versions (id integer PRIMARY KEY, record_id integer NOT NULL);
      CREATE TABLE procedure_entries (id integer PRIMARY KEY, record_id integer NOT NULL);
      CREATE TABLE emergency_drugs (id integer PRIMARY KEY);
      CREATE TABLE evidence_exclusions (id integer PRIMARY KEY, record_id integer NOT NULL);
      CREATE TABLE evidence_calibration_switch (id integer PRIMARY KEY);
      CREATE TABLE safety_acknowledgements (id integer PRIMARY KEY);
      CREATE TABLE clinic_settings (id integer PRIMARY KEY, clinic_name text NOT NULL);
      CREATE TABLE workstations (id text PRIMARY KEY, name text NOT NULL);
    `);
    await writer.query(changeNoticesMigration.postgresql);
    const queue = noticeQueue();
    const listening = listenForChanges(url, (notice) => queue.publish(notice));
    onTestFinished(() => listening.close());
    await listening.ready;

    await writer.query('BEGIN');
    await writer.query('INSERT INTO weights (id, patient_id) VALUES (1, 3)');
    await writer.query('INSERT INTO procedure_entries (id, record_id) VALUES (1, 9)');
    // A notice sent by another connection meanwhile arrives first: the rows above wait for COMMIT.
    const sentinel = await client(url, 'tidewing ws-third');
    await sentinel.query(`SELECT pg_notify('tidewing_changes', '{"table":"safety_acknowledgements"}')`);
    expect(await queue.until(1)).toEqual([{ kind: 'safety', elsewhere: true }]);
    await writer.query('COMMIT');
    await writer.query(`INSERT INTO plans (id, patient_id, planned_for) VALUES (5, 3, '2026-12-03')`);
    await writer.query('INSERT INTO plan_choices (id, comparison_id, chosen_id) VALUES (1, 5, 6)');
    await writer.query('INSERT INTO procedure_records (id, patient_id) VALUES (9, 3)');
    await writer.query(`INSERT INTO clinic_settings (id, clinic_name) VALUES (1, 'A')`);
    await writer.query(`UPDATE clinic_settings SET clinic_name = 'B'`);
    await writer.query(`INSERT INTO workstations (id, name) VALUES ('abcdefgh', 'Theatre 1')`);
    await writer.query('INSERT INTO species (id) VALUES (1)');

    expect(await queue.until(10)).toEqual([
      { kind: 'safety', elsewhere: true },
      { kind: 'weights', patientId: 3, elsewhere: true },
      { kind: 'procedure-entries', recordId: 9, elsewhere: true },
      { kind: 'plans', patientId: 3, planId: 5, plannedFor: '2026-12-03', elsewhere: true },
      { kind: 'plans', planId: 6, elsewhere: true },
      { kind: 'procedure-records', patientId: 3, recordId: 9, elsewhere: true },
      { kind: 'settings', elsewhere: true },
      { kind: 'settings', elsewhere: true },
      { kind: 'workstations', elsewhere: true },
      { kind: 'species', elsewhere: true },
    ]);
    // A rolled-back row sends nothing: the next notice is the one after it.
    await writer.query('BEGIN');
    await writer.query('INSERT INTO weights (id, patient_id) VALUES (2, 4)');
    await writer.query('ROLLBACK');
    await writer.query('INSERT INTO emergency_drugs (id) VALUES (1)');
    expect((await queue.until(11))[10]).toEqual({ kind: 'drugs', elsewhere: true });
  });

  it('gets one notice per row added to the clinic tables of the real schema, none from the derived tables', async (context) => {
    const url = await scratch(context);
    const clinic = await openPostgresClinic(url, { migrations });
    onTestFinished(() => clinic.close());
    const queue = noticeQueue();
    const listening = listenForChanges(url, (notice) => queue.publish(notice));
    onTestFinished(() => listening.close());
    await listening.ready;
    const writer = await client(url, 'tidewing ws-other');
    const at = '2026-12-01T09:30:00.000Z';
    const statements: [string, unknown[]][] = [
      [
        `INSERT INTO species (species_key, origin, common_name, mass_min_g, mass_max_g, mass_basis, entered_at, entered_by)
         VALUES ('testbird', 'clinic', 'Test bird', 10, 20, 'test row', $1, 'RW')`,
        [at],
      ],
      ['INSERT INTO patients (created_at) VALUES ($1)', [at]],
      [
        `INSERT INTO patient_versions (patient_id, name, species_key, sex, entered_at, entered_by)
         VALUES (1, 'Pip', 'testbird', 'female', $1, 'RW')`,
        [at],
      ],
      ['INSERT INTO patient_current (patient_id, version_id) VALUES (1, 1)', []],
      [
        `INSERT INTO weights (patient_id, weighed_on, mass_g, entered_at, entered_by)
         VALUES (1, '2026-12-01', 350, $1, 'RW')`,
        [at],
      ],
      [
        `INSERT INTO plans (patient_id, planned_for, input_json, result_json, model_version, entered_at, entered_by)
         VALUES (1, '2026-12-02', '{}', '{}', 'm1', $1, 'RW')`,
        [at],
      ],
      [
        `INSERT INTO plan_choices (comparison_id, chosen_id, entered_at, entered_by) VALUES (1, 1, $1, 'RW')`,
        [at],
      ],
      ['INSERT INTO procedure_records (patient_id, created_at) VALUES (1, $1)', [at]],
      [
        `INSERT INTO procedure_record_versions (record_id, plan_id, started_at, procedure_name, airway, circuit, staff_initials, entered_at, entered_by)
         VALUES (1, 1, $1, 'Wing radiographs', 'mask', 'nonRebreathing', 'RW', $1, 'RW')`,
        [at],
      ],
      [
        `INSERT INTO procedure_entries (record_id, at, kind, heart_rate_per_min, entered_at, entered_by)
         VALUES (1, $1, 'vitals', 280, $1, 'RW')`,
        [at],
      ],
      [
        `INSERT INTO emergency_drugs (name, concentration_mg_per_ml, dose_low_mg_per_kg, route, dose_source, entered_at, entered_by)
         VALUES ('Drug A', 1, 1, 'IV', 'Clinic protocol 2026', $1, 'RW')`,
        [at],
      ],
      [
        `INSERT INTO evidence_exclusions (record_id, excluded, reason, entered_at, entered_by)
         VALUES (1, 1, 'premedicated', $1, 'RW')`,
        [at],
      ],
      [
        `INSERT INTO evidence_calibration_switch (calibration_on, entered_at, entered_by) VALUES (0, $1, 'RW')`,
        [at],
      ],
      [
        `INSERT INTO safety_acknowledgements (acknowledged_at, app_version, acknowledged_by) VALUES ($1, '1.0.0', 'RW')`,
        [at],
      ],
      [
        `INSERT INTO clinic_settings (id, clinic_name, address_line, mass_unit, pressure_unit, temperature_unit, default_agent, paper_size, updated_at)
         VALUES (1, 'A', '', 'g', 'mmHg', 'C', 'isoflurane', 'A4', $1)`,
        [at],
      ],
      [
        `INSERT INTO workstations (id, name, theme, initials, updated_at) VALUES ('abcdefgh', 'Theatre 1', 'dim', 'RW', $1)`,
        [at],
      ],
    ];
    for (const [text, values] of statements) await writer.query(text, values);
    expect(await queue.until(statements.length - 1)).toEqual([
      { kind: 'species', elsewhere: true },
      { kind: 'patients', patientId: 1, elsewhere: true },
      { kind: 'patients', patientId: 1, elsewhere: true },
      { kind: 'weights', patientId: 1, elsewhere: true },
      { kind: 'plans', patientId: 1, planId: 1, plannedFor: '2026-12-02', elsewhere: true },
      { kind: 'plans', planId: 1, elsewhere: true },
      { kind: 'procedure-records', patientId: 1, recordId: 1, elsewhere: true },
      { kind: 'procedure-records', recordId: 1, elsewhere: true },
      { kind: 'procedure-entries', recordId: 1, elsewhere: true },
      { kind: 'drugs', elsewhere: true },
      { kind: 'evidence', recordId: 1, elsewhere: true },
      { kind: 'evidence', elsewhere: true },
      { kind: 'safety', elsewhere: true },
      { kind: 'settings', elsewhere: true },
      { kind: 'workstations', elsewhere: true },
    ]);
  });

  it('reconnects when its connection is cut, then tells every screen to refresh and carries on', async (context) => {
    const url = await scratch(context);
    const queue = noticeQueue();
    const logged: string[] = [];
    let listens = 0;
    let relistened: () => void = () => undefined;
    const again = new Promise<void>((resolve) => {
      relistened = resolve;
    });
    const listening = listenForChanges(url, (notice) => queue.publish(notice), {
      firstDelayMs: 10,
      log: (message) => logged.push(message),
      onListening: () => {
        listens += 1;
        if (listens === 2) relistened();
      },
    });
    onTestFinished(() => listening.close());
    await listening.ready;
    const other = await client(url, 'tidewing ws-other');
    // As a server restart does: the listener's backend is terminated.
    const cut = await other.query<{ cut: boolean }>(
      'SELECT pg_terminate_backend(pid) AS cut FROM pg_stat_activity WHERE application_name = $1 AND datname = current_database()',
      [listenerApplicationName],
    );
    expect(cut.rows.map((row) => row.cut)).toEqual([true]);
    await again;
    expect(logged.join('\n')).toContain('reconnecting');
    expect(queue.received.map((notice) => notice.kind).sort()).toEqual([...changeKinds].sort());
    await other.query('SELECT pg_notify($1, $2)', ['tidewing_changes', '{"table":"weights","patient":4}']);
    expect((await queue.until(changeKinds.length + 1)).at(-1)).toEqual({
      kind: 'weights',
      patientId: 4,
      elsewhere: true,
    });
  });
});
