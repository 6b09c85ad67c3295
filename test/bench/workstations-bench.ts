import pg from 'pg';
import { startTestCluster } from '../support/postgres-cluster.js';
import { temporaryFolder } from '../support/temporary-folder.js';
import { runWorkstationLoad } from '../e2e/support/workstation-load.js';
import { median, quantile, type Figure } from './figures.js';

/**
 * Five workstations (five hosts, one PostgreSQL database on a throwaway loopback cluster) each
 * saving one log row per second for two minutes, one host killed with SIGKILL after 40 s and
 * started again. Reports save times as the workstations saw them and whether any acknowledged
 * row was lost (the e2e test runs the same load for 20 s and asserts that none is).
 */
export async function benchWorkstationLoad(durationMs = 120_000): Promise<Figure[]> {
  const cluster = await startTestCluster();
  const data = temporaryFolder('tidewing-bench-load-');
  try {
    const admin = new pg.Client({ connectionString: cluster.appUrl });
    await admin.connect();
    await admin.query('CREATE DATABASE tidewing_load');
    await admin.end();
    const url = new URL(cluster.appUrl);
    url.pathname = '/tidewing_load';
    const result = await runWorkstationLoad({
      databaseUrl: url.toString(),
      dataRoot: data.folder,
      workstations: 5,
      entriesPerSecond: 1,
      durationMs,
      killAfterMs: 40_000,
      log: (line) => process.stderr.write(`  ${line}\n`),
    });
    return [
      { name: 'acknowledgedRows', value: result.acknowledged.length, unit: '' },
      { name: 'lostAcknowledgedRows', value: result.lost.length, unit: '', note: 'must be 0' },
      { name: 'failedOrRefusedSaves', value: result.failed, unit: '', note: 'while a host was down' },
      { name: 'saveMedianMs', value: median(result.saveMs), unit: 'ms' },
      { name: 'saveP99Ms', value: quantile(result.saveMs, 0.99), unit: 'ms' },
    ];
  } finally {
    cluster.stop();
    data.remove();
  }
}
