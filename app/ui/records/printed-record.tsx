import type { PlanDetail } from '../../contract/plan-records.js';
import type { ProcedureDetail } from '../../contract/record-channels.js';
import type { ProcedureEntry } from '../../contract/records.js';
import type { ClinicSettings } from '../../contract/settings.js';
import { agents } from '../../core/agents.js';
import { minutesWithRangeText } from '../../core/worksheet.js';
import { displayDateTime, setClinicDateFormat } from '../common/display.js';
import { paperClass, usePrintedRunningLines } from '../common/printed-pages.js';
import { circuitLabels, routeLabels } from '../../core/delivery.js';
import { dialStepsText } from '../../core/plan-phases.js';
import { clockText } from './clock-time.js';
import {
  readingFields,
  readingLabel,
  toDisplayReading,
  type DisplayUnits,
  type ReadingField,
} from './entry-form.js';
import { eventSummary, minutesFromStart, recoveryMilestones } from './monitoring.js';
import { RecordStrips } from './record-strips.js';
import type { VoidedRow } from './printed-record-data.js';
import './printed-record.css';

export type PrintedRecordProps = {
  readonly detail: ProcedureDetail;
  /** Every version of each corrected row, newest first, by the row's current id. */
  readonly histories: Readonly<Record<number, readonly ProcedureEntry[]>>;
  /** The linked plan, or null when none is linked (or it could not be read). */
  readonly plan: PlanDetail | null;
  /** The voided rows, printed struck through in the log with who voided them, when and why. */
  readonly voided: readonly VoidedRow[];
  readonly settings: ClinicSettings;
  readonly appVersion: string;
  readonly printedAt: Date;
};

function readingText(values: ProcedureEntry['values'], field: ReadingField, units: DisplayUnits): string {
  const value = values[field];
  return value === null ? '' : String(toDisplayReading(field, value, units));
}

/**
 * What changed between two versions of a row, field by field: the earlier value struck through
 * beside the value that replaced it.
 */
function changedParts(
  earlier: ProcedureEntry['values'],
  later: ProcedureEntry['values'],
  units: DisplayUnits,
): { readonly label: string; readonly was: string; readonly now: string }[] {
  const parts: { label: string; was: string; now: string }[] = [];
  if (earlier.at !== later.at)
    parts.push({ label: 'Time', was: clockText(earlier.at), now: clockText(later.at) });
  for (const field of readingFields) {
    const was = readingText(earlier, field, units);
    const now = readingText(later, field, units);
    if (was === now) continue;
    const { label, unit } = readingLabel(field, units);
    parts.push({
      label: `${label} (${unit})`,
      was: was === '' ? 'blank' : was,
      now: now === '' ? 'blank' : now,
    });
  }
  const wasEvent = earlier.kind === 'event' ? eventSummary(earlier) : earlier.eventNote;
  const nowEvent = later.kind === 'event' ? eventSummary(later) : later.eventNote;
  if (wasEvent !== nowEvent)
    parts.push({ label: 'Event or note', was: wasEvent === '' ? 'blank' : wasEvent, now: nowEvent });
  return parts;
}

/** Who wrote a version: the initials, with the workstation in brackets when known. */
function writtenBy(entry: ProcedureEntry): string {
  return entry.workstationName === null
    ? entry.stamp.enteredBy
    : `${entry.stamp.enteredBy} (${entry.workstationName})`;
}

/** " on Theatre 1" for a version whose workstation is known. */
function onWorkstation(entry: ProcedureEntry): string {
  return entry.workstationName === null ? '' : ` on ${entry.workstationName}`;
}

/** Each correction of a row: the struck value, the new one, who corrected it, when and why. */
function Corrections({
  versions,
  units,
}: {
  readonly versions: readonly ProcedureEntry[];
  readonly units: DisplayUnits;
}) {
  // Newest first: each version after the first was replaced by the one listed just before it.
  return (
    <ul className="pr-corrections">
      {versions.slice(1).map((earlier, index) => {
        const replacedBy = versions[index];
        if (replacedBy === undefined) return null;
        const parts = changedParts(earlier.values, replacedBy.values, units);
        return (
          <li key={earlier.id}>
            Corrected by {replacedBy.stamp.enteredBy}
            {onWorkstation(replacedBy)} at {displayDateTime(replacedBy.stamp.enteredAt)}
            {replacedBy.voided ? ', as entered in error' : ''}:{' '}
            {parts.length === 0
              ? 'no value changed'
              : parts.map((part, at) => (
                  <span key={part.label}>
                    {part.label} <del>{part.was}</del> → {part.now}
                    {at < parts.length - 1 ? '; ' : ''}
                  </span>
                ))}
            . Reason: “{replacedBy.stamp.reason}”. First entered by {writtenBy(earlier)}.
          </li>
        );
      })}
    </ul>
  );
}

/**
 * The procedure record for the patient file: details, the log as strips and as a table, the
 * events, every correction shown as a correction (the struck value, the new one, who and why),
 * the initials on each row, and the linked plan's predicted milestones beside what was logged.
 * Plain hooks only (print.html renders it through Preact's compatibility layer).
 */
export function PrintedRecord({
  detail,
  histories,
  plan,
  voided,
  settings,
  appVersion,
  printedAt,
}: PrintedRecordProps) {
  // print.html draws the record without the app's root, where the format is set otherwise.
  setClinicDateFormat(settings.dateFormat);
  const { record, patient, species, entries } = detail;
  const values = record.values;
  const units: DisplayUnits = { temperature: settings.temperatureUnit, pressure: settings.pressureUnit };
  const identifier =
    patient.values.ringId !== ''
      ? `ring ${patient.values.ringId}`
      : patient.values.microchipId !== ''
        ? `chip ${patient.values.microchipId}`
        : `patient ${String(patient.id)}`;
  const clinic = settings.clinicName === '' ? 'Clinic name not set' : settings.clinicName;
  const day = values.startedAt.slice(0, 10);
  usePrintedRunningLines(
    `${clinic} · ${patient.values.name} (${identifier})`,
    `${day} · procedure record ${String(record.id)} version ${String(record.stamp.versionId)}`,
    'Tidewing anaesthetic record',
  );
  const sorted = [...entries].sort((a, b) => Date.parse(a.values.at) - Date.parse(b.values.at));
  const startedAtMs = Date.parse(values.startedAt);
  const lastMs = Math.max(
    values.endedAt === null ? startedAtMs : Date.parse(values.endedAt),
    ...sorted.map((entry) => Date.parse(entry.values.at)),
  );
  const untilMinutes = Math.ceil((lastMs - startedAtMs) / 60_000) + 1;
  const shownFields = readingFields.filter((field) =>
    sorted.some((entry) => entry.values.kind === 'vitals' && entry.values[field] !== null),
  );
  // The log table shows the voided rows in their place, struck through; the strips leave them out.
  type LogRow =
    | { readonly entry: (typeof sorted)[number]; readonly voidedRow: null }
    | { readonly entry: ProcedureEntry; readonly voidedRow: VoidedRow };
  const logRows: LogRow[] = [
    ...sorted.map((entry): LogRow => ({ entry, voidedRow: null })),
    ...voided.map((row): LogRow => ({ entry: row.entry, voidedRow: row })),
  ].sort((a, b) => Date.parse(a.entry.values.at) - Date.parse(b.entry.values.at) || a.entry.id - b.entry.id);
  const events = sorted.filter((entry) => entry.values.kind === 'event');
  const milestones = recoveryMilestones(sorted);
  const initials = [...new Set(sorted.map((entry) => entry.stamp.enteredBy))];

  return (
    <article
      className={`printed-record ${paperClass(settings.paperSize)}`}
      data-ready="true"
      aria-labelledby="printed-record-title"
    >
      <header className="pr-header">
        <div>
          <p className="pr-clinic">{clinic}</p>
          {settings.addressLine !== '' && <p className="pr-small">{settings.addressLine}</p>}
        </div>
        <div className="pr-title-block">
          <h1 id="printed-record-title">Anaesthetic record</h1>
          <p>
            Record {record.id} · {displayDateTime(values.startedAt)}
          </p>
        </div>
      </header>

      <section aria-labelledby="pr-details">
        <h2 id="pr-details">Patient and procedure</h2>
        <table className="pr-facts">
          <tbody>
            <tr>
              <th scope="row">Patient</th>
              <td>
                <strong>{patient.values.name}</strong> · {identifier} · {patient.values.sex} ·{' '}
                {species?.values.commonName ?? patient.values.speciesKey}
                {detail.latestMassG === null ? '' : ` · latest weight ${String(detail.latestMassG)} g`}
              </td>
            </tr>
            <tr>
              <th scope="row">Procedure</th>
              <td>
                {values.procedureName} · ASA{' '}
                {values.asaGrade === null
                  ? 'not graded'
                  : `${String(values.asaGrade)}${values.emergency ? 'E' : ''}`}
              </td>
            </tr>
            <tr>
              <th scope="row">Airway and system</th>
              <td>
                {routeLabels[values.airway]}
                {values.tubeSizeMm === null ? '' : `, ${String(values.tubeSizeMm)} mm`}
                {values.tubeType === '' ? '' : ` ${values.tubeType}`} · {circuitLabels[values.circuit]}
              </td>
            </tr>
            <tr>
              <th scope="row">Agent</th>
              <td>
                {values.agent === null
                  ? 'not recorded (the record was made before records named their agent)'
                  : agents[values.agent].displayName}
              </td>
            </tr>
            <tr>
              <th scope="row">Before induction</th>
              <td>
                Fasting: {values.fasting === '' ? 'not recorded' : values.fasting} · crop {values.cropChecked}
              </td>
            </tr>
            <tr>
              <th scope="row">Start and end</th>
              <td>
                {displayDateTime(values.startedAt)} to{' '}
                {values.endedAt === null ? 'not ended' : displayDateTime(values.endedAt)}
              </td>
            </tr>
            <tr>
              <th scope="row">Staff</th>
              <td>
                Monitoring: {values.staffInitials}; rows entered by{' '}
                {initials.length === 0 ? 'nobody yet' : initials.join(', ')}
              </td>
            </tr>
          </tbody>
        </table>
      </section>

      {plan !== null && (
        <section aria-labelledby="pr-plan">
          <h2 id="pr-plan">
            Plan {plan.plan.id} (version {plan.plan.stamp.versionId}): predicted beside logged
          </h2>
          <table className="pr-grid">
            <thead>
              <tr>
                <th scope="col">Milestone</th>
                <th scope="col">Predicted by the plan</th>
                <th scope="col">Logged</th>
              </tr>
            </thead>
            <tbody>
              <tr>
                <th scope="row">Planned depth reached / intubation</th>
                <td>
                  {minutesWithRangeText(
                    plan.plan.result.milestones.inductionMin,
                    plan.plan.result.uncertainty.inductionMin,
                  )}{' '}
                  from the start
                </td>
                <td>
                  {(() => {
                    const intubation = sorted.find((entry) => entry.values.eventType === 'intubation');
                    return intubation === undefined
                      ? 'no intubation logged'
                      : `intubation at ${String(minutesFromStart(values.startedAt, intubation.values.at))} min`;
                  })()}
                </td>
              </tr>
              <tr>
                <th scope="row">Vaporiser off</th>
                <td>
                  {plan.plan.result.milestones.vaporiserOffMin === null
                    ? 'not in the plan'
                    : `at ${String(plan.plan.result.milestones.vaporiserOffMin)} min`}
                </td>
                <td>
                  {milestones[0]?.at == null
                    ? 'not logged'
                    : `at ${String(minutesFromStart(values.startedAt, milestones[0].at))} min`}
                </td>
              </tr>
              <tr>
                <th scope="row">Recovery after vaporiser off</th>
                <td>
                  {minutesWithRangeText(
                    plan.plan.result.milestones.recoveryMin,
                    plan.plan.result.uncertainty.recoveryMin,
                  )}{' '}
                  (brain below the waking level)
                </td>
                <td>
                  {milestones
                    .slice(1)
                    .map((milestone) =>
                      milestone.minutesAfterGasOff === null
                        ? `${milestone.label}: not logged`
                        : `${milestone.label}: ${String(milestone.minutesAfterGasOff)} min`,
                    )
                    .join('; ')}
                </td>
              </tr>
            </tbody>
          </table>
          <p className="pr-small">
            {agents[plan.plan.input.agent].displayName}, planned dial{' '}
            {dialStepsText(plan.plan.input.schedule)}. The prediction is for the plan’s schedule, not for what
            was given.
          </p>
        </section>
      )}

      <section aria-labelledby="pr-chart">
        <h2 id="pr-chart">The log over time</h2>
        {sorted.length === 0 ? (
          <p>Nothing was logged.</p>
        ) : (
          <RecordStrips
            startedAt={values.startedAt}
            entries={sorted}
            units={units}
            untilMinutes={untilMinutes}
          />
        )}
      </section>

      <section aria-labelledby="pr-log" className="pr-log">
        <h2 id="pr-log">The log</h2>
        <table className="pr-grid pr-log-table">
          <thead>
            <tr>
              <th scope="col">Time</th>
              <th scope="col">Min</th>
              {shownFields.map((field) => {
                const { label, unit } = readingLabel(field, units);
                return (
                  <th scope="col" key={field}>
                    {label} ({unit})
                  </th>
                );
              })}
              <th scope="col">Event or note</th>
              <th scope="col">By</th>
            </tr>
          </thead>
          <tbody>
            {logRows.map((row) => {
              if (row.voidedRow !== null) {
                const { entry, voidedRow } = row;
                return (
                  <tr key={entry.id} className="pr-voided">
                    <td>
                      <del>{clockText(entry.values.at)}</del>
                    </td>
                    <td className="pr-number">
                      <del>{minutesFromStart(values.startedAt, entry.values.at)}</del>
                    </td>
                    {shownFields.map((field) => (
                      <td key={field} className="pr-number">
                        <del>
                          {entry.values.kind === 'vitals' ? readingText(entry.values, field, units) : ''}
                        </del>
                      </td>
                    ))}
                    <td>
                      {entry.values.kind === 'event' && <del>{eventSummary(entry.values)} </del>}
                      <span className="pr-void-note">
                        Voided by {entry.stamp.enteredBy}
                        {onWorkstation(entry)} at {displayDateTime(entry.stamp.enteredAt)}. Reason: “
                        {entry.stamp.reason}”.
                        {voidedRow.firstEnteredBy === null
                          ? ''
                          : ` First entered by ${voidedRow.firstEnteredBy}.`}
                      </span>
                    </td>
                    <td>
                      <del>{voidedRow.firstEnteredBy ?? ''}</del> {writtenBy(entry)}
                    </td>
                  </tr>
                );
              }
              const entry = row.entry;
              const versions = histories[entry.id];
              return (
                <tr key={entry.id} className={entry.corrected ? 'pr-corrected' : undefined}>
                  <td>{clockText(entry.values.at)}</td>
                  <td className="pr-number">{minutesFromStart(values.startedAt, entry.values.at)}</td>
                  {shownFields.map((field) => (
                    <td key={field} className="pr-number">
                      {entry.values.kind === 'vitals' ? readingText(entry.values, field, units) : ''}
                    </td>
                  ))}
                  <td>
                    {entry.values.kind === 'event' ? (
                      <strong>{eventSummary(entry.values)}</strong>
                    ) : (
                      entry.values.eventNote
                    )}
                    {entry.corrected &&
                      (versions === undefined ? (
                        <span className="pr-small"> (corrected; history not available)</span>
                      ) : (
                        <Corrections versions={versions} units={units} />
                      ))}
                  </td>
                  <td>{writtenBy(entry)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </section>

      <section aria-labelledby="pr-events">
        <h2 id="pr-events">Events</h2>
        {events.length === 0 ? (
          <p>No events were logged.</p>
        ) : (
          <ol className="pr-events">
            {events.map((entry) => (
              <li key={entry.id}>
                {clockText(entry.values.at)} ({minutesFromStart(values.startedAt, entry.values.at)} min):{' '}
                {eventSummary(entry.values)} · {writtenBy(entry)}
              </li>
            ))}
          </ol>
        )}
      </section>

      <section aria-labelledby="pr-sign" className="pr-sign">
        <h2 id="pr-sign">Signatures</h2>
        <p>Anaesthetist: ______________________________ Initials: ________ Date and time: ______________</p>
        <p>
          Veterinarian responsible: ______________________________ Initials: ________ Date and time:
          ______________
        </p>
      </section>

      <footer className="pr-footer">
        Tidewing {appVersion} · record {record.id} version {record.stamp.versionId}, last saved by{' '}
        {record.stamp.enteredBy} · printed {displayDateTime(printedAt)}
      </footer>
    </article>
  );
}
