import type { TidewingDatabase } from '../connection.js';

export type SafetyAcknowledgement = { acknowledgedAt: string; appVersion: string; acknowledgedBy: string };

type AcknowledgementRow = { acknowledged_at: string; app_version: string; acknowledged_by: string };

/** All SQL for the safety_acknowledgements table; rows are only ever added. */
export function createSafetyAcknowledgementRepository(db: TidewingDatabase) {
  const latest = db.prepare<[], AcknowledgementRow>(
    'SELECT acknowledged_at, app_version, acknowledged_by FROM safety_acknowledgements ORDER BY id DESC LIMIT 1',
  );
  const forVersion = db.prepare<[string], { count: number }>(
    'SELECT count(*) AS count FROM safety_acknowledgements WHERE app_version = ?',
  );
  const insert = db.prepare(
    'INSERT INTO safety_acknowledgements (acknowledged_at, app_version, acknowledged_by) VALUES (?, ?, ?)',
  );

  return {
    latest(): SafetyAcknowledgement | null {
      const row = latest.get();
      return row === undefined
        ? null
        : {
            acknowledgedAt: row.acknowledged_at,
            appVersion: row.app_version,
            acknowledgedBy: row.acknowledged_by,
          };
    },
    isAcknowledged(appVersion: string): boolean {
      return (forVersion.get(appVersion)?.count ?? 0) > 0;
    },
    record(appVersion: string, acknowledgedBy: string, at: Date): void {
      insert.run(at.toISOString(), appVersion, acknowledgedBy);
    },
  };
}

export type SafetyAcknowledgementRepository = ReturnType<typeof createSafetyAcknowledgementRepository>;
