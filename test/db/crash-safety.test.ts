import { seededRandom } from '../../app/core/model/uncertainty.js';
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../../db/connection.js';
import { checkDatabaseFile } from '../../db/integrity.js';
import { addPatientAndRecord, fixtureFolder, type Fixture } from './support/record-fixture.js';

const writerScript = path.join(path.dirname(fileURLToPath(import.meta.url)), 'support', 'crash-writer.mjs');
const runs = 20;

type WriterRun = { reportedIds: number[]; stderr: string; signal: NodeJS.Signals | null };

/** Starts the writer, waits for its first committed entry, then kills it after `delayMs`. */
function runWriterAndKill(databaseFile: string, recordId: number, delayMs: number): Promise<WriterRun> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [writerScript, databaseFile, String(recordId)], {
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    let killScheduled = false;
    // Only if the writer never reports a commit; the test then fails on its empty report.
    const failsafe = setTimeout(() => child.kill('SIGKILL'), 20_000);
    child.stdout.setEncoding('utf8');
    child.stderr.setEncoding('utf8');
    child.stdout.on('data', (chunk: string) => {
      stdout += chunk;
      if (!killScheduled && stdout.includes('\n')) {
        killScheduled = true;
        setTimeout(() => child.kill('SIGKILL'), delayMs);
      }
    });
    child.stderr.on('data', (chunk: string) => {
      stderr += chunk;
    });
    child.once('error', reject);
    child.once('close', (_code, signal) => {
      clearTimeout(failsafe);
      // A line cut off by the kill was never fully reported; only whole lines count.
      const whole = stdout.slice(0, stdout.lastIndexOf('\n') + 1);
      resolve({
        reportedIds: whole
          .split('\n')
          .filter((line) => line !== '')
          .map(Number),
        stderr,
        signal,
      });
    });
  });
}

describe('a writer killed with SIGKILL in the middle of a stream of entries', () => {
  let fixture: Fixture;
  let recordId: number;
  beforeAll(() => {
    fixture = fixtureFolder();
    const db = openDatabase(fixture.databaseFile);
    recordId = addPatientAndRecord(db);
    db.close();
  });
  afterAll(() => fixture.remove());

  it(`leaves, ${runs} times over, a database that opens, passes integrity_check and holds every committed entry`, async () => {
    const random = seededRandom(20261202);
    const reportedSoFar = new Set<number>();
    const committedPerRun: number[] = [];
    for (let run = 0; run < runs; run += 1) {
      const delayMs = Math.floor(random() * 150);
      const result = await runWriterAndKill(fixture.databaseFile, recordId, delayMs);
      expect(result.signal, `run ${run}`).toBe('SIGKILL');
      expect(result.stderr, `run ${run}`).toBe('');
      expect(result.reportedIds.length, `run ${run}: the writer committed before the kill`).toBeGreaterThan(
        0,
      );
      result.reportedIds.forEach((id) => reportedSoFar.add(id));

      const db = openDatabase(fixture.databaseFile);
      try {
        expect(db.pragma('integrity_check', { simple: true }), `run ${run}`).toBe('ok');
        expect(db.pragma('foreign_key_check'), `run ${run}`).toEqual([]);
        const present = new Set(db.prepare('SELECT id FROM procedure_entries').pluck().all() as number[]);
        const lost = [...reportedSoFar].filter((id) => !present.has(id));
        expect(lost, `run ${run} (kill after ${delayMs} ms): committed entries missing`).toEqual([]);
        // At most the one row whose commit returned just before the kill went unreported.
        const unreported = [...present].filter((id) => !reportedSoFar.has(id));
        expect(unreported.length, `run ${run}`).toBeLessThanOrEqual(1);
        unreported.forEach((id) => reportedSoFar.add(id));
        committedPerRun.push(result.reportedIds.length);
      } finally {
        db.close();
      }
    }
    expect(checkDatabaseFile(fixture.databaseFile).ok).toBe(true);
    if (process.env['TIDEWING_REPORT_CRASH_TEST'] === '1')
      process.stderr.write(`entries reported per run: ${committedPerRun.join(' ')}\n`);
  }, 60_000);
});
