import type { Patient, PatientSummary, PatientValues } from '../../app/contract/records.js';
import { sql as kyselySql, type Generated } from 'kysely';
import { writeTransaction, type Sql } from '../clinic-db.js';
import { chainIds, stampOf, type StampRow } from './version-chain.js';

type PatientVersionRow = StampRow & {
  patient_id: number;
  name: string;
  species_key: string;
  sex: PatientValues['sex'];
  hatch_date: string | null;
  age_text: string;
  ring_id: string;
  microchip_id: string;
  owner_reference: string;
  notes: string;
  created_at: string;
};

type Tables = {
  patients: { id: Generated<number>; created_at: string };
  patient_versions: Omit<PatientVersionRow, 'id' | 'created_at'> & { id: Generated<number> };
  patient_current: { patient_id: number; version_id: number };
  /**
   * SQLite: an FTS5 table (trigram), whose hidden column named after the table is what MATCH
   * takes; PostgreSQL: a plain table with a pg_trgm index on search_text.
   */
  patient_search: { rowid: number; search_text: string; patient_search: Generated<string> };
  species: { id: number; species_key: string; common_name: string; corrects_id: number | null };
  weights: {
    id: number;
    patient_id: number;
    corrects_id: number | null;
    voided: number;
    weighed_on: string;
    mass_g: number;
  };
};

type SummaryRow = {
  id: number;
  name: string;
  species_key: string;
  species_name: string | null;
  ring_id: string;
  microchip_id: string;
  owner_reference: string;
  latest_mass_g: number | null;
  latest_weighed_on: string | null;
};

type Meta = { enteredBy: string; reason: string };

function rowToPatient(row: PatientVersionRow): Patient {
  return {
    id: row.patient_id,
    createdAt: row.created_at,
    values: {
      name: row.name,
      speciesKey: row.species_key,
      sex: row.sex,
      hatchDate: row.hatch_date,
      ageText: row.age_text,
      ringId: row.ring_id,
      microchipId: row.microchip_id,
      ownerReference: row.owner_reference,
      notes: row.notes,
    },
    stamp: stampOf(row),
  };
}

function rowToSummary(row: SummaryRow): PatientSummary {
  return {
    id: row.id,
    name: row.name,
    speciesKey: row.species_key,
    speciesName: row.species_name,
    ringId: row.ring_id,
    microchipId: row.microchip_id,
    ownerReference: row.owner_reference,
    latestMassG: row.latest_mass_g,
    latestWeighedOn: row.latest_weighed_on,
  };
}

/** What the search index holds for a patient: every field staff search by. */
function searchText(values: PatientValues, speciesName: string | null): string {
  return [
    values.name,
    speciesName ?? '',
    values.speciesKey,
    values.ringId,
    values.microchipId,
    values.ownerReference,
    values.hatchDate ?? '',
    values.sex,
    values.notes,
  ]
    .filter((part) => part !== '')
    .join(' \u2022 ');
}

/** Quotes a search for FTS5 so that punctuation in IDs is matched literally. */
function ftsPhrase(query: string): string {
  return `"${query.replace(/"/g, '""')}"`;
}

/** A LIKE pattern that finds `text` anywhere, with LIKE's own characters matched literally (escape \). */
function containsPattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (match) => `\\${match}`)}%`;
}

/**
 * The smallest string after every string that starts with `prefix`, in code point order: the
 * prefix with its last character one higher ("pi" -> "pj"); null when there is none.
 */
export function nextPrefix(prefix: string): string | null {
  const characters = [...prefix];
  while (characters.length > 0) {
    const last = (characters.pop() as string).codePointAt(0) as number;
    let next = last + 1;
    // Skip the surrogate range, which holds no characters of its own.
    if (next >= 0xd800 && next <= 0xdfff) next = 0xe000;
    if (next <= 0x10ffff) return characters.join('') + String.fromCodePoint(next);
  }
  return null;
}

/** All SQL for patients, patient_versions, patient_current and patient_search. */
export function createPatientRepository(sql: Sql) {
  const tables = (on: Sql) => on.kysely.withTables<Tables>();

  async function speciesName(on: Sql, key: string): Promise<string | null> {
    const row = await tables(on)
      .selectFrom('species as s')
      .select('s.common_name')
      .where('s.species_key', '=', key)
      .where(({ not, exists, selectFrom }) =>
        not(
          exists(
            selectFrom('species as later').select('later.id').whereRef('later.corrects_id', '=', 's.id'),
          ),
        ),
      )
      .executeTakeFirst();
    return row?.common_name ?? null;
  }

  async function currentRow(on: Sql, patientId: number): Promise<PatientVersionRow | undefined> {
    return tables(on)
      .selectFrom('patient_current as c')
      .innerJoin('patient_versions as v', 'v.id', 'c.version_id')
      .innerJoin('patients as p', 'p.id', 'c.patient_id')
      .selectAll('v')
      .select('p.created_at')
      .where('c.patient_id', '=', patientId)
      .executeTakeFirst();
  }

  async function addVersion(
    on: Sql,
    patientId: number,
    correctsId: number | null,
    values: PatientValues,
    meta: Meta,
    at: Date,
  ): Promise<Patient> {
    const { id: versionId } = await tables(on)
      .insertInto('patient_versions')
      .values({
        patient_id: patientId,
        corrects_id: correctsId,
        name: values.name,
        species_key: values.speciesKey,
        sex: values.sex,
        hatch_date: values.hatchDate,
        age_text: values.ageText,
        ring_id: values.ringId,
        microchip_id: values.microchipId,
        owner_reference: values.ownerReference,
        notes: values.notes,
        entered_at: at.toISOString(),
        entered_by: meta.enteredBy,
        reason: meta.reason,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    await tables(on)
      .insertInto('patient_current')
      .values({ patient_id: patientId, version_id: versionId })
      .onConflict((conflict) =>
        conflict
          .column('patient_id')
          .doUpdateSet((update) => ({ version_id: update.ref('excluded.version_id') })),
      )
      .execute();
    await tables(on).deleteFrom('patient_search').where('rowid', '=', patientId).execute();
    await tables(on)
      .insertInto('patient_search')
      .values({ rowid: patientId, search_text: searchText(values, await speciesName(on, values.speciesKey)) })
      .execute();
    return rowToPatient((await currentRow(on, patientId)) as PatientVersionRow);
  }

  /** Each patient's current version with its species' name and its newest weight that stands. */
  function summaries() {
    return tables(sql)
      .selectFrom('patients as p')
      .innerJoin('patient_current as c', 'c.patient_id', 'p.id')
      .innerJoin('patient_versions as v', 'v.id', 'c.version_id')
      .leftJoin('weights as w', (join) =>
        join.on(({ eb, selectFrom }) =>
          eb(
            'w.id',
            '=',
            selectFrom('weights as x')
              .select('x.id')
              .whereRef('x.patient_id', '=', 'p.id')
              .where('x.voided', '=', 0)
              .where(({ not, exists, selectFrom: inner }) =>
                not(
                  exists(
                    inner('weights as later').select('later.id').whereRef('later.corrects_id', '=', 'x.id'),
                  ),
                ),
              )
              .orderBy('x.weighed_on', 'desc')
              .orderBy('x.id', 'desc')
              .limit(1),
          ),
        ),
      )
      .select(({ selectFrom }) => [
        'p.id',
        'v.name',
        'v.species_key',
        'v.ring_id',
        'v.microchip_id',
        'v.owner_reference',
        selectFrom('species as s')
          .select('s.common_name')
          .whereRef('s.species_key', '=', 'v.species_key')
          .where(({ not, exists, selectFrom: inner }) =>
            not(
              exists(inner('species as later').select('later.id').whereRef('later.corrects_id', '=', 's.id')),
            ),
          )
          .as('species_name'),
        'w.mass_g as latest_mass_g',
        'w.weighed_on as latest_weighed_on',
      ]);
  }

  /** The ids of patients whose search text holds `text` (three or more characters on SQLite). */
  function matching(text: string) {
    const search = tables(sql).selectFrom('patient_search').select('rowid');
    // The one statement whose dialects differ: SQLite's FTS5 trigram index is asked with MATCH
    // (a quoted phrase, so punctuation in IDs is literal); PostgreSQL's pg_trgm index serves ILIKE.
    if (sql.engine === 'postgresql') return search.where('search_text', 'ilike', containsPattern(text));
    return search.where('patient_search', 'match', ftsPhrase(text));
  }

  /**
   * The ids of patients whose current name, ring number or microchip number starts with `text`
   * (one or two characters, too short for the trigram index): a range on the start-of-field index of
   * each, so the search never reads every patient. The text is folded as the engine's lower()
   * folds the stored value (SQLite: A-Z only; PostgreSQL: its locale's lower case), and the
   * range compares code point by code point on both (SQLite's BINARY, PostgreSQL's "C").
   */
  function matchingStart(text: string) {
    const from =
      sql.engine === 'sqlite' ? text.replace(/[A-Z]/g, (letter) => letter.toLowerCase()) : text.toLowerCase();
    const to = nextPrefix(from);
    const folded = (column: 'v.name' | 'v.ring_id' | 'v.microchip_id') =>
      sql.engine === 'postgresql'
        ? kyselySql`(lower(${kyselySql.ref(column)}) COLLATE "C")`
        : kyselySql`lower(${kyselySql.ref(column)})`;
    const starts = (column: 'v.name' | 'v.ring_id' | 'v.microchip_id') =>
      to === null
        ? kyselySql<boolean>`${folded(column)} >= ${from}`
        : kyselySql<boolean>`(${folded(column)} >= ${from} AND ${folded(column)} < ${to})`;
    return tables(sql)
      .selectFrom('patient_current as c')
      .innerJoin('patient_versions as v', 'v.id', 'c.version_id')
      .select('c.patient_id')
      .where(({ or }) => or([starts('v.name'), starts('v.ring_id'), starts('v.microchip_id')]));
  }

  return {
    create(values: PatientValues, meta: Meta, at: Date): Promise<Patient> {
      return writeTransaction(sql, async (tx) => {
        const { id: patientId } = await tables(tx)
          .insertInto('patients')
          .values({ created_at: at.toISOString() })
          .returning('id')
          .executeTakeFirstOrThrow();
        return addVersion(tx, patientId, null, values, meta, at);
      });
    },
    /**
     * Adds a corrected version; the earlier one stays in the history. With `versionId` (the version
     * the user saw), refuses with PatientVersionMismatchError when another version was saved since.
     */
    correct(
      patientId: number,
      values: PatientValues,
      meta: Meta,
      at: Date,
      versionId?: number,
    ): Promise<Patient | null> {
      return writeTransaction(sql, async (tx) => {
        const current = await currentRow(tx, patientId);
        if (current === undefined) return null;
        if (versionId !== undefined && versionId !== current.id)
          throw new PatientVersionMismatchError(versionId, current.id);
        return addVersion(tx, patientId, current.id, values, meta, at);
      });
    },
    async get(patientId: number): Promise<Patient | null> {
      const row = await currentRow(sql, patientId);
      return row === undefined ? null : rowToPatient(row);
    },
    async history(patientId: number): Promise<Patient[]> {
      const row = await currentRow(sql, patientId);
      if (row === undefined) return [];
      const ids = await chainIds(sql, 'patient_versions', row.id);
      // Newest first, as the chain is: a later version always has a higher id.
      const rows = await tables(sql)
        .selectFrom('patient_versions as v')
        .innerJoin('patients as p', 'p.id', 'v.patient_id')
        .selectAll('v')
        .select('p.created_at')
        .where('v.id', 'in', ids)
        .orderBy('v.id', 'desc')
        .execute();
      return rows.map(rowToPatient);
    },
    /**
     * Finds patients by name or ID, species, ring, microchip, owner reference, hatch date or notes:
     * three or more characters anywhere in them (the trigram index). One or two characters find
     * the patients whose name, ring number or microchip number starts with them (indexed ranges).
     */
    async search(query: string, limit = 50): Promise<PatientSummary[]> {
      const trimmed = query.trim();
      if (trimmed === '')
        return (await summaries().orderBy('p.id', 'desc').limit(limit).execute()).map(rowToSummary);
      const ids = [...trimmed].length < 3 ? matchingStart(trimmed) : matching(trimmed);
      // The first `limit` patients by name are chosen before their summaries (species name,
      // latest weight) are read: a common start such as "zu" matches thousands of birds, and
      // reading every one's summary only to keep fifty is what made the search slow.
      const first = tables(sql)
        .selectFrom('patient_current as fc')
        .innerJoin('patient_versions as fv', 'fv.id', 'fc.version_id')
        .select('fc.patient_id')
        .where('fc.patient_id', 'in', ids)
        .orderBy(kyselySql`lower(fv.name)`)
        .orderBy('fc.patient_id')
        .limit(limit);
      const rows = await summaries()
        .where('p.id', 'in', first)
        .orderBy(kyselySql`lower(v.name)`)
        .orderBy('p.id')
        .execute();
      return rows.map(rowToSummary);
    },
    async count(): Promise<number> {
      const row = await tables(sql)
        .selectFrom('patients')
        .select(({ fn }) => fn.countAll<number>().as('total'))
        .executeTakeFirst();
      return Number(row?.total ?? 0);
    },
    /**
     * How many patients were first entered by `enteredBy` with this owner reference, whatever was
     * corrected since (the demo clinic's invented birds: entered by DEMO, owner "Demo owner
     * (invented)").
     */
    async countFirstEntered(enteredBy: string, ownerReference: string): Promise<number> {
      const row = await tables(sql)
        .selectFrom('patient_versions')
        .select(({ fn }) => fn.countAll<number>().as('total'))
        .where('corrects_id', 'is', null)
        .where('entered_by', '=', enteredBy)
        .where('owner_reference', '=', ownerReference)
        .executeTakeFirst();
      return Number(row?.total ?? 0);
    },
  };
}

export type PatientRepository = ReturnType<typeof createPatientRepository>;

/** A correction named a version of the patient's details that is no longer the current one. */
export class PatientVersionMismatchError extends Error {
  readonly seenVersionId: number;
  readonly currentVersionId: number;
  constructor(seenVersionId: number, currentVersionId: number) {
    super(`Version ${String(seenVersionId)} of the patient's details is not the current one.`);
    this.name = 'PatientVersionMismatchError';
    this.seenVersionId = seenVersionId;
    this.currentVersionId = currentVersionId;
  }
}
