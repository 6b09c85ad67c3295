import type { PlanDetail } from '../../contract/plan-records.js';
import type { ProcedureDetail } from '../../contract/record-channels.js';
import type { ProcedureEntry } from '../../contract/records.js';
import { api } from '../common/bridge.js';

/** What the printed record needs beyond the record itself. */
export type PrintedRecordExtras = {
  readonly histories: Readonly<Record<number, readonly ProcedureEntry[]>>;
  readonly plan: PlanDetail | null;
};

/**
 * Asks, all at once, for the history of every corrected row (to print each correction with its
 * reason) and for the linked plan (to print its predicted milestones). A plan that cannot be
 * read is left out rather than stopping the print; a history that cannot be read is said so on
 * its row.
 */
export async function loadPrintedRecordExtras(detail: ProcedureDetail): Promise<PrintedRecordExtras> {
  const corrected = detail.entries.filter((entry) => entry.corrected);
  const planId = detail.record.values.planId;
  const [versions, plan] = await Promise.all([
    Promise.all(corrected.map((entry) => api.invoke('entries:history', { id: entry.id }))),
    planId === null ? Promise.resolve(null) : api.invoke('plans:get', { id: planId }),
  ]);
  const histories: Record<number, readonly ProcedureEntry[]> = {};
  corrected.forEach((entry, index) => {
    const answer = versions[index];
    if (answer?.ok === true) histories[entry.id] = answer.value;
  });
  return { histories, plan: plan?.ok === true ? plan.value : null };
}
