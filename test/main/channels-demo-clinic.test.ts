/**
 * The demo clinic chosen on the first start (`demo-clinic:status`, `demo-clinic:create`), on both
 * engines: written once into an empty clinic by the same `writeDemoClinic` as `--demo`, the
 * clinic named as the invented demo clinic when it had no name, and refused while the clinic
 * holds any patient. The demo clinic and its birds are invented.
 */
import { sql } from 'kysely';
import { describe, expect, it, onTestFinished } from 'vitest';
import type { ResponseOf } from '../../app/contract/channels.js';
import { changeNoticesFor } from '../../app/contract/change-notices.js';
import { defaultClinicSettings } from '../../app/contract/settings.js';
import { demoClinicName, demoClinicSize } from '../../app/core/evidence/demo-clinic.js';
import { speciesReference } from '../../app/core/species-reference.js';
import type { ClinicDb, Engine } from '../../db/clinic-db.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { createBackEndParts, createDispatcher } from '../../main/back-end/handlers.js';
import { writeDemoClinic } from '../../main/back-end/demo-clinic.js';
import { enteredByRw, pipValues } from '../support/clinic-birds.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const now = new Date('2026-12-01T09:30:00.000Z');
/** What the screens are told the demo holds: six invented species (app/core/evidence/demo-clinic.ts). */
const demo = {
  name: 'Fernbrook Avian Practice (demo, invented)',
  birds: 28,
  species: 6,
  records: 60,
  days: 180,
};

describe.each(testEngines)('the demo clinic as a first-start choice on %s', (engine: Engine) => {
  /** A fresh clinic with the species reference seeded (as every start does), behind the dispatcher. */
  async function clinicBehindDispatcher(
    context: { skip: (note?: string) => never },
    evidenceBackfillMode: 'manual' | 'automatic' = 'manual',
  ) {
    const clinic = await openTestClinic(engine, context);
    await createSpeciesRepository(clinic).seedReference(speciesReference, now);
    const temp = temporaryFolder('tidewing-demo-choice-');
    onTestFinished(temp.remove);
    const { handlers, evidenceBackfill } = createBackEndParts({
      clinic,
      appVersion: '9.8.7',
      dataDirectory: temp.folder,
      host: 'browser',
      now: () => now,
      evidenceBackfill: evidenceBackfillMode,
    });
    onTestFinished(() => evidenceBackfill.stop());
    const dispatch = createDispatcher(handlers);
    async function answer<C extends 'demo-clinic:status' | 'demo-clinic:create' | 'settings:get'>(
      channel: C,
    ): Promise<ResponseOf<C>> {
      const result = await dispatch(channel, {});
      if (!result.ok) expect.fail(`${channel} was refused: ${JSON.stringify(result.error)}`);
      return result.value as ResponseOf<C>;
    }
    return { clinic, dispatch, answer, dataDirectory: temp.folder, evidenceBackfill };
  }

  async function rows(
    clinic: ClinicDb,
    table: 'patients' | 'weights' | 'procedure_records',
  ): Promise<number> {
    const result = await sql<{ n: number }>`SELECT count(*) AS n FROM ${sql.table(table)}`.execute(
      clinic.kysely,
    );
    return Number(result.rows[0]?.n);
  }

  it('writes the invented demo clinic once into an empty clinic, named as the demo, and then refuses', async (context) => {
    const { clinic, dispatch, answer, dataDirectory, evidenceBackfill } =
      await clinicBehindDispatcher(context);
    expect(await answer('demo-clinic:status')).toEqual({
      patientCount: 0,
      demoPatientCount: 0,
      engine,
      dataDirectory,
      demo,
    });
    expect((await answer('settings:get')).settings).toBeNull();

    const written = await answer('demo-clinic:create');
    // Six invented species: 28 invented birds and 60 finished procedures (demo-clinic.ts).
    expect({ name: demoClinicName, ...demoClinicSize }).toEqual(demo);
    expect(written.recordsWritten).toBe(60);
    expect(written.status).toEqual({ patientCount: 28, demoPatientCount: 28, engine, dataDirectory, demo });
    expect(written.settings.settings).toEqual({
      ...defaultClinicSettings,
      clinicName: 'Fernbrook Avian Practice (demo, invented)',
      dateFormat: 'YYYY-MM-DD',
    });
    expect(written.settings.updatedAt).toBe(now.toISOString());
    expect(await rows(clinic, 'patients')).toBe(28);
    expect(await rows(clinic, 'weights')).toBe(28);
    expect(await rows(clinic, 'procedure_records')).toBe(60);
    // The demo's rows are compared with the model in the background (docs/evidence.md): listed
    // as still being compared until then, and all 60 once the back-fill has run.
    const waiting = await dispatch('evidence:list', {});
    expect(waiting.ok && (waiting.value as ResponseOf<'evidence:list'>).counts.pending).toBe(60);
    expect(await evidenceBackfill.run()).toBe(60);
    const evidence = await dispatch('evidence:list', {});
    expect(evidence.ok && (evidence.value as ResponseOf<'evidence:list'>).counts.completed).toBe(60);
    expect(evidence.ok && (evidence.value as ResponseOf<'evidence:list'>).counts.pending).toBe(0);

    // Asked again: refused, with why and how to see the demo anyway; nothing more written.
    const again = await dispatch('demo-clinic:create', {});
    expect(again.ok).toBe(false);
    expect(again.ok ? null : again.error).toEqual({
      code: 'conflict',
      message:
        "The demo clinic was not written: this clinic already holds 28 patients, and the demo's invented birds are never mixed with a clinic's own. To explore the demo, start Tidewing on a new, empty data folder (npm start -- --data FOLDER) and choose the demo clinic on its first start.",
    });
    expect(await rows(clinic, 'patients')).toBe(28);
    expect(await rows(clinic, 'procedure_records')).toBe(60);
    // `--demo` goes through the same writeDemoClinic, which leaves the clinic alone too.
    expect(await writeDemoClinic(clinic, now)).toBe(0);
    expect(await rows(clinic, 'procedure_records')).toBe(60);

    // A real bird added later is counted, but not as invented; the header keeps saying demo.
    const pip = await dispatch('patients:create', { values: pipValues, meta: enteredByRw });
    expect(pip.ok, JSON.stringify(pip)).toBe(true);
    expect(await answer('demo-clinic:status')).toMatchObject({ patientCount: 29, demoPatientCount: 28 });
  });

  it('refuses while the clinic holds a patient of its own, and writes nothing', async (context) => {
    const { clinic, dispatch, answer } = await clinicBehindDispatcher(context);
    const pip = await dispatch('patients:create', { values: pipValues, meta: enteredByRw });
    expect(pip.ok, JSON.stringify(pip)).toBe(true);
    expect(await answer('demo-clinic:status')).toMatchObject({ patientCount: 1, demoPatientCount: 0 });

    const refused = await dispatch('demo-clinic:create', {});
    expect(refused.ok ? null : refused.error.code).toBe('conflict');
    expect(refused.ok ? '' : refused.error.message).toMatch(
      /^The demo clinic was not written: this clinic already holds 1 patient, and the demo's invented birds are never mixed with a clinic's own\./,
    );
    expect(await rows(clinic, 'patients')).toBe(1);
    expect(await rows(clinic, 'procedure_records')).toBe(0);
    expect((await answer('settings:get')).settings).toBeNull();
  });

  it('starts comparing the demo’s records with the model at once where the back-fill runs by itself (the hosts)', async (context) => {
    const { dispatch, answer, evidenceBackfill } = await clinicBehindDispatcher(context, 'automatic');
    expect((await answer('demo-clinic:create')).recordsWritten).toBe(60);
    // No view was opened: the write itself started the back-fill.
    await evidenceBackfill.idle();
    const evidence = await dispatch('evidence:list', {});
    expect(evidence.ok && (evidence.value as ResponseOf<'evidence:list'>).counts).toMatchObject({
      completed: 60,
      pending: 0,
    });
  });

  it('keeps a clinic name already set', async (context) => {
    const { dispatch, answer } = await clinicBehindDispatcher(context);
    const saved = await dispatch('settings:save', {
      ...defaultClinicSettings,
      clinicName: 'Heron Lane Bird Clinic',
    });
    expect(saved.ok, JSON.stringify(saved)).toBe(true);
    const written = await answer('demo-clinic:create');
    expect(written.recordsWritten).toBe(60);
    expect(written.settings.settings?.clinicName).toBe('Heron Lane Bird Clinic');
  });
});

describe('the demo clinic’s change notices', () => {
  it('tell every screen that patients, weights, records, logs, evidence and settings changed', () => {
    const notices = changeNoticesFor('demo-clinic:create', {
      recordsWritten: 60,
      status: { patientCount: 28, demoPatientCount: 28, engine: 'sqlite', dataDirectory: '/tmp/x', demo },
      settings: { settings: null, updatedAt: null },
    });
    expect(notices.map((notice) => notice.kind)).toEqual([
      'patients',
      'weights',
      'procedure-records',
      'procedure-entries',
      'evidence',
      'settings',
    ]);
    expect(
      changeNoticesFor('demo-clinic:status', {
        patientCount: 0,
        demoPatientCount: 0,
        engine: 'sqlite',
        dataDirectory: '/tmp/x',
        demo,
      }),
    ).toEqual([]);
  });
});
