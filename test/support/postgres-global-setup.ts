import type { TestProject } from 'vitest/node';
import { startTestCluster } from './postgres-cluster.js';

declare module 'vitest' {
  // Vitest's provided values are typed by declaration merging, which needs an interface.
  // eslint-disable-next-line @typescript-eslint/consistent-type-definitions
  export interface ProvidedContext {
    /** Connection URLs of the run's throwaway PostgreSQL cluster, or why there is none. */
    postgres: { adminUrl: string; appUrl: string } | { missing: string };
  }
}

/**
 * Starts one PostgreSQL cluster for the whole run (both projects) and stops it at the end. When
 * the server programs are missing, tests that need PostgreSQL fail under CI and skip elsewhere,
 * saying so (see `needPostgres`).
 */
export async function setup(project: TestProject): Promise<() => void> {
  try {
    const cluster = await startTestCluster();
    project.provide('postgres', { adminUrl: cluster.adminUrl, appUrl: cluster.appUrl });
    return () => cluster.stop();
  } catch (error) {
    project.provide('postgres', { missing: error instanceof Error ? error.message : String(error) });
    return () => undefined;
  }
}
