import type { PlanDetail } from '../../contract/plan-records.js';
import type { ProcedureDetail } from '../../contract/record-channels.js';
import type { ProcedureEntry } from '../../contract/records.js';
import { api } from '../common/bridge.js';

/** What the printed record needs beyond the record itself. */
export type PrintedRecordExtras = {
  readonly histories: Readonly<Record<number, readonly ProcedureEntry[]>>;
  readonly plan: PlanDetail | null;
  /** Each voided row (as the void saved it: who, when, why), with who first entered it. */
  readonly voided: readonly VoidedRow[];
};

export type VoidedRow = { readonly entry: ProcedureEntry; readonly firstEnteredBy: string | null };

/**
 * Asks, all at once, for the history of every corrected row (to print each correction with its
 * reason), the voided rows (printed struck through with who voided them and why) and for the
 * linked plan (to print its predicted milestones). A plan that cannot be
 * read is left out rather than stopping the print; a history that cannot be read is said so on
 * its row.
 */
export async function loadPrintedRecordExtras(detail: ProcedureDetail): Promise<PrintedRecordExtras> {
  const corrected = detail.entries.filter((entry) => entry.corrected);
  const planId = detail.record.values.planId;
  const [versions, plan, voidedAnswer] = await Promise.all([
    Promise.all(corrected.map((entry) => api.invoke('entries:history', { id: entry.id }))),
    planId === null ? Promise.resolve(null) : api.invoke('plans:get', { id: planId }),
    api.invoke('entries:voided', { recordId: detail.record.id }),
  ]);
  const voidedRows = voidedAnswer.ok ? voidedAnswer.value : [];
  const voidedHistories = await Promise.all(
    voidedRows.map((entry) => api.invoke('entries:history', { id: entry.id })),
  );
  const voided = voidedRows.map((entry, index) => {
    const chain = voidedHistories[index];
    return {
      entry,
      firstEnteredBy: chain?.ok === true ? (chain.value.at(-1)?.stamp.enteredBy ?? null) : null,
    };
  });
  const histories: Record<number, readonly ProcedureEntry[]> = {};
  corrected.forEach((entry, index) => {
    const answer = versions[index];
    if (answer?.ok === true) histories[entry.id] = answer.value;
  });
  return { histories, plan: plan?.ok === true ? plan.value : null, voided };
}
