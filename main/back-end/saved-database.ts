import fs from 'node:fs';
import path from 'node:path';
import { parsePostgresAddress, PostgresAddressError, postgresGuide } from '../../db/postgres-options.js';
import { workstationFileName, workstationIdentity } from './workstation-identity.js';

/**
 * The clinic database this workstation uses at its next start when neither `--database` nor
 * TIDEWING_DATABASE_URL names one, kept in `workstation.json` beside the workstation's identity.
 * Never a password: the address is refused when it holds one. The desktop window may keep the
 * password sealed by the operating system's keychain (Electron's safeStorage): only the sealed
 * bytes are written, as base64.
 */
export type SavedDatabase = {
  /** A postgresql:// address without a password, or null for the file in the data folder. */
  readonly address: string | null;
  /** The password sealed by the desktop's safeStorage, base64; null when none is kept. */
  readonly sealedPassword: string | null;
};

const noneSaved: SavedDatabase = { address: null, sealedPassword: null };

function readJson(file: string): Record<string, unknown> | null {
  try {
    const parsed: unknown = JSON.parse(fs.readFileSync(file, 'utf8'));
    return typeof parsed === 'object' && parsed !== null ? (parsed as Record<string, unknown>) : null;
  } catch {
    return null;
  }
}

/** The saved choice (none when the file or the fields are missing or unreadable). */
export function readSavedDatabase(dataDirectory: string): SavedDatabase {
  const json = readJson(path.join(dataDirectory, workstationFileName));
  if (json === null) return noneSaved;
  const address = typeof json['databaseAddress'] === 'string' ? json['databaseAddress'] : null;
  const sealed = typeof json['databasePasswordSealed'] === 'string' ? json['databasePasswordSealed'] : null;
  return { address, sealedPassword: address === null ? null : sealed };
}

/** Refuses an address Tidewing cannot use or one that holds a password; the message says what to do. */
export function checkAddressToSave(address: string): string {
  const parsed = parsePostgresAddress(address);
  if (parsed.password !== null)
    throw new PostgresAddressError(
      'Remove the password from the address: it would be written in the data folder as plain text. ' +
        `Put it in a password file (PGPASSFILE or ~/.pgpass, readable only by you) or in PGPASSWORD instead; see ${postgresGuide}.`,
    );
  return address.trim();
}

/**
 * Writes the choice into workstation.json, keeping the identity (made first when missing) and
 * any other field. Written beside and renamed into place, so a crash leaves the old file whole.
 */
export function saveDatabaseChoice(dataDirectory: string, choice: SavedDatabase): SavedDatabase {
  const checked = choice.address === null ? null : checkAddressToSave(choice.address);
  workstationIdentity(dataDirectory);
  const file = path.join(dataDirectory, workstationFileName);
  const json = readJson(file) ?? {};
  delete json['databaseAddress'];
  delete json['databasePasswordSealed'];
  if (checked !== null) {
    json['databaseAddress'] = checked;
    if (choice.sealedPassword !== null) json['databasePasswordSealed'] = choice.sealedPassword;
  }
  const draft = `${file}.${String(process.pid)}.saving`;
  fs.writeFileSync(draft, `${JSON.stringify(json, null, 2)}\n`, { mode: 0o600 });
  fs.renameSync(draft, file);
  return readSavedDatabase(dataDirectory);
}
