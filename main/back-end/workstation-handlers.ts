import fs from 'node:fs';
import path from 'node:path';
import type { ThemeChoice } from '../../app/contract/workstation.js';
import type { Sql } from '../../db/clinic-db.js';
import { createWorkstationRepository } from '../../db/repositories/workstation-repository.js';
import type { HandlerTable } from './handlers.js';
import {
  workstationFileName,
  workstationIdentity,
  type WorkstationIdentity,
} from './workstation-identity.js';

type WorkstationHandlers = Pick<HandlerTable, 'workstation:get' | 'workstation:save'>;

/**
 * This workstation's settings. The identity file is read (or made) at the first call, so a
 * command that never asks for it leaves the data folder as it was.
 *
 * `theme` answers at once (the hosts write it into each page as it is served): it is the value
 * `loadTheme` read at start, kept up to date by `workstation:save`.
 */
export function createWorkstationHandlers(
  clinic: Sql,
  dataDirectory: string,
  now: () => Date,
): WorkstationHandlers & { readonly theme: () => ThemeChoice; readonly loadTheme: () => Promise<void> } {
  const workstations = createWorkstationRepository(clinic);
  let identity: WorkstationIdentity | null = null;
  let theme: ThemeChoice = 'system';
  const defaults = () => {
    identity ??= workstationIdentity(dataDirectory);
    return { id: identity.id, name: identity.defaultName };
  };
  return {
    'workstation:get': () => workstations.get(defaults()),
    'workstation:save': async (request) => {
      const saved = await workstations.save(defaults(), request, now());
      theme = saved.theme;
      return saved;
    },
    theme: () => theme,
    // The page still opens (in the system's theme) when the identity or the row cannot be read;
    // the screens then report the failure of workstation:get themselves. A data folder without
    // an identity file has no saved theme, and is left without one until it is asked for.
    loadTheme: async () => {
      try {
        if (!fs.existsSync(path.join(dataDirectory, workstationFileName))) return;
        theme = (await workstations.get(defaults())).theme;
      } catch {
        theme = 'system';
      }
    },
  };
}
