import { sql as sqlText, type Generated, type Selectable } from 'kysely';
import type { Checklist, SavedPlan } from '../../app/contract/plan-records.js';
import type { PlanInput, PlanResult } from '../../app/contract/plan.js';
import { writeTransaction, type Sql } from '../clinic-db.js';
import { stampOf } from './version-chain.js';

type PlansTable = {
  id: Generated<number>;
  patient_id: number | null;
  corrects_id: number | null;
  variant_of: number | null;
  planned_for: string;
  label: string;
  input_json: string;
  result_json: string;
  checklist_json: string;
  model_version: string;
  entered_at: string;
  entered_by: string;
  reason: string;
};

type PlanChoicesTable = {
  id: Generated<number>;
  comparison_id: number;
  chosen_id: number;
  entered_at: string;
  entered_by: string;
  reason: string;
};

type Tables = { plans: PlansTable; plan_choices: PlanChoicesTable };

type PlanRow = Selectable<PlansTable>;

type Meta = { enteredBy: string; reason: string };

export type PlanToStore = {
  readonly patientId: number | null;
  readonly plannedFor: string;
  readonly label: string;
  readonly input: PlanInput;
  readonly result: PlanResult;
  readonly checklist: Checklist;
  readonly modelVersion: string;
};

function rowToPlan(row: PlanRow): SavedPlan {
  return {
    id: row.id,
    patientId: row.patient_id,
    plannedFor: row.planned_for,
    label: row.label,
    input: JSON.parse(row.input_json) as PlanInput,
    result: JSON.parse(row.result_json) as PlanResult,
    checklist: JSON.parse(row.checklist_json) as Checklist,
    modelVersion: row.model_version,
    variantOf: row.variant_of,
    stamp: stampOf(row),
  };
}

/** The statements of the plans and plan_choices tables on one connection or transaction. */
function planQueries(sql: Sql) {
  const db = sql.kysely.withTables<Tables>();

  const byId = (id: number): Promise<PlanRow | undefined> =>
    db.selectFrom('plans').selectAll().where('id', '=', id).executeTakeFirst();

  /** The rows of `ids`, newest first. */
  const byIds = (ids: readonly number[]): Promise<PlanRow[]> =>
    db.selectFrom('plans').selectAll().where('id', 'in', ids).orderBy('id', 'desc').execute();

  async function isCorrected(id: number): Promise<boolean> {
    const later = await db.selectFrom('plans').select('id').where('corrects_id', '=', id).executeTakeFirst();
    return later !== undefined;
  }

  /** Every row id in the chain of versions holding `id`, newest first (a recursive CTE). */
  async function chainIds(id: number): Promise<number[]> {
    const result = await sqlText<{ id: number }>`
      WITH RECURSIVE earlier(id, corrects_id) AS (
        SELECT id, corrects_id FROM plans WHERE id = ${id}
        UNION ALL
        SELECT t.id, t.corrects_id FROM plans t JOIN earlier ON t.id = earlier.corrects_id
      ),
      root AS (SELECT id FROM earlier WHERE corrects_id IS NULL),
      later(id) AS (
        SELECT id FROM root
        UNION ALL
        SELECT t.id FROM plans t JOIN later ON t.corrects_id = later.id
      )
      SELECT id FROM later ORDER BY id DESC`.execute(db);
    return result.rows.map((row) => row.id);
  }

  /** The first row of the chain holding `id`: a plan's id through all its versions. */
  async function rootOf(id: number): Promise<number> {
    const ids = await chainIds(id);
    return ids[ids.length - 1] as number;
  }

  async function newestOf(id: number): Promise<number> {
    return (await chainIds(id))[0] as number;
  }

  /** The first rows of the plans saved as variants of `comparisonId`. */
  async function variantRoots(comparisonId: number): Promise<number[]> {
    const rows = await db
      .selectFrom('plans')
      .select('id')
      .where('variant_of', '=', comparisonId)
      .where('corrects_id', 'is', null)
      .orderBy('id')
      .execute();
    return rows.map((row) => row.id);
  }

  async function insertChoice(comparisonId: number, chosenId: number, meta: Meta, at: Date): Promise<void> {
    await db
      .insertInto('plan_choices')
      .values({
        comparison_id: comparisonId,
        chosen_id: chosenId,
        entered_at: at.toISOString(),
        entered_by: meta.enteredBy,
        reason: meta.reason,
      })
      .execute();
  }

  async function latestChoice(comparisonId: number): Promise<number | null> {
    const row = await db
      .selectFrom('plan_choices')
      .select('chosen_id')
      .where('comparison_id', '=', comparisonId)
      .orderBy('id', 'desc')
      .limit(1)
      .executeTakeFirst();
    return row?.chosen_id ?? null;
  }

  async function write(
    plan: PlanToStore,
    correctsId: number | null,
    variantOf: number | null,
    meta: Meta,
    at: Date,
  ): Promise<SavedPlan> {
    const row = await db
      .insertInto('plans')
      .values({
        patient_id: plan.patientId,
        corrects_id: correctsId,
        variant_of: variantOf,
        planned_for: plan.plannedFor,
        label: plan.label,
        input_json: JSON.stringify(plan.input),
        result_json: JSON.stringify(plan.result),
        checklist_json: JSON.stringify(plan.checklist),
        model_version: plan.modelVersion,
        entered_at: at.toISOString(),
        entered_by: meta.enteredBy,
        reason: meta.reason,
      })
      .returningAll()
      .executeTakeFirstOrThrow();
    return rowToPlan(row);
  }

  /** The newest version of each plan (no later row corrects it), optionally narrowed. */
  const current = () =>
    db
      .selectFrom('plans as p')
      .selectAll('p')
      .where(({ not, exists, selectFrom }) =>
        not(
          exists(selectFrom('plans as later').select('later.id').whereRef('later.corrects_id', '=', 'p.id')),
        ),
      );

  return {
    byId,
    byIds,
    isCorrected,
    chainIds,
    rootOf,
    newestOf,
    variantRoots,
    insertChoice,
    latestChoice,
    write,
    current,
  };
}

/**
 * All SQL for the plans table: the plan's inputs, the computed snapshot with the model version,
 * the checklist; and plan_choices, which plan of a comparison the clinic chose (rows only added).
 * An edit is a new row pointing at the one it replaces; ids of the newest row are what screens
 * hold. Works on SQLite and PostgreSQL alike.
 */
export function createPlanRepository(sql: Sql) {
  const queries = planQueries(sql);

  return {
    save(plan: PlanToStore, meta: Meta, at: Date): Promise<SavedPlan> {
      return queries.write(plan, null, null, meta, at);
    },
    /**
     * A comparison: plan A, and variant B marked as an alternative of A, saved together with A
     * recorded as the chosen plan until the clinic chooses otherwise.
     */
    saveComparison(
      plan: PlanToStore,
      variant: PlanToStore,
      meta: Meta,
      at: Date,
    ): Promise<{ plan: SavedPlan; variant: SavedPlan }> {
      return writeTransaction(sql, async (tx) => {
        const inTx = planQueries(tx);
        const first = await inTx.write(plan, null, null, meta, at);
        const second = await inTx.write(variant, null, first.id, meta, at);
        await inTx.insertChoice(first.id, first.id, meta, at);
        return { plan: first, variant: second };
      });
    },
    /**
     * A variant of a plan already saved: a new plan marked as its alternative (of the comparison
     * the saved plan belongs to, when it is itself a variant). The saved plan is never changed;
     * when this starts a comparison, the saved plan is recorded as the chosen one, as in
     * `saveComparison`. Refuses to branch from a version that was already replaced.
     */
    saveVariant(
      ofPlanId: number,
      variant: PlanToStore,
      meta: Meta,
      at: Date,
    ): Promise<SavedPlan | 'not-found' | 'stale'> {
      return writeTransaction(sql, async (tx) => {
        const inTx = planQueries(tx);
        const saved = await inTx.byId(ofPlanId);
        if (saved === undefined) return 'not-found' as const;
        if (await inTx.isCorrected(ofPlanId)) return 'stale' as const;
        const comparisonId = saved.variant_of ?? (await inTx.rootOf(ofPlanId));
        if ((await inTx.latestChoice(comparisonId)) === null)
          await inTx.insertChoice(comparisonId, comparisonId, meta, at);
        return inTx.write(variant, null, comparisonId, meta, at);
      });
    },
    /**
     * The plans of the comparison `planId` belongs to (newest versions, the compared plan first)
     * and which of them is chosen; null when the plan is in no comparison.
     */
    async comparisonOf(
      planId: number,
    ): Promise<{ comparisonId: number; planIds: number[]; chosenId: number } | null> {
      const plan = await queries.byId(planId);
      if (plan === undefined) return null;
      const comparisonId = plan.variant_of ?? (await queries.rootOf(planId));
      const variants = await queries.variantRoots(comparisonId);
      if (variants.length === 0) return null;
      const chosen = await queries.latestChoice(comparisonId);
      const planIds: number[] = [];
      for (const id of [comparisonId, ...variants]) planIds.push(await queries.newestOf(id));
      return { comparisonId, planIds, chosenId: await queries.newestOf(chosen ?? comparisonId) };
    },
    /** Records which plan of its comparison the clinic will use; the earlier choice stays as history. */
    choose(
      planId: number,
      meta: Meta,
      at: Date,
    ): Promise<'not-found' | 'no-comparison' | 'stale' | 'chosen'> {
      return writeTransaction(sql, async (tx) => {
        const inTx = planQueries(tx);
        const plan = await inTx.byId(planId);
        if (plan === undefined) return 'not-found' as const;
        if (await inTx.isCorrected(planId)) return 'stale' as const;
        const comparisonId = plan.variant_of ?? (await inTx.rootOf(planId));
        if (plan.variant_of === null && (await inTx.variantRoots(comparisonId)).length === 0)
          return 'no-comparison' as const;
        await inTx.insertChoice(comparisonId, await inTx.rootOf(planId), meta, at);
        return 'chosen' as const;
      });
    },
    /** A new version of a plan; refuses to branch from a version that was already replaced. */
    correct(
      planId: number,
      plan: PlanToStore,
      meta: Meta,
      at: Date,
    ): Promise<SavedPlan | 'not-found' | 'stale'> {
      return writeTransaction(sql, async (tx) => {
        const inTx = planQueries(tx);
        const previous = await inTx.byId(planId);
        if (previous === undefined) return 'not-found' as const;
        if (await inTx.isCorrected(planId)) return 'stale' as const;
        return inTx.write(plan, planId, previous.variant_of, meta, at);
      });
    },
    async get(planId: number): Promise<SavedPlan | null> {
      const row = await queries.byId(planId);
      return row === undefined ? null : rowToPlan(row);
    },
    /** Whether a newer version of this plan exists. */
    isSuperseded(planId: number): Promise<boolean> {
      return queries.isCorrected(planId);
    },
    async listForPatient(patientId: number): Promise<SavedPlan[]> {
      const rows = await queries
        .current()
        .where('p.patient_id', '=', patientId)
        .orderBy('p.planned_for', 'desc')
        .orderBy('p.id', 'desc')
        .execute();
      return rows.map(rowToPlan);
    },
    async listForDay(date: string): Promise<SavedPlan[]> {
      const rows = await queries.current().where('p.planned_for', '=', date).orderBy('p.id').execute();
      return rows.map(rowToPlan);
    },
    /** The newest version of each plan, latest planned date first. */
    async listRecent(limit: number): Promise<SavedPlan[]> {
      const rows = await queries
        .current()
        .orderBy('p.planned_for', 'desc')
        .orderBy('p.id', 'desc')
        .limit(limit)
        .execute();
      return rows.map(rowToPlan);
    },
    /** Every version of the plan holding `planId`, newest first, in one query. */
    async history(planId: number): Promise<SavedPlan[]> {
      const ids = await queries.chainIds(planId);
      if (ids.length === 0) return [];
      return (await queries.byIds(ids)).map(rowToPlan);
    },
  };
}

export type PlanRepository = ReturnType<typeof createPlanRepository>;
