import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

const root = findProjectRoot();

function sourceFiles(folder: string): string[] {
  return fs
    .readdirSync(folder, { withFileTypes: true })
    .flatMap((entry) =>
      entry.isDirectory()
        ? sourceFiles(path.join(folder, entry.name))
        : entry.name.endsWith('.ts')
          ? [path.join(folder, entry.name)]
          : [],
    );
}

/** The text after the call `transaction(...)` that starts at `start` (the index of its `(`). */
function afterCall(text: string, start: number): string {
  let depth = 0;
  for (let index = start; index < text.length; index += 1) {
    const character = text[index];
    if (character === '(') depth += 1;
    if (character === ')') {
      depth -= 1;
      if (depth === 0) return text.slice(index + 1, index + 40);
    }
  }
  throw new Error('unbalanced parentheses after transaction(');
}

describe('write transactions', () => {
  it('no code in db/ begins a transaction without naming its mode: IMMEDIATE for writes, DEFERRED only for the read-only export', () => {
    // better-sqlite3's db.transaction(fn) names its mode; the query layer's kysely.transaction()
    // gets it from the driver (BEGIN IMMEDIATE on SQLite, see db/clinic-db.ts) and is begun only
    // by writeTransaction and by the PostgreSQL migrations.
    const calls: { file: string; after: string }[] = [];
    for (const file of sourceFiles(path.join(root, 'db'))) {
      const text = fs.readFileSync(file, 'utf8');
      // better-sqlite3's db.transaction(fn); Kysely's transaction() builder (no argument) is
      // begun by the drivers in db/clinic-db.ts (IMMEDIATE on SQLite).
      for (const match of text.matchAll(/\.transaction\(/g))
        calls.push({
          file: path.relative(root, file),
          after: afterCall(text, (match.index ?? 0) + match[0].length - 1),
        });
    }
    // The query layer's builder, `kysely.transaction().execute(...)`: its BEGIN comes from the
    // driver (IMMEDIATE on SQLite). Begun by writeTransaction, the PostgreSQL migrations, the
    // move to PostgreSQL (its target) and the tables' consistent read snapshot.
    const queryLayer = calls.filter((call) =>
      /^\s*\.(execute|setIsolationLevel|setAccessMode)\(/.test(call.after),
    );
    expect(queryLayer.map((call) => call.file).sort()).toEqual([
      path.join('db', 'clinic-db.ts'),
      path.join('db', 'clinic-tables.ts'),
      path.join('db', 'move-to-postgresql.ts'),
      path.join('db', 'postgres-connection.ts'),
      path.join('db', 'postgres-connection.ts'),
    ]);
    // better-sqlite3's db.transaction(fn), which must name its mode: only the SQLite migrations.
    const raw = calls.filter((call) => !queryLayer.includes(call));
    expect(raw.map((call) => call.file).sort()).toEqual([path.join('db', 'connection.ts')]);
    for (const call of raw) {
      const mode = /^\s*\.(immediate|deferred)\(/.exec(call.after)?.[1];
      expect(mode, `${call.file}: transaction(...)${call.after}`).toBeDefined();
      if (mode === 'deferred') expect(call.file).toBe(path.join('db', 'export.ts'));
    }
  });

  it('the back end begins every transaction it runs, at start and for each save, with BEGIN IMMEDIATE', async () => {
    const temp = temporaryFolder();
    const statements: string[] = [];
    const backEnd = startBackEnd({
      dataDirectory: temp.folder,
      appVersion: '9.8.7',
      host: 'browser',
      openOptions: { trace: (sql) => statements.push(sql) },
    });
    cleanups.push(() => {
      backEnd.close();
      temp.remove();
    });
    const meta = { enteredBy: 'RW', reason: '' };
    const created = await backEnd.dispatch('patients:create', {
      values: { name: 'Pip', speciesKey: 'budgerigar', ringId: 'HL-24-117' },
      meta,
    });
    expect(created.ok, JSON.stringify(created)).toBe(true);
    const patientId = created.ok ? (created.value as { id: number }).id : 0;
    const today = new Date().toISOString().slice(0, 10);
    const weighed = await backEnd.dispatch('weights:add', {
      patientId,
      values: { weighedOn: today, massG: 33 },
      meta,
    });
    expect(weighed.ok, JSON.stringify(weighed)).toBe(true);
    const weightId = weighed.ok ? (weighed.value as { id: number }).id : 0;
    const corrected = await backEnd.dispatch('weights:correct', {
      id: weightId,
      values: { weighedOn: today, massG: 34 },
      meta: { enteredBy: 'RW', reason: 'Misread the scale' },
    });
    expect(corrected.ok, JSON.stringify(corrected)).toBe(true);
    const now = new Date();
    const record = await backEnd.dispatch('procedures:create', {
      patientId,
      values: {
        startedAt: new Date(now.getTime() - 60_000).toISOString(),
        procedureName: 'Wing radiograph',
        airway: 'mask',
        circuit: 'nonRebreathing',
        staffInitials: 'RW',
      },
      meta,
    });
    expect(record.ok, JSON.stringify(record)).toBe(true);
    const recordId = record.ok ? (record.value as { id: number }).id : 0;
    const entry = await backEnd.dispatch('entries:add', {
      recordId,
      values: { at: now.toISOString(), kind: 'vitals', heartRatePerMin: 300 },
      meta,
    });
    expect(entry.ok, JSON.stringify(entry)).toBe(true);
    const entryId = entry.ok ? (entry.value as { id: number }).id : 0;
    const voided = await backEnd.dispatch('entries:void', {
      id: entryId,
      meta: { enteredBy: 'RW', reason: 'Wrong bird' },
    });
    expect(voided.ok, JSON.stringify(voided)).toBe(true);

    const begins = statements.filter((sql) => /^\s*BEGIN\b/i.test(sql));
    // Three migrations, the species seeding, the new patient and the weight correction (a new
    // weight is one INSERT, which takes the write lock by itself).
    expect(begins.length).toBeGreaterThanOrEqual(6);
    // The shared query layer writes its BEGIN in lower case.
    expect([...new Set(begins.map((sql) => sql.trim().toUpperCase()))]).toEqual(['BEGIN IMMEDIATE']);
  });
});
