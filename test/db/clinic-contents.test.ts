import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { speciesReference } from '../../app/core/species-reference.js';
import { clinicContentsOfFile } from '../../db/clinic-contents.js';
import { sqliteClinicDb } from '../../db/clinic-db.js';
import { openDatabase } from '../../db/connection.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { addPatientAndRecord, enteredAt, sha256 } from './support/record-fixture.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

function folder(): string {
  const temp = temporaryFolder('tidewing-contents-');
  cleanups.push(temp.remove);
  return temp.folder;
}

describe('clinicContentsOfFile', () => {
  it('counts what the clinic entered, not the species reference Tidewing seeds, and reads only', async () => {
    const file = path.join(folder(), 'tidewing.db');
    const db = openDatabase(file);
    const species = createSpeciesRepository(sqliteClinicDb(db));
    await species.seedReference(speciesReference, new Date('2026-01-01T00:00:00Z'));
    db.close();
    const empty = clinicContentsOfFile(file);
    expect(empty?.recordCount).toBe(0);
    expect(empty?.latestRecordAt).toBeNull();
    expect(empty?.tableCount).toBeGreaterThan(5);

    const writer = openDatabase(file);
    // One patient (a patient row and its first version) and one record (row and version).
    addPatientAndRecord(writer);
    const budgerigar = await createSpeciesRepository(sqliteClinicDb(writer)).get('budgerigar');
    if (budgerigar === null) throw new Error('the seeded reference lacks the budgerigar');
    await createSpeciesRepository(sqliteClinicDb(writer)).correct(
      'budgerigar',
      { ...budgerigar.values, massMaxG: 60 },
      { enteredBy: 'MK', reason: 'Exhibition birds' },
      new Date('2026-02-01T10:00:00.000Z'),
    );
    writer.close();
    const before = sha256(file);
    expect(clinicContentsOfFile(file)).toMatchObject({
      recordCount: 5,
      latestRecordAt: '2026-02-01T10:00:00.000Z',
    });
    expect(enteredAt < '2026-02-01T10:00:00.000Z').toBe(true);
    expect(sha256(file)).toBe(before);
    expect(fs.readdirSync(path.dirname(file))).toEqual(['tidewing.db']);
  });

  it('reports an empty file as holding no tables, and a file that is not a database as unreadable', () => {
    const base = folder();
    const empty = path.join(base, 'empty.db');
    fs.writeFileSync(empty, '');
    expect(clinicContentsOfFile(empty)).toEqual({ tableCount: 0, recordCount: 0, latestRecordAt: null });
    const text = path.join(base, 'notes.db');
    fs.writeFileSync(text, 'Weighed Pip: 33 g. '.repeat(400));
    expect(clinicContentsOfFile(text)).toBeNull();
  });
});
