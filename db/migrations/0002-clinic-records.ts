/**
 * Clinic records: species reference, patients, weights, plans, procedure records and their
 * entries. Record rows are never changed or deleted: a correction is a new row whose
 * `corrects_id` points at the row it replaces, with who, when and why. Triggers refuse UPDATE
 * and DELETE on every record table so that no code path can lose history.
 */
const recordColumns = `
  entered_at TEXT NOT NULL CHECK (length(entered_at) >= 20),
  entered_by TEXT NOT NULL CHECK (length(trim(entered_by)) BETWEEN 1 AND 80),
  reason TEXT NOT NULL DEFAULT '' CHECK (length(reason) <= 500)`;

function immutable(table: string): string {
  return `
    CREATE TRIGGER ${table}_never_updated BEFORE UPDATE ON ${table}
      BEGIN SELECT RAISE(ABORT, '${table} rows are never changed in place; add a correction'); END;
    CREATE TRIGGER ${table}_never_deleted BEFORE DELETE ON ${table}
      BEGIN SELECT RAISE(ABORT, '${table} rows are never deleted; add a correction that voids the row'); END;`;
}

function macColumns(agent: string): string {
  return `
  mac_${agent}_pct REAL CHECK (mac_${agent}_pct IS NULL OR mac_${agent}_pct BETWEEN 0.1 AND 15),
  mac_${agent}_sd_pct REAL CHECK (mac_${agent}_sd_pct IS NULL OR mac_${agent}_sd_pct >= 0),
  mac_${agent}_measure TEXT CHECK (mac_${agent}_measure IS NULL OR mac_${agent}_measure IN ('MAC', 'ED50', 'minimum anaesthetic dose')),
  mac_${agent}_basis TEXT,
  mac_${agent}_note TEXT`;
}

function macChecks(agent: string): string {
  return `
  CHECK ((mac_${agent}_pct IS NULL) = (mac_${agent}_basis IS NULL)),
  CHECK ((mac_${agent}_pct IS NULL) = (mac_${agent}_measure IS NULL))`;
}

// PostgreSQL: the same columns, rules and defaults in its dialect (integer, double precision,
// text; ids from an identity that a copied row's explicit id does not advance).
const recordColumnsPostgresql = `
  entered_at text NOT NULL CHECK (length(entered_at) >= 20),
  entered_by text NOT NULL CHECK (length(trim(entered_by)) BETWEEN 1 AND 80),
  reason text NOT NULL DEFAULT '' CHECK (length(reason) <= 500)`;

/**
 * PostgreSQL's form of `immutable`: row triggers raising the same message as SQLite's (the
 * trigger function, made below, raises its first argument), and TRUNCATE, which runs no row
 * trigger, refused as a delete.
 */
function immutablePostgresql(table: string): string {
  const changed = `${table} rows are never changed in place; add a correction`;
  const deleted = `${table} rows are never deleted; add a correction that voids the row`;
  return `
    CREATE TRIGGER ${table}_never_updated BEFORE UPDATE ON ${table}
      FOR EACH ROW EXECUTE FUNCTION tidewing_refuse_change('${changed}');
    CREATE TRIGGER ${table}_never_deleted BEFORE DELETE ON ${table}
      FOR EACH ROW EXECUTE FUNCTION tidewing_refuse_change('${deleted}');
    CREATE TRIGGER ${table}_never_truncated BEFORE TRUNCATE ON ${table}
      FOR EACH STATEMENT EXECUTE FUNCTION tidewing_refuse_change('${deleted}');`;
}

function macColumnsPostgresql(agent: string): string {
  return `
  mac_${agent}_pct double precision CHECK (mac_${agent}_pct IS NULL OR mac_${agent}_pct BETWEEN 0.1 AND 15),
  mac_${agent}_sd_pct double precision CHECK (mac_${agent}_sd_pct IS NULL OR mac_${agent}_sd_pct >= 0),
  mac_${agent}_measure text CHECK (mac_${agent}_measure IS NULL OR mac_${agent}_measure IN ('MAC', 'ED50', 'minimum anaesthetic dose')),
  mac_${agent}_basis text,
  mac_${agent}_note text`;
}

// PostgreSQL names a CHECK on one column after its table and column (`weights_mass_g_check`);
// checks on two columns are named here the same way after their first column, so that a failure
// can point at the field as SQLite's message (the check's text) does.
function macChecksPostgresql(agent: string): string {
  return `
  CONSTRAINT species_mac_${agent}_pct_with_basis_check CHECK ((mac_${agent}_pct IS NULL) = (mac_${agent}_basis IS NULL)),
  CONSTRAINT species_mac_${agent}_pct_with_measure_check CHECK ((mac_${agent}_pct IS NULL) = (mac_${agent}_measure IS NULL))`;
}

export const clinicRecordsMigration = {
  version: 2,
  name: 'clinic records with corrections',
  sql: `
    CREATE TABLE species (
      id INTEGER PRIMARY KEY,
      species_key TEXT NOT NULL CHECK (species_key GLOB '[a-z0-9]*' AND length(species_key) BETWEEN 1 AND 60),
      corrects_id INTEGER UNIQUE REFERENCES species (id),
      origin TEXT NOT NULL CHECK (origin IN ('reference', 'clinic')),
      common_name TEXT NOT NULL CHECK (length(trim(common_name)) BETWEEN 1 AND 120),
      scientific_name TEXT NOT NULL DEFAULT '' CHECK (length(scientific_name) <= 120),
      mass_min_g REAL NOT NULL CHECK (mass_min_g > 0),
      mass_max_g REAL NOT NULL CHECK (mass_max_g >= mass_min_g AND mass_max_g <= 20000),
      mass_basis TEXT NOT NULL CHECK (length(trim(mass_basis)) > 0),
      heart_rate_min_per_min REAL CHECK (heart_rate_min_per_min IS NULL OR heart_rate_min_per_min > 0),
      heart_rate_max_per_min REAL CHECK (heart_rate_max_per_min IS NULL OR heart_rate_max_per_min >= heart_rate_min_per_min),
      heart_rate_basis TEXT,
      breaths_min_per_min REAL CHECK (breaths_min_per_min IS NULL OR breaths_min_per_min > 0),
      breaths_max_per_min REAL CHECK (breaths_max_per_min IS NULL OR breaths_max_per_min >= breaths_min_per_min),
      breaths_basis TEXT,
      ${macColumns('isoflurane')},
      ${macColumns('sevoflurane')},
      ${macColumns('desflurane')},
      apnoea_mac_multiple REAL CHECK (apnoea_mac_multiple IS NULL OR apnoea_mac_multiple > 0),
      apnoea_basis TEXT,
      anatomy_notes_json TEXT NOT NULL DEFAULT '[]' CHECK (json_valid(anatomy_notes_json) AND json_type(anatomy_notes_json) = 'array'),
      ${recordColumns},
      CHECK ((heart_rate_min_per_min IS NULL) = (heart_rate_basis IS NULL)),
      CHECK ((breaths_min_per_min IS NULL) = (breaths_basis IS NULL)),
      CHECK ((apnoea_mac_multiple IS NULL) = (apnoea_basis IS NULL)),
      ${macChecks('isoflurane')},
      ${macChecks('sevoflurane')},
      ${macChecks('desflurane')}
    ) STRICT;
    CREATE UNIQUE INDEX species_first_key ON species (species_key) WHERE corrects_id IS NULL;
    CREATE INDEX species_key_index ON species (species_key);
    ${immutable('species')}

    CREATE TABLE patients (
      id INTEGER PRIMARY KEY,
      created_at TEXT NOT NULL
    ) STRICT;
    ${immutable('patients')}

    CREATE TABLE patient_versions (
      id INTEGER PRIMARY KEY,
      patient_id INTEGER NOT NULL REFERENCES patients (id),
      corrects_id INTEGER UNIQUE REFERENCES patient_versions (id),
      name TEXT NOT NULL CHECK (length(trim(name)) BETWEEN 1 AND 120),
      species_key TEXT NOT NULL CHECK (length(species_key) BETWEEN 1 AND 60),
      sex TEXT NOT NULL CHECK (sex IN ('female', 'male', 'unknown')),
      hatch_date TEXT CHECK (hatch_date IS NULL OR hatch_date GLOB '[0-9][0-9][0-9][0-9]-[0-9][0-9]-[0-9][0-9]'),
      age_text TEXT NOT NULL DEFAULT '' CHECK (length(age_text) <= 60),
      ring_id TEXT NOT NULL DEFAULT '' CHECK (length(ring_id) <= 60),
      microchip_id TEXT NOT NULL DEFAULT '' CHECK (length(microchip_id) <= 60),
      owner_reference TEXT NOT NULL DEFAULT '' CHECK (length(owner_reference) <= 120),
      notes TEXT NOT NULL DEFAULT '' CHECK (length(notes) <= 4000),
      ${recordColumns}
    ) STRICT;
    CREATE INDEX patient_versions_patient ON patient_versions (patient_id);
    ${immutable('patient_versions')}

    -- Pointer to each patient's current version: an index kept in the same transaction as
    -- each new version, not a record; the versions above stay untouched.
    CREATE TABLE patient_current (
      patient_id INTEGER PRIMARY KEY REFERENCES patients (id),
      version_id INTEGER NOT NULL UNIQUE REFERENCES patient_versions (id)
    ) STRICT;

    CREATE VIRTUAL TABLE patient_search USING fts5 (search_text, tokenize = 'trigram');

    CREATE TABLE weights (
      id INTEGER PRIMARY KEY,
      patient_id INTEGER NOT NULL REFERENCES patients (id),
      corrects_id INTEGER UNIQUE REFERENCES weights (id),
      voided INTEGER NOT NULL DEFAULT 0 CHECK (voided IN (0, 1)),
      weighed_on TEXT NOT NULL CHECK (weighed_on GLOB '[0-9][0-9][0-9][0-9]-[0-9][0-9]-[0-9][0-9]*'),
      mass_g REAL NOT NULL CHECK (mass_g > 0 AND mass_g <= 20000),
      body_condition TEXT NOT NULL DEFAULT '' CHECK (body_condition IN ('', 'emaciated', 'thin', 'ideal', 'overweight', 'obese')),
      weighed_by TEXT NOT NULL DEFAULT '' CHECK (length(weighed_by) <= 80),
      ${recordColumns}
    ) STRICT;
    CREATE INDEX weights_patient ON weights (patient_id, weighed_on);
    ${immutable('weights')}

    CREATE TABLE plans (
      id INTEGER PRIMARY KEY,
      patient_id INTEGER REFERENCES patients (id),
      corrects_id INTEGER UNIQUE REFERENCES plans (id),
      planned_for TEXT NOT NULL CHECK (planned_for GLOB '[0-9][0-9][0-9][0-9]-[0-9][0-9]-[0-9][0-9]'),
      label TEXT NOT NULL DEFAULT '' CHECK (length(label) <= 120),
      input_json TEXT NOT NULL CHECK (json_valid(input_json)),
      result_json TEXT NOT NULL CHECK (json_valid(result_json)),
      checklist_json TEXT NOT NULL DEFAULT '{}' CHECK (json_valid(checklist_json)),
      model_version TEXT NOT NULL CHECK (length(model_version) > 0),
      ${recordColumns}
    ) STRICT;
    CREATE INDEX plans_patient ON plans (patient_id);
    CREATE INDEX plans_day ON plans (planned_for);
    ${immutable('plans')}

    CREATE TABLE procedure_records (
      id INTEGER PRIMARY KEY,
      patient_id INTEGER NOT NULL REFERENCES patients (id),
      created_at TEXT NOT NULL
    ) STRICT;
    ${immutable('procedure_records')}

    CREATE TABLE procedure_record_versions (
      id INTEGER PRIMARY KEY,
      record_id INTEGER NOT NULL REFERENCES procedure_records (id),
      corrects_id INTEGER UNIQUE REFERENCES procedure_record_versions (id),
      plan_id INTEGER REFERENCES plans (id),
      started_at TEXT NOT NULL,
      ended_at TEXT,
      asa_grade INTEGER CHECK (asa_grade IS NULL OR asa_grade BETWEEN 1 AND 5),
      emergency INTEGER NOT NULL DEFAULT 0 CHECK (emergency IN (0, 1)),
      procedure_name TEXT NOT NULL CHECK (length(trim(procedure_name)) BETWEEN 1 AND 200),
      fasting TEXT NOT NULL DEFAULT '' CHECK (length(fasting) <= 200),
      crop_checked TEXT NOT NULL DEFAULT 'not checked' CHECK (crop_checked IN ('not checked', 'empty', 'not empty')),
      airway TEXT NOT NULL CHECK (airway IN ('mask', 'chamber', 'endotracheal', 'airSacTube')),
      tube_size_mm REAL CHECK (tube_size_mm IS NULL OR tube_size_mm BETWEEN 1 AND 15),
      tube_type TEXT NOT NULL DEFAULT '' CHECK (tube_type IN ('', 'uncuffed', 'cuffed, cuff down', 'cuffed, cuff up')),
      circuit TEXT NOT NULL CHECK (circuit IN ('nonRebreathing', 'circle')),
      staff_initials TEXT NOT NULL CHECK (length(trim(staff_initials)) BETWEEN 1 AND 40),
      prompt_interval_min REAL NOT NULL DEFAULT 5 CHECK (prompt_interval_min BETWEEN 1 AND 30),
      ${recordColumns}
    ) STRICT;
    CREATE INDEX procedure_record_versions_record ON procedure_record_versions (record_id);
    ${immutable('procedure_record_versions')}

    CREATE TABLE procedure_entries (
      id INTEGER PRIMARY KEY,
      record_id INTEGER NOT NULL REFERENCES procedure_records (id),
      corrects_id INTEGER UNIQUE REFERENCES procedure_entries (id),
      voided INTEGER NOT NULL DEFAULT 0 CHECK (voided IN (0, 1)),
      at TEXT NOT NULL,
      kind TEXT NOT NULL CHECK (kind IN ('vitals', 'event')),
      vapor_pct REAL CHECK (vapor_pct IS NULL OR vapor_pct BETWEEN 0 AND 10),
      oxygen_lpm REAL CHECK (oxygen_lpm IS NULL OR oxygen_lpm BETWEEN 0 AND 15),
      heart_rate_per_min REAL CHECK (heart_rate_per_min IS NULL OR heart_rate_per_min BETWEEN 0 AND 1200),
      breaths_per_min REAL CHECK (breaths_per_min IS NULL OR breaths_per_min BETWEEN 0 AND 300),
      temperature_c REAL CHECK (temperature_c IS NULL OR temperature_c BETWEEN 20 AND 46),
      etco2_mmhg REAL CHECK (etco2_mmhg IS NULL OR etco2_mmhg BETWEEN 0 AND 150),
      spo2_pct REAL CHECK (spo2_pct IS NULL OR spo2_pct BETWEEN 0 AND 100),
      event_type TEXT CHECK (event_type IS NULL OR event_type IN (
        'induction', 'intubation', 'apnoea', 'ippvOn', 'ippvOff', 'vaporiserOff', 'extubation',
        'regurgitation', 'drugGiven', 'note', 'firstMovement', 'standing')),
      event_note TEXT NOT NULL DEFAULT '' CHECK (length(event_note) <= 1000),
      drug_name TEXT NOT NULL DEFAULT '' CHECK (length(drug_name) <= 120),
      drug_dose TEXT NOT NULL DEFAULT '' CHECK (length(drug_dose) <= 120),
      ${recordColumns},
      CHECK ((kind = 'event') = (event_type IS NOT NULL))
    ) STRICT;
    CREATE INDEX procedure_entries_record ON procedure_entries (record_id, at);
    ${immutable('procedure_entries')}
  `,
  postgresql: `
    -- json_valid and json_type of SQLite: false (not an error) for text that is not JSON, and
    -- null for null, so that a CHECK refuses bad text exactly as on SQLite.
    CREATE FUNCTION tidewing_is_json(value text) RETURNS boolean
      LANGUAGE plpgsql IMMUTABLE STRICT PARALLEL SAFE AS $$
      BEGIN
        PERFORM value::json;
        RETURN true;
      EXCEPTION WHEN data_exception THEN
        RETURN false;
      END;
      $$;
    CREATE FUNCTION tidewing_json_type(value text) RETURNS text
      LANGUAGE plpgsql IMMUTABLE STRICT PARALLEL SAFE AS $$
      BEGIN
        RETURN json_typeof(value::json);
      EXCEPTION WHEN data_exception THEN
        RETURN NULL;
      END;
      $$;

    -- The append-only rule: raises its first argument, the same message SQLite's trigger raises,
    -- naming the table and the trigger (the error's table and constraint fields).
    CREATE FUNCTION tidewing_refuse_change() RETURNS trigger
      LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION USING MESSAGE = TG_ARGV[0], ERRCODE = 'raise_exception',
          TABLE = TG_TABLE_NAME, SCHEMA = TG_TABLE_SCHEMA, CONSTRAINT = TG_NAME;
      END;
      $$;

    CREATE TABLE species (
      id integer GENERATED BY DEFAULT AS IDENTITY PRIMARY KEY,
      species_key text NOT NULL CHECK (species_key ~ '^[a-z0-9]' AND length(species_key) BETWEEN 1 AND 60),
      corrects_id integer UNIQUE REFERENCES species (id),
      origin text NOT NULL CHECK (origin IN ('reference', 'clinic')),
      common_name text NOT NULL CHECK (length(trim(common_name)) BETWEEN 1 AND 120),
      scientific_name text NOT NULL DEFAULT '' CHECK (length(scientific_name) <= 120),
      mass_min_g double precision NOT NULL CHECK (mass_min_g > 0),
      mass_max_g double precision NOT NULL CONSTRAINT species_mass_max_g_check CHECK (mass_max_g >= mass_min_g AND mass_max_g <= 20000),
      mass_basis text NOT NULL CHECK (length(trim(mass_basis)) > 0),
      heart_rate_min_per_min double precision CHECK (heart_rate_min_per_min IS NULL OR heart_rate_min_per_min > 0),
      heart_rate_max_per_min double precision CONSTRAINT species_heart_rate_max_per_min_check CHECK (heart_rate_max_per_min IS NULL OR heart_rate_max_per_min >= heart_rate_min_per_min),
      heart_rate_basis text,
      breaths_min_per_min double precision CHECK (breaths_min_per_min IS NULL OR breaths_min_per_min > 0),
      breaths_max_per_min double precision CONSTRAINT species_breaths_max_per_min_check CHECK (breaths_max_per_min IS NULL OR breaths_max_per_min >= breaths_min_per_min),
      breaths_basis text,
      ${macColumnsPostgresql('isoflurane')},
      ${macColumnsPostgresql('sevoflurane')},
      ${macColumnsPostgresql('desflurane')},
      apnoea_mac_multiple double precision CHECK (apnoea_mac_multiple IS NULL OR apnoea_mac_multiple > 0),
      apnoea_basis text,
      anatomy_notes_json text NOT NULL DEFAULT '[]' CHECK (tidewing_is_json(anatomy_notes_json) AND tidewing_json_type(anatomy_notes_json) = 'array'),
      ${recordColumnsPostgresql},
      CONSTRAINT species_heart_rate_min_per_min_with_basis_check CHECK ((heart_rate_min_per_min IS NULL) = (heart_rate_basis IS NULL)),
      CONSTRAINT species_breaths_min_per_min_with_basis_check CHECK ((breaths_min_per_min IS NULL) = (breaths_basis IS NULL)),
      CONSTRAINT species_apnoea_mac_multiple_with_basis_check CHECK ((apnoea_mac_multiple IS NULL) = (apnoea_basis IS NULL)),
      ${macChecksPostgresql('isoflurane')},
      ${macChecksPostgresql('sevoflurane')},
      ${macChecksPostgresql('desflurane')}
    );
    CREATE UNIQUE INDEX species_first_key ON species (species_key) WHERE corrects_id IS NULL;
    CREATE INDEX species_key_index ON species (species_key);
    ${immutablePostgresql('species')}

    CREATE TABLE patients (
      id integer GENERATED BY DEFAULT AS IDENTITY PRIMARY KEY,
      created_at text NOT NULL
    );
    ${immutablePostgresql('patients')}

    CREATE TABLE patient_versions (
      id integer GENERATED BY DEFAULT AS IDENTITY PRIMARY KEY,
      patient_id integer NOT NULL REFERENCES patients (id),
      corrects_id integer UNIQUE REFERENCES patient_versions (id),
      name text NOT NULL CHECK (length(trim(name)) BETWEEN 1 AND 120),
      species_key text NOT NULL CHECK (length(species_key) BETWEEN 1 AND 60),
      sex text NOT NULL CHECK (sex IN ('female', 'male', 'unknown')),
      hatch_date text CHECK (hatch_date IS NULL OR hatch_date ~ '^[0-9]{4}-[0-9]{2}-[0-9]{2}$'),
      age_text text NOT NULL DEFAULT '' CHECK (length(age_text) <= 60),
      ring_id text NOT NULL DEFAULT '' CHECK (length(ring_id) <= 60),
      microchip_id text NOT NULL DEFAULT '' CHECK (length(microchip_id) <= 60),
      owner_reference text NOT NULL DEFAULT '' CHECK (length(owner_reference) <= 120),
      notes text NOT NULL DEFAULT '' CHECK (length(notes) <= 4000),
      ${recordColumnsPostgresql}
    );
    CREATE INDEX patient_versions_patient ON patient_versions (patient_id);
    ${immutablePostgresql('patient_versions')}

    -- Pointer to each patient's current version: an index kept in the same transaction as
    -- each new version, not a record; the versions above stay untouched.
    CREATE TABLE patient_current (
      patient_id integer PRIMARY KEY REFERENCES patients (id),
      version_id integer NOT NULL UNIQUE REFERENCES patient_versions (id)
    );

    -- The patient search text, derived and rewritten with each version (SQLite keeps it in an
    -- FTS5 trigram table). Same name and columns (rowid is the patient id), searched with ILIKE
    -- through a trigram index. pg_trgm is a trusted extension, so the database's owner may
    -- create it; a DBA may also create it beforehand (in a schema on the search path), and
    -- then this statement does nothing.
    CREATE EXTENSION IF NOT EXISTS pg_trgm;
    CREATE TABLE patient_search (
      rowid integer PRIMARY KEY REFERENCES patients (id),
      search_text text NOT NULL
    );
    CREATE INDEX patient_search_trigram ON patient_search USING gin (search_text gin_trgm_ops);

    CREATE TABLE weights (
      id integer GENERATED BY DEFAULT AS IDENTITY PRIMARY KEY,
      patient_id integer NOT NULL REFERENCES patients (id),
      corrects_id integer UNIQUE REFERENCES weights (id),
      voided integer NOT NULL DEFAULT 0 CHECK (voided IN (0, 1)),
      weighed_on text NOT NULL CHECK (weighed_on ~ '^[0-9]{4}-[0-9]{2}-[0-9]{2}'),
      mass_g double precision NOT NULL CONSTRAINT weights_mass_g_check CHECK (mass_g > 0 AND mass_g <= 20000),
      body_condition text NOT NULL DEFAULT '' CHECK (body_condition IN ('', 'emaciated', 'thin', 'ideal', 'overweight', 'obese')),
      weighed_by text NOT NULL DEFAULT '' CHECK (length(weighed_by) <= 80),
      ${recordColumnsPostgresql}
    );
    CREATE INDEX weights_patient ON weights (patient_id, weighed_on);
    ${immutablePostgresql('weights')}

    CREATE TABLE plans (
      id integer GENERATED BY DEFAULT AS IDENTITY PRIMARY KEY,
      patient_id integer REFERENCES patients (id),
      corrects_id integer UNIQUE REFERENCES plans (id),
      planned_for text NOT NULL CHECK (planned_for ~ '^[0-9]{4}-[0-9]{2}-[0-9]{2}$'),
      label text NOT NULL DEFAULT '' CHECK (length(label) <= 120),
      input_json text NOT NULL CHECK (tidewing_is_json(input_json)),
      result_json text NOT NULL CHECK (tidewing_is_json(result_json)),
      checklist_json text NOT NULL DEFAULT '{}' CHECK (tidewing_is_json(checklist_json)),
      model_version text NOT NULL CHECK (length(model_version) > 0),
      ${recordColumnsPostgresql}
    );
    CREATE INDEX plans_patient ON plans (patient_id);
    CREATE INDEX plans_day ON plans (planned_for);
    ${immutablePostgresql('plans')}

    CREATE TABLE procedure_records (
      id integer GENERATED BY DEFAULT AS IDENTITY PRIMARY KEY,
      patient_id integer NOT NULL REFERENCES patients (id),
      created_at text NOT NULL
    );
    ${immutablePostgresql('procedure_records')}

    CREATE TABLE procedure_record_versions (
      id integer GENERATED BY DEFAULT AS IDENTITY PRIMARY KEY,
      record_id integer NOT NULL REFERENCES procedure_records (id),
      corrects_id integer UNIQUE REFERENCES procedure_record_versions (id),
      plan_id integer REFERENCES plans (id),
      started_at text NOT NULL,
      ended_at text,
      asa_grade integer CHECK (asa_grade IS NULL OR asa_grade BETWEEN 1 AND 5),
      emergency integer NOT NULL DEFAULT 0 CHECK (emergency IN (0, 1)),
      procedure_name text NOT NULL CHECK (length(trim(procedure_name)) BETWEEN 1 AND 200),
      fasting text NOT NULL DEFAULT '' CHECK (length(fasting) <= 200),
      crop_checked text NOT NULL DEFAULT 'not checked' CHECK (crop_checked IN ('not checked', 'empty', 'not empty')),
      airway text NOT NULL CHECK (airway IN ('mask', 'chamber', 'endotracheal', 'airSacTube')),
      tube_size_mm double precision CHECK (tube_size_mm IS NULL OR tube_size_mm BETWEEN 1 AND 15),
      tube_type text NOT NULL DEFAULT '' CHECK (tube_type IN ('', 'uncuffed', 'cuffed, cuff down', 'cuffed, cuff up')),
      circuit text NOT NULL CHECK (circuit IN ('nonRebreathing', 'circle')),
      staff_initials text NOT NULL CHECK (length(trim(staff_initials)) BETWEEN 1 AND 40),
      prompt_interval_min double precision NOT NULL DEFAULT 5 CHECK (prompt_interval_min BETWEEN 1 AND 30),
      ${recordColumnsPostgresql}
    );
    CREATE INDEX procedure_record_versions_record ON procedure_record_versions (record_id);
    ${immutablePostgresql('procedure_record_versions')}

    CREATE TABLE procedure_entries (
      id integer GENERATED BY DEFAULT AS IDENTITY PRIMARY KEY,
      record_id integer NOT NULL REFERENCES procedure_records (id),
      corrects_id integer UNIQUE REFERENCES procedure_entries (id),
      voided integer NOT NULL DEFAULT 0 CHECK (voided IN (0, 1)),
      at text NOT NULL,
      kind text NOT NULL CHECK (kind IN ('vitals', 'event')),
      vapor_pct double precision CHECK (vapor_pct IS NULL OR vapor_pct BETWEEN 0 AND 10),
      oxygen_lpm double precision CHECK (oxygen_lpm IS NULL OR oxygen_lpm BETWEEN 0 AND 15),
      heart_rate_per_min double precision CHECK (heart_rate_per_min IS NULL OR heart_rate_per_min BETWEEN 0 AND 1200),
      breaths_per_min double precision CHECK (breaths_per_min IS NULL OR breaths_per_min BETWEEN 0 AND 300),
      temperature_c double precision CHECK (temperature_c IS NULL OR temperature_c BETWEEN 20 AND 46),
      etco2_mmhg double precision CHECK (etco2_mmhg IS NULL OR etco2_mmhg BETWEEN 0 AND 150),
      spo2_pct double precision CHECK (spo2_pct IS NULL OR spo2_pct BETWEEN 0 AND 100),
      event_type text CHECK (event_type IS NULL OR event_type IN (
        'induction', 'intubation', 'apnoea', 'ippvOn', 'ippvOff', 'vaporiserOff', 'extubation',
        'regurgitation', 'drugGiven', 'note', 'firstMovement', 'standing')),
      event_note text NOT NULL DEFAULT '' CHECK (length(event_note) <= 1000),
      drug_name text NOT NULL DEFAULT '' CHECK (length(drug_name) <= 120),
      drug_dose text NOT NULL DEFAULT '' CHECK (length(drug_dose) <= 120),
      ${recordColumnsPostgresql},
      CONSTRAINT procedure_entries_kind_with_event_type_check CHECK ((kind = 'event') = (event_type IS NOT NULL))
    );
    CREATE INDEX procedure_entries_record ON procedure_entries (record_id, at);
    ${immutablePostgresql('procedure_entries')}
  `,
} as const;
