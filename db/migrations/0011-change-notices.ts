/**
 * Change notices between workstations. On PostgreSQL several workstations share one database:
 * after a row is added to a clinic table (or the clinic's settings or a workstation's row is
 * written), a trigger sends a small notice on the channel `tidewing_changes` with the table and
 * the ids a screen needs to decide whether to refresh; PostgreSQL delivers it to every listening
 * workstation when the transaction commits (db/change-listener.ts listens and republishes it to
 * the back end's change source). No values are sent, only ids: each payload stays far below
 * PostgreSQL's 8000-byte limit. `by` is the writing connection's application_name, so a
 * workstation can tell its own writes (already published in-process) from the others'.
 *
 * Numbered 11 after migration 10 (being written on another branch); it joins the list in
 * index.ts when that lands (the tests apply it after the current list meanwhile).
 *
 * SQLite has one writer host per data folder; its own back end publishes every change it makes,
 * so its text is a harmless no-op that keeps the numbering the same on both engines.
 */

/** The LISTEN/NOTIFY channel of change notices. */
export const changeNoticeChannel = 'tidewing_changes';

/** Tables whose new rows send a notice (rows are only ever added to them). */
export const noticeTablesOnInsert = [
  'species',
  'patients',
  'patient_versions',
  'weights',
  'plans',
  'plan_choices',
  'procedure_records',
  'procedure_record_versions',
  'procedure_entries',
  'emergency_drugs',
  'evidence_exclusions',
  'evidence_calibration_switch',
  'safety_acknowledgements',
] as const;

/** Tables whose one row per key is replaced in place: a notice on insert and on update. */
export const noticeTablesOnWrite = ['clinic_settings', 'workstations'] as const;

export type NoticeTable = (typeof noticeTablesOnInsert)[number] | (typeof noticeTablesOnWrite)[number];

const triggers = [
  ...noticeTablesOnInsert.map(
    (table) => `
    CREATE TRIGGER ${table}_change_notice AFTER INSERT ON ${table}
      FOR EACH ROW EXECUTE FUNCTION tidewing_change_notice();`,
  ),
  ...noticeTablesOnWrite.map(
    (table) => `
    CREATE TRIGGER ${table}_change_notice AFTER INSERT OR UPDATE ON ${table}
      FOR EACH ROW EXECUTE FUNCTION tidewing_change_notice();`,
  ),
].join('');

export const changeNoticesMigration = {
  version: 11,
  name: 'change notices',
  sql: `
    -- SQLite has one writer host per data folder, which publishes its own changes in-process:
    -- nothing to do here. The statement only keeps the migration numbering equal on both engines.
    SELECT 1;
  `,
  postgresql: `
    -- One function for every notice table: PL/pgSQL prepares each branch for the table it runs
    -- on, so a column named in another table's branch is never looked up.
    CREATE FUNCTION tidewing_change_notice() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      patient integer;
      record integer;
      plan integer;
      day text;
    BEGIN
      CASE TG_TABLE_NAME
        WHEN 'patients' THEN patient := NEW.id;
        WHEN 'patient_versions', 'weights' THEN patient := NEW.patient_id;
        WHEN 'plans' THEN plan := NEW.id; patient := NEW.patient_id; day := NEW.planned_for;
        WHEN 'plan_choices' THEN plan := NEW.chosen_id;
        WHEN 'procedure_records' THEN record := NEW.id; patient := NEW.patient_id;
        WHEN 'procedure_record_versions', 'procedure_entries', 'evidence_exclusions' THEN record := NEW.record_id;
        ELSE NULL;
      END CASE;
      PERFORM pg_notify('${changeNoticeChannel}', json_strip_nulls(json_build_object(
        'table', TG_TABLE_NAME,
        'patient', patient,
        'record', record,
        'plan', plan,
        'day', day,
        'by', left(current_setting('application_name'), 63)
      ))::text);
      RETURN NULL;
    END
    $$;
    ${triggers}
  `,
} as const;
