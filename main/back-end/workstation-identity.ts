import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { hasLetterOrDigit } from '../../app/contract/input-rules.js';

/**
 * Which workstation this is: a random id made once and kept in the data folder, and the name it
 * starts with (the computer's host name) until the clinic names it in Settings. The id is the
 * key of the workstation's settings in the clinic database, so they stay put when the browser
 * host's port (and with it the browser's storage) changes.
 */
export type WorkstationIdentity = { readonly id: string; readonly defaultName: string };

export const workstationFileName = 'workstation.json';

const idPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

function parseIdentity(text: string): WorkstationIdentity | null {
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    return null;
  }
  if (typeof parsed !== 'object' || parsed === null) return null;
  const { id, defaultName } = parsed as Record<string, unknown>;
  if (typeof id !== 'string' || !idPattern.test(id)) return null;
  return {
    id,
    defaultName: typeof defaultName === 'string' ? nameFromHostName(defaultName) : 'This workstation',
  };
}

/** A name from the host name that the contract's naming rule accepts (at most 80 characters). */
export function nameFromHostName(hostName: string): string {
  const cleaned = hostName
    .replace(/[^\p{L}\p{N} ._-]/gu, '')
    .trim()
    .slice(0, 80);
  return hasLetterOrDigit(cleaned) ? cleaned : 'This workstation';
}

/**
 * Reads `workstation.json` in the data folder, or makes it (a fresh random UUID) when it is not
 * there. Two processes starting at once agree on one file: it is written beside and linked into
 * place, which fails when another got there first, and then that one is read. A file that
 * cannot be read as an identity is kept, renamed with the time, and a new one made, so nothing
 * is destroyed. Synchronous; a few file operations.
 */
export function workstationIdentity(
  dataDirectory: string,
  hostName: string = os.hostname(),
  now: Date = new Date(),
): WorkstationIdentity {
  const file = path.join(dataDirectory, workstationFileName);
  for (let attempt = 0; attempt < 3; attempt += 1) {
    let text: string | null;
    try {
      text = fs.readFileSync(file, 'utf8');
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
      text = null;
    }
    if (text === null) {
      const made = { id: crypto.randomUUID(), defaultName: nameFromHostName(hostName) };
      const draft = `${file}.${made.id}.new`;
      fs.mkdirSync(dataDirectory, { recursive: true });
      fs.writeFileSync(draft, `${JSON.stringify(made, null, 2)}\n`, { flag: 'wx' });
      try {
        fs.linkSync(draft, file);
        return made;
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
        continue; // another process made it first: read theirs
      } finally {
        fs.rmSync(draft, { force: true });
      }
    }
    const identity = parseIdentity(text);
    if (identity !== null) return identity;
    // Unreadable as an identity: set aside, never overwritten.
    fs.renameSync(file, `${file}.unreadable-${now.toISOString().replace(/[:.]/g, '-')}`);
  }
  throw new Error(`Could not read or make ${file}; check that the data folder can be written.`);
}

/**
 * This workstation's id, for stamping the entries it writes: read (or made) at the first call
 * and kept. Null while the data folder cannot give one (unwritable, unreadable): the entry is
 * still saved, without its workstation, because losing a clinical row to a preferences file
 * would be worse.
 */
export function workstationIdOf(dataDirectory: string): () => string | null {
  let id: string | null = null;
  return () => {
    if (id !== null) return id;
    try {
      id = workstationIdentity(dataDirectory).id;
    } catch {
      return null;
    }
    return id;
  };
}
