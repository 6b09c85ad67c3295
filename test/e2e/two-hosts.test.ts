import { describe, expect, it } from 'vitest';
import { temporaryFolder } from '../support/temporary-folder.js';
import { callBridge, sharedBrowser, startHostProcess } from './host-process.js';

const session = sharedBrowser('tidewing-e2e-two-');

describe('two Tidewing hosts in one browser', () => {
  it('both keep working after each is reloaded, each with its own cookie and token', async () => {
    const otherData = temporaryFolder('tidewing-e2e-two-other-');
    const first = await startHostProcess(session.dataFolder);
    const second = await startHostProcess(otherData.folder);
    // One context, as one browser profile: cookies for 127.0.0.1 are shared across its ports.
    const context = await session.browser.newContext();
    try {
      const pageA = await context.newPage();
      const pageB = await context.newPage();
      await pageA.goto(first.url);
      await pageA.getByRole('heading', { name: 'Before you use Tidewing' }).waitFor();
      await pageB.goto(second.url);
      await pageB.getByRole('heading', { name: 'Before you use Tidewing' }).waitFor();
      const names = (await context.cookies()).map((cookie) => cookie.name).sort();
      expect(names).toEqual([`tidewing_files_${first.port}`, `tidewing_files_${second.port}`].sort());
      for (const page of [pageA, pageB, pageA]) {
        await page.reload();
        await page.getByRole('heading', { name: 'Before you use Tidewing' }).waitFor();
        const answer = await callBridge(page, 'safety:status', {});
        expect(answer.ok, JSON.stringify(answer)).toBe(true);
      }
    } finally {
      await context.close();
      await first.stop();
      await second.stop();
      otherData.remove();
    }
  });
});
