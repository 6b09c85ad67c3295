import { afterEach, describe, expect, it } from 'vitest';
import { worksheetPdfUnavailableMessage } from '../../app/contract/worksheet-channels.js';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { createDispatcher } from '../../main/back-end/handlers.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));

function backEnd() {
  const temp = temporaryFolder();
  const started = startBackEnd({ dataDirectory: temp.folder, appVersion: '9.8.7', host: 'browser' });
  cleanups.push(() => {
    started.close();
    temp.remove();
  });
  return started;
}

describe('worksheets:save-pdf', () => {
  it("answers in the browser host that it is not available there and names the browser's Print", async () => {
    const result = await backEnd().dispatch('worksheets:save-pdf', { suggestedName: 'pip.pdf' });
    expect(result).toEqual({
      ok: false,
      error: { code: 'unavailable', message: worksheetPdfUnavailableMessage },
    });
    expect(worksheetPdfUnavailableMessage).toMatch(/Print/);
    expect(worksheetPdfUnavailableMessage).toMatch(/npx tidewing worksheet/);
  });

  it('checks the request against the contract before any host sees it', async () => {
    const result = await backEnd().dispatch('worksheets:save-pdf', { suggestedName: 42 });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.error.code).toBe('invalid-request');
  });

  it("passes a host's own implementation through the same schemas (as the desktop does)", async () => {
    const shared = backEnd();
    const desktop = createDispatcher({
      ...shared.handlers,
      'worksheets:save-pdf': (request) => ({ saved: true, file: `/tmp/${request.suggestedName}` }),
    });
    expect(await desktop('worksheets:save-pdf', { suggestedName: 'pip.pdf' })).toEqual({
      ok: true,
      value: { saved: true, file: '/tmp/pip.pdf' },
    });
    const cancelled = createDispatcher({
      ...shared.handlers,
      'worksheets:save-pdf': () => ({ saved: false }),
    });
    expect(await cancelled('worksheets:save-pdf', { suggestedName: 'pip.pdf' })).toEqual({
      ok: true,
      value: { saved: false },
    });
    // An answer outside the schema (a saved file without its path) is refused, not shown.
    const broken = createDispatcher({
      ...shared.handlers,
      'worksheets:save-pdf': () => ({ saved: true }) as never,
    });
    expect((await broken('worksheets:save-pdf', { suggestedName: 'pip.pdf' })).ok).toBe(false);
  });
});
