import { seededRandom } from '../../app/core/model/uncertainty.js';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import type { PatientValues, ProcedureEntryValues } from '../../app/contract/records.js';
import { backupDatabase } from '../../db/backup.js';
import { sqliteClinicDb, writeTransaction } from '../../db/clinic-db.js';
import { openDatabase } from '../../db/connection.js';
import { checkDatabaseFile } from '../../db/integrity.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { median, quantile, type Figure } from './figures.js';

const entryWrites = 400;
const patientCount = 50_000;
const searchRepeats = 40;

const syllables = [
  'ki',
  'wi',
  'pe',
  'ro',
  'sa',
  'mu',
  'lo',
  'ta',
  'bi',
  'zu',
  'ne',
  'po',
  'ri',
  'ca',
  'do',
  'fe',
  'ga',
  'ho',
  'ju',
  'ly',
];
const speciesKeys = [
  'zebrafinch',
  'canary',
  'budgerigar',
  'lovebird',
  'cockatiel',
  'sunconure',
  'africangrey',
  'amazon',
  'macaw',
  'cockatoo',
  'pigeon',
  'chicken',
  'duck',
  'harrishawk',
  'barnowl',
];

export function generatedPatient(random: () => number, index: number): PatientValues {
  const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)] as T;
  const name = `${pick(syllables)}${pick(syllables)}${pick(syllables)}`;
  return {
    name: `${name.charAt(0).toUpperCase()}${name.slice(1)} ${index}`,
    speciesKey: pick(speciesKeys),
    sex: pick(['female', 'male', 'unknown'] as const),
    hatchDate: null,
    ageText: '',
    ringId: random() < 0.6 ? `NL-${2015 + Math.floor(random() * 10)}-${String(index).padStart(6, '0')}` : '',
    microchipId: random() < 0.4 ? String(900_000_000_000_000 + index * 7919) : '',
    ownerReference: `OWN-${String(Math.floor(random() * 20_000)).padStart(5, '0')}`,
    notes: '',
  };
}

export function vitals(sequence: number): ProcedureEntryValues {
  return {
    at: new Date(Date.UTC(2026, 0, 1, 9, 0, 0) + sequence * 60_000).toISOString(),
    kind: 'vitals',
    vaporPct: 2.5,
    oxygenLpm: 1,
    heartRatePerMin: 280 + (sequence % 40),
    breathsPerMin: 28,
    temperatureC: 40.1,
    etco2Mmhg: null,
    spo2Pct: null,
    eventType: null,
    eventNote: '',
    drugName: '',
    drugDose: '',
  };
}

/**
 * Records figures: a procedure entry written through the repository against a raw prepared
 * INSERT of the same row on the same connection (both WAL, synchronous FULL, so each is one
 * fsync'd commit), interleaved so that disk noise falls on both alike; patient search over
 * 50,000 generated patients; and backup and integrity check of that database.
 */
export async function benchRecords(): Promise<Figure[]> {
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'tidewing-records-bench-'));
  try {
    const db = openDatabase(path.join(folder, 'tidewing.db'));
    const clinic = sqliteClinicDb(db);
    const patients = createPatientRepository(clinic);
    const entries = createProcedureEntryRepository(clinic);
    const meta = { enteredBy: 'bench', reason: '' };
    const at = new Date(Date.UTC(2026, 0, 1, 9, 0, 0));

    const first = await patients.create(generatedPatient(seededRandom(1), 0), meta, at);
    const recordId = Number(
      db
        .prepare('INSERT INTO procedure_records (patient_id, created_at) VALUES (?, ?)')
        .run(first.id, at.toISOString()).lastInsertRowid,
    );
    const raw = db.prepare(
      `INSERT INTO procedure_entries (record_id, corrects_id, voided, at, kind, vapor_pct, oxygen_lpm, heart_rate_per_min, breaths_per_min,
         temperature_c, etco2_mmhg, spo2_pct, event_type, event_note, drug_name, drug_dose, entered_at, entered_by, reason)
       VALUES (@recordId, NULL, 0, @at, @kind, @vaporPct, @oxygenLpm, @heartRatePerMin, @breathsPerMin,
         @temperatureC, @etco2Mmhg, @spo2Pct, @eventType, @eventNote, @drugName, @drugDose, @enteredAt, 'bench', '')`,
    );
    const throughRepository: number[] = [];
    const rawInsert: number[] = [];
    for (let sequence = 0; sequence < entryWrites + 20; sequence += 1) {
      const values = vitals(sequence);
      let startedAt = performance.now();
      await entries.add(recordId, values, meta, at);
      const repositoryMs = performance.now() - startedAt;
      startedAt = performance.now();
      raw.run({ ...values, recordId, enteredAt: at.toISOString() });
      const rawMs = performance.now() - startedAt;
      // The first writes warm the statement cache and the file; they are not the steady state.
      if (sequence >= 20) {
        throughRepository.push(repositoryMs);
        rawInsert.push(rawMs);
      }
    }

    const random = seededRandom(20261202);
    const generateStartedAt = performance.now();
    // Queries are taken from patients half-way through the list, so that each one finds someone.
    const sample: PatientValues[] = [];
    await writeTransaction(clinic, async (tx) => {
      const inTransaction = createPatientRepository(tx);
      for (let index = 1; index < patientCount; index += 1) {
        const values = generatedPatient(random, index);
        if (index >= patientCount / 2 && sample.length < 200) sample.push(values);
        await inTransaction.create(values, meta, at);
      }
    });
    const generateMs = performance.now() - generateStartedAt;

    const withRing = sample.find((values) => values.ringId !== '');
    const withChip = sample.find((values) => values.microchipId !== '');
    const queries = {
      'name fragment (3+ characters, trigram index)': (sample[0]?.name ?? 'kiwi').slice(0, 4),
      'whole ring ID': withRing?.ringId ?? 'NL-2019',
      'last 8 microchip digits': (withChip?.microchipId ?? '9000').slice(-8),
      'owner reference': sample[1]?.ownerReference ?? 'OWN-0',
      'one or two characters (scan)': 'zu',
    };
    const searchFigures: Figure[] = [];
    const allSearches: number[] = [];
    for (const [label, query] of Object.entries(queries)) {
      const times: number[] = [];
      let found = 0;
      for (let repeat = 0; repeat < searchRepeats; repeat += 1) {
        const startedAt = performance.now();
        found = (await patients.search(query)).length;
        times.push(performance.now() - startedAt);
      }
      allSearches.push(...times.slice(3));
      searchFigures.push({
        name: `patient search: ${label}, median`,
        value: median(times.slice(3)),
        unit: 'ms',
        note: `${patientCount} patients, "${query}", ${found} shown (limit 50)`,
      });
    }

    const backupStartedAt = performance.now();
    const backup = await backupDatabase(db, path.join(folder, 'backup.db'), undefined, { verify: 'none' });
    const backupMs = performance.now() - backupStartedAt;
    db.close();
    const checkStartedAt = performance.now();
    const check = checkDatabaseFile(path.join(folder, 'tidewing.db'));
    const checkMs = performance.now() - checkStartedAt;
    const quickStartedAt = performance.now();
    checkDatabaseFile(path.join(folder, 'tidewing.db'), { quick: true });
    const quickMs = performance.now() - quickStartedAt;
    if (!check.ok) throw new Error(`the benchmark database failed its check: ${check.message}`);

    const repositoryMedian = median(throughRepository);
    const rawMedian = median(rawInsert);
    return [
      {
        name: `procedure entry write via repository, median of ${entryWrites}`,
        value: repositoryMedian,
        unit: 'ms',
        note: 'WAL, synchronous FULL: one fsync per entry',
      },
      {
        name: 'procedure entry write via repository, p99',
        value: quantile(throughRepository, 0.99),
        unit: 'ms',
      },
      {
        name: `raw prepared INSERT, median of ${entryWrites}`,
        value: rawMedian,
        unit: 'ms',
        note: 'same row, same connection, interleaved',
      },
      { name: 'raw prepared INSERT, p99', value: quantile(rawInsert, 0.99), unit: 'ms' },
      {
        name: 'entry write ratio repository / raw (medians)',
        value: repositoryMedian / rawMedian,
        unit: 'x',
      },
      { name: `generate ${patientCount} patients (one transaction)`, value: generateMs, unit: 'ms' },
      ...searchFigures,
      { name: 'patient search, p99 over all queries', value: quantile(allSearches, 0.99), unit: 'ms' },
      { name: 'database size with 50,000 patients', value: backup.sizeBytes / (1024 * 1024), unit: 'MB' },
      {
        name: 'online backup of that database',
        value: backupMs,
        unit: 'ms',
        note: 'SQLite backup API, no verify',
      },
      {
        name: 'integrity_check of that database',
        value: checkMs,
        unit: 'ms',
        note: 'checkDatabaseFile, full',
      },
      { name: 'quick_check of that database', value: quickMs, unit: 'ms', note: 'checkDatabaseFile, quick' },
    ];
  } finally {
    fs.rmSync(folder, { recursive: true, force: true });
  }
}
