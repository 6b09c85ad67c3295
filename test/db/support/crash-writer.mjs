// Child process of the crash-safety test: appends procedure entries to a Tidewing database, one
// row per transaction, and prints each entry's id on stdout only after its commit has returned.
// The parent kills it with SIGKILL at a random moment. Plain JavaScript, so that it runs under
// node without a TypeScript loader; the connection settings mirror db/connection.ts.
import Database from 'better-sqlite3';
import fs from 'node:fs';

const [databaseFile, recordIdText] = process.argv.slice(2);
if (databaseFile === undefined || recordIdText === undefined) {
  process.stderr.write('usage: crash-writer.mjs DATABASE RECORD_ID\n');
  process.exit(2);
}
const recordId = Number(recordIdText);

const db = new Database(databaseFile, { fileMustExist: true });
db.pragma('journal_mode = WAL');
db.pragma('synchronous = FULL');
db.pragma('foreign_keys = ON');
db.pragma('busy_timeout = 5000');

const insert = db.prepare(
  `INSERT INTO procedure_entries (record_id, at, kind, vapor_pct, oxygen_lpm, heart_rate_per_min, breaths_per_min, event_type, event_note, entered_at, entered_by)
   VALUES (@recordId, @at, @kind, @vaporPct, 1, @heartRate, 24, @eventType, @note, @at, 'crash test')`,
);
const addEntry = db.transaction((sequence) => {
  const at = new Date(Date.UTC(2026, 0, 1, 9, 0, 0) + sequence * 1000).toISOString();
  const isEvent = sequence % 7 === 0;
  return Number(
    insert.run({
      recordId,
      at,
      kind: isEvent ? 'event' : 'vitals',
      vaporPct: isEvent ? null : 2 + (sequence % 5) / 10,
      heartRate: isEvent ? null : 250 + (sequence % 50),
      eventType: isEvent ? 'note' : null,
      // Rows of varied length so that commits cross page boundaries at different points.
      note: isEvent ? 'x'.repeat(sequence % 900) : '',
    }).lastInsertRowid,
  );
});

for (let sequence = 0; ; sequence += 1) {
  const id = addEntry(sequence);
  // Synchronous write: the id is reported only once the commit (and its fsync) has returned.
  fs.writeSync(1, `${id}\n`);
}
