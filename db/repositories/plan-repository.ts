import type { Checklist, SavedPlan } from '../../app/contract/plan-records.js';
import type { PlanInput, PlanResult } from '../../app/contract/plan.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';
import { chainIds, stampOf, type StampRow } from './version-chain.js';

type PlanRow = StampRow & {
  patient_id: number | null;
  planned_for: string;
  label: string;
  input_json: string;
  result_json: string;
  checklist_json: string;
  model_version: string;
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
    `INSERT INTO plans (patient_id, corrects_id, planned_for, label, input_json, result_json, checklist_json, model_version, entered_at, entered_by, reason)
     VALUES (@patientId, @correctsId, @plannedFor, @label, @inputJson, @resultJson, @checklistJson, @modelVersion, @enteredAt, @enteredBy, @reason)`,
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

  function write(plan: PlanToStore, correctsId: number | null, meta: Meta, at: Date): SavedPlan {
    const id = Number(
      insert.run({
        patientId: plan.patientId,
        correctsId,
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
      return write(plan, null, meta, at);
    },
    /** A new version of a plan; refuses to branch from a version that was already replaced. */
    correct(planId: number, plan: PlanToStore, meta: Meta, at: Date): SavedPlan | 'not-found' | 'stale' {
      return writeTransaction(db, () => {
        if (byId.get(planId) === undefined) return 'not-found' as const;
        if (isCorrected.get(planId) !== undefined) return 'stale' as const;
        return write(plan, planId, meta, at);
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
      return chainIds(db, 'plans', planId).map((id) => rowToPlan(byId.get(id) as PlanRow));
    },
  };
}

export type PlanRepository = ReturnType<typeof createPlanRepository>;
