import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import {
  nameFromHostName,
  workstationFileName,
  workstationIdentity,
} from '../../main/back-end/workstation-identity.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((cleanup) => cleanup()));
function folder(): string {
  const temp = temporaryFolder('tidewing-workstation-');
  cleanups.push(temp.remove);
  return temp.folder;
}

describe('workstation identity in the data folder', () => {
  it('is made once with a random id and the host name, then read back unchanged', () => {
    const data = folder();
    const first = workstationIdentity(data, 'theatre-pc');
    expect(first.id).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/);
    expect(first.defaultName).toBe('theatre-pc');
    expect(workstationIdentity(data, 'another-name')).toEqual(first);
    // Only the identity file is left behind: no draft files.
    expect(fs.readdirSync(data)).toEqual([workstationFileName]);
  });

  it('gives another data folder another id', () => {
    expect(workstationIdentity(folder(), 'pc').id).not.toBe(workstationIdentity(folder(), 'pc').id);
  });

  it('keeps an unreadable file under another name instead of overwriting it', () => {
    const data = folder();
    fs.writeFileSync(path.join(data, workstationFileName), '{ not json');
    const made = workstationIdentity(data, 'pc', new Date('2026-12-01T09:30:00.000Z'));
    expect(made.defaultName).toBe('pc');
    const kept = path.join(data, `${workstationFileName}.unreadable-2026-12-01T09-30-00-000Z`);
    expect(fs.readFileSync(kept, 'utf8')).toBe('{ not json');
    expect(workstationIdentity(data, 'pc')).toEqual(made);
  });

  it('names a workstation from a host name the naming rule accepts', () => {
    expect(nameFromHostName('prep-room.local')).toBe('prep-room.local');
    expect(nameFromHostName('\u202e\u0000')).toBe('This workstation');
    expect(nameFromHostName('x'.repeat(100))).toHaveLength(80);
  });
});
