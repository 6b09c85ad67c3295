import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { workstationFileName } from '../../main/back-end/workstation-identity.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';

const open: ChannelHarness[] = [];
afterEach(() => open.splice(0).forEach((harness) => harness.close()));
function harness(): ChannelHarness {
  const opened = openChannelHarness();
  open.push(opened);
  return opened;
}

function identityOf(dataDirectory: string): { id: string; defaultName: string } {
  return JSON.parse(fs.readFileSync(path.join(dataDirectory, workstationFileName), 'utf8')) as {
    id: string;
    defaultName: string;
  };
}

describe('workstation channels', () => {
  it('workstation:get answers the defaults under the id made in the data folder before any save', async () => {
    const api = harness();
    const answer = await api.answer('workstation:get', {});
    const identity = identityOf(api.dataDirectory);
    expect(answer).toEqual({
      id: identity.id,
      name: identity.defaultName,
      theme: 'system',
      initials: '',
      updatedAt: null,
    });
  });

  it('workstation:save changes only the fields given and stamps the time', async () => {
    const api = harness();
    await api.answer('workstation:save', { name: 'Theatre 1', theme: 'dim' });
    api.clock.set('2026-12-01T10:00:00.000Z');
    const saved = await api.answer('workstation:save', { initials: '  RW ' });
    expect(saved).toMatchObject({ name: 'Theatre 1', theme: 'dim', initials: 'RW' });
    expect(saved.updatedAt).toBe('2026-12-01T10:00:00.000Z');
    expect(await api.answer('workstation:get', {})).toEqual(saved);
    expect(api.backEnd.workstationTheme()).toBe('dim');
    // Blank initials are allowed: the next write asks who is at the keyboard.
    expect((await api.answer('workstation:save', { initials: '' })).initials).toBe('');
  });

  it('keeps the settings for the same data folder across back ends (a restart, a new port)', async () => {
    const api = harness();
    await api.answer('workstation:save', { theme: 'light', initials: 'JS' });
    api.backEnd.close();
    const again = startBackEnd({ dataDirectory: api.dataDirectory, appVersion: '9.8.7', host: 'browser' });
    try {
      // The pinned theme is read at start, for the hosts to write into the first page.
      await again.ready;
      expect(again.workstationTheme()).toBe('light');
      const answer = await again.dispatch('workstation:get', {});
      expect(answer).toMatchObject({ ok: true, value: { theme: 'light', initials: 'JS' } });
    } finally {
      again.close();
    }
  });

  it('workstation:save refuses a blank name, an unknown theme and hidden characters, naming the field', async () => {
    const api = harness();
    expect(await api.refusal('workstation:save', { name: '   ' })).toMatchObject({
      code: 'invalid-request',
      field: 'name',
    });
    expect(await api.refusal('workstation:save', { theme: 'dark' })).toMatchObject({
      code: 'invalid-request',
      field: 'theme',
    });
    expect(await api.refusal('workstation:save', { initials: 'R\u202eW' })).toMatchObject({
      code: 'invalid-request',
      field: 'initials',
    });
    expect(await api.refusal('workstation:save', { initials: '--' })).toMatchObject({ field: 'initials' });
    expect(await api.refusal('workstation:save', {})).toMatchObject({ code: 'invalid-request' });
    expect(await api.refusal('workstation:save', { colour: 'blue' })).toMatchObject({
      code: 'invalid-request',
    });
    expect((await api.answer('workstation:get', {})).updatedAt).toBeNull();
  });
});
