import path from 'node:path';
import pg from 'pg';
import { heronLaneSettings } from '../../support/clinic-settings.js';
import { pipValues } from '../../support/clinic-birds.js';
import { startHostProcess, type RunningHost } from './host-spawn.js';
import { connectApi, type ApiClient } from './host-api-client.js';

export type LoadOptions = {
  /** The PostgreSQL database every workstation shares. */
  readonly databaseUrl: string;
  /** A folder for the workstations' data folders (one each). */
  readonly dataRoot: string;
  readonly workstations: number;
  /** Entries each workstation saves per second. */
  readonly entriesPerSecond: number;
  readonly durationMs: number;
  /** When (ms after the start) one host is killed with SIGKILL and started again; null for never. */
  readonly killAfterMs: number | null;
  /** Progress lines (the bench prints them). */
  readonly log?: (line: string) => void;
};

export type LoadResult = {
  /** Ids of every entry a host acknowledged (answered ok). */
  readonly acknowledged: readonly number[];
  /** Acknowledged ids not found in the database afterwards: must be empty. */
  readonly lost: readonly number[];
  /** Saves that failed (the killed host's in-flight and refused calls), never acknowledged. */
  readonly failed: number;
  /** Milliseconds from request to acknowledgement, one per acknowledged save. */
  readonly saveMs: readonly number[];
  /** The killed workstation's number, or null. */
  readonly killed: number | null;
};

type Workstation = { host: RunningHost; api: ApiClient; readonly dataFolder: string };

async function openWorkstation(databaseUrl: string, dataFolder: string): Promise<Workstation> {
  const host = await startHostProcess(dataFolder, ['--database', databaseUrl], 30_000);
  return { host, api: await connectApi(host.url), dataFolder };
}

async function must<T>(api: ApiClient, channel: string, payload: unknown): Promise<T> {
  const answer = await api<T>(channel, payload);
  if (!answer.ok || answer.value === undefined)
    throw new Error(`${channel} failed while setting up: ${JSON.stringify(answer.error)}`);
  return answer.value;
}

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/**
 * Several Tidewing hosts (one per workstation, each with its own data folder) on one PostgreSQL
 * database, each saving procedure log rows to one shared record at a fixed rate; one host is
 * killed with SIGKILL part-way and started again. Bounded by `durationMs` and the rate; loopback
 * only. Every save a host acknowledged must then be in the database.
 */
export async function runWorkstationLoad(options: LoadOptions): Promise<LoadResult> {
  const log = options.log ?? (() => undefined);
  const stations: Workstation[] = [];
  try {
    for (let index = 0; index < options.workstations; index += 1)
      stations.push(
        await openWorkstation(options.databaseUrl, path.join(options.dataRoot, `ws${String(index)}`)),
      );
    const first = stations[0];
    if (first === undefined) throw new Error('No workstation');
    await must(first.api, 'safety:acknowledge', { acknowledgedBy: 'RW', accepted: true });
    await must(first.api, 'settings:save', heronLaneSettings);
    const patient = await must<{ id: number }>(first.api, 'patients:create', {
      values: pipValues,
      meta: { enteredBy: 'RW', reason: '' },
    });
    const record = await must<{ id: number }>(first.api, 'procedures:create', {
      patientId: patient.id,
      values: {
        planId: null,
        startedAt: new Date(Date.now() - 60_000).toISOString(),
        endedAt: null,
        asaGrade: 2,
        emergency: false,
        procedureName: 'Load run',
        fasting: '',
        cropChecked: 'empty',
        airway: 'mask',
        tubeSizeMm: null,
        tubeType: '',
        circuit: 'nonRebreathing',
        staffInitials: 'RW',
        promptIntervalMin: 5,
      },
      meta: { enteredBy: 'RW', reason: '' },
    });

    const acknowledged: number[] = [];
    const saveMs: number[] = [];
    let failed = 0;
    const killedIndex = options.killAfterMs === null ? null : Math.min(1, options.workstations - 1);
    let restarting = false;
    const startedAt = Date.now();
    const intervalMs = 1000 / options.entriesPerSecond;

    const save = async (station: Workstation, index: number, beat: number) => {
      const payload = {
        recordId: record.id,
        values: {
          at: new Date().toISOString(),
          kind: 'vitals',
          vaporPct: 2,
          oxygenLpm: 1,
          heartRatePerMin: 300 + index,
          breathsPerMin: 20 + (beat % 20),
          temperatureC: 40.1,
          etco2Mmhg: null,
          spo2Pct: null,
          eventType: null,
          eventNote: '',
          drugName: '',
          drugDose: '',
        },
        meta: { enteredBy: `W${String(index + 1)}`, reason: '' },
      };
      const sent = performance.now();
      try {
        const answer = await station.api<{ id: number }>('entries:add', payload);
        if (answer.ok && answer.value !== undefined) {
          acknowledged.push(answer.value.id);
          saveMs.push(performance.now() - sent);
        } else failed += 1;
      } catch {
        // The host died with the request in flight: never acknowledged, so nothing was promised.
        failed += 1;
      }
    };

    const loops = stations.map(async (station, index) => {
      const pending: Promise<void>[] = [];
      for (let beat = 0; ; beat += 1) {
        const due = startedAt + beat * intervalMs + (index * intervalMs) / options.workstations;
        if (due - startedAt >= options.durationMs) break;
        const wait = due - Date.now();
        if (wait > 0) await sleep(wait);
        if (index === killedIndex && restarting) {
          failed += 1;
          continue;
        }
        pending.push(save(stations[index] ?? station, index, beat));
      }
      await Promise.all(pending);
    });

    const killer = (async () => {
      if (options.killAfterMs === null || killedIndex === null) return;
      await sleep(options.killAfterMs);
      const victim = stations[killedIndex];
      if (victim === undefined) return;
      log(`SIGKILL workstation ${String(killedIndex + 1)} at ${String(Date.now() - startedAt)} ms`);
      restarting = true;
      victim.host.process.kill('SIGKILL');
      await new Promise<void>((resolve) =>
        victim.host.process.exitCode !== null ? resolve() : victim.host.process.once('exit', () => resolve()),
      );
      stations[killedIndex] = await openWorkstation(options.databaseUrl, victim.dataFolder);
      restarting = false;
      log(`workstation ${String(killedIndex + 1)} back at ${String(Date.now() - startedAt)} ms`);
    })();

    await Promise.all([...loops, killer]);

    const client = new pg.Client({ connectionString: options.databaseUrl });
    await client.connect();
    let stored: Set<number>;
    try {
      const rows = await client.query<{ id: number }>(
        'SELECT id FROM procedure_entries WHERE id = ANY($1::int[])',
        [acknowledged],
      );
      stored = new Set(rows.rows.map((row) => Number(row.id)));
    } finally {
      await client.end();
    }
    return {
      acknowledged,
      lost: acknowledged.filter((id) => !stored.has(id)),
      failed,
      saveMs,
      killed: killedIndex,
    };
  } finally {
    await Promise.all(stations.map((station) => station.host.stop()));
  }
}
