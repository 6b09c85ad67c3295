import type { DemoClinicStatus } from '../../app/contract/demo-clinic-channels.js';
import { demoClinicName, demoClinicSize } from '../../app/core/evidence/demo-clinic.js';
import type { ClinicDb } from '../../db/clinic-db.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createSettingsRepository } from '../../db/repositories/settings-repository.js';
import { demoEnteredBy, demoOwnerReference, writeDemoClinic } from './demo-clinic.js';
import { HandlerError, type HandlerTable } from './handlers.js';

type DemoClinicHandlers = Pick<HandlerTable, 'demo-clinic:status' | 'demo-clinic:create'>;

/** Why the demo clinic was not written, and how to see it anyway. */
export function demoRefusedMessage(patientCount: number): string {
  const patients = `${String(patientCount)} patient${patientCount === 1 ? '' : 's'}`;
  return `The demo clinic was not written: this clinic already holds ${patients}, and the demo's invented birds are never mixed with a clinic's own. To explore the demo, start Tidewing on a new, empty data folder (npm start -- --data FOLDER) and choose the demo clinic on its first start.`;
}

/** The demo clinic as a first-start choice: its status, and the write (one implementation, `writeDemoClinic`). */
export function createDemoClinicHandlers(
  now: () => Date,
  clinic: ClinicDb,
  dataDirectory: string,
): DemoClinicHandlers {
  const patients = createPatientRepository(clinic);
  const status = async (): Promise<DemoClinicStatus> => ({
    patientCount: await patients.count(),
    demoPatientCount: await patients.countFirstEntered(demoEnteredBy, demoOwnerReference),
    engine: clinic.engine,
    dataDirectory,
    demo: { name: demoClinicName, ...demoClinicSize },
  });
  return {
    'demo-clinic:status': status,
    'demo-clinic:create': async () => {
      const before = await patients.count();
      if (before > 0) throw new HandlerError('conflict', demoRefusedMessage(before));
      const recordsWritten = await writeDemoClinic(clinic, now());
      // Another workstation added a bird between the question and the write.
      if (recordsWritten === 0)
        throw new HandlerError('conflict', demoRefusedMessage(await patients.count()));
      return {
        recordsWritten,
        status: await status(),
        settings: await createSettingsRepository(clinic).get(),
      };
    },
  };
}
