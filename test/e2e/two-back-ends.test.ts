import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { checkDatabaseFile, openReadOnly } from '../../db/integrity.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const root = findProjectRoot();
const writerScript = path.join(path.dirname(fileURLToPath(import.meta.url)), 'support', 'racing-writer.mjs');

type WriterResult = { started: boolean; succeeded?: number; failures?: string[]; error?: string };

/** Starts a writer on the folder; resolves once it has opened the database and waits for "go". */
function startWriter(
  dataDirectory: string,
  writes: number,
  label: string,
): Promise<{ child: ChildProcessWithoutNullStreams; result: Promise<WriterResult> }> {
  const child = spawn(process.execPath, [writerScript, root, dataDirectory, String(writes), label]);
  let output = '';
  let errors = '';
  child.stderr.on('data', (chunk: Buffer) => (errors += chunk.toString()));
  const result = new Promise<WriterResult>((resolve, reject) => {
    child.once('close', (code) => {
      const last = output.trim().split('\n').pop() ?? '';
      try {
        resolve(JSON.parse(last) as WriterResult);
      } catch {
        reject(new Error(`writer ${label} exited with ${String(code)}: ${output}${errors}`));
      }
    });
  });
  result.catch(() => undefined);
  return new Promise((resolve, reject) => {
    child.stdout.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      if (output.startsWith('ready\n')) resolve({ child, result });
    });
    void result.then(
      (finished) =>
        reject(new Error(`writer ${label} stopped before it was ready: ${JSON.stringify(finished)}`)),
      reject,
    );
  });
}

describe('two back ends on one data folder', () => {
  it('both open a fresh folder at the same moment, and all 120 racing saves succeed', async () => {
    const data = temporaryFolder('tidewing-race-');
    try {
      // Both start together on an empty folder: they race the migrations too.
      const [first, second] = await Promise.all([
        startWriter(data.folder, 60, 'A'),
        startWriter(data.folder, 60, 'B'),
      ]);
      first.child.stdin.end('go\n');
      second.child.stdin.end('go\n');
      const results = await Promise.all([first.result, second.result]);
      for (const result of results) {
        expect(result.failures).toEqual([]);
        expect(result.succeeded).toBe(60);
      }

      const file = path.join(data.folder, 'tidewing.db');
      expect(checkDatabaseFile(file).status).toBe('ok');
      const opened = openReadOnly(file);
      try {
        const count = (sql: string) => opened.db.prepare(sql).pluck().get() as number;
        // 30 new patients from each writer; 30 corrections on top of each writer's one weight.
        expect(count('SELECT count(*) FROM patients')).toBe(60);
        expect(count('SELECT count(*) FROM weights')).toBe(2 * (1 + 30));
      } finally {
        opened.close();
      }
    } finally {
      data.remove();
    }
  });
});
