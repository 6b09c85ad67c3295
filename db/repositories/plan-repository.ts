import type { Checklist, SavedPlan } from '../../app/contract/plan-records.js';
import type { PlanInput, PlanResult } from '../../app/contract/plan.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';
import { chainIdsSync, stampOf, type StampRow } from './version-chain.js';

type PlanRow = StampRow & {
  patient_id: number | null;
  planned_for: string;
  label: string;
  input_json: string;
  result_json: string;
  checklist_json: string;
  model_version: string;
  variant_of: number | null;
};

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

/**
 * All SQL for the plans table: the plan's inputs, the computed snapshot with the model version,
 * the checklist. An edit is a new row pointing at the one it replaces; ids of the newest row are
 * what screens hold.
 */
export function createPlanRepository(db: TidewingDatabase) {
  const insert = db.prepare(
    `INSERT INTO plans (patient_id, corrects_id, variant_of, planned_for, label, input_json, result_json, checklist_json, model_version, entered_at, entered_by, reason)
     VALUES (@patientId, @correctsId, @variantOf, @plannedFor, @label, @inputJson, @resultJson, @checklistJson, @modelVersion, @enteredAt, @enteredBy, @reason)`,
  );
  const insertChoice = db.prepare(
    `INSERT INTO plan_choices (comparison_id, chosen_id, entered_at, entered_by, reason)
     VALUES (@comparisonId, @chosenId, @enteredAt, @enteredBy, @reason)`,
  );
  const latestChoice = db.prepare<[number], { chosen_id: number }>(
    'SELECT chosen_id FROM plan_choices WHERE comparison_id = ? ORDER BY id DESC LIMIT 1',
  );
  const variantRoots = db.prepare<[number], { id: number }>(
    `SELECT DISTINCT first.id FROM plans first WHERE first.variant_of = ? AND first.corrects_id IS NULL ORDER BY first.id`,
  );
  const byId = db.prepare<[number], PlanRow>('SELECT * FROM plans WHERE id = ?');
  const isCorrected = db.prepare<[number], { found: number }>(
    'SELECT 1 AS found FROM plans WHERE corrects_id = ?',
  );
  const currentCondition = 'NOT EXISTS (SELECT 1 FROM plans later WHERE later.corrects_id = p.id)';
  const forPatient = db.prepare<[number], PlanRow>(
    `SELECT * FROM plans p WHERE patient_id = ? AND ${currentCondition} ORDER BY planned_for DESC, id DESC`,
  );
  const forDay = db.prepare<[string], PlanRow>(
    `SELECT * FROM plans p WHERE planned_for = ? AND ${currentCondition} ORDER BY id`,
  );
  const recent = db.prepare<[number], PlanRow>(
    `SELECT * FROM plans p WHERE ${currentCondition} ORDER BY planned_for DESC, id DESC LIMIT ?`,
  );

  /** The first row of the chain holding `id`: a plan's id through all its versions. */
  function rootOf(id: number): number {
    const ids = chainIdsSync(db, 'plans', id);
    return ids[ids.length - 1] as number;
  }
  function newestOf(id: number): number {
    return chainIdsSync(db, 'plans', id)[0] as number;
  }

  function write(
    plan: PlanToStore,
    correctsId: number | null,
    variantOf: number | null,
    meta: Meta,
    at: Date,
  ): SavedPlan {
    const id = Number(
      insert.run({
        patientId: plan.patientId,
        correctsId,
        variantOf,
        plannedFor: plan.plannedFor,
        label: plan.label,
        inputJson: JSON.stringify(plan.input),
        resultJson: JSON.stringify(plan.result),
        checklistJson: JSON.stringify(plan.checklist),
        modelVersion: plan.modelVersion,
        enteredAt: at.toISOString(),
        ...meta,
      }).lastInsertRowid,
    );
    return rowToPlan(byId.get(id) as PlanRow);
  }

  return {
    save(plan: PlanToStore, meta: Meta, at: Date): SavedPlan {
      return write(plan, null, null, meta, at);
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
    ): { plan: SavedPlan; variant: SavedPlan } {
      return writeTransaction(db, () => {
        const first = write(plan, null, null, meta, at);
        const second = write(variant, null, first.id, meta, at);
        insertChoice.run({
          comparisonId: first.id,
          chosenId: first.id,
          enteredAt: at.toISOString(),
          ...meta,
        });
        return { plan: first, variant: second };
      });
    },
    /**
     * The plans of the comparison `planId` belongs to (newest versions, the compared plan first)
     * and which of them is chosen; null when the plan is in no comparison.
     */
    comparisonOf(planId: number): { comparisonId: number; planIds: number[]; chosenId: number } | null {
      const plan = byId.get(planId);
      if (plan === undefined) return null;
      const comparisonId = plan.variant_of ?? rootOf(planId);
      const variants = variantRoots.all(comparisonId).map((row) => row.id);
      if (variants.length === 0) return null;
      const choice = latestChoice.get(comparisonId);
      return {
        comparisonId,
        planIds: [comparisonId, ...variants].map(newestOf),
        chosenId: newestOf(choice?.chosen_id ?? comparisonId),
      };
    },
    /** Records which plan of its comparison the clinic will use; the earlier choice stays as history. */
    choose(planId: number, meta: Meta, at: Date): 'not-found' | 'no-comparison' | 'stale' | 'chosen' {
      return writeTransaction(db, () => {
        if (byId.get(planId) === undefined) return 'not-found' as const;
        if (isCorrected.get(planId) !== undefined) return 'stale' as const;
        const plan = byId.get(planId) as PlanRow;
        const comparisonId = plan.variant_of ?? rootOf(planId);
        if (plan.variant_of === null && variantRoots.all(comparisonId).length === 0)
          return 'no-comparison' as const;
        insertChoice.run({ comparisonId, chosenId: rootOf(planId), enteredAt: at.toISOString(), ...meta });
        return 'chosen' as const;
      });
    },
    /** A new version of a plan; refuses to branch from a version that was already replaced. */
    correct(planId: number, plan: PlanToStore, meta: Meta, at: Date): SavedPlan | 'not-found' | 'stale' {
      return writeTransaction(db, () => {
        if (byId.get(planId) === undefined) return 'not-found' as const;
        if (isCorrected.get(planId) !== undefined) return 'stale' as const;
        return write(plan, planId, (byId.get(planId) as PlanRow).variant_of, meta, at);
      });
    },
    get(planId: number): SavedPlan | null {
      const row = byId.get(planId);
      return row === undefined ? null : rowToPlan(row);
    },
    /** Whether a newer version of this plan exists. */
    isSuperseded(planId: number): boolean {
      return isCorrected.get(planId) !== undefined;
    },
    listForPatient(patientId: number): SavedPlan[] {
      return forPatient.all(patientId).map(rowToPlan);
    },
    listForDay(date: string): SavedPlan[] {
      return forDay.all(date).map(rowToPlan);
    },
    /** The newest version of each plan, latest planned date first. */
    listRecent(limit: number): SavedPlan[] {
      return recent.all(limit).map(rowToPlan);
    },
    history(planId: number): SavedPlan[] {
      return chainIdsSync(db, 'plans', planId).map((id) => rowToPlan(byId.get(id) as PlanRow));
    },
  };
}

export type PlanRepository = ReturnType<typeof createPlanRepository>;
