import type { Generated } from 'kysely';
import type { Sql } from '../clinic-db.js';

export type SafetyAcknowledgement = { acknowledgedAt: string; appVersion: string; acknowledgedBy: string };

type AcknowledgementRow = {
  id: Generated<number>;
  acknowledged_at: string;
  app_version: string;
  acknowledged_by: string;
};

type Tables = { safety_acknowledgements: AcknowledgementRow };

/** All SQL for the safety_acknowledgements table; rows are only ever added. */
export function createSafetyAcknowledgementRepository(sql: Sql) {
  const db = sql.kysely.withTables<Tables>();

  return {
    async latest(): Promise<SafetyAcknowledgement | null> {
      const row = await db
        .selectFrom('safety_acknowledgements')
        .select(['acknowledged_at', 'app_version', 'acknowledged_by'])
        .orderBy('id', 'desc')
        .limit(1)
        .executeTakeFirst();
      return row === undefined
        ? null
        : {
            acknowledgedAt: row.acknowledged_at,
            appVersion: row.app_version,
            acknowledgedBy: row.acknowledged_by,
          };
    },
    async isAcknowledged(appVersion: string): Promise<boolean> {
      const row = await db
        .selectFrom('safety_acknowledgements')
        .select('id')
        .where('app_version', '=', appVersion)
        .limit(1)
        .executeTakeFirst();
      return row !== undefined;
    },
    async record(appVersion: string, acknowledgedBy: string, at: Date): Promise<void> {
      await db
        .insertInto('safety_acknowledgements')
        .values({
          acknowledged_at: at.toISOString(),
          app_version: appVersion,
          acknowledged_by: acknowledgedBy,
        })
        .execute();
    },
  };
}

export type SafetyAcknowledgementRepository = ReturnType<typeof createSafetyAcknowledgementRepository>;
