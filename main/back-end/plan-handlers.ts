import { ConcurrentChangeError, concurrentChangeMessage } from './concurrent-change.js';
import { laterVersion } from '../../db/repositories/version-chain.js';
import type { ParsedRequestOf, ResponseOf } from '../../app/contract/channels.js';
import type { planChannels, PlanFields, SavedPlan } from '../../app/contract/plan-records.js';
import { planResultSchema, type PlanInput } from '../../app/contract/plan.js';
import { localDateOf, plannedDateProblem } from '../../app/contract/input-rules.js';
import { speciesToReference } from '../../app/contract/species-mapping.js';
import { computePlan, modelVersion } from '../../app/core/model/compute-plan.js';
import { phasesOfPlan } from '../../app/core/plan-phases.js';
import { weightTrend } from '../../app/core/weight-trend.js';
import { defaultDateFormat, formatCalendarDate } from '../../app/core/date-format.js';
import { displayMass } from '../../app/core/units.js';
import type { ClinicDb } from '../../db/clinic-db.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createPlanRepository } from '../../db/repositories/plan-repository.js';
import { createSettingsRepository } from '../../db/repositories/settings-repository.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { createWeightRepository } from '../../db/repositories/weight-repository.js';
import { RecordError } from './record-handlers.js';

type PlanChannel = keyof typeof planChannels;
type PlanHandlerTable = { [C in PlanChannel]: (request: ParsedRequestOf<C>) => Promise<ResponseOf<C>> };

function openItems(plan: SavedPlan): number {
  return (
    Object.values(plan.checklist.items).filter((state) => state === 'open').length +
    (plan.checklist.asaGrade === null ? 1 : 0)
  );
}

/** Handlers for planning: compute, save (the snapshot is computed here, never taken from the screen), read. */
export function createPlanHandlers(now: () => Date, clinic: ClinicDb): PlanHandlerTable {
  const species = createSpeciesRepository(clinic);
  const patients = createPatientRepository(clinic);
  const weights = createWeightRepository(clinic);
  const settings = createSettingsRepository(clinic);
  const plans = createPlanRepository(clinic);

  // Parsing the model's answer with the contract's schema both checks it and copies its
  // read-only arrays into the plain shape the contract stores.
  const compute = async (input: PlanInput) =>
    planResultSchema.parse(computePlan(input, { species: (await species.list()).map(speciesToReference) }));

  async function toStore(fields: PlanFields, reasonGiven: boolean) {
    if (fields.patientId !== null && (await patients.get(fields.patientId)) === null)
      throw new RecordError('not-found', `Patient ${fields.patientId} was not found.`, 'fields.patientId');
    const dateProblem = plannedDateProblem(fields.plannedFor, localDateOf(now()), reasonGiven);
    if (dateProblem !== null) throw new RecordError('invalid-request', dateProblem, 'fields.plannedFor');
    return { ...fields, result: await compute(fields.input), modelVersion };
  }

  async function summary(plan: SavedPlan) {
    const comparison = await plans.comparisonOf(plan.id);
    const patient = plan.patientId === null ? null : await patients.get(plan.patientId);
    return {
      id: plan.id,
      patientId: plan.patientId,
      patientName: patient?.values.name ?? plan.input.patientName ?? null,
      plannedFor: plan.plannedFor,
      label: plan.label,
      agent: plan.input.agent,
      route: plan.input.route,
      circuit: plan.input.circuit ?? null,
      bodyMassG: plan.input.bodyMassG,
      liquidMl: plan.result.consumption.liquidMl,
      oxygenL: plan.result.oxygen.usedL,
      inductionMin: plan.result.milestones.inductionMin,
      freshGasLpm: plan.input.freshGasLpm,
      schedule: plan.input.schedule.map((step) => ({ atMin: step.atMin, vaporPct: step.vaporPct })),
      recoveryMin: plan.result.milestones.recoveryMin,
      phases: phasesOfPlan(plan.input, plan.result).map((phase) => ({
        startMin: phase.startMin,
        gapMin: phase.gapMin,
        route: phase.route,
        circuit: phase.route === 'chamber' ? null : phase.circuit,
        freshGasLpm: phase.freshGasLpm,
        recommendedLpm: phase.flows.recommendedLpm,
        minimumLpm: phase.flows.minimumLpm,
        dialSteps: phase.dialSteps.map((step) => ({ atMin: step.atMin, vaporPct: step.vaporPct })),
      })),
      openChecklistItems: openItems(plan),
      // The compared plan's newest version, which screens open.
      variantOf: plan.variantOf === null ? null : (comparison?.planIds[0] ?? plan.variantOf),
      chosen: comparison === null ? null : comparison.chosenId === plan.id,
      asaGrade: plan.checklist.asaGrade,
      emergency: plan.checklist.emergency,
    };
  }

  /** One plan at a time: a pool or the SQLite connection is not flooded by a long list. */
  async function summaries(list: readonly SavedPlan[]) {
    const lines = [];
    for (const plan of list) lines.push(await summary(plan));
    return lines;
  }

  return {
    'plans:save': async (request) =>
      plans.save(await toStore(request.fields, request.meta.reason !== ''), request.meta, now()),
    'plans:save-comparison': async (request) => {
      const reasonGiven = request.meta.reason !== '';
      const first = await toStore(request.fields, reasonGiven);
      const second = await toStore(request.variantFields, reasonGiven);
      if (first.patientId !== second.patientId || first.plannedFor !== second.plannedFor)
        throw new RecordError(
          'invalid-request',
          'Both plans of a comparison are for the same patient on the same day.',
          'variantFields.plannedFor',
        );
      return plans.saveComparison(first, second, request.meta, now());
    },
    'plans:save-variant': async (request) => {
      const saved = await plans.get(request.of);
      if (saved === null) throw new RecordError('not-found', `Plan ${request.of} was not found.`, 'of');
      const variant = await toStore(request.fields, request.meta.reason !== '');
      if (variant.patientId !== saved.patientId || variant.plannedFor !== saved.plannedFor)
        throw new RecordError(
          'invalid-request',
          'A variant is for the same patient on the same day as the plan it is compared with.',
          'fields.plannedFor',
        );
      const outcome = await plans.saveVariant(request.of, variant, request.meta, now());
      if (outcome === 'not-found')
        throw new RecordError('not-found', `Plan ${request.of} was not found.`, 'of');
      if (outcome === 'stale') {
        // Who saved the newer version, where, when and why; the variant was not saved.
        const later = await laterVersion(clinic, 'plans', request.of);
        throw new ConcurrentChangeError(concurrentChangeMessage('plan', later, now()), later);
      }
      return outcome;
    },
    'plans:choose': async (request) => {
      const outcome = await plans.choose(request.id, request.meta, now());
      if (outcome === 'not-found')
        throw new RecordError('not-found', `Plan ${request.id} was not found.`, 'id');
      if (outcome === 'stale')
        throw new RecordError(
          'conflict',
          'This plan was changed since you opened it; open its newest version.',
          'id',
        );
      if (outcome === 'no-comparison')
        throw new RecordError('invalid-request', 'This plan was not saved as part of a comparison.', 'id');
      return { chosenId: request.id };
    },
    'plans:correct': async (request) => {
      const saved = await plans.correct(
        request.id,
        await toStore(request.fields, request.meta.reason !== ''),
        request.meta,
        now(),
      );
      if (saved === 'not-found')
        throw new RecordError('not-found', `Plan ${request.id} was not found.`, 'id');
      if (saved === 'stale') {
        // Who saved the newer version, where, when and why; nothing of this change was written.
        const later = await laterVersion(clinic, 'plans', request.id);
        throw new ConcurrentChangeError(concurrentChangeMessage('plan', later, now()), later);
      }
      return saved;
    },
    'plans:get': async (request) => {
      const plan = await plans.get(request.id);
      if (plan === null) throw new RecordError('not-found', `Plan ${request.id} was not found.`, 'id');
      const patient = plan.patientId === null ? null : await patients.get(plan.patientId);
      const speciesKey = patient?.values.speciesKey ?? plan.input.speciesId;
      const speciesRecord = speciesKey === undefined ? null : await species.get(speciesKey);
      let weightTrendText: string | null = null;
      if (patient !== null) {
        const list = await weights.list(patient.id);
        const range =
          speciesRecord === null
            ? null
            : {
                minG: speciesRecord.values.massMinG,
                maxG: speciesRecord.values.massMaxG,
                speciesName: speciesRecord.values.commonName,
              };
        const trend = weightTrend(
          list.map((weight) => ({ weighedOn: weight.values.weighedOn, massG: weight.values.massG })),
          range,
        );
        const parts = [];
        // In the clinic's units and date format, as the sheet writes every other mass and date.
        const clinicSettings = (await settings.get()).settings;
        if (trend.latest !== null)
          parts.push(
            `latest ${displayMass(trend.latest.massG, clinicSettings?.massUnit ?? 'g')} on ${formatCalendarDate(trend.latest.weighedOn, clinicSettings?.dateFormat ?? defaultDateFormat)}`,
          );
        if (trend.sinceLast !== null)
          parts.push(
            `${trend.sinceLast.percent >= 0 ? '+' : ''}${trend.sinceLast.percent.toFixed(1)} % since the previous weight`,
          );
        if (trend.sinceFirst !== null && list.length > 2)
          parts.push(
            `${trend.sinceFirst.percent >= 0 ? '+' : ''}${trend.sinceFirst.percent.toFixed(1)} % since the first`,
          );
        parts.push(...trend.flags.map((flag) => flag.message));
        weightTrendText = parts.length === 0 ? null : parts.join('; ');
      }
      const comparison = await plans.comparisonOf(plan.id);
      const members = new Map<number, SavedPlan>();
      for (const id of comparison?.planIds ?? []) members.set(id, (await plans.get(id)) as SavedPlan);
      return {
        plan,
        comparison:
          comparison === null
            ? null
            : {
                chosenId: comparison.chosenId,
                plans: comparison.planIds.map((id) => {
                  const member = members.get(id) as SavedPlan;
                  const variantOf = member.variantOf === null ? null : (comparison.planIds[0] ?? null);
                  return { id, label: member.label, variantOf };
                }),
              },
        patient,
        species: speciesRecord,
        weightTrendText,
        history: (await plans.history(request.id)).map((version) => ({
          id: version.id,
          stamp: version.stamp,
          modelVersion: version.modelVersion,
        })),
      };
    },
    'plans:for-patient': async (request) => summaries(await plans.listForPatient(request.patientId)),
    'plans:recent': async (request) => summaries(await plans.listRecent(request.limit)),
    'plans:day': async (request) => {
      const list = await plans.listForDay(request.date);
      const liquidMlByAgent: Record<string, number> = {};
      let oxygenL = 0;
      const lines = await summaries(list);
      // A compared plan the clinic did not choose is not given: the day's totals leave it out.
      const notChosen = new Set(lines.filter((line) => line.chosen === false).map((line) => line.id));
      for (const plan of list) {
        if (notChosen.has(plan.id)) continue;
        liquidMlByAgent[plan.input.agent] =
          (liquidMlByAgent[plan.input.agent] ?? 0) + plan.result.consumption.liquidMl;
        oxygenL += plan.result.oxygen.usedL;
      }
      return { date: request.date, plans: lines, totals: { liquidMlByAgent, oxygenL } };
    },
  };
}
