import { useMemo, useState } from 'react';
import type { ProcedureDetail } from '../../contract/record-channels.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useChannel } from '../common/use-channel.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { href } from '../shell/areas.js';
import { ApnoeaStopwatchButton, useApnoeaStopwatch } from './apnoea-stopwatch.js';
import type { DisplayUnits } from './entry-form.js';
import { EntryRow } from './entry-row.js';
import { EntryTable } from './entry-table.js';
import { EventButtons } from './event-buttons.js';
import { apnoeaNote } from './monitoring.js';
import { PlanComparison } from './plan-comparison.js';
import { PromptInterval } from './prompt-interval.js';
import { RecordChart } from './record-chart.js';
import { RecordDetailsEditor } from './record-details-editor.js';
import { RecordHeader } from './record-header.js';
import { RecordPrintView } from './record-print-view.js';
import './record-entry.css';
import { Milestones } from './record-milestones.js';
import { LogForecastPanel } from '../evidence/log-forecast.js';
import { useNowMs } from './use-now.js';
import { useReturnFocus } from '../common/return-focus.js';
import { useRecordWrites } from './use-record-writes.js';
import { VitalsReminder } from './vitals-reminder.js';

export { apnoeaKey } from './apnoea-stopwatch.js';

/** The live entry screen for one procedure record. */
export function LiveRecord({ recordId }: { readonly recordId: number }) {
  const [load, reload] = useChannel('procedures:get', { id: recordId });
  // The log rows and details shown; the entry row and open forms keep what is being typed.
  useChangeNotices(
    (notice) =>
      (notice.kind === 'procedure-entries' || notice.kind === 'procedure-records') &&
      (notice.recordId === undefined || notice.recordId === recordId),
    reload,
  );
  if (load.state === 'loading') return <p aria-busy="true">Opening the procedure record…</p>;
  if (load.state === 'failed') {
    return (
      <section className="screen">
        <h1>Procedure record</h1>
        <p className="form-error" role="alert">
          {load.error.message} <a href={href('records')}>Back to the records</a>
        </p>
      </section>
    );
  }
  return <LiveRecordScreen detail={load.value} reload={reload} />;
}

function LiveRecordScreen({
  detail,
  reload,
}: {
  readonly detail: ProcedureDetail;
  readonly reload: () => void;
}) {
  const settings = useClinicSettings();
  const units: DisplayUnits = useMemo(
    () => ({ temperature: settings.temperatureUnit, pressure: settings.pressureUnit }),
    [settings.temperatureUnit, settings.pressureUnit],
  );
  const nowMs = useNowMs();
  const { record, entries } = detail;
  const values = record.values;
  const writes = useRecordWrites(record.id, record.stamp.versionId, units, reload);
  const [editingDetails, setEditingDetails] = useState(false);
  // Escape or Close in the details editor puts focus back on the "Correct details" button.
  const detailsOpener = useReturnFocus();
  // The Time box of the entry row: the event buttons log at this time too.
  const [timeText, setTimeText] = useState('');
  const stopwatch = useApnoeaStopwatch(nowMs, (finished) => {
    void writes.logEvent('apnoea', {
      at: new Date(finished.startedAtMs).toISOString(),
      eventNote: apnoeaNote(finished.durationS),
    });
  });
  const startedAtMs = Date.parse(values.startedAt);
  const endedAtMs = values.endedAt === null ? null : Date.parse(values.endedAt);

  return (
    <section className="screen record-live" aria-labelledby="record-title">
      <RecordHeader
        detail={detail}
        nowMs={nowMs}
        editingDetails={editingDetails}
        onToggleDetails={() => {
          if (!editingDetails) detailsOpener.remember();
          setEditingDetails(!editingDetails);
        }}
        onExportCsv={() => void writes.exportCsv()}
        onCorrect={(next, reason) => void writes.correctRecord(next, reason)}
      />

      {editingDetails && (
        <RecordDetailsEditor
          recordId={record.id}
          versionId={record.stamp.versionId}
          values={values}
          onSave={writes.correctRecord}
          onClose={() => {
            setEditingDetails(false);
            detailsOpener.returnFocus();
          }}
        />
      )}

      <VitalsReminder values={values} entries={entries} nowMs={nowMs} />
      {writes.gate}
      {writes.writeFailure !== null && (
        <p className="form-error" role="alert">
          {writes.writeFailure}
        </p>
      )}

      <EntryRow
        units={units}
        record={values}
        lastEntry={entries.filter((entry) => entry.values.kind === 'vitals').at(-1)?.values ?? null}
        onSave={writes.addEntry}
        timeText={timeText}
        onTimeText={setTimeText}
      />

      <div className="record-toolbar">
        <ApnoeaStopwatchButton stopwatch={stopwatch} />
        <EventButtons onLog={writes.logEvent} timeText={timeText} onTimeUsed={() => setTimeText('')} />
      </div>

      <Milestones entries={entries} />
      <LogForecastPanel detail={detail} nowMs={nowMs} />

      <div className="record-body">
        <div className="record-chart-panel">
          <RecordChart
            startedAt={values.startedAt}
            entries={entries}
            units={units}
            untilMinutes={Math.ceil(((endedAtMs ?? nowMs) - startedAtMs) / 60_000) + 1}
          />
          {values.planId === null ? (
            <p className="record-plan-line">No plan linked.</p>
          ) : (
            <PlanComparison planId={values.planId} startedAt={values.startedAt} entries={entries} />
          )}
          <PromptInterval values={values} onSave={writes.correctRecord} />
        </div>
        <EntryTable
          entries={entries}
          startedAt={values.startedAt}
          units={units}
          onCorrect={writes.correctEntry}
          onVoid={writes.voidEntry}
        />
      </div>
      <RecordPrintView detail={detail} />
    </section>
  );
}
