import { clinicSettingsMigration } from './0001-clinic-settings.js';
import { clinicRecordsMigration } from './0002-clinic-records.js';
import { emergencyDrugsMigration } from './0003-emergency-drugs.js';
import { bodyMassTo200KgMigration } from './0004-body-mass-to-200-kg.js';
import { dateFormatMigration } from './0005-date-format.js';
import { clinicEvidenceMigration } from './0006-clinic-evidence.js';
import { workstationsMigration } from './0007-workstations.js';
import { planVariantsMigration } from './0008-plan-variants.js';
import { evidencePredictionCacheMigration } from './0009-evidence-prediction-cache.js';
import { entryWorkstationsMigration } from './0010-entry-workstations.js';
import { changeNoticesMigration } from './0011-change-notices.js';
import { recordAgentMigration } from './0012-record-agent.js';
import { patientSearchStartsMigration } from './0013-patient-search-starts.js';

/**
 * One schema step for both engines: `sql` for SQLite, `postgresql` for a PostgreSQL server. The
 * two texts build the same tables, constraints and append-only rules in each dialect; their
 * histories may differ where SQLite needs a table rebuild that PostgreSQL does in place, but
 * after each step the schema means the same on both.
 */
export type Migration = {
  readonly version: number;
  readonly name: string;
  readonly sql: string;
  readonly postgresql: string;
};

/** Forward-only, numbered from 1 without gaps; each runs in one transaction. */
export const migrations: readonly Migration[] = [
  clinicSettingsMigration,
  clinicRecordsMigration,
  emergencyDrugsMigration,
  bodyMassTo200KgMigration,
  dateFormatMigration,
  clinicEvidenceMigration,
  workstationsMigration,
  planVariantsMigration,
  evidencePredictionCacheMigration,
  entryWorkstationsMigration,
  changeNoticesMigration,
  recordAgentMigration,
  patientSearchStartsMigration,
];

export const latestSchemaVersion = migrations.length;
