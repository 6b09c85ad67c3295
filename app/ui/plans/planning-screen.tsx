import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { localDateOf, plannedDateProblem } from '../../contract/input-rules.js';
import {
  checklistSchema,
  planFieldsSchema,
  type Checklist,
  type PlanDetail,
  type PlanFields,
} from '../../contract/plan-records.js';
import type { Species } from '../../contract/records.js';
import { speciesToReference } from '../../contract/species-mapping.js';
import { cautionsForPatient } from '../../core/patient-cautions.js';
import { api } from '../common/bridge.js';
import { useChangeNotices } from '../common/use-change-notices.js';
import { displayDate, displayDateTime, displayMass, todayIso } from '../common/display.js';
import { fieldErrorsFromContract, type FieldErrors } from '../common/field-errors.js';
import { TextField } from '../common/fields.js';
import { useClinicSettings } from '../common/settings-context.js';
import { useInitialsGate } from '../common/initials-gate.js';
import { href } from '../shell/areas.js';
import { ChecklistPanel } from './checklist-panel.js';
import { CompareTable } from './compare-table.js';
import { defaultDraft, inputToDraft, type PlanDraft } from './plan-draft.js';
import { PlanForm } from './plan-form.js';
import { CautionList, PlanResults } from './plan-results.js';
import { PlanCalibration } from '../evidence/plan-calibration.js';
import { usePlanComputation } from './use-plan-computation.js';
import { SaveStatus, type SaveMessage } from '../common/save-status.js';

export type PlanningStart =
  | { readonly kind: 'quick' }
  | { readonly kind: 'patient'; readonly patientId: number }
  | { readonly kind: 'saved'; readonly planId: number };

type Context = {
  readonly patientId: number | null;
  readonly patientLabel: string | null;
  readonly savedPlanId: number | null;
  readonly savedStamp: string | null;
};

const emptyChecklist: Checklist = checklistSchema.parse({});

/** What the user can change on a saved plan; compared with the saved version to tell an edit. */
type Editable = {
  readonly draft: PlanDraft;
  readonly checklist: Checklist;
  readonly plannedFor: string;
  readonly label: string;
};

function sameEditable(a: Editable, b: Editable): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/** Plan an anaesthetic: inputs on the left, predictions redrawn on every change on the right. */
export function PlanningScreen({ start }: { readonly start: PlanningStart }) {
  const settings = useClinicSettings();
  const { gate, withInitials } = useInitialsGate();
  const [species, setSpecies] = useState<Species[]>([]);
  const [draftA, setDraftA] = useState<PlanDraft>(() =>
    defaultDraft(settings.defaultAgent, settings.massUnit),
  );
  const [draftB, setDraftB] = useState<PlanDraft | null>(null);
  const [active, setActive] = useState<'A' | 'B'>('A');
  const [checklist, setChecklist] = useState<Checklist>(emptyChecklist);
  const [plannedFor, setPlannedFor] = useState(todayIso());
  const [label, setLabel] = useState('');
  const [saveErrors, setSaveErrors] = useState<FieldErrors>({});
  const [dateReason, setDateReason] = useState('');
  const [context, setContext] = useState<Context>({
    patientId: null,
    patientLabel: null,
    savedPlanId: null,
    savedStamp: null,
  });
  const [loadFailure, setLoadFailure] = useState<string | null>(null);
  // The patient's sex, once known: cautions for the other sex are not shown.
  const [patientSex, setPatientSex] = useState<'male' | 'female' | 'unknown' | null>(null);
  const [saveMessage, setSaveMessage] = useState<SaveMessage | null>(null);
  const [loaded, setLoaded] = useState(start.kind === 'quick');
  // The saved comparison this plan belongs to: its plans and which one the clinic will use.
  const [comparison, setComparison] = useState<PlanDetail['comparison']>(null);

  // The saved version the form shows, as the form holds it: a difference is the user's edit.
  const [savedEditable, setSavedEditable] = useState<Editable | null>(null);
  // A newer version saved on another workstation or in another tab while this form was edited.
  const [newer, setNewer] = useState<PlanDetail | null>(null);

  /** Shows a saved plan's version in the form (plan A), with its comparison. */
  const showSaved = useCallback(
    (detail: PlanDetail) => {
      const { plan, patient } = detail;
      const editable: Editable = {
        draft: inputToDraft(plan.input, settings.massUnit),
        checklist: plan.checklist,
        plannedFor: plan.plannedFor,
        label: plan.label,
      };
      setComparison(detail.comparison);
      setDraftB(null);
      setActive('A');
      setPatientSex(patient?.values.sex ?? null);
      setDraftA(editable.draft);
      setChecklist(editable.checklist);
      setPlannedFor(editable.plannedFor);
      setLabel(editable.label);
      setSavedEditable(editable);
      setNewer(null);
      setContext({
        patientId: plan.patientId,
        patientLabel:
          patient === null
            ? (plan.input.patientName ?? null)
            : `${patient.values.name} · ${detail.species?.values.commonName ?? patient.values.speciesKey}`,
        savedPlanId: plan.id,
        savedStamp: `${displayDateTime(plan.stamp.enteredAt)} by ${plan.stamp.enteredBy}`,
      });
      setLoaded(true);
    },
    [settings.massUnit],
  );

  const edited =
    savedEditable !== null &&
    (draftB !== null || !sameEditable(savedEditable, { draft: draftA, checklist, plannedFor, label }));
  // Read after the refresh's awaits, when the user may have typed meanwhile.
  const editedNow = useRef(edited);
  useEffect(() => {
    editedNow.current = edited;
  });

  /**
   * A plan changed here or elsewhere: the comparison (which plan is chosen) is read again; when
   * the plan on screen has a newer version, an untouched form shows it, while a form being edited
   * is kept, with an offer to show the new version.
   */
  async function refreshSaved() {
    const shownId = context.savedPlanId;
    if (shownId === null) return;
    const answer = await api.invoke('plans:get', { id: shownId });
    if (!answer.ok) return;
    setComparison(answer.value.comparison);
    const newestId = Math.max(...answer.value.history.map((version) => version.id), shownId);
    if (newestId === shownId) return;
    const latest = await api.invoke('plans:get', { id: newestId });
    if (!latest.ok) return;
    if (editedNow.current) {
      setNewer(latest.value);
      return;
    }
    showSaved(latest.value);
    window.history.replaceState(null, '', href('plans', newestId));
  }
  useChangeNotices(
    (notice) => notice.kind === 'plans' && context.savedPlanId !== null,
    () => void refreshSaved(),
  );

  useEffect(() => {
    void api
      .invoke('species:list', {})
      .then((answer) => (answer.ok ? setSpecies(answer.value) : setLoadFailure(answer.error.message)));
  }, []);

  useEffect(() => {
    if (start.kind === 'patient') {
      void api.invoke('patients:get', { id: start.patientId }).then((answer) => {
        if (!answer.ok) return setLoadFailure(answer.error.message);
        const { patient, trend } = answer.value;
        setPatientSex(patient.values.sex);
        const massG = trend.latest?.massG ?? null;
        setDraftA((current) => ({
          ...current,
          patientName: patient.values.name,
          speciesId: patient.values.speciesKey,
          massText: massG === null ? '' : String(settings.massUnit === 'kg' ? massG / 1000 : massG),
        }));
        const weightText =
          trend.latest === null
            ? 'no weight recorded'
            : `${displayMass(trend.latest.massG, settings.massUnit)} on ${displayDate(trend.latest.weighedOn)}`;
        setContext({
          patientId: patient.id,
          patientLabel: `${patient.values.name} · ${answer.value.species?.values.commonName ?? patient.values.speciesKey} · ${weightText}`,
          savedPlanId: null,
          savedStamp: null,
        });
        setLoaded(true);
      });
    } else if (start.kind === 'saved') {
      void api.invoke('plans:get', { id: start.planId }).then((answer) => {
        if (!answer.ok) return setLoadFailure(answer.error.message);
        showSaved(answer.value);
      });
    }
  }, [start, settings.massUnit, showSaved]);

  const references = useMemo(() => species.map(speciesToReference), [species]);
  const computationA = usePlanComputation(draftA, references, loaded);
  const computationB = usePlanComputation(draftB ?? draftA, references, loaded && draftB !== null);
  const shownDraft = active === 'B' && draftB !== null ? draftB : draftA;
  const shownComputation = active === 'B' && draftB !== null ? computationB : computationA;

  async function save() {
    setSaveMessage(null);
    if (computationA.input === null) {
      setSaveMessage({ kind: 'failed', text: 'Not saved: correct the plan inputs marked in plan A first.' });
      return;
    }
    // The date and label are checked here with the contract's rules, so each message shows beside
    // its box; a new plan dated more than a year away is refused (an edit carries a reason).
    const localErrors: Record<string, string> = {};
    const date = planFieldsSchema.shape.plannedFor.safeParse(plannedFor);
    const dateProblem = date.success
      ? plannedDateProblem(
          plannedFor,
          localDateOf(new Date()),
          context.savedPlanId !== null || dateReason.trim() !== '',
        )
      : (date.error.issues[0]?.message ?? null);
    if (dateProblem !== null) localErrors['plannedFor'] = dateProblem;
    const labelCheck = planFieldsSchema.shape.label.safeParse(label);
    if (!labelCheck.success) localErrors['label'] = labelCheck.error.issues[0]?.message ?? 'Check the label.';
    setSaveErrors(localErrors);
    if (Object.keys(localErrors).length > 0) {
      setSaveMessage({ kind: 'failed', text: 'Not saved: correct the fields marked above.' });
      return;
    }
    const fields = { patientId: context.patientId, plannedFor, label, input: computationA.input, checklist };
    const reason = context.savedPlanId === null ? dateReason.trim() : 'Plan edited';
    if (draftB !== null && context.savedPlanId === null) {
      if (computationB.input === null) {
        setSaveMessage({
          kind: 'failed',
          text: 'Not saved: correct the plan inputs marked in plan B first.',
        });
        return;
      }
      const variantFields = { ...fields, input: computationB.input };
      withInitials((enteredBy) => void writeComparison(fields, variantFields, { enteredBy, reason }));
      return;
    }
    // Without initials, a prompt opens beside the button, focused, and the save goes ahead once given.
    withInitials((enteredBy) => void write(fields, { enteredBy, reason }));
  }

  /** A new plan with a variant open: both are saved, B as the alternative of A, A chosen. */
  async function writeComparison(
    fields: PlanFields,
    variantFields: PlanFields,
    meta: { enteredBy: string; reason: string },
  ) {
    const answer = await api.invoke('plans:save-comparison', { fields, variantFields, meta });
    if (!answer.ok) {
      setSaveErrors(fieldErrorsFromContract(answer.error));
      setSaveMessage({ kind: 'failed', text: `Not saved: ${answer.error.message}` });
      return;
    }
    const { plan, variant } = answer.value;
    setSavedEditable({ draft: draftA, checklist, plannedFor, label });
    setNewer(null);
    setContext((current) => ({
      ...current,
      savedPlanId: plan.id,
      savedStamp: `${displayDateTime(plan.stamp.enteredAt)} by ${plan.stamp.enteredBy}`,
    }));
    setComparison({
      chosenId: plan.id,
      plans: [
        { id: plan.id, label: plan.label, variantOf: null },
        { id: variant.id, label: variant.label, variantOf: plan.id },
      ],
    });
    setDraftB(null);
    setActive('A');
    setSaveMessage({
      kind: 'saved',
      text: `Saved plan A as plan ${plan.id} (the chosen plan) and plan B as plan ${variant.id}, its alternative (model ${plan.modelVersion}).`,
    });
    window.history.replaceState(null, '', href('plans', plan.id));
  }

  /**
   * The plan shown (plan B when a variant is open, else the form as edited) saved as a new plan
   * marked as an alternative of the saved one, which is not changed; the new plan then opens.
   */
  function saveAsVariant() {
    const of = context.savedPlanId;
    const input = draftB !== null ? computationB.input : computationA.input;
    setSaveMessage(null);
    if (of === null) return;
    if (input === null) {
      setSaveMessage({ kind: 'failed', text: 'Not saved: correct the plan inputs marked first.' });
      return;
    }
    const fields = { patientId: context.patientId, plannedFor, label, input, checklist };
    withInitials(
      (enteredBy) =>
        void api
          .invoke('plans:save-variant', { of, fields, meta: { enteredBy, reason: '' } })
          .then((answer) => {
            if (!answer.ok) {
              setSaveMessage({ kind: 'failed', text: `Not saved: ${answer.error.message}` });
              return;
            }
            setSaveMessage({
              kind: 'saved',
              text: `Saved as plan ${answer.value.id}, an alternative of plan ${of}, which is not changed.`,
            });
            window.location.hash = href('plans', answer.value.id);
          }),
    );
  }

  function choose(planId: number) {
    withInitials(
      (enteredBy) =>
        void api.invoke('plans:choose', { id: planId, meta: { enteredBy, reason: '' } }).then((answer) => {
          if (!answer.ok) {
            setSaveMessage({ kind: 'failed', text: `Not chosen: ${answer.error.message}` });
            return;
          }
          setComparison((current) =>
            current === null ? null : { ...current, chosenId: answer.value.chosenId },
          );
          setSaveMessage({ kind: 'saved', text: `Plan ${answer.value.chosenId} is now the chosen plan.` });
        }),
    );
  }

  async function write(fields: PlanFields, meta: { enteredBy: string; reason: string }) {
    const answer =
      context.savedPlanId === null
        ? await api.invoke('plans:save', { fields, meta })
        : await api.invoke('plans:correct', { id: context.savedPlanId, fields, meta });
    if (!answer.ok) {
      setSaveErrors(
        Object.fromEntries(
          Object.entries(fieldErrorsFromContract(answer.error)).map(([field, message]) => [
            field.replace(/^fields\./, ''),
            message,
          ]),
        ),
      );
      setSaveMessage({ kind: 'failed', text: `Not saved: ${answer.error.message}` });
      return;
    }
    setSavedEditable({ draft: draftA, checklist, plannedFor, label });
    setNewer(null);
    setContext((current) => ({
      ...current,
      savedPlanId: answer.value.id,
      savedStamp: `${displayDateTime(answer.value.stamp.enteredAt)} by ${answer.value.stamp.enteredBy}`,
    }));
    setSaveMessage({
      kind: 'saved',
      text: `Saved as plan ${answer.value.id} (model ${answer.value.modelVersion}).`,
    });
    window.history.replaceState(null, '', href('plans', answer.value.id));
  }

  // A new plan dated more than a year either side of today is kept only with a reason.
  const needsDateReason =
    context.savedPlanId === null &&
    planFieldsSchema.shape.plannedFor.safeParse(plannedFor).success &&
    plannedDateProblem(plannedFor, localDateOf(new Date()), false) !== null;
  const editingB = active === 'B' && draftB !== null;
  // Stable, so the memoised form does not re-render when only the results change.
  const setShownDraft = useCallback(
    (draft: PlanDraft) => (editingB ? setDraftB(draft) : setDraftA(draft)),
    [editingB],
  );

  if (loadFailure !== null)
    return (
      <p className="form-error" role="alert">
        {loadFailure}
      </p>
    );
  if (!loaded) return <p aria-busy="true">Loading…</p>;
  const comparing = draftB !== null;
  // A variant open on a new plan is saved with it; editing a saved plan saves plan A only.
  const savesComparison = comparing && context.savedPlanId === null;

  return (
    <section className="screen" aria-labelledby="planning-title">
      <h1 id="planning-title">
        {context.savedPlanId === null ? 'New anaesthetic plan' : `Anaesthetic plan ${context.savedPlanId}`}
        {context.patientLabel !== null && <span className="muted"> · {context.patientLabel}</span>}
      </h1>
      {context.patientId !== null && (
        <p>
          <a href={href('patients', context.patientId)}>← Patient record</a>
        </p>
      )}
      <div className="save-bar">
        <TextField
          label="Planned for"
          name="plannedFor"
          type="date"
          value={plannedFor}
          error={saveErrors['plannedFor']}
          onChange={setPlannedFor}
        />
        {needsDateReason && (
          <TextField
            label="Reason (for a date more than a year away)"
            name="reason"
            value={dateReason}
            error={saveErrors['meta.reason']}
            onChange={setDateReason}
          />
        )}
        <TextField
          label="Label"
          name="label"
          value={label}
          placeholder="e.g. crop biopsy"
          error={saveErrors['label']}
          onChange={setLabel}
        />
        <button type="button" className="primary" onClick={() => void save()}>
          {savesComparison ? 'Save both plans' : context.savedPlanId === null ? 'Save plan' : 'Save changes'}
        </button>
        {context.savedPlanId !== null && (
          <button type="button" onClick={saveAsVariant}>
            Save as a variant
          </button>
        )}
        {context.savedPlanId !== null && (
          <a className="button-link secondary" href={href('worksheets', context.savedPlanId)}>
            Open worksheet
          </a>
        )}
        {gate}
        <SaveStatus message={saveMessage} />
        {context.savedStamp !== null && <p className="muted">Last saved {context.savedStamp}.</p>}
        {newer !== null && (
          <p className="notice" role="status">
            This plan was changed on another workstation or in another tab while you were editing it (plan{' '}
            {newer.plan.id}, saved {displayDateTime(newer.plan.stamp.enteredAt)} by{' '}
            {newer.plan.stamp.enteredBy}
            ).{' '}
            <button
              type="button"
              onClick={() => {
                showSaved(newer);
                window.history.replaceState(null, '', href('plans', newer.plan.id));
              }}
            >
              Show the new plan
            </button>{' '}
            (your changes here are then dropped)
          </p>
        )}
        {comparing && context.savedPlanId !== null && (
          <p className="hint">
            Saving changes saves plan A; “Save as a variant” saves plan B as a new plan beside it.
          </p>
        )}
      </div>
      {comparison !== null && context.savedPlanId !== null && (
        <section className="panel saved-comparison" aria-labelledby="saved-comparison-heading">
          <h2 id="saved-comparison-heading">Saved comparison</h2>
          <ul>
            {comparison.plans.map((member) => (
              <li key={member.id}>
                {member.id === context.savedPlanId ? (
                  <strong>This plan ({member.id})</strong>
                ) : (
                  <a href={href('plans', member.id)}>Open plan {member.id}</a>
                )}
                {member.label === '' ? '' : ` · ${member.label}`}
                {member.variantOf === null
                  ? ' · compared plan'
                  : ` · alternative of plan ${member.variantOf}`}
                {member.id === comparison.chosenId ? (
                  <strong> · chosen</strong>
                ) : (
                  member.id === context.savedPlanId && (
                    <>
                      {' · '}
                      <button type="button" onClick={() => choose(member.id)}>
                        Use this plan
                      </button>
                    </>
                  )
                )}
              </li>
            ))}
          </ul>
        </section>
      )}
      <div className="variant-tabs" role="group" aria-label="Plan variants">
        <button type="button" aria-pressed={active === 'A'} onClick={() => setActive('A')}>
          Plan A
        </button>
        {comparing ? (
          <>
            <button type="button" aria-pressed={active === 'B'} onClick={() => setActive('B')}>
              Plan B
            </button>
            <button
              type="button"
              onClick={() => {
                if (draftB !== null) setDraftA(draftB);
                setDraftB(null);
                setActive('A');
              }}
            >
              Keep B as the plan
            </button>
            <button
              type="button"
              onClick={() => {
                setDraftB(null);
                setActive('A');
              }}
            >
              Stop comparing
            </button>
          </>
        ) : (
          <button
            type="button"
            onClick={() => {
              setDraftB(draftA);
              setActive('B');
            }}
          >
            Compare with a variant
          </button>
        )}
      </div>
      <div className="planning">
        <div>
          <PlanForm
            draft={shownDraft}
            problems={shownComputation.problems}
            species={species}
            speciesLocked={context.patientId !== null}
            onChange={setShownDraft}
          />
          <ChecklistPanel checklist={checklist} onChange={setChecklist} />
        </div>
        <div>
          {comparing &&
            computationA.result !== null &&
            computationB.result !== null &&
            computationA.input !== null &&
            computationB.input !== null && (
              <section className="panel" aria-labelledby="compare-heading">
                <h2 id="compare-heading">Plan A and plan B</h2>
                <CompareTable
                  inputA={computationA.input}
                  inputB={computationB.input}
                  resultA={computationA.result}
                  resultB={computationB.result}
                />
                <h3>Cautions of plan {active === 'A' ? 'B' : 'A'}</h3>
                <CautionList
                  cautions={cautionsForPatient(
                    (active === 'A' ? computationB.result : computationA.result).cautions,
                    patientSex,
                  )}
                />
              </section>
            )}
          {shownComputation.failure !== null && (
            <p className="form-error" role="alert">
              The model could not run: {shownComputation.failure}
            </p>
          )}
          {shownComputation.result === null ? (
            <p className="muted" aria-live="polite">
              {Object.keys(shownComputation.problems).length > 0
                ? 'Enter the body mass and the marked fields to see predictions.'
                : 'Computing…'}
            </p>
          ) : (
            <PlanResults
              result={{
                ...shownComputation.result,
                cautions: cautionsForPatient(shownComputation.result.cautions, patientSex),
              }}
              pending={shownComputation.pending || Object.keys(shownComputation.problems).length > 0}
              band={shownComputation.band}
              setFreshGasLpm={shownComputation.input?.freshGasLpm ?? null}
              compareWith={
                comparing && computationA.result !== null && computationB.result !== null
                  ? active === 'A'
                    ? { label: 'plan B', result: computationB.result }
                    : { label: 'plan A', result: computationA.result }
                  : undefined
              }
            />
          )}
          {shownComputation.result !== null && (
            <PlanCalibration
              result={shownComputation.result}
              speciesKey={shownComputation.input?.speciesId}
              savedPlanId={context.savedPlanId}
            />
          )}
        </div>
      </div>
    </section>
  );
}
