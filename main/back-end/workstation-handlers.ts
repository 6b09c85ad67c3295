import type { ThemeChoice } from '../../app/contract/workstation.js';
import type { TidewingDatabase } from '../../db/connection.js';
import { createWorkstationRepository } from '../../db/repositories/workstation-repository.js';
import type { HandlerTable } from './handlers.js';
import { workstationIdentity, type WorkstationIdentity } from './workstation-identity.js';

type WorkstationHandlers = Pick<HandlerTable, 'workstation:get' | 'workstation:save'>;

/**
 * This workstation's settings. The identity file is read (or made) at the first call, so a
 * command that never asks for it leaves the data folder as it was.
 */
export function createWorkstationHandlers(
  db: TidewingDatabase,
  dataDirectory: string,
  now: () => Date,
): WorkstationHandlers & { readonly theme: () => ThemeChoice } {
  const workstations = createWorkstationRepository(db);
  let identity: WorkstationIdentity | null = null;
  const defaults = () => {
    identity ??= workstationIdentity(dataDirectory);
    return { id: identity.id, name: identity.defaultName };
  };
  return {
    'workstation:get': () => workstations.get(defaults()),
    'workstation:save': (request) => workstations.save(defaults(), request, now()),
    // The page still opens (in the system's theme) when the identity or the row cannot be read;
    // the screens then report the failure of workstation:get themselves.
    theme: () => {
      try {
        return workstations.get(defaults()).theme;
      } catch {
        return 'system';
      }
    },
  };
}
