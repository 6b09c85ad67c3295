import { useEffect, useId, useMemo, useRef, useState, type FormEvent } from 'react';
import type { EventType, ProcedureEntryValues, ProcedureRecordValues } from '../../contract/records.js';
import type { ProcedureDetail } from '../../contract/record-channels.js';
import { entryTimeProblem } from '../../contract/input-rules.js';
import { formatMass } from '../../core/units.js';
import { api } from '../common/bridge.js';
import type { FieldErrors } from '../common/field-errors.js';
import { useClinicSettings } from '../common/settings-context.js';
import { TimeChart, type ChartSeries } from '../common/time-chart.js';
import { useChannel } from '../common/use-channel.js';
import { href } from '../shell/areas.js';
import { clockMinutesText, clockText, formatElapsed } from './clock-time.js';
import { downloadText } from '../common/download.js';
import {
  checkEntry,
  emptyReadings,
  parseNumber,
  readingFields,
  readingLabel,
  toDisplayReading,
  type DisplayUnits,
  type ReadingDraft,
} from './entry-form.js';
import { EntryTable } from './entry-table.js';
import { useInitialsGate } from './initials-gate.js';
import {
  apnoeaActionSeconds,
  apnoeaNote,
  eventLabels,
  promptState,
  recoveryMilestones,
  stoppedStopwatch,
  stopwatchLevel,
  stopwatchSeconds,
  toggleStopwatch,
  type Stopwatch,
} from './monitoring.js';
import { airwayText, asaText, circuitLabels } from './record-form.js';
import { PlanComparison } from './plan-comparison.js';
import { RecordDetailsEditor } from './record-details-editor.js';
import { recordSeries } from './record-series.js';

/** The key that starts and stops the apnoea stopwatch: no clash with typing numbers. */
export const apnoeaKey = 'F2';

/** Re-renders every second so clocks and reminders stay current. */
function useNowMs(): number {
  const [nowMs, setNowMs] = useState(() => Date.now());
  useEffect(() => {
    const timer = window.setInterval(() => setNowMs(Date.now()), 1000);
    return () => window.clearInterval(timer);
  }, []);
  return nowMs;
}

type Write = (enteredBy: string) => Promise<string | null>;

/** The live entry screen for one procedure record. */
export function LiveRecord({ recordId }: { readonly recordId: number }) {
  const [load, reload] = useChannel('procedures:get', { id: recordId });
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

const chartStyle: Readonly<
  Record<
    'heartRatePerMin' | 'breathsPerMin' | 'temperatureC' | 'etco2Mmhg' | 'vaporPct',
    { stroke: string; dash?: number[]; scale: string }
  >
> = {
  heartRatePerMin: { stroke: '#8a1c1c', scale: 'rate' },
  breathsPerMin: { stroke: '#1f4e79', dash: [8, 4], scale: 'rate' },
  temperatureC: { stroke: '#b7791f', dash: [2, 3], scale: 'temperature' },
  etco2Mmhg: { stroke: '#1e5b2e', dash: [12, 4, 2, 4], scale: 'etco2' },
  vaporPct: { stroke: '#6b3fa0', scale: 'vapor' },
};

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
  const { record, patient, species, latestMassG, entries } = detail;
  const values = record.values;
  const { gate, withInitials } = useInitialsGate();
  const [writeFailure, setWriteFailure] = useState<string | null>(null);
  const [stopwatch, setStopwatch] = useState<Stopwatch>(stoppedStopwatch);
  const [editingDetails, setEditingDetails] = useState(false);
  const startedAtMs = Date.parse(values.startedAt);
  const endedAtMs = values.endedAt === null ? null : Date.parse(values.endedAt);

  /** Runs a write once initials are known; reports the outcome to the caller and reloads. */
  function write(run: Write): Promise<string | null> {
    return new Promise((resolve) => {
      withInitials(
        (enteredBy) => {
          void run(enteredBy).then((message) => {
            if (message === null) reload();
            setWriteFailure(message);
            resolve(message);
          });
        },
        () => resolve('Not saved: enter your initials to save.'),
      );
    });
  }

  function addEntry(entryValues: ProcedureEntryValues): Promise<string | null> {
    return write(async (enteredBy) => {
      const answer = await api.invoke('entries:add', {
        recordId: record.id,
        values: entryValues,
        meta: { enteredBy, reason: '' },
      });
      return answer.ok ? null : `Not saved: ${answer.error.message}`;
    });
  }

  function logEvent(
    eventType: EventType,
    extra: { at?: string; eventNote?: string; drugName?: string; drugDose?: string } = {},
  ): Promise<string | null> {
    const checked = checkEntry(
      {
        timeText: '',
        readings: emptyReadings,
        kind: 'event',
        eventType,
        eventNote: extra.eventNote ?? '',
        drugName: extra.drugName ?? '',
        drugDose: extra.drugDose ?? '',
      },
      units,
      new Date(),
    );
    if (!checked.ok)
      return Promise.resolve(Object.values(checked.errors)[0] ?? 'The event could not be checked.');
    return addEntry({ ...checked.values, at: extra.at ?? checked.values.at });
  }

  function correctRecord(next: ProcedureRecordValues, reason: string): Promise<string | null> {
    return write(async (enteredBy) => {
      const answer = await api.invoke('procedures:correct', {
        id: record.id,
        values: next,
        meta: { enteredBy, reason },
      });
      return answer.ok ? null : `Not saved: ${answer.error.message}`;
    });
  }

  // The stopwatch key works wherever focus is, so the hands stay on the keyboard.
  const toggleRef = useRef<() => void>(() => undefined);
  useEffect(() => {
    toggleRef.current = () => {
      const { next, finished } = toggleStopwatch(stopwatch, Date.now());
      setStopwatch(next);
      if (finished !== null)
        void logEvent('apnoea', {
          at: new Date(finished.startedAtMs).toISOString(),
          eventNote: apnoeaNote(finished.durationS),
        });
    };
  });
  useEffect(() => {
    function onKey(event: KeyboardEvent) {
      if (event.key !== apnoeaKey || event.repeat) return;
      event.preventDefault();
      toggleRef.current();
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  const vitalsTimes = entries
    .filter((entry) => entry.values.kind === 'vitals')
    .map((entry) => Date.parse(entry.values.at));
  const prompt = promptState(startedAtMs, vitalsTimes, nowMs, values.promptIntervalMin, endedAtMs);
  const level = stopwatchLevel(stopwatch, nowMs);
  const seconds = stopwatchSeconds(stopwatch, nowMs);

  async function exportCsv() {
    const answer = await api.invoke('procedures:export-csv', { id: record.id });
    if (answer.ok) downloadText(answer.value.fileName, answer.value.csv, 'text/csv;charset=utf-8');
    setWriteFailure(answer.ok ? null : `Export failed: ${answer.error.message}`);
  }

  return (
    <section className="screen record-live" aria-labelledby="record-title">
      <header className="record-header">
        <div className="record-header-main">
          <h1 id="record-title">
            {patient.values.name}{' '}
            <span className="record-species">{species?.values.commonName ?? patient.values.speciesKey}</span>
          </h1>
          <p className="record-facts">
            <span>{values.procedureName}</span>
            <span>ASA {asaText(values)}</span>
            <span>{airwayText(values)}</span>
            <span>{circuitLabels[values.circuit]}</span>
            <span>
              {latestMassG === null
                ? 'no weight recorded'
                : `latest weight ${formatMass(latestMassG, settings.massUnit).text}`}
            </span>
            <span>staff {values.staffInitials}</span>
          </p>
        </div>
        <div className="record-clock" aria-label="Elapsed time since the start">
          <span className="record-clock-label">{endedAtMs === null ? 'Elapsed' : 'Duration'}</span>
          <span className="record-clock-value">{formatElapsed((endedAtMs ?? nowMs) - startedAtMs)}</span>
          <span className="record-clock-label">from {clockMinutesText(new Date(startedAtMs))}</span>
        </div>
        <div className="record-header-actions">
          <button type="button" onClick={() => void exportCsv()}>
            Download CSV
          </button>
          <button
            type="button"
            aria-expanded={editingDetails}
            onClick={() => setEditingDetails((open) => !open)}
          >
            Correct details
          </button>
          {endedAtMs === null ? (
            <button
              type="button"
              onClick={() =>
                void correctRecord({ ...values, endedAt: new Date().toISOString() }, 'Procedure ended')
              }
            >
              End procedure
            </button>
          ) : (
            <span className="hint">ended {clockText(values.endedAt ?? '')}</span>
          )}
        </div>
      </header>

      {editingDetails && (
        <RecordDetailsEditor
          recordId={record.id}
          values={values}
          onSave={correctRecord}
          onClose={() => setEditingDetails(false)}
        />
      )}

      {prompt.due && (
        <div className="record-prompt" role="alert">
          Time to log vitals: no row for {Math.floor(prompt.sinceLastMin)} min (reminder every{' '}
          {values.promptIntervalMin} min).
        </div>
      )}
      {gate}
      {writeFailure !== null && (
        <p className="form-error" role="alert">
          {writeFailure}
        </p>
      )}

      <EntryRow
        units={units}
        record={values}
        lastEntry={entries.filter((entry) => entry.values.kind === 'vitals').at(-1)?.values ?? null}
        onSave={addEntry}
      />

      <div className="record-toolbar">
        <div className="record-stopwatch">
          <button
            type="button"
            className={`record-apnoea record-apnoea-${level}`}
            aria-pressed={level !== 'stopped'}
            aria-keyshortcuts={apnoeaKey}
            onClick={() => toggleRef.current()}
          >
            {level === 'stopped' ? 'Start apnoea stopwatch' : `Apnoea ${seconds} s: stop and log`}{' '}
            <kbd>{apnoeaKey}</kbd>
          </button>
          {level === 'danger' && (
            <span className="record-apnoea-warning" role="alert">
              Apnoea over {apnoeaActionSeconds} s: act now.
            </span>
          )}
        </div>
        <EventButtons onLog={logEvent} />
      </div>

      <Milestones entries={entries} />

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
          <PromptInterval values={values} onSave={correctRecord} />
        </div>
        <EntryTable
          entries={entries}
          startedAt={values.startedAt}
          units={units}
          onCorrect={(id, next, reason) =>
            write(async (enteredBy) => {
              const answer = await api.invoke('entries:correct', {
                id,
                values: next,
                meta: { enteredBy, reason },
              });
              return answer.ok ? null : answer.error.message;
            })
          }
          onVoid={(id, reason) =>
            write(async (enteredBy) => {
              const answer = await api.invoke('entries:void', { id, meta: { enteredBy, reason } });
              return answer.ok ? null : answer.error.message;
            })
          }
        />
      </div>
    </section>
  );
}

function EntryRow({
  units,
  record,
  lastEntry,
  onSave,
}: {
  readonly units: DisplayUnits;
  /** The record's start and end: a row's time must lie within them (with the contract's tolerances). */
  readonly record: Pick<ProcedureRecordValues, 'startedAt' | 'endedAt'>;
  readonly lastEntry: ProcedureEntryValues | null;
  readonly onSave: (values: ProcedureEntryValues) => Promise<string | null>;
}) {
  const [timeText, setTimeText] = useState('');
  const [readings, setReadings] = useState<ReadingDraft>(emptyReadings);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const firstReading = useRef<HTMLInputElement | null>(null);
  const baseId = useId();
  const nowMs = useNowMs();

  async function submit(event: FormEvent) {
    event.preventDefault();
    if (busy) return;
    const now = new Date();
    const checked = checkEntry({ timeText, readings, kind: 'vitals' }, units, now);
    if (!checked.ok) {
      setErrors(checked.errors);
      return;
    }
    // The back end refuses a time outside the record too; checking here shows it by the time box.
    const outside = entryTimeProblem(checked.values.at, record, now);
    if (outside !== null) {
      setErrors({ at: outside });
      return;
    }
    setErrors({});
    setBusy(true);
    const message = await onSave(checked.values);
    setBusy(false);
    if (message === null) {
      setTimeText('');
      setReadings(emptyReadings);
    }
    firstReading.current?.focus();
  }

  return (
    <form
      className="record-entry"
      onSubmit={(event) => void submit(event)}
      noValidate
      aria-label="New row of readings"
    >
      <div className="record-entry-fields">
        <div className="field record-cell">
          <label htmlFor={`${baseId}-time`}>Time</label>
          <input
            id={`${baseId}-time`}
            value={timeText}
            size={6}
            placeholder={clockMinutesText(new Date(nowMs))}
            aria-describedby={`${baseId}-time-hint`}
            aria-invalid={errors['at'] !== undefined}
            onChange={(event) => {
              setTimeText(event.target.value);
              setErrors({});
            }}
          />
          <span className="visually-hidden" id={`${baseId}-time-hint`}>
            Blank for now, or HH:MM
          </span>
        </div>
        {readingFields.map((field, index) => {
          const { label, unit } = readingLabel(field, units);
          const last = lastEntry?.[field] ?? null;
          return (
            <div className="field record-cell" key={field}>
              <label htmlFor={`${baseId}-${field}`}>
                {label} <span className="record-unit">{unit}</span>
              </label>
              <input
                id={`${baseId}-${field}`}
                ref={index === 0 ? firstReading : undefined}
                autoFocus={index === 0}
                value={readings[field]}
                inputMode="decimal"
                size={5}
                placeholder={last === null ? '' : String(toDisplayReading(field, last, units))}
                aria-invalid={errors[field] !== undefined}
                aria-describedby={field === 'spo2Pct' ? `${baseId}-spo2-hint` : undefined}
                onChange={(event) => {
                  const text = event.target.value;
                  setReadings((current) => ({ ...current, [field]: text }));
                  setErrors({});
                }}
              />
              {field === 'spo2Pct' && (
                <span className="record-unit" id={`${baseId}-spo2-hint`}>
                  trend only in birds
                </span>
              )}
            </div>
          );
        })}
        <div className="record-cell record-entry-submit">
          <button type="submit" className="primary" disabled={busy}>
            Save row <kbd className="record-kbd-light">Enter</kbd>
          </button>
        </div>
      </div>
      {Object.keys(errors).length > 0 && (
        <ul className="record-entry-errors">
          {Object.entries(errors).map(([field, message]) => (
            <li key={field} className="field-error" role="alert">
              {message}
            </li>
          ))}
        </ul>
      )}
      <p className="hint">
        Blank boxes are not measured. Time blank means now; type HH:MM for an earlier reading. Placeholders
        show the last row.
      </p>
    </form>
  );
}

const buttonEvents: readonly EventType[] = [
  'induction',
  'intubation',
  'ippvOn',
  'ippvOff',
  'vaporiserOff',
  'extubation',
  'regurgitation',
  'firstMovement',
  'standing',
];

function EventButtons({
  onLog,
}: {
  readonly onLog: (
    eventType: EventType,
    extra?: { eventNote?: string; drugName?: string; drugDose?: string },
  ) => Promise<string | null>;
}) {
  const [open, setOpen] = useState<'drugGiven' | 'note' | null>(null);
  const [note, setNote] = useState('');
  const [drugName, setDrugName] = useState('');
  const [drugDose, setDrugDose] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [logged, setLogged] = useState<string | null>(null);
  const baseId = useId();

  async function log(
    eventType: EventType,
    extra?: { eventNote?: string; drugName?: string; drugDose?: string },
  ) {
    const message = await onLog(eventType, extra);
    setError(message);
    if (message === null) {
      setLogged(`${eventLabels[eventType]} logged at ${clockText(new Date().toISOString())}.`);
      setOpen(null);
      setNote('');
      setDrugName('');
      setDrugDose('');
    }
  }

  function submitDetail(event: FormEvent) {
    event.preventDefault();
    if (open === 'note') {
      if (note.trim() === '') {
        setError('Type the note first.');
        return;
      }
      void log('note', { eventNote: note.trim() });
    } else if (open === 'drugGiven') {
      if (drugName.trim() === '') {
        setError('Name the drug given.');
        return;
      }
      void log('drugGiven', { drugName: drugName.trim(), drugDose: drugDose.trim(), eventNote: note.trim() });
    }
  }

  return (
    <div className="record-events" role="group" aria-label="Events">
      {buttonEvents.map((eventType) => (
        <button type="button" key={eventType} onClick={() => void log(eventType)}>
          {eventLabels[eventType]}
        </button>
      ))}
      <button
        type="button"
        aria-expanded={open === 'drugGiven'}
        onClick={() => setOpen(open === 'drugGiven' ? null : 'drugGiven')}
      >
        Drug given…
      </button>
      <button
        type="button"
        aria-expanded={open === 'note'}
        onClick={() => setOpen(open === 'note' ? null : 'note')}
      >
        Note…
      </button>
      {open !== null && (
        <form className="record-event-detail" onSubmit={submitDetail} noValidate>
          {open === 'drugGiven' && (
            <>
              <label htmlFor={`${baseId}-drug`}>Drug</label>
              <input
                id={`${baseId}-drug`}
                value={drugName}
                size={14}
                autoFocus
                aria-invalid={error === 'Name the drug given.'}
                onChange={(event) => setDrugName(event.target.value)}
              />
              <label htmlFor={`${baseId}-dose`}>Dose and route as given</label>
              <input
                id={`${baseId}-dose`}
                value={drugDose}
                size={16}
                onChange={(event) => setDrugDose(event.target.value)}
              />
            </>
          )}
          <label htmlFor={`${baseId}-note`}>Note</label>
          <input
            id={`${baseId}-note`}
            value={note}
            size={24}
            autoFocus={open === 'note'}
            onChange={(event) => setNote(event.target.value)}
          />
          <button type="submit" className="primary">
            Log {open === 'note' ? 'note' : 'drug'}
          </button>
          {open === 'drugGiven' && (
            <span className="hint">Entered by the clinic; Tidewing suggests no dose.</span>
          )}
        </form>
      )}
      {error !== null && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
      {logged !== null && error === null && (
        <p className="status-saved" role="status">
          {logged}
        </p>
      )}
    </div>
  );
}

function Milestones({ entries }: { readonly entries: readonly { readonly values: ProcedureEntryValues }[] }) {
  const milestones = recoveryMilestones(entries);
  return (
    <dl className="record-milestones" aria-label="Recovery milestones">
      {milestones.map((milestone) => (
        <div
          key={milestone.eventType}
          className={milestone.at === null ? 'record-milestone-pending' : 'record-milestone-done'}
        >
          <dt>{milestone.label}</dt>
          <dd>
            {milestone.at === null ? '—' : clockText(milestone.at)}
            {milestone.minutesAfterGasOff !== null &&
              milestone.eventType !== 'vaporiserOff' &&
              ` (+${milestone.minutesAfterGasOff} min)`}
          </dd>
        </div>
      ))}
    </dl>
  );
}

type RecordChartProps = {
  readonly startedAt: string;
  readonly entries: readonly { readonly values: ProcedureEntryValues }[];
  readonly units: DisplayUnits;
  /** Right end of the time axis in minutes since the start. */
  readonly untilMinutes: number;
};

function RecordChart({ startedAt, entries, units, untilMinutes }: RecordChartProps) {
  const data = useMemo(
    () => recordSeries(startedAt, entries, units, untilMinutes),
    [startedAt, entries, units, untilMinutes],
  );
  const series: ChartSeries[] = useMemo(() => {
    const list: ChartSeries[] = (Object.keys(chartStyle) as (keyof typeof chartStyle)[]).map((field) => {
      const style = chartStyle[field];
      const { label, unit } = readingLabel(field, units);
      return {
        label: `${label} (${unit})`,
        values: data.readings[field],
        stroke: style.stroke,
        scale: style.scale,
        points: true,
        ...(style.dash === undefined ? {} : { dash: style.dash }),
      };
    });
    list.push({
      label: 'Event markers (listed below)',
      values: data.events,
      stroke: '#555d66',
      scale: 'events',
      points: false,
      width: 1.5,
      dash: [3, 4],
    });
    return list;
  }, [data, units]);
  if (data.minutes.length === 0)
    return <p className="hint record-chart-empty">The chart appears once rows are logged.</p>;
  const temperatureUnit = readingLabel('temperatureC', units).unit;
  const summary = `Logged vitals and events over ${untilMinutes} minutes since the start: ${entries.length - data.eventList.length} rows of vitals, ${data.eventList.length} events.`;
  return (
    <>
      <TimeChart
        x={data.minutes}
        xLabel="minutes since start"
        series={series}
        height={240}
        summary={summary}
        axes={[
          { scale: 'rate', label: 'HR, RR (/min)' },
          { scale: 'temperature', label: `Temp (${temperatureUnit})`, side: 'right' },
          { scale: 'etco2', label: `EtCO2 (${units.pressure})`, side: 'right' },
          { scale: 'vapor', label: 'Vaporiser (%)', side: 'right' },
        ]}
      />
      {data.eventList.length > 0 && (
        <p className="record-event-strip">
          <span className="record-event-strip-title">Event markers:</span>
          {data.eventList.map((event, index) => (
            <span key={index}>
              {event.minutes} min {eventLabels[event.eventType]}
            </span>
          ))}
        </p>
      )}
    </>
  );
}

function PromptInterval({
  values,
  onSave,
}: {
  readonly values: ProcedureRecordValues;
  readonly onSave: (next: ProcedureRecordValues, reason: string) => Promise<string | null>;
}) {
  const [text, setText] = useState(String(values.promptIntervalMin));
  const [error, setError] = useState<string | null>(null);
  const id = useId();
  async function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = parseNumber(text);
    if (parsed === null || parsed === 'invalid' || parsed < 1 || parsed > 30) {
      setError('Prompt interval is 1 to 30 minutes.');
      return;
    }
    if (parsed === values.promptIntervalMin) return;
    const message = await onSave(
      { ...values, promptIntervalMin: parsed },
      `Prompt interval changed from ${values.promptIntervalMin} to ${parsed} min`,
    );
    setError(message);
  }
  return (
    <form className="record-interval" onSubmit={(event) => void submit(event)} noValidate>
      <label htmlFor={id}>Remind me to log vitals every</label>
      <input
        id={id}
        value={text}
        size={3}
        inputMode="decimal"
        aria-invalid={error !== null}
        onChange={(event) => setText(event.target.value)}
      />
      <span>min</span>
      <button type="submit">Set</button>
      {error !== null && (
        <span className="field-error" role="alert">
          {error}
        </span>
      )}
    </form>
  );
}
