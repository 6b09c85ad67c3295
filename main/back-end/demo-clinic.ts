import { speciesToReference } from '../../app/contract/species-mapping.js';
import { defaultClinicSettings } from '../../app/contract/settings.js';
import { demoClinicName, generateDemoClinic, type DemoClinic } from '../../app/core/evidence/demo-clinic.js';
import { writeTransaction, type Sql } from '../../db/clinic-db.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { createSettingsRepository } from '../../db/repositories/settings-repository.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { createWeightRepository } from '../../db/repositories/weight-repository.js';

/** The seed of the demo clinic: the same clinic at every demo start on the same day. */
export const demoSeed = 20261202;

/** Who entered the demo's rows: no one of the clinic. */
export const demoEnteredBy = 'DEMO';
/** The owner reference of every invented bird; with `demoEnteredBy`, how the demo's birds are known. */
export const demoOwnerReference = 'Demo owner (invented)';

const demoMeta = { enteredBy: demoEnteredBy, reason: '' } as const;

/**
 * Fills an empty clinic with the invented demo clinic (`--demo`, or the demo chosen on the first
 * start through `demo-clinic:create`), and names the clinic as the invented demo clinic when it
 * has no name yet. A clinic that already holds a patient is left alone: invented birds are never
 * mixed with a clinic's own.
 * @returns the number of procedure records written (0 when the clinic was not empty)
 */
export async function writeDemoClinic(clinic: Sql, now: Date): Promise<number> {
  if ((await createPatientRepository(clinic).count()) > 0) return 0;
  const species = await createSpeciesRepository(clinic).list();
  const demo = generateDemoClinic(demoSeed, now.toISOString().slice(0, 10), {
    species: species.map(speciesToReference),
  });
  // Asked again inside the write: another workstation may have added a bird meanwhile.
  return writeTransaction(clinic, async (tx) => {
    if ((await createPatientRepository(tx).count()) > 0) return 0;
    const written = await writeDemoRecords(tx, demo, now);
    const settings = createSettingsRepository(tx);
    if ((await settings.get()).settings === null)
      await settings.save({ ...defaultClinicSettings, clinicName: demoClinicName }, now);
    return written;
  });
}

/**
 * Writes a generated demo clinic's patients, weights, records and entries in one transaction.
 * @returns the number of procedure records written
 */
export async function writeDemoRecords(clinic: Sql, demo: DemoClinic, now: Date): Promise<number> {
  return writeTransaction(clinic, async (tx) => {
    const patients = createPatientRepository(tx);
    const weights = createWeightRepository(tx);
    const records = createProcedureRecordRepository(tx);
    const entries = createProcedureEntryRepository(tx);
    const patientIds: number[] = [];
    for (const patient of demo.patients) {
      const created = await patients.create(
        {
          name: patient.name,
          speciesKey: patient.speciesKey,
          sex: 'unknown',
          hatchDate: null,
          ageText: '',
          ringId: '',
          microchipId: '',
          ownerReference: demoOwnerReference,
          notes: `${demoClinicName}: an invented bird for the demo.`,
        },
        demoMeta,
        now,
      );
      await weights.add(
        created.id,
        {
          weighedOn: patient.weighedOn,
          massG: patient.massG,
          bodyCondition: 'ideal',
          weighedBy: demoEnteredBy,
        },
        demoMeta,
        now,
      );
      patientIds.push(created.id);
    }
    for (const record of demo.records) {
      const created = await records.create(
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
          agent: record.agent,
          staffInitials: record.staffInitials,
          promptIntervalMin: 5,
        },
        demoMeta,
        now,
      );
      for (const entry of record.entries)
        await entries.add(
          created.id,
          { ...entry, etco2Mmhg: null, spo2Pct: null, eventNote: '', drugName: '', drugDose: '' },
          demoMeta,
          now,
        );
    }
    return demo.records.length;
  });
}
