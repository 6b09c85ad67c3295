import fs from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import type { RequestOf } from '../../app/contract/channels.js';
import { defaultClinicSettings } from '../../app/contract/settings.js';
import { modelVersion } from '../../app/core/model/compute-plan.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { correctionBy, enteredByRw, kiwiValues, openChecklist, pipValues } from '../support/clinic-birds.js';

const open: ChannelHarness[] = [];
afterEach(() => open.splice(0).forEach((harness) => harness.close()));
function harness(): ChannelHarness {
  const opened = openChannelHarness();
  open.push(opened);
  return opened;
}

type PlanInputRequest = RequestOf<'plans:save'>['fields']['input'];

/** A plan input from examples/plans, as the planning screen would send it. */
function example(name: string): PlanInputRequest {
  const file = path.join(findProjectRoot(), 'examples', 'plans', `${name}.json`);
  return JSON.parse(fs.readFileSync(file, 'utf8')) as PlanInputRequest;
}

const pipInput = example('pip-budgerigar-mask-isoflurane');
const doraIsofluraneInput = {
  ...example('dora-pekin-duck-endotracheal-sevoflurane'),
  agent: 'isoflurane',
} as const;

const mostlyDone = {
  ...openChecklist,
  asaGrade: 2,
  items: {
    ...openChecklist.items,
    fastingAndCrop: 'done',
    hydration: 'done',
    bloods: 'not applicable',
    equipmentLeakCheck: 'done',
    oxygenSupply: 'done',
  },
} as const;

describe('plan channels', () => {
  it('plans:save computes the snapshot in the back end and stamps it with the model version', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const saved = await api.answer('plans:save', {
      fields: {
        patientId: pip.id,
        plannedFor: '2026-12-02',
        label: 'Wing radiograph',
        input: pipInput,
        checklist: mostlyDone,
      },
      meta: enteredByRw,
    });
    expect(saved).toMatchObject({
      patientId: pip.id,
      plannedFor: '2026-12-02',
      label: 'Wing radiograph',
      input: pipInput,
      checklist: mostlyDone,
      modelVersion,
      stamp: { enteredBy: 'RW', enteredAt: '2026-12-01T09:30:00.000Z', correctsId: null },
    });
    expect(saved.result.modelVersion).toBe(modelVersion);
    expect(saved.result.consumption.liquidMl).toBeGreaterThan(0);
    expect(saved.result.oxygen.usedL).toBeGreaterThan(0);
    // The same input saved again gives the same snapshot: the model run is deterministic.
    const again = await api.answer('plans:save', {
      fields: { patientId: null, plannedFor: '2026-12-02', input: pipInput, checklist: openChecklist },
      meta: enteredByRw,
    });
    expect(again.result).toEqual(saved.result);
  });

  it('plans:save uses the clinic’s own species MAC for new plans', async () => {
    const api = harness();
    const fields = {
      patientId: null,
      plannedFor: '2026-12-02',
      input: doraIsofluraneInput,
      checklist: openChecklist,
    };
    const before = await api.answer('plans:save', { fields, meta: enteredByRw });
    // Pekin duck isoflurane MAC 1.30 % (Ludders, Mitchell & Rode 1990), from the shipped reference.
    expect(before.result.mac.valuePct).toBe(1.3);
    expect(before.result.mac.basis).toMatch(/Ludders/);
    const [duck] = (await api.answer('species:list', {})).filter((species) => species.key === 'pekin-duck');
    if (duck?.values.mac.isoflurane == null) return expect.fail('Pekin duck has no isoflurane MAC');
    await api.answer('species:correct', {
      key: 'pekin-duck',
      values: {
        ...duck.values,
        mac: {
          ...duck.values.mac,
          isoflurane: {
            ...duck.values.mac.isoflurane,
            macPct: 1.4,
            basis: 'Clinic protocol 2026 (assumption)',
          },
        },
      },
      meta: correctionBy('MK', 'Our protocol'),
    });
    const after = await api.answer('plans:save', { fields, meta: enteredByRw });
    expect(after.result.mac).toMatchObject({ valuePct: 1.4 });
    expect(after.result.mac.basis).toMatch(/Clinic protocol 2026/);
  });

  it('plans:save names the field of a bad plan input, a bad date and a patient that does not exist', async () => {
    const api = harness();
    const save = (fields: Record<string, unknown>) =>
      api.refusal('plans:save', {
        fields: {
          patientId: null,
          plannedFor: '2026-12-02',
          input: pipInput,
          checklist: openChecklist,
          ...fields,
        },
        meta: enteredByRw,
      });
    const mass = await save({ input: { ...pipInput, bodyMassG: -32 } });
    expect(mass).toMatchObject({ code: 'invalid-request', field: 'fields.input.bodyMassG' });
    const date = await save({ plannedFor: '2 December' });
    expect(date).toMatchObject({
      field: 'fields.plannedFor',
      message:
        'Planned date "2 December" is not a date on the calendar; enter it as YYYY-MM-DD, e.g. 2024-03-15.',
    });
    const asa = await save({ checklist: { ...openChecklist, asaGrade: 6 } });
    expect(asa).toMatchObject({ field: 'fields.checklist.asaGrade', message: 'ASA grade is 1 to 5.' });
    const nobody = await save({ patientId: 77 });
    expect(nobody).toMatchObject({ code: 'not-found', field: 'fields.patientId' });
    const noInitials = await api.refusal('plans:save', {
      fields: { patientId: null, plannedFor: '2026-12-02', input: pipInput, checklist: openChecklist },
      meta: { enteredBy: ' ' },
    });
    expect(noInitials).toMatchObject({
      field: 'meta.enteredBy',
      message: 'Enter your initials at the top of the screen first; every record carries them.',
    });
    expect(await api.answer('plans:recent', {})).toEqual([]);
  });

  it('plans:get shows the plan with its patient, species, weight trend and version history', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const weight = { bodyCondition: 'ideal', weighedBy: 'RW' } as const;
    await api.answer('weights:add', {
      patientId: pip.id,
      values: { ...weight, weighedOn: '2026-11-01', massG: 40 },
      meta: enteredByRw,
    });
    await api.answer('weights:add', {
      patientId: pip.id,
      values: { ...weight, weighedOn: '2026-11-29', massG: 36 },
      meta: enteredByRw,
    });
    const saved = await api.answer('plans:save', {
      fields: { patientId: pip.id, plannedFor: '2026-12-02', input: pipInput, checklist: openChecklist },
      meta: enteredByRw,
    });
    const detail = await api.answer('plans:get', { id: saved.id });
    expect(detail.plan).toEqual(saved);
    expect(detail.patient?.values.name).toBe('Pip');
    expect(detail.species?.key).toBe('budgerigar');
    // 40 g to 36 g: a 10 % loss, band 10-15 % (IVAPM pain scale for birds).
    expect(detail.weightTrendText).toMatch(
      /^latest 36 g on 2026-11-29; -10\.0 % since the previous weight; /,
    );
    expect(detail.weightTrendText).toContain('band 10-15 %');
    expect(detail.history).toEqual([{ id: saved.id, stamp: saved.stamp, modelVersion }]);
    // The latest weight's day follows the clinic's date format, as every other date on the sheet.
    await api.answer('settings:save', {
      ...defaultClinicSettings,
      clinicName: 'Harbour Bird Clinic',
      dateFormat: 'D MMM YYYY',
    });
    expect((await api.answer('plans:get', { id: saved.id })).weightTrendText).toMatch(
      /^latest 36 g on 29 Nov 2026; /,
    );
  });

  it('plans:get says a missing plan was not found', async () => {
    const api = harness();
    expect(await api.refusal('plans:get', { id: 5 })).toMatchObject({
      code: 'not-found',
      message: 'Plan 5 was not found.',
    });
    expect(await api.refusal('plans:get', { id: 1.5 })).toMatchObject({
      code: 'invalid-request',
      field: 'id',
    });
  });

  it('plans:correct makes a new version; correcting the replaced one again conflicts', async () => {
    const api = harness();
    const fields = { patientId: null, plannedFor: '2026-12-02', input: pipInput, checklist: openChecklist };
    const first = await api.answer('plans:save', { fields, meta: enteredByRw });
    api.clock.set('2026-12-01T12:00:00.000Z');
    const second = await api.answer('plans:correct', {
      id: first.id,
      fields: { ...fields, label: 'Moved to Thursday', plannedFor: '2026-12-03' },
      meta: { enteredBy: 'MK', reason: 'Owner asked for Thursday' },
    });
    expect(second).toMatchObject({
      plannedFor: '2026-12-03',
      label: 'Moved to Thursday',
      stamp: { correctsId: first.id, enteredBy: 'MK', enteredAt: '2026-12-01T12:00:00.000Z' },
    });
    const history = (await api.answer('plans:get', { id: second.id })).history;
    expect(history.map((version) => version.id)).toEqual([second.id, first.id]);
    const stale = await api.refusal('plans:correct', { id: first.id, fields, meta: enteredByRw });
    expect(stale.code).toBe('conflict');
    // Who saved the newer version, when and why (the clock shows the workstation's local time).
    expect(stale.message).toMatch(
      /^Not saved: this plan was already corrected by MK at \d\d:\d\d \(reason: Owner asked for Thursday\)\. Your change was not applied; reload to see the current plan\.$/,
    );
    expect(await api.refusal('plans:correct', { id: 999, fields, meta: enteredByRw })).toMatchObject({
      code: 'not-found',
    });
    expect(
      await api.refusal('plans:correct', {
        id: second.id,
        fields: { ...fields, label: 'x'.repeat(121) },
        meta: enteredByRw,
      }),
    ).toMatchObject({ field: 'fields.label', message: 'Label must be at most 120 characters.' });
  });

  it('plans:for-patient, plans:recent and plans:day summarise the newest version of each plan', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const kiwi = await api.answer('patients:create', { values: kiwiValues, meta: enteredByRw });
    const pipPlan = await api.answer('plans:save', {
      fields: {
        patientId: pip.id,
        plannedFor: '2026-12-02',
        label: 'Radiograph',
        input: pipInput,
        checklist: mostlyDone,
      },
      meta: enteredByRw,
    });
    const kiwiInput: PlanInputRequest = {
      ...pipInput,
      patientName: 'Kiwi',
      speciesId: 'cockatiel',
      bodyMassG: 95,
    };
    const kiwiPlan = await api.answer('plans:save', {
      fields: { patientId: kiwi.id, plannedFor: '2026-12-02', input: kiwiInput, checklist: openChecklist },
      meta: enteredByRw,
    });
    const later = await api.answer('plans:save', {
      fields: {
        patientId: pip.id,
        plannedFor: '2026-12-09',
        label: 'Recheck',
        input: pipInput,
        checklist: openChecklist,
      },
      meta: enteredByRw,
    });

    const forPip = await api.answer('plans:for-patient', { patientId: pip.id });
    expect(forPip.map((plan) => plan.id)).toEqual([later.id, pipPlan.id]);
    expect(forPip[1]).toEqual({
      id: pipPlan.id,
      patientId: pip.id,
      patientName: 'Pip',
      plannedFor: '2026-12-02',
      label: 'Radiograph',
      agent: 'isoflurane',
      route: 'mask',
      circuit: 'nonRebreathing',
      bodyMassG: 32,
      liquidMl: pipPlan.result.consumption.liquidMl,
      oxygenL: pipPlan.result.oxygen.usedL,
      inductionMin: pipPlan.result.milestones.inductionMin,
      // examples/plans/pip-budgerigar-mask-isoflurane.json: 1 L/min, 4 % from 0 min, 2 % from 4, off at 30
      freshGasLpm: 1,
      schedule: [
        { atMin: 0, vaporPct: 4 },
        { atMin: 4, vaporPct: 2 },
        { atMin: 30, vaporPct: 0 },
      ],
      recoveryMin: pipPlan.result.milestones.recoveryMin,
      // A plan saved alone is in no comparison.
      variantOf: null,
      chosen: null,
      // A single-route plan is one phase from 0 min, with the flow the model recommends for it.
      phases: [
        {
          startMin: 0,
          gapMin: 0,
          route: 'mask',
          circuit: 'nonRebreathing',
          freshGasLpm: pipInput.freshGasLpm,
          recommendedLpm: pipPlan.result.flows.recommendedLpm,
          minimumLpm: pipPlan.result.flows.minimumLpm,
          dialSteps: pipInput.schedule,
        },
      ],
      // Two checklist items left open (scavenging, emergency card); the ASA grade is given.
      openChecklistItems: 2,
      asaGrade: 2,
      emergency: false,
    });
    // Seven open items plus the missing ASA grade.
    expect(forPip[0]?.openChecklistItems).toBe(8);
    expect(await api.answer('plans:for-patient', { patientId: 404 })).toEqual([]);

    const recent = await api.answer('plans:recent', { limit: 2 });
    expect(recent.map((plan) => plan.id)).toEqual([later.id, kiwiPlan.id]);

    const day = await api.answer('plans:day', { date: '2026-12-02' });
    expect(day.date).toBe('2026-12-02');
    expect(day.plans.map((plan) => plan.patientName)).toEqual(['Pip', 'Kiwi']);
    expect(Object.keys(day.totals.liquidMlByAgent)).toEqual(['isoflurane']);
    expect(day.totals.liquidMlByAgent['isoflurane']).toBeCloseTo(
      pipPlan.result.consumption.liquidMl + kiwiPlan.result.consumption.liquidMl,
      12,
    );
    expect(day.totals.oxygenL).toBeCloseTo(pipPlan.result.oxygen.usedL + kiwiPlan.result.oxygen.usedL, 12);
    expect(await api.answer('plans:day', { date: '2026-12-25' })).toEqual({
      date: '2026-12-25',
      plans: [],
      totals: { liquidMlByAgent: {}, oxygenL: 0 },
    });
  });

  it('a phased plan is summarised phase by phase: chamber (no breathing system), then a tube', async () => {
    const api = harness();
    const kiwi = await api.answer('patients:create', { values: kiwiValues, meta: enteredByRw });
    const input: PlanInputRequest = {
      ...pipInput,
      bodyMassG: 95,
      route: 'chamber',
      chamberVolumeL: 2,
      freshGasLpm: 2,
      laterPhases: [
        { startMin: 6, gapMin: 1, route: 'endotracheal', circuit: 'nonRebreathing', freshGasLpm: 0.5 },
      ],
    };
    delete (input as { circuit?: unknown }).circuit;
    delete (input as { maskDeadSpaceMl?: unknown }).maskDeadSpaceMl;
    delete (input as { maskLeakFraction?: unknown }).maskLeakFraction;
    const saved = await api.answer('plans:save', {
      fields: { patientId: kiwi.id, plannedFor: '2026-12-02', label: '', input, checklist: openChecklist },
      meta: enteredByRw,
    });
    const [summary] = await api.answer('plans:for-patient', { patientId: kiwi.id });
    expect(
      summary?.phases.map(({ startMin, gapMin, route, circuit, freshGasLpm }) => ({
        startMin,
        gapMin,
        route,
        circuit,
        freshGasLpm,
      })),
    ).toEqual([
      { startMin: 0, gapMin: 0, route: 'chamber', circuit: null, freshGasLpm: 2 },
      { startMin: 6, gapMin: 1, route: 'endotracheal', circuit: 'nonRebreathing', freshGasLpm: 0.5 },
    ]);
    expect(summary?.phases[1]?.recommendedLpm).toBe(saved.result.phases[1]?.flows.recommendedLpm);
    expect(summary?.phases[1]?.dialSteps).toEqual(saved.result.phases[1]?.dialSteps);
  });

  it('plans:for-patient, plans:recent and plans:day name the field they refuse', async () => {
    const api = harness();
    expect(await api.refusal('plans:for-patient', { patientId: 0 })).toMatchObject({
      code: 'invalid-request',
      field: 'patientId',
    });
    expect(await api.refusal('plans:recent', { limit: 501 })).toMatchObject({ field: 'limit' });
    expect(await api.refusal('plans:day', { date: '2026-12-2' })).toMatchObject({
      field: 'date',
      message: 'Day "2026-12-2" is not a date on the calendar; enter it as YYYY-MM-DD, e.g. 2024-03-15.',
    });
  });
  it('plans:save-comparison keeps both variants, the second marked as an alternative, one chosen', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const fields = {
      patientId: pip.id,
      plannedFor: '2026-12-02',
      label: 'Wing radiograph',
      input: pipInput,
      checklist: mostlyDone,
    };
    const variantFields = {
      ...fields,
      label: 'Wing radiograph, lower flow',
      input: { ...pipInput, freshGasLpm: pipInput.freshGasLpm / 2 },
    };
    const { plan, variant } = await api.answer('plans:save-comparison', {
      fields,
      variantFields,
      meta: enteredByRw,
    });
    expect(plan).toMatchObject({ label: 'Wing radiograph', variantOf: null });
    expect(variant).toMatchObject({ label: 'Wing radiograph, lower flow', variantOf: plan.id });
    expect(variant.input.freshGasLpm).toBe(pipInput.freshGasLpm / 2);

    const chosenOf = async () =>
      (await api.answer('plans:day', { date: '2026-12-02' })).plans.map((line) => ({
        id: line.id,
        variantOf: line.variantOf,
        chosen: line.chosen,
      }));
    // The compared plan is the chosen one until the clinic chooses otherwise.
    expect(await chosenOf()).toEqual([
      { id: plan.id, variantOf: null, chosen: true },
      { id: variant.id, variantOf: plan.id, chosen: false },
    ]);
    const detail = await api.answer('plans:get', { id: variant.id });
    expect(detail.comparison).toEqual({
      chosenId: plan.id,
      plans: [
        { id: plan.id, label: 'Wing radiograph', variantOf: null },
        { id: variant.id, label: 'Wing radiograph, lower flow', variantOf: plan.id },
      ],
    });

    api.clock.set('2026-12-01T12:00:00.000Z');
    expect(await api.answer('plans:choose', { id: variant.id, meta: enteredByRw })).toEqual({
      chosenId: variant.id,
    });
    expect(await chosenOf()).toEqual([
      { id: plan.id, variantOf: null, chosen: false },
      { id: variant.id, variantOf: plan.id, chosen: true },
    ]);
    // The day's totals count the chosen plan only: the other is not given.
    const totals = (await api.answer('plans:day', { date: '2026-12-02' })).totals;
    expect(totals.oxygenL).toBe(variant.result.oxygen.usedL);
    expect(totals.liquidMlByAgent).toEqual({ isoflurane: variant.result.consumption.liquidMl });

    // A correction of the chosen variant stays the chosen plan and stays an alternative.
    const corrected = await api.answer('plans:correct', {
      id: variant.id,
      fields: { ...variantFields, label: 'Lower flow, checked' },
      meta: correctionBy('MK', 'Label made clearer'),
    });
    expect(corrected.variantOf).toBe(plan.id);
    expect(await chosenOf()).toEqual([
      { id: plan.id, variantOf: null, chosen: false },
      { id: corrected.id, variantOf: plan.id, chosen: true },
    ]);
    expect(await api.refusal('plans:choose', { id: variant.id, meta: enteredByRw })).toMatchObject({
      code: 'conflict',
    });
    await api.answer('plans:choose', { id: plan.id, meta: enteredByRw });
    expect((await chosenOf()).filter((line) => line.chosen === true)).toEqual([
      { id: plan.id, variantOf: null, chosen: true },
    ]);
  });

  it('plans:choose refuses a plan outside a comparison; a comparison is one patient on one day', async () => {
    const api = harness();
    const fields = { patientId: null, plannedFor: '2026-12-02', input: pipInput, checklist: openChecklist };
    const single = await api.answer('plans:save', { fields, meta: enteredByRw });
    expect(single.variantOf).toBeNull();
    expect(await api.refusal('plans:choose', { id: single.id, meta: enteredByRw })).toMatchObject({
      code: 'invalid-request',
      message: 'This plan was not saved as part of a comparison.',
    });
    expect(await api.refusal('plans:choose', { id: 999, meta: enteredByRw })).toMatchObject({
      code: 'not-found',
    });
    const [line] = (await api.answer('plans:day', { date: '2026-12-02' })).plans;
    expect(line).toMatchObject({ variantOf: null, chosen: null });
    expect((await api.answer('plans:get', { id: single.id })).comparison).toBeNull();
    expect(
      await api.refusal('plans:save-comparison', {
        fields,
        variantFields: { ...fields, plannedFor: '2026-12-03' },
        meta: enteredByRw,
      }),
    ).toMatchObject({ code: 'invalid-request', field: 'variantFields.plannedFor' });
  });

  it('plans:save-variant saves a variant of a saved plan as a new plan, the saved one unchanged and chosen', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const fields = {
      patientId: pip.id,
      plannedFor: '2026-12-02',
      label: 'Wing radiograph',
      input: pipInput,
      checklist: mostlyDone,
    };
    const saved = await api.answer('plans:save', { fields, meta: enteredByRw });
    const before = await api.answer('plans:get', { id: saved.id });
    const variant = await api.answer('plans:save-variant', {
      of: saved.id,
      fields: { ...fields, label: 'Wing radiograph, lower flow', input: { ...pipInput, freshGasLpm: 0.5 } },
      meta: enteredByRw,
    });
    expect(variant).toMatchObject({ label: 'Wing radiograph, lower flow', variantOf: saved.id });
    expect(variant.id).toBeGreaterThan(saved.id);
    // The saved plan is not changed: same row, same version, no later version.
    const after = await api.answer('plans:get', { id: saved.id });
    expect(after.plan).toEqual(before.plan);
    expect(after.history).toEqual(before.history);
    // The two are now a comparison, the saved plan chosen until the clinic chooses otherwise.
    expect(after.comparison).toEqual({
      chosenId: saved.id,
      plans: [
        { id: saved.id, label: 'Wing radiograph', variantOf: null },
        { id: variant.id, label: 'Wing radiograph, lower flow', variantOf: saved.id },
      ],
    });
    // A variant of the variant joins the same comparison; the choice stays.
    const third = await api.answer('plans:save-variant', {
      of: variant.id,
      fields: {
        ...fields,
        label: 'Wing radiograph, sevoflurane',
        input: { ...pipInput, agent: 'sevoflurane' },
      },
      meta: enteredByRw,
    });
    expect(third.variantOf).toBe(saved.id);
    const day = (await api.answer('plans:day', { date: '2026-12-02' })).plans;
    expect(day.map((line) => [line.id, line.variantOf, line.chosen])).toEqual([
      [saved.id, null, true],
      [variant.id, saved.id, false],
      [third.id, saved.id, false],
    ]);
  });

  it('plans:save-variant refuses another day, a missing plan and a replaced version', async () => {
    const api = harness();
    const fields = {
      patientId: null,
      plannedFor: '2026-12-02',
      label: '',
      input: pipInput,
      checklist: openChecklist,
    };
    const saved = await api.answer('plans:save', { fields, meta: enteredByRw });
    expect(
      await api.refusal('plans:save-variant', {
        of: saved.id,
        fields: { ...fields, plannedFor: '2026-12-03' },
        meta: enteredByRw,
      }),
    ).toMatchObject({ code: 'invalid-request', field: 'fields.plannedFor' });
    expect(await api.refusal('plans:save-variant', { of: 999, fields, meta: enteredByRw })).toMatchObject({
      code: 'not-found',
      field: 'of',
    });
    await api.answer('plans:correct', {
      id: saved.id,
      fields: { ...fields, label: 'corrected' },
      meta: { enteredBy: 'RW', reason: 'Label added' },
    });
    expect(
      await api.refusal('plans:save-variant', { of: saved.id, fields, meta: enteredByRw }),
    ).toMatchObject({
      code: 'conflict',
    });
    // Nothing was saved by the refusals: the plan has no comparison.
    expect((await api.answer('plans:get', { id: saved.id })).comparison).toBeNull();
  });
});
