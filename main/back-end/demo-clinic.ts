import { speciesToReference } from '../../app/contract/species-mapping.js';
import { demoClinicName, generateDemoClinic, type DemoClinic } from '../../app/core/evidence/demo-clinic.js';
import { writeTransaction, type ClinicDb } from '../../db/clinic-db.js';
import type { TidewingDatabase } from '../../db/connection.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { createWeightRepository } from '../../db/repositories/weight-repository.js';

/** The seed of the demo clinic: the same clinic at every demo start on the same day. */
export const demoSeed = 20261202;

const demoMeta = { enteredBy: 'DEMO', reason: '' } as const;

/**
 * Fills an empty clinic with the invented demo clinic (`--demo`). A clinic that already holds a
 * patient is left alone: invented birds are never mixed with a clinic's own.
 * @returns the number of procedure records written (0 when the clinic was not empty)
 */
export async function writeDemoClinic(clinic: ClinicDb, now: Date): Promise<number> {
  const db = sqliteHandle(clinic);
  if (createPatientRepository(db).count() > 0) return 0;
  const species = createSpeciesRepository(db).list();
  const demo = generateDemoClinic(demoSeed, now.toISOString().slice(0, 10), {
    species: species.map(speciesToReference),
  });
  return writeDemoRecords(clinic, demo, now);
}

/**
 * The SQLite handle for the repositories not yet on the shared query layer: on SQLite it is the
 * same connection as `clinic`, so their writes join the transaction begun through `clinic`.
 */
function sqliteHandle(clinic: ClinicDb): TidewingDatabase {
  if (clinic.sqlite === null)
    throw new Error('The demo clinic can be written only to an SQLite clinic database for now.');
  return clinic.sqlite;
}

/**
 * Writes a generated demo clinic's patients, weights, records and entries in one transaction.
 * @returns the number of procedure records written
 */
export async function writeDemoRecords(clinic: ClinicDb, demo: DemoClinic, now: Date): Promise<number> {
  const db = sqliteHandle(clinic);
  return writeTransaction(clinic, async () => {
    const patients = createPatientRepository(db);
    const weights = createWeightRepository(db);
    const records = createProcedureRecordRepository(db);
    const entries = createProcedureEntryRepository(db);
    const patientIds = demo.patients.map((patient) => {
      const created = patients.create(
        {
          name: patient.name,
          speciesKey: patient.speciesKey,
          sex: 'unknown',
          hatchDate: null,
          ageText: '',
          ringId: '',
          microchipId: '',
          ownerReference: 'Demo owner (invented)',
          notes: `${demoClinicName}: an invented bird for the demo.`,
        },
        demoMeta,
        now,
      );
      weights.add(
        created.id,
        { weighedOn: patient.weighedOn, massG: patient.massG, bodyCondition: 'ideal', weighedBy: 'DEMO' },
        demoMeta,
        now,
      );
      return created.id;
    });
    for (const record of demo.records) {
      const created = records.create(
        patientIds[record.patientIndex] as number,
        {
          planId: null,
          startedAt: record.startedAt,
          endedAt: record.endedAt,
          asaGrade: 2,
          emergency: false,
          procedureName: record.procedureName,
          fasting: '',
          cropChecked: 'not checked',
          airway: record.airway,
          tubeSizeMm: null,
          tubeType: record.airway === 'endotracheal' ? 'uncuffed' : '',
          circuit: 'nonRebreathing',
          staffInitials: record.staffInitials,
          promptIntervalMin: 5,
        },
        demoMeta,
        now,
      );
      for (const entry of record.entries)
        entries.add(
          created.id,
          { ...entry, etco2Mmhg: null, spo2Pct: null, eventNote: '', drugName: '', drugDose: '' },
          demoMeta,
          now,
        );
    }
    return demo.records.length;
  });
}
