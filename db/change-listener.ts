import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { z } from 'zod';
import { changeKinds, type ChangeKind, type ChangeNoticeInput } from '../app/contract/change-notices.js';
import { changeNoticeChannel, type NoticeTable } from './migrations/0011-change-notices.js';

/** Which kind of data a notice table holds (the contract's change kinds). */
export const changeKindOfTable: Readonly<Record<NoticeTable, ChangeKind>> = {
  species: 'species',
  patients: 'patients',
  patient_versions: 'patients',
  weights: 'weights',
  plans: 'plans',
  plan_choices: 'plans',
  procedure_records: 'procedure-records',
  procedure_record_versions: 'procedure-records',
  procedure_entries: 'procedure-entries',
  emergency_drugs: 'drugs',
  evidence_exclusions: 'evidence',
  evidence_calibration_switch: 'evidence',
  safety_acknowledgements: 'safety',
  clinic_settings: 'settings',
  workstations: 'workstations',
};

const positive = z.number().int().positive().optional();
const payloadSchema = z.object({
  table: z.string(),
  patient: positive,
  record: positive,
  plan: positive,
  day: z
    .string()
    .regex(/^\d{4}-\d{2}-\d{2}$/)
    .optional(),
  by: z.string().optional(),
});

/**
 * The notice a trigger's payload (migration 11) stands for, and the application_name of the
 * connection that wrote the row; null for a payload from no table of ours.
 */
export function noticeFromPayload(payload: string): { notice: ChangeNoticeInput; by: string } | null {
  let json: unknown;
  try {
    json = JSON.parse(payload);
  } catch {
    return null;
  }
  const parsed = payloadSchema.safeParse(json);
  if (!parsed.success) return null;
  const { table, patient, record, plan, day, by } = parsed.data;
  if (!Object.prototype.hasOwnProperty.call(changeKindOfTable, table)) return null;
  return {
    notice: {
      kind: changeKindOfTable[table as NoticeTable],
      ...(patient === undefined ? {} : { patientId: patient }),
      ...(record === undefined ? {} : { recordId: record }),
      ...(plan === undefined ? {} : { planId: plan }),
      ...(day === undefined ? {} : { plannedFor: day }),
      elsewhere: true,
    },
    by: by ?? '',
  };
}

export type ChangeListenerOptions = {
  /**
   * The application_name of this back end's own pool: its writes are already published
   * in-process, so their notices are not published a second time. Without it, a workstation's
   * own writes are published twice (harmless: a screen refreshes once more).
   */
  readonly ownApplicationName?: string;
  readonly log?: (message: string) => void;
  /** Wait before the first reconnection, doubled after each failure up to `maxDelayMs`. */
  readonly firstDelayMs?: number;
  readonly maxDelayMs?: number;
  /** Called each time LISTEN is in place (the first time and after each reconnection). */
  readonly onListening?: () => void;
};

export type ChangeListening = {
  /** Settles when the first LISTEN is in place. */
  readonly ready: Promise<void>;
  /** Stops listening and ends the connection; no reconnection afterwards. */
  close(): Promise<void>;
};

/**
 * A name for one back end's pool connections (`application_name`, at most 63 bytes): give it to
 * the pool (`openPostgresClinic(url, { pool: { application_name } })`) and to `listenForChanges`
 * as `ownApplicationName`, so the back end's own writes, already published in-process, are not
 * published again when their notices come back from the server.
 */
export function backEndApplicationName(): string {
  return `tidewing ${randomBytes(6).toString('hex')}`;
}

/** The application_name of the listening connection (its own notices never come from it). */
export const listenerApplicationName = 'tidewing change listener';

/**
 * One dedicated connection per back end that LISTENs on `tidewing_changes` and publishes each
 * notice of another workstation's write (`elsewhere: true`). When the server goes away (restart,
 * network) it reconnects with a growing wait; after a reconnection it publishes one notice of
 * every kind, since notices sent meanwhile were lost, so every open screen refreshes.
 */
export function listenForChanges(
  connection: string | pg.ClientConfig,
  publish: (notice: ChangeNoticeInput) => void,
  options: ChangeListenerOptions = {},
): ChangeListening {
  const log = options.log ?? (() => undefined);
  const firstDelayMs = options.firstDelayMs ?? 250;
  const maxDelayMs = options.maxDelayMs ?? 15_000;
  const config: pg.ClientConfig = {
    ...(typeof connection === 'string' ? { connectionString: connection } : connection),
    application_name: listenerApplicationName,
    keepAlive: true,
  };
  let closed = false;
  let current: pg.Client | null = null;
  let retry: NodeJS.Timeout | null = null;
  let delayMs = firstDelayMs;
  let listenedBefore = false;
  let markReady: () => void = () => undefined;
  const ready = new Promise<void>((resolve) => {
    markReady = resolve;
  });

  function onNotification(message: pg.Notification): void {
    if (message.channel !== changeNoticeChannel || message.payload === undefined) return;
    const read = noticeFromPayload(message.payload);
    if (read === null) {
      log(`A change notice from the database was not understood: ${message.payload.slice(0, 200)}`);
      return;
    }
    if (options.ownApplicationName !== undefined && read.by === options.ownApplicationName) return;
    publish(read.notice);
  }

  function lost(client: pg.Client, reason: string): void {
    if (client !== current || closed) return;
    current = null;
    client.removeAllListeners('notification');
    void client.end().catch(() => undefined);
    log(`Change notices from other workstations stopped (${reason}); reconnecting in ${String(delayMs)} ms.`);
    retry = setTimeout(() => {
      retry = null;
      void connect();
    }, delayMs);
    delayMs = Math.min(maxDelayMs, delayMs * 2);
  }

  async function connect(): Promise<void> {
    if (closed) return;
    const client = new pg.Client(config);
    current = client;
    client.on('notification', onNotification);
    client.on('error', (error) => lost(client, error.message));
    client.on('end', () => lost(client, 'the connection ended'));
    try {
      await client.connect();
      await client.query(`LISTEN ${changeNoticeChannel}`);
    } catch (error) {
      lost(client, error instanceof Error ? error.message : String(error));
      return;
    }
    if (client !== current || closed) return;
    delayMs = firstDelayMs;
    if (listenedBefore) {
      log('Change notices from other workstations resumed; every screen refreshes.');
      for (const kind of changeKinds) publish({ kind, elsewhere: true });
    }
    listenedBefore = true;
    markReady();
    options.onListening?.();
  }

  void connect();
  return {
    ready,
    close: async () => {
      closed = true;
      if (retry !== null) clearTimeout(retry);
      const client = current;
      current = null;
      if (client !== null) {
        client.removeAllListeners('notification');
        await client.end().catch(() => undefined);
      }
    },
  };
}
