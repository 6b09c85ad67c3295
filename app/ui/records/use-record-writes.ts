import { useState, type ReactNode } from 'react';
import type { ProcedureEntryValues, ProcedureRecordValues } from '../../contract/records.js';
import type { Result } from '../../contract/result.js';
import type { EventType } from '../../core/procedure-events.js';
import { api } from '../common/bridge.js';
import { downloadText } from '../common/download.js';
import { checkEntry, emptyReadings, type DisplayUnits } from './entry-form.js';
import { useInitialsGate } from '../common/initials-gate.js';

/** What a write answered: null when saved, else the message and whether another change came first. */
type Outcome = { readonly message: string; readonly conflict: boolean } | null;
type Write = (enteredBy: string) => Promise<Outcome>;

/** The answer as an outcome; a refusal starts with "Not saved:" when `notSaved` (once). */
function outcomeOf(answer: Result<unknown>, notSaved: boolean): Outcome {
  if (answer.ok) return null;
  const text = answer.error.message;
  return {
    message: notSaved && !text.startsWith('Not saved:') ? `Not saved: ${text}` : text,
    conflict: answer.error.code === 'conflict',
  };
}

/** Details an event row may carry besides its type; `at` (ISO 8601) back-dates it. */
/**
 * What comes with an event: an exact instant (`at`, e.g. when the apnoea stopwatch started), or
 * the time typed in the Time box (`timeText`, blank for now), and the note or drug.
 */
export type EventExtra = {
  at?: string;
  timeText?: string;
  eventNote?: string;
  drugName?: string;
  drugDose?: string;
};

export type RecordWrites = {
  /** The initials prompt, shown when a write needs initials not yet given. */
  readonly gate: ReactNode;
  /** The message of the last failed write or export, null after a success. */
  readonly writeFailure: string | null;
  readonly addEntry: (values: ProcedureEntryValues) => Promise<string | null>;
  readonly logEvent: (eventType: EventType, extra?: EventExtra) => Promise<string | null>;
  /**
   * Saves the record's details as a correction of `versionId` (the version the user worked
   * from; the one on screen when not given).
   */
  readonly correctRecord: (
    next: ProcedureRecordValues,
    reason: string,
    versionId?: number,
  ) => Promise<string | null>;
  readonly correctEntry: (id: number, next: ProcedureEntryValues, reason: string) => Promise<string | null>;
  readonly voidEntry: (id: number, reason: string) => Promise<string | null>;
  readonly exportCsv: () => Promise<void>;
};

/**
 * Every write of the live record screen. Each runs once initials are known, answers null when
 * saved or the message to show, and reloads the record after a success, and after a refusal
 * because another workstation changed it first (so the screen shows what is now saved, while
 * the form that was refused keeps what the user typed).
 * @param versionId the version of the record's details on screen
 */
export function useRecordWrites(
  recordId: number,
  versionId: number,
  units: DisplayUnits,
  reload: () => void,
): RecordWrites {
  const { gate, withInitials } = useInitialsGate();
  const [writeFailure, setWriteFailure] = useState<string | null>(null);

  /** Runs a write once initials are known; reports the outcome to the caller and reloads. */
  function write(run: Write): Promise<string | null> {
    return new Promise((resolve) => {
      withInitials(
        (enteredBy) => {
          void run(enteredBy).then((outcome) => {
            if (outcome === null || outcome.conflict) reload();
            setWriteFailure(outcome?.message ?? null);
            resolve(outcome?.message ?? null);
          });
        },
        () => resolve('Not saved: enter your initials to save.'),
      );
    });
  }

  function addEntry(entryValues: ProcedureEntryValues): Promise<string | null> {
    return write(async (enteredBy) => {
      const answer = await api.invoke('entries:add', {
        recordId,
        values: entryValues,
        meta: { enteredBy, reason: '' },
      });
      return outcomeOf(answer, true);
    });
  }

  function logEvent(eventType: EventType, extra: EventExtra = {}): Promise<string | null> {
    const checked = checkEntry(
      {
        timeText: extra.timeText ?? '',
        readings: emptyReadings,
        kind: 'event',
        eventType,
        eventNote: extra.eventNote ?? '',
        drugName: extra.drugName ?? '',
        drugDose: extra.drugDose ?? '',
      },
      units,
      new Date(),
    );
    if (!checked.ok)
      return Promise.resolve(Object.values(checked.errors)[0] ?? 'The event could not be checked.');
    return addEntry({ ...checked.values, at: extra.at ?? checked.values.at });
  }

  function correctRecord(
    next: ProcedureRecordValues,
    reason: string,
    basedOn: number = versionId,
  ): Promise<string | null> {
    return write(async (enteredBy) => {
      const answer = await api.invoke('procedures:correct', {
        id: recordId,
        versionId: basedOn,
        values: next,
        meta: { enteredBy, reason },
      });
      return outcomeOf(answer, true);
    });
  }

  function correctEntry(id: number, next: ProcedureEntryValues, reason: string): Promise<string | null> {
    return write(async (enteredBy) => {
      const answer = await api.invoke('entries:correct', {
        id,
        values: next,
        meta: { enteredBy, reason },
      });
      return outcomeOf(answer, false);
    });
  }

  function voidEntry(id: number, reason: string): Promise<string | null> {
    return write(async (enteredBy) => {
      const answer = await api.invoke('entries:void', { id, meta: { enteredBy, reason } });
      return outcomeOf(answer, false);
    });
  }

  async function exportCsv() {
    const answer = await api.invoke('procedures:export-csv', { id: recordId });
    if (answer.ok) downloadText(answer.value.fileName, answer.value.csv, 'text/csv;charset=utf-8');
    setWriteFailure(answer.ok ? null : `Export failed: ${answer.error.message}`);
  }

  return { gate, writeFailure, addEntry, logEvent, correctRecord, correctEntry, voidEntry, exportCsv };
}
