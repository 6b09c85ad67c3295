import { useState } from 'react';
import { api } from '../common/bridge.js';
import { displayDateTime } from '../common/display.js';
import { downloadText } from '../common/download.js';
import { useChannel } from '../common/use-channel.js';
import { SaveStatus, type SaveMessage } from '../common/save-status.js';

/** Where the data lives, the automatic backups, and the whole database as JSON. */
export function DataSection() {
  const [info] = useChannel('app:info', {});
  const [backups] = useChannel('database:backups', {});
  const [database] = useChannel('database:current', {});
  const onServer = database.state === 'ready' && database.value.engine === 'postgresql';
  const [status, setStatus] = useState<SaveMessage | null>(null);
  const [busy, setBusy] = useState(false);

  async function exportJson() {
    setBusy(true);
    setStatus(null);
    const answer = await api.invoke('database:export-json', {});
    setBusy(false);
    if (!answer.ok) {
      setStatus({ kind: 'failed', text: `Not exported: ${answer.error.message}` });
      return;
    }
    downloadText(answer.value.fileName, answer.value.json, 'application/json');
    setStatus({ kind: 'saved', text: `Exported ${answer.value.fileName}.` });
  }

  return (
    <section className="panel data-section" aria-labelledby="data-title">
      <h2 id="data-title">Data and backups</h2>
      {onServer && (
        <p>
          The clinic database is on the server <code>{database.value.location}</code> (schema version{' '}
          {info.state === 'ready' ? info.value.schemaVersion : '…'}). Its backups are made on the server by
          the clinic’s IT (see docs/postgresql.md); this workstation makes no backup file at start.
        </p>
      )}
      {!onServer && info.state === 'ready' && (
        <p>
          The clinic database is in <code>{info.value.dataDirectory}</code> (schema version{' '}
          {info.value.schemaVersion}).
        </p>
      )}
      {!onServer && backups.state === 'ready' && (
        <p>
          Tidewing makes a backup in <code>{backups.value.folder}</code> at every start and keeps the last 10.{' '}
          {backups.value.backups[0] === undefined
            ? 'No backup yet.'
            : `Latest: ${displayDateTime(backups.value.backups[0].takenAt)} (${backups.value.backups.length} kept).`}{' '}
          Copy them to another disk regularly; <code>npx tidewing restore FILE</code> puts one back after
          checking it.
        </p>
      )}
      <div className="form-actions">
        <button type="button" onClick={() => void exportJson()} disabled={busy}>
          {busy ? 'Exporting…' : 'Export the whole database as JSON'}
        </button>
        <SaveStatus message={status} />
      </div>
    </section>
  );
}
