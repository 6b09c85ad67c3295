import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { localDateOf } from '../../app/contract/input-rules.js';
import { needPostgres, scratchPostgresDatabase } from '../support/postgres-database.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import {
  callBridge,
  completeFirstRun,
  ensureScreenshotFolder,
  sharedBrowser,
  startHostProcess,
} from './host-process.js';
import { runWorkstationLoad } from './support/workstation-load.js';

const session = sharedBrowser('tidewing-e2e-pg-');
const shots = ensureScreenshotFolder();

const yesterday = () => {
  const moment = new Date();
  moment.setDate(moment.getDate() - 1);
  return localDateOf(moment);
};

describe('several workstations on one PostgreSQL database', () => {
  it('a patient made at reception is listed in theatre, a weight appears there without a reload, and a clashing correction is refused with who and when', async (context) => {
    const { appUrl } = needPostgres(context);
    const database = await scratchPostgresDatabase(appUrl);
    const receptionData = temporaryFolder('tidewing-e2e-pg-reception-');
    const theatreData = temporaryFolder('tidewing-e2e-pg-theatre-');
    const reception = await startHostProcess(receptionData.folder, ['--database', database.url], 30_000);
    const theatre = await startHostProcess(theatreData.folder, ['--database', database.url], 30_000);
    const pageA = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    const pageB = await session.browser.newPage({ viewport: { width: 1366, height: 800 } });
    try {
      await completeFirstRun(pageA, reception.url, 'RW');
      await callBridge(pageA, 'workstation:save', { name: 'Reception' });
      await completeFirstRun(pageB, theatre.url, 'JT');
      await callBridge(pageB, 'workstation:save', { name: 'Theatre 1' });

      // Reception makes the patient through its screen.
      await pageA.getByRole('link', { name: 'New patient' }).click();
      await pageA.getByLabel('Name or clinic ID').fill('Pip');
      await pageA.getByLabel('Species').selectOption('budgerigar');
      await pageA.getByLabel('Sex').selectOption('male');
      await pageA.getByLabel('Name or clinic ID').press('Enter');
      await pageA.getByRole('heading', { name: /Pip/ }).waitFor();

      // Theatre lists it (a fresh look at the list: the acceptance check), then opens it.
      await pageB.reload();
      await pageB.getByRole('link', { name: /Pip/ }).first().click();
      await pageB.getByRole('heading', { name: /Pip/ }).waitFor();

      // Reception weighs the bird; theatre's open patient page shows it without a reload.
      await pageA.getByLabel('Date', { exact: true }).fill(yesterday());
      await pageA.getByLabel('Weight (g)', { exact: true }).fill('38');
      await pageA.getByLabel('Weight (g)', { exact: true }).press('Enter');
      await pageA.getByRole('cell', { name: '38 g' }).waitFor();
      await pageB.getByRole('cell', { name: '38 g' }).waitFor({ timeout: 10_000 });
      await pageB.screenshot({ path: path.join(shots, '90-postgresql-weight-on-second-workstation.png') });

      // Both correct the same weight version: the first wins, the second is told who and when.
      const found = await callBridge<{ patients: { id: number }[] }>(pageB, 'patients:search', {
        query: 'Pip',
      });
      expect(found.ok, JSON.stringify(found)).toBe(true);
      const patientId = found.value?.patients[0]?.id ?? -1;
      const detail = await callBridge<{ weights: { id: number; values: Record<string, unknown> }[] }>(
        pageB,
        'patients:get',
        { id: patientId },
      );
      const weight = detail.value?.weights[0];
      expect(weight).toBeDefined();
      const correct = (page: typeof pageA, massG: number, initials: string) =>
        callBridge(page, 'weights:correct', {
          id: weight?.id,
          values: { ...weight?.values, massG },
          meta: { enteredBy: initials, reason: 'Scale re-zeroed' },
        });
      const first = await correct(pageA, 37, 'RW');
      expect(first.ok, JSON.stringify(first)).toBe(true);
      const second = await correct(pageB, 39, 'JT');
      expect(second.ok).toBe(false);
      const error = second.error as { code: string; message: string };
      expect(error.code).toBe('conflict');
      expect(error.message).toMatch(/already corrected by RW at \d\d:\d\d \(reason: Scale re-zeroed\)/);
    } finally {
      await pageA.close();
      await pageB.close();
      await reception.stop();
      await theatre.stop();
      receptionData.remove();
      theatreData.remove();
      await database.drop();
    }
  });

  it('five workstations saving log rows while one is killed and restarted lose no acknowledged row', async (context) => {
    const { appUrl } = needPostgres(context);
    const database = await scratchPostgresDatabase(appUrl);
    const dataRoot = temporaryFolder('tidewing-e2e-pg-load-');
    try {
      // Bounded: 5 workstations x 1 row/s x 20 s here; `npm run bench -- workstations` runs 2 min.
      const result = await runWorkstationLoad({
        databaseUrl: database.url,
        dataRoot: dataRoot.folder,
        workstations: 5,
        entriesPerSecond: 1,
        durationMs: 20_000,
        killAfterMs: 6_000,
      });
      expect(result.killed).not.toBeNull();
      expect(result.acknowledged.length).toBeGreaterThan(50);
      expect(result.lost).toEqual([]);
      expect(new Set(result.acknowledged).size).toBe(result.acknowledged.length);
    } finally {
      dataRoot.remove();
      await database.drop();
    }
  });
});
