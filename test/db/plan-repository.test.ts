import fs from 'node:fs';
import path from 'node:path';
import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { checklistSchema } from '../../app/contract/plan-records.js';
import { planInputSchema, planResultSchema } from '../../app/contract/plan.js';
import { computePlan, modelVersion } from '../../app/core/model/compute-plan.js';
import { speciesReference } from '../../app/core/species-reference.js';
import type { ClinicDb } from '../../db/clinic-db.js';
import { createPlanRepository, type PlanToStore } from '../../db/repositories/plan-repository.js';
import { findProjectRoot } from '../../main/back-end/project-paths.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';

const t0 = new Date('2026-12-01T08:00:00.000Z');
const t1 = new Date('2026-12-01T09:00:00.000Z');
const t2 = new Date('2026-12-01T10:00:00.000Z');
const meta = { enteredBy: 'RW', reason: '' };

// Pip's plan from the examples (a budgerigar, mask, isoflurane), computed once by the model.
const pipInput = planInputSchema.parse(
  JSON.parse(
    fs.readFileSync(
      path.join(findProjectRoot(), 'examples', 'plans', 'pip-budgerigar-mask-isoflurane.json'),
      'utf8',
    ),
  ),
);
const pipResult = planResultSchema.parse(computePlan(pipInput, { species: speciesReference }));

function planFor(plannedFor: string, label: string, patientId: number | null = null): PlanToStore {
  return {
    patientId,
    plannedFor,
    label,
    input: pipInput,
    result: pipResult,
    checklist: checklistSchema.parse({ asaGrade: 2, notes: '' }),
    modelVersion,
  };
}

/** A patient row for plans to belong to (the patients table's own module writes real ones). */
async function addPatient(clinic: ClinicDb): Promise<number> {
  const result = await sql<{
    id: number;
  }>`INSERT INTO patients (created_at) VALUES (${t0.toISOString()}) RETURNING id`.execute(clinic.kysely);
  return result.rows[0]?.id as number;
}

async function countRows(clinic: ClinicDb, table: 'plans' | 'plan_choices'): Promise<number> {
  const result = await sql<{ n: number }>`SELECT count(*) AS n FROM ${sql.table(table)}`.execute(
    clinic.kysely,
  );
  return Number(result.rows[0]?.n);
}

describe.each(testEngines)('plan repository on %s', (engine) => {
  it('saves a plan and reads it back whole, with its stamp', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const plans = createPlanRepository(clinic);
    const patientId = await addPatient(clinic);
    const saved = await plans.save(planFor('2026-12-02', 'Pip, wing radiograph', patientId), meta, t0);
    expect(saved).toEqual({
      id: saved.id,
      patientId,
      plannedFor: '2026-12-02',
      label: 'Pip, wing radiograph',
      input: pipInput,
      result: pipResult,
      checklist: checklistSchema.parse({ asaGrade: 2, notes: '' }),
      modelVersion,
      variantOf: null,
      stamp: {
        versionId: saved.id,
        enteredAt: t0.toISOString(),
        enteredBy: 'RW',
        reason: '',
        correctsId: null,
      },
    });
    expect(await plans.get(saved.id)).toEqual(saved);
    expect(await plans.get(saved.id + 100)).toBeNull();
    expect(await plans.isSuperseded(saved.id)).toBe(false);
  });

  it('a correction is a new version: lists show only the newest, history has all, a stale edit is refused', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const plans = createPlanRepository(clinic);
    const patientId = await addPatient(clinic);
    const first = await plans.save(planFor('2026-12-02', 'first', patientId), meta, t0);
    const other = await plans.save(planFor('2026-12-03', 'other', patientId), meta, t0);
    const loose = await plans.save(planFor('2026-12-02', 'no patient'), meta, t0);
    const second = await plans.correct(
      first.id,
      planFor('2026-12-02', 'second', patientId),
      { enteredBy: 'CD', reason: 'Later start' },
      t1,
    );
    if (typeof second === 'string') throw new Error(second);
    const third = await plans.correct(
      second.id,
      planFor('2026-12-02', 'third', patientId),
      { enteredBy: 'CD', reason: 'Label' },
      t2,
    );
    if (typeof third === 'string') throw new Error(third);
    expect(third.stamp).toMatchObject({ correctsId: second.id, enteredBy: 'CD', reason: 'Label' });

    expect(await plans.correct(first.id, planFor('2026-12-02', 'late', patientId), meta, t2)).toBe('stale');
    expect(await plans.correct(9999, planFor('2026-12-02', 'none', patientId), meta, t2)).toBe('not-found');
    expect(await plans.isSuperseded(first.id)).toBe(true);
    expect(await plans.isSuperseded(third.id)).toBe(false);

    // Newest planned date first, then newest id.
    expect((await plans.listForPatient(patientId)).map((plan) => plan.label)).toEqual(['other', 'third']);
    expect((await plans.listForDay('2026-12-02')).map((plan) => plan.label)).toEqual(['no patient', 'third']);
    expect((await plans.listRecent(2)).map((plan) => plan.id)).toEqual([other.id, third.id]);
    expect((await plans.listRecent(10)).map((plan) => plan.id)).toEqual([other.id, third.id, loose.id]);
    // The whole chain from any of its versions, newest first.
    for (const id of [first.id, second.id, third.id])
      expect((await plans.history(id)).map((plan) => plan.label)).toEqual(['third', 'second', 'first']);
    expect(await plans.history(9999)).toEqual([]);
    expect(await countRows(clinic, 'plans')).toBe(5);
  });

  it('a comparison keeps both plans; the newest choice counts and follows corrections', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const plans = createPlanRepository(clinic);
    const patientId = await addPatient(clinic);
    const lone = await plans.save(planFor('2026-12-02', 'alone', patientId), meta, t0);
    const { plan, variant } = await plans.saveComparison(
      planFor('2026-12-02', 'mask', patientId),
      planFor('2026-12-02', 'chamber', patientId),
      meta,
      t0,
    );
    expect(variant.variantOf).toBe(plan.id);
    expect(await plans.comparisonOf(plan.id)).toEqual({
      comparisonId: plan.id,
      planIds: [plan.id, variant.id],
      chosenId: plan.id,
    });
    expect(await plans.comparisonOf(variant.id)).toEqual(await plans.comparisonOf(plan.id));
    expect(await plans.comparisonOf(lone.id)).toBeNull();
    expect(await plans.comparisonOf(9999)).toBeNull();

    expect(await plans.choose(variant.id, { enteredBy: 'CD', reason: '' }, t1)).toBe('chosen');
    expect((await plans.comparisonOf(plan.id))?.chosenId).toBe(variant.id);

    // A correction of either plan keeps the comparison and the choice, by the newest ids.
    const newerVariant = await plans.correct(
      variant.id,
      planFor('2026-12-02', 'chamber, longer', patientId),
      { enteredBy: 'CD', reason: 'Longer' },
      t2,
    );
    if (typeof newerVariant === 'string') throw new Error(newerVariant);
    expect(newerVariant.variantOf).toBe(plan.id);
    const newerPlan = await plans.correct(
      plan.id,
      planFor('2026-12-02', 'mask, lower flow', patientId),
      { enteredBy: 'CD', reason: 'Flow' },
      t2,
    );
    if (typeof newerPlan === 'string') throw new Error(newerPlan);
    expect(await plans.comparisonOf(newerPlan.id)).toEqual({
      comparisonId: plan.id,
      planIds: [newerPlan.id, newerVariant.id],
      chosenId: newerVariant.id,
    });

    expect(await plans.choose(variant.id, meta, t2)).toBe('stale');
    expect(await plans.choose(lone.id, meta, t2)).toBe('no-comparison');
    expect(await plans.choose(9999, meta, t2)).toBe('not-found');
    expect(await plans.choose(newerPlan.id, meta, t2)).toBe('chosen');
    expect((await plans.comparisonOf(newerVariant.id))?.chosenId).toBe(newerPlan.id);
    // Every choice stays as a row: the first at saving, then two.
    expect(await countRows(clinic, 'plan_choices')).toBe(3);
    await expect(sql`UPDATE plan_choices SET entered_by = 'X'`.execute(clinic.kysely)).rejects.toThrow(
      /never changed in place/,
    );
    await expect(sql`DELETE FROM plan_choices`.execute(clinic.kysely)).rejects.toThrow(/never deleted/);
  });

  it('writes a comparison in one transaction: a refused variant leaves no plan and no choice', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const plans = createPlanRepository(clinic);
    await expect(
      plans.saveComparison(planFor('2026-12-02', 'mask'), planFor('2 December', 'chamber'), meta, t0),
    ).rejects.toThrow();
    expect(await countRows(clinic, 'plans')).toBe(0);
    expect(await countRows(clinic, 'plan_choices')).toBe(0);
  });
});
