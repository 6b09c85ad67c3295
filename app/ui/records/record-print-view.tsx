import { useEffect, useState } from 'react';
import type { ProcedureDetail } from '../../contract/record-channels.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useChannel } from '../common/use-channel.js';
import { PrintedRecord } from './printed-record.js';
import { loadPrintedRecordExtras, type PrintedRecordExtras } from './printed-record-data.js';

/**
 * The printed record, hidden on screen, that takes the record screen's place when the browser
 * prints (Ctrl+P or the Print record button): the same page `tidewing record` writes.
 */
export function RecordPrintView({ detail }: { readonly detail: ProcedureDetail }) {
  const settings = useClinicSettings();
  const [info] = useChannel('app:info', {});
  const [extras, setExtras] = useState<PrintedRecordExtras | null>(null);
  const [printedAt, setPrintedAt] = useState(() => new Date());
  useEffect(() => {
    let live = true;
    void loadPrintedRecordExtras(detail).then((loaded) => {
      if (live) setExtras(loaded);
    });
    return () => {
      live = false;
    };
  }, [detail]);
  useEffect(() => {
    const stamp = () => setPrintedAt(new Date());
    window.addEventListener('beforeprint', stamp);
    return () => window.removeEventListener('beforeprint', stamp);
  }, []);
  return (
    <div className="record-print-view">
      {extras === null ? (
        <p>The printed record is still loading; print again in a moment.</p>
      ) : (
        <PrintedRecord
          detail={detail}
          histories={extras.histories}
          plan={extras.plan}
          voided={extras.voided}
          settings={settings}
          appVersion={info.state === 'ready' ? info.value.appVersion : ''}
          printedAt={printedAt}
        />
      )}
    </div>
  );
}
