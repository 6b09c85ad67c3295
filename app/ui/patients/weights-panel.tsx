import { useRef, useState, type FormEvent } from 'react';
import type { PatientDetail } from '../../contract/record-channels.js';
import {
  bodyConditions,
  weightValuesSchema,
  type Weight,
  type WeightValues,
} from '../../contract/records.js';
import {
  addDays,
  calendarDate,
  localDateOf,
  recentDateWindowDays,
  weighingDateProblem,
} from '../../contract/input-rules.js';
import { describeIssues } from '../../contract/result.js';
import { gToKg, kgToG } from '../../core/units.js';
import { weightSlipReasons } from '../../core/weight-trend.js';
import { api } from '../common/bridge.js';
import { displayDate, displayDateTime, displayMass, todayIso } from '../common/display.js';
import { fieldErrorsFrom, fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { NumberField, parseNumber, SelectField, TextField } from '../common/fields.js';
import { useOperator } from '../common/operator.js';
import { useClinicSettings } from '../common/settings-context.js';
import { TimeChart } from '../common/time-chart.js';
import { useInitialsGate } from '../common/initials-gate.js';
import { useFocusFirstError } from '../common/screen-focus.js';
import { ScrollRegion } from '../common/scroll-region.js';

type Props = { readonly detail: PatientDetail; readonly onChanged: () => void };

type Editing = { readonly weight: Weight; readonly mode: 'correct' | 'void' } | null;

const dayMs = 86_400_000;

/** Weight history with IVAPM loss bands, species-range checks, a chart and corrections. */
export function WeightsPanel({ detail, onChanged }: Props) {
  const settings = useClinicSettings();
  const { initials } = useOperator();
  const { gate, withInitials } = useInitialsGate();
  const { ref: formRef, focusFirstError } = useFocusFirstError<HTMLFormElement>();
  const unit = settings.massUnit;
  const [weighedOn, setWeighedOn] = useState(todayIso());
  const [massText, setMassText] = useState('');
  const [bodyCondition, setBodyCondition] = useState<(typeof bodyConditions)[number]>('');
  const [weighedBy, setWeighedBy] = useState('');
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<string | null>(null);
  const [editing, setEditing] = useState<Editing>(null);
  const [history, setHistory] = useState<{ id: number; versions: Weight[] } | null>(null);
  // A weight that looks like a slip waits here for a second Enter (or Esc to fix it).
  const [confirming, setConfirming] = useState<{ massText: string; reasons: string[] } | null>(null);

  const opener = useRef<HTMLElement | null>(null);

  function startEdit(weight: Weight, mode: 'correct' | 'void') {
    // Escape in the form returns focus here.
    opener.current = document.activeElement instanceof HTMLElement ? document.activeElement : null;
    setEditing({ weight, mode });
    setWeighedOn(weight.values.weighedOn);
    setMassText(String(unit === 'kg' ? gToKg(weight.values.massG) : weight.values.massG));
    setBodyCondition(weight.values.bodyCondition);
    setWeighedBy(weight.values.weighedBy);
    setReason('');
    setErrors({});
    setFailure(null);
  }

  function focusMass() {
    const box = document.querySelector<HTMLInputElement>('.weights-form [name="massG"]');
    box?.focus();
    box?.select();
  }

  function reset() {
    setConfirming(null);
    setEditing(null);
    setMassText('');
    setReason('');
    setBodyCondition('');
    setErrors({});
  }

  async function submit(event: FormEvent) {
    event.preventDefault();
    setFailure(null);
    const typed = parseNumber(massText);
    const massG = typed === null || Number.isNaN(typed) ? typed : unit === 'kg' ? kgToG(typed) : typed;
    const parsed = weightValuesSchema.safeParse({
      weighedOn,
      massG: massG ?? undefined,
      bodyCondition,
      weighedBy: weighedBy.trim() === '' ? initials : weighedBy,
    });
    const fieldErrors: Record<string, string> = parsed.success
      ? {}
      : { ...fieldErrorsFrom(describeIssues(parsed.error.issues)) };
    if (massG === null) fieldErrors['massG'] = `Enter the weight in ${unit}.`;
    else if (Number.isNaN(massG)) fieldErrors['massG'] = `Weight must be a number in ${unit}.`;
    if (editing !== null && reason.trim() === '')
      fieldErrors['reason'] = 'Say why; the reason is kept with the history.';
    // The back end checks the date against its clock too; checking here shows it before sending.
    const dateProblem = weightValuesSchema.shape.weighedOn.safeParse(weighedOn).success
      ? weighingDateProblem(weighedOn, localDateOf(new Date()), editing !== null || reason.trim() !== '')
      : null;
    if (dateProblem !== null) fieldErrors['weighedOn'] = dateProblem;
    if (!parsed.success || Object.keys(fieldErrors).length > 0) {
      setErrors(fieldErrors);
      focusFirstError();
      return;
    }
    setErrors({});
    if (editing?.mode !== 'void' && massG !== null && !Number.isNaN(massG)) {
      const range =
        detail.species === null
          ? null
          : {
              minG: detail.species.values.massMinG,
              maxG: detail.species.values.massMaxG,
              speciesName: detail.species.values.commonName,
            };
      const last = editing === null ? detail.trend.latest : null;
      const reasons = weightSlipReasons(massG, last, range);
      if (reasons.length > 0 && confirming?.massText !== massText) {
        setConfirming({ massText, reasons });
        focusMass();
        return;
      }
    }
    setConfirming(null);
    const values = parsed.data;
    const target = editing;
    // Without initials, a prompt opens in the form, focused, and the save goes ahead once given.
    withInitials((enteredBy) => void write(values, target, { enteredBy, reason: reason.trim() }));
  }

  async function write(values: WeightValues, editing: Editing, meta: { enteredBy: string; reason: string }) {
    const answer =
      editing === null
        ? await api.invoke('weights:add', {
            patientId: detail.patient.id,
            values,
            meta,
          })
        : editing.mode === 'void'
          ? await api.invoke('weights:void', { id: editing.weight.id, meta })
          : await api.invoke('weights:correct', {
              id: editing.weight.id,
              values,
              meta,
            });
    if (!answer.ok) {
      setErrors(
        Object.fromEntries(
          Object.entries(fieldErrorsFromContract(answer.error)).map(([field, message]) => [
            field.replace(/^(values|meta)\./, ''),
            message,
          ]),
        ),
      );
      setFailure(answer.error.message);
      focusFirstError();
      return;
    }
    reset();
    onChanged();
  }

  async function showHistory(weight: Weight) {
    const answer = await api.invoke('weights:history', { id: weight.id });
    if (answer.ok) setHistory({ id: weight.id, versions: answer.value });
  }

  // A weighing more than a year ago is kept only with a reason (e.g. copied from a paper record).
  const needsReason =
    editing === null &&
    calendarDate('Weighing date').safeParse(weighedOn).success &&
    weighedOn < addDays(localDateOf(new Date()), -recentDateWindowDays);
  const weights = detail.weights;
  const firstDay = weights.length > 0 ? Date.parse(weights[0]?.values.weighedOn ?? '') : 0;
  const x = weights.map((weight) => (Date.parse(weight.values.weighedOn) - firstDay) / dayMs);
  const range = detail.species === null ? null : detail.species.values;
  const shownMass = (massG: number) => displayMass(massG, unit);
  const series = [
    {
      label: `Weight (${unit})`,
      values: weights.map((weight) => (unit === 'kg' ? gToKg(weight.values.massG) : weight.values.massG)),
      stroke: 'var(--chart-blue)',
      points: true,
      scale: 'mass',
    },
    ...(range === null
      ? []
      : [
          {
            label: 'Typical range, low',
            values: weights.map(() => (unit === 'kg' ? gToKg(range.massMinG) : range.massMinG)),
            stroke: 'var(--chart-grey)',
            dash: [6, 4],
            width: 1,
            scale: 'mass',
          },
          {
            label: 'Typical range, high',
            values: weights.map(() => (unit === 'kg' ? gToKg(range.massMaxG) : range.massMaxG)),
            stroke: 'var(--chart-grey)',
            dash: [2, 3],
            width: 1,
            scale: 'mass',
          },
        ]),
  ];

  return (
    <section className="panel" aria-labelledby="weights-title">
      <h2 id="weights-title">Weights</h2>
      {detail.trend.flags.map((flag) => (
        <div
          key={flag.code}
          className={`flag ${flag.severity}`}
          role={flag.severity === 'danger' ? 'alert' : 'note'}
        >
          <strong>{flag.severity}</strong>
          {flag.message}
          <span className="basis">Basis: {flag.reason}</span>
        </div>
      ))}
      {detail.trend.sinceLast !== null && (
        <p>
          Since the previous weight: {detail.trend.sinceLast.grams >= 0 ? '+' : ''}
          {detail.trend.sinceLast.grams.toFixed(1)} g ({detail.trend.sinceLast.percent.toFixed(1)} %)
          {detail.trend.sinceFirst !== null && (
            <>
              {' '}
              · since the first: {detail.trend.sinceFirst.grams >= 0 ? '+' : ''}
              {detail.trend.sinceFirst.grams.toFixed(1)} g ({detail.trend.sinceFirst.percent.toFixed(1)} %)
            </>
          )}
        </p>
      )}
      {weights.length >= 2 && (
        <TimeChart
          x={x}
          xLabel="Days since first weight"
          series={series}
          axes={[{ scale: 'mass', label: `Body mass (${unit})` }]}
          height={220}
          summary={`Weight history of ${detail.patient.values.name}: ${weights.length} weights from ${displayDate(weights[0]?.values.weighedOn ?? '')} to ${displayDate(weights.at(-1)?.values.weighedOn ?? '')}.`}
        />
      )}
      {weights.length === 0 ? (
        <p className="muted">No weights yet.</p>
      ) : (
        <ScrollRegion label="Weights table">
          <table className="data-table">
            <thead>
              <tr>
                <th>Date</th>
                <th className="number">Weight</th>
                <th>Body condition</th>
                <th>Weighed by</th>
                <th>Entered</th>
                <th>Actions</th>
              </tr>
            </thead>
            <tbody>
              {weights.map((weight, index) => (
                <tr key={weight.id}>
                  <td>{displayDate(weight.values.weighedOn)}</td>
                  <td className="number">{shownMass(weight.values.massG)}</td>
                  <td>{weight.values.bodyCondition || '—'}</td>
                  <td>{weight.values.weighedBy || '—'}</td>
                  <td>
                    {weight.stamp.enteredBy}, {displayDateTime(weight.stamp.enteredAt)}
                    {weight.stamp.correctsId !== null && (
                      <span className="basis">Corrected: {weight.stamp.reason}</span>
                    )}
                  </td>
                  <td className="row-actions">
                    <button
                      type="button"
                      aria-label={`Correct weight of ${displayDate(weight.values.weighedOn)} (row ${index + 1})`}
                      onClick={() => startEdit(weight, 'correct')}
                    >
                      Correct
                    </button>{' '}
                    <button
                      type="button"
                      aria-label={`Void weight of ${displayDate(weight.values.weighedOn)} (row ${index + 1})`}
                      onClick={() => startEdit(weight, 'void')}
                    >
                      Void
                    </button>{' '}
                    {weight.stamp.correctsId !== null && (
                      <button
                        type="button"
                        aria-label={`History of weight of ${displayDate(weight.values.weighedOn)} (row ${index + 1})`}
                        onClick={() => void showHistory(weight)}
                      >
                        History
                      </button>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      )}
      {history !== null && (
        <div className="panel" role="region" aria-label="Weight history">
          <h3>History of this weight</h3>
          <ol className="history">
            {history.versions.map((version) => (
              <li key={version.id}>
                {version.voided ? 'Voided' : shownMass(version.values.massG)} on{' '}
                {displayDate(version.values.weighedOn)} · entered by {version.stamp.enteredBy},{' '}
                {displayDateTime(version.stamp.enteredAt)}
                {version.stamp.reason !== '' && ` · why: ${version.stamp.reason}`}
              </li>
            ))}
          </ol>
          <button type="button" onClick={() => setHistory(null)}>
            Close history
          </button>
        </div>
      )}
      <form
        ref={formRef}
        className="form weights-form"
        noValidate
        onSubmit={(event) => void submit(event)}
        onKeyDown={(event) => {
          if (event.key !== 'Escape') return;
          // Esc first leaves a weight's confirmation (back to the weight box), then the correction.
          if (confirming !== null) {
            event.preventDefault();
            setConfirming(null);
            focusMass();
          } else if (editing !== null) {
            event.preventDefault();
            reset();
            opener.current?.focus();
          }
        }}
        aria-label={editing === null ? 'Add a weight' : 'Correct a weight'}
      >
        <h3>
          {editing === null
            ? 'Add a weight'
            : editing.mode === 'void'
              ? `Void the weight of ${displayDate(editing.weight.values.weighedOn)}`
              : `Correct the weight of ${displayDate(editing.weight.values.weighedOn)}`}
        </h3>
        {editing?.mode !== 'void' && (
          <div className="form-grid">
            <TextField
              label="Date"
              name="weighedOn"
              type="date"
              value={weighedOn}
              error={errors['weighedOn']}
              onChange={setWeighedOn}
            />
            <NumberField
              label="Weight"
              name="massG"
              unit={unit}
              value={massText}
              error={errors['massG']}
              onChange={setMassText}
            />
            <SelectField
              label="Body condition"
              name="bodyCondition"
              value={bodyCondition}
              options={bodyConditions.map((value) => ({ value, label: value === '' ? 'not scored' : value }))}
              onChange={setBodyCondition}
            />
            <TextField
              label="Weighed by"
              name="weighedBy"
              value={weighedBy}
              placeholder={initials || 'initials'}
              error={errors['weighedBy']}
              onChange={setWeighedBy}
            />
          </div>
        )}
        {(editing !== null || needsReason) && (
          <TextField
            label={editing === null ? 'Reason (for a date more than a year ago)' : 'Reason'}
            name="reason"
            value={reason}
            error={errors['reason']}
            autoFocus={editing !== null}
            onChange={setReason}
          />
        )}
        {confirming !== null && confirming.massText === massText && (
          <div className="form-error weight-confirm" role="alert">
            <p>
              <strong>Check this weight before it is saved.</strong>
            </p>
            <ul>
              {confirming.reasons.map((text) => (
                <li key={text}>{text}</li>
              ))}
            </ul>
            <p>Press Enter again to save it as it is, or Esc to fix it.</p>
          </div>
        )}
        {gate}
        {failure !== null && (
          <p className="form-error" role="alert">
            {failure}
          </p>
        )}
        <div className="form-actions">
          <button type="submit" className="primary">
            {confirming !== null && confirming.massText === massText
              ? 'Save this weight anyway'
              : editing === null
                ? 'Add weight'
                : editing.mode === 'void'
                  ? 'Void weight'
                  : 'Save correction'}
          </button>
          {editing !== null && (
            <button type="button" onClick={reset}>
              Cancel
            </button>
          )}
        </div>
      </form>
    </section>
  );
}
