import { checkBeforeStart } from '../back-end/start-up-guard.js';
import { databaseExists, type CommandIo } from './command-io.js';

/**
 * The start-up guard for a command that reads the live database (`backup`, `export`): a
 * missing, emptied, damaged or foreign database is refused with the guard's message (the
 * problem, the newest good backup and the restore command) and nothing is written. A database
 * from a newer Tidewing may still be read. Returns true when the command may go on.
 */
export function databaseReadyForReading(
  io: CommandIo,
  command: string,
  location: { readonly dataDirectory: string; readonly databaseFile: string },
): boolean {
  const finding = checkBeforeStart({ dataDirectory: location.dataDirectory });
  if (!finding.ok) {
    if (finding.problem === 'tooNew') return true;
    io.stderr(`tidewing ${command}: ${finding.message}\n`);
    return false;
  }
  if (finding.state === 'absent') return databaseExists(io, command, location);
  if (finding.state === 'empty') {
    io.stderr(
      `tidewing ${command}: the database ${location.databaseFile} is empty: it holds no clinic to ${command === 'backup' ? 'back up' : command}. Nothing was written.\n`,
    );
    return false;
  }
  return true;
}
