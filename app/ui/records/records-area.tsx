import type { Route } from '../shell/areas.js';
import { LiveRecord } from './live-record.js';
import { NewRecordForm } from './new-record-form.js';
import { RecentRecords } from './recent-records.js';

function positiveId(text: string | undefined): number | null {
  if (text === undefined || !/^\d+$/.test(text)) return null;
  const value = Number(text);
  return value > 0 && Number.isSafeInteger(value) ? value : null;
}

/**
 * Procedure records: `#/records` lists recent records, `#/records/new/<patientId>` starts one,
 * `#/records/<id>` is the live entry screen.
 */
export function RecordsArea({ route }: { readonly route: Route }) {
  const [first, second] = route.segments;
  if (first === 'new') return <NewRecordForm key={second ?? ''} patientId={positiveId(second)} />;
  const id = positiveId(first);
  if (id !== null) return <LiveRecord key={id} recordId={id} />;
  return <RecentRecords />;
}
