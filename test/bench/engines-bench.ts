import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { sql } from 'kysely';
import pg from 'pg';
import { seededRandom } from '../../app/core/model/uncertainty.js';
import { sqliteClinicDb, writeTransaction, type ClinicDb } from '../../db/clinic-db.js';
import { openDatabase } from '../../db/connection.js';
import { openPostgresClinic } from '../../db/postgres-connection.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { startTestCluster } from '../support/postgres-cluster.js';
import { median, quantile, type Figure } from './figures.js';
import { generatedPatient, vitals } from './records-bench.js';

const entryWrites = 300;
const patientCount = 50_000;
const searchRepeats = 30;

type EngineFigures = {
  saveMedianMs: number;
  saveP99Ms: number;
  searchMedianMs: number;
  searchWorstMedianMs: number;
};

/** Entry saves and patient search through the same repositories on one open clinic database. */
async function measure(clinic: ClinicDb): Promise<EngineFigures> {
  const meta = { enteredBy: 'bench', reason: '' };
  const at = new Date(Date.UTC(2026, 0, 1, 9, 0, 0));
  const patients = createPatientRepository(clinic);
  const first = await patients.create(generatedPatient(seededRandom(1), 0), meta, at);
  const record = await createProcedureRecordRepository(clinic).create(
    first.id,
    {
      planId: null,
      startedAt: at.toISOString(),
      endedAt: null,
      asaGrade: 2,
      emergency: false,
      procedureName: 'Bench',
      fasting: '',
      cropChecked: 'empty',
      airway: 'mask',
      tubeSizeMm: null,
      tubeType: '',
      circuit: 'nonRebreathing',
      agent: 'isoflurane',
      staffInitials: 'RW',
      promptIntervalMin: 5,
    },
    meta,
    at,
  );
  const entries = createProcedureEntryRepository(clinic);
  const saves: number[] = [];
  for (let sequence = 0; sequence < entryWrites + 20; sequence += 1) {
    const startedAt = performance.now();
    await entries.add(record.id, vitals(sequence), meta, at);
    if (sequence >= 20) saves.push(performance.now() - startedAt);
  }

  const random = seededRandom(20261202);
  const sample: string[] = [];
  await writeTransaction(clinic, async (tx) => {
    const inTransaction = createPatientRepository(tx);
    for (let index = 1; index < patientCount; index += 1) {
      const values = generatedPatient(random, index);
      if (index >= patientCount / 2 && sample.length < 3)
        sample.push(values.name.slice(0, 4), values.ownerReference);
      await inTransaction.create(values, meta, at);
    }
  });
  // Fresh statistics, as autovacuum would have gathered on a clinic's server by the next day.
  if (clinic.engine === 'postgresql') await sql`ANALYZE`.execute(clinic.kysely);
  const medians: number[] = [];
  for (const query of [...sample, 'zu']) {
    const times: number[] = [];
    for (let repeat = 0; repeat < searchRepeats; repeat += 1) {
      const startedAt = performance.now();
      await patients.search(query);
      times.push(performance.now() - startedAt);
    }
    medians.push(median(times.slice(3)));
  }
  return {
    saveMedianMs: median(saves),
    saveP99Ms: quantile(saves, 0.99),
    searchMedianMs: median(medians),
    searchWorstMedianMs: Math.max(...medians),
  };
}

/**
 * The two engines side by side through the same repositories: a procedure log row saved (SQLite
 * WAL with synchronous FULL; PostgreSQL over loopback on a throwaway cluster, fsync on) and
 * patient search over 50,000 patients. Targets: PostgreSQL save within 3x of SQLite's; search
 * under 20 ms on both.
 */
export async function benchEngines(): Promise<Figure[]> {
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tidewing-engines-bench-'));
  const cluster = await startTestCluster({ fsync: true });
  try {
    const sqlite = sqliteClinicDb(openDatabase(path.join(folder, 'tidewing.db')));
    const onSqlite = await measure(sqlite);
    await sqlite.close();
    const admin = new pg.Client({ connectionString: cluster.appUrl });
    await admin.connect();
    await admin.query('CREATE DATABASE tidewing_engines');
    await admin.end();
    const url = new URL(cluster.appUrl);
    url.pathname = '/tidewing_engines';
    const postgres = await openPostgresClinic(url.toString());
    const onPostgres = await measure(postgres);
    await postgres.close();
    return [
      { name: 'entry save, SQLite, median', value: onSqlite.saveMedianMs, unit: 'ms' },
      { name: 'entry save, SQLite, p99', value: onSqlite.saveP99Ms, unit: 'ms' },
      { name: 'entry save, PostgreSQL loopback, median', value: onPostgres.saveMedianMs, unit: 'ms' },
      { name: 'entry save, PostgreSQL loopback, p99', value: onPostgres.saveP99Ms, unit: 'ms' },
      {
        name: 'entry save, PostgreSQL / SQLite',
        value: onPostgres.saveMedianMs / onSqlite.saveMedianMs,
        unit: 'x',
        note: 'target <= 3',
      },
      { name: 'patient search, SQLite, median of queries', value: onSqlite.searchMedianMs, unit: 'ms' },
      {
        name: 'patient search, SQLite, slowest query',
        value: onSqlite.searchWorstMedianMs,
        unit: 'ms',
        note: 'target < 20',
      },
      { name: 'patient search, PostgreSQL, median of queries', value: onPostgres.searchMedianMs, unit: 'ms' },
      {
        name: 'patient search, PostgreSQL, slowest query',
        value: onPostgres.searchWorstMedianMs,
        unit: 'ms',
        note: 'target < 20',
      },
    ];
  } finally {
    cluster.stop();
    fs.rmSync(folder, { recursive: true, force: true });
  }
}
