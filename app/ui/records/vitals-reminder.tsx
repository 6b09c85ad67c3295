import type { ProcedureEntryValues, ProcedureRecordValues } from '../../contract/records.js';
import { promptState } from './monitoring.js';

/** The reminder to log vitals, shown once no vitals row was logged for the record's prompt interval. */
export function VitalsReminder({
  values,
  entries,
  nowMs,
}: {
  readonly values: ProcedureRecordValues;
  readonly entries: readonly { readonly values: ProcedureEntryValues }[];
  readonly nowMs: number;
}) {
  const startedAtMs = Date.parse(values.startedAt);
  const endedAtMs = values.endedAt === null ? null : Date.parse(values.endedAt);
  const vitalsTimes = entries
    .filter((entry) => entry.values.kind === 'vitals')
    .map((entry) => Date.parse(entry.values.at));
  const prompt = promptState(startedAtMs, vitalsTimes, nowMs, values.promptIntervalMin, endedAtMs);
  if (!prompt.due) return null;
  return (
    <div className="record-prompt" role="alert">
      Time to log vitals: no row for {Math.floor(prompt.sinceLastMin)} min (reminder every{' '}
      {values.promptIntervalMin} min).
    </div>
  );
}
