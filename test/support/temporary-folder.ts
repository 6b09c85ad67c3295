import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

/** A fresh folder under the system temp folder; removed by the returned function. */
export function temporaryFolder(prefix = 'tidewing-test-'): { folder: string; remove: () => void } {
  const folder = fs.mkdtempSync(path.join(os.tmpdir(), prefix));
  return { folder, remove: () => fs.rmSync(folder, { recursive: true, force: true }) };
}
