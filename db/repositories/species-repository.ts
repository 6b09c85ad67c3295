import type { Species, SpeciesValues } from '../../app/contract/records.js';
import { agentIds, type AgentId } from '../../app/core/agents.js';
import { storedBasis } from '../../app/core/sourced.js';
import type { PotencyMeasure, SpeciesReference } from '../../app/core/species-reference.js';
import { sql as kyselySql, type Generated, type Insertable } from 'kysely';
import { writeTransaction, type Sql } from '../clinic-db.js';
import { chainIds, stampOf, type StampRow } from './version-chain.js';

type SpeciesRow = StampRow & {
  species_key: string;
  origin: 'reference' | 'clinic';
  common_name: string;
  scientific_name: string;
  mass_min_g: number;
  mass_max_g: number;
  mass_basis: string;
  heart_rate_min_per_min: number | null;
  heart_rate_max_per_min: number | null;
  heart_rate_basis: string | null;
  breaths_min_per_min: number | null;
  breaths_max_per_min: number | null;
  breaths_basis: string | null;
  apnoea_mac_multiple: number | null;
  apnoea_basis: string | null;
  anatomy_notes_json: string;
} & Record<`mac_${AgentId}_${'pct' | 'sd_pct'}`, number | null> &
  Record<`mac_${AgentId}_${'measure' | 'basis' | 'note'}`, string | null>;

type Tables = { species: Omit<SpeciesRow, 'id'> & { id: Generated<number> } };

type Meta = { enteredBy: string; reason: string };

function rowToSpecies(row: SpeciesRow): Species {
  const mac = Object.fromEntries(
    agentIds.map((agent) => {
      const pct = row[`mac_${agent}_pct`];
      return [
        agent,
        pct === null
          ? null
          : {
              macPct: pct,
              sdPct: row[`mac_${agent}_sd_pct`],
              measure: (row[`mac_${agent}_measure`] ?? 'MAC') as PotencyMeasure,
              basis: row[`mac_${agent}_basis`] ?? '',
              note: row[`mac_${agent}_note`],
            },
      ];
    }),
  ) as SpeciesValues['mac'];
  return {
    key: row.species_key,
    origin: row.origin,
    values: {
      commonName: row.common_name,
      scientificName: row.scientific_name,
      massMinG: row.mass_min_g,
      massMaxG: row.mass_max_g,
      massBasis: row.mass_basis,
      heartRate:
        row.heart_rate_min_per_min === null
          ? null
          : {
              min: row.heart_rate_min_per_min,
              max: row.heart_rate_max_per_min ?? row.heart_rate_min_per_min,
              basis: row.heart_rate_basis ?? '',
            },
      breathsPerMin:
        row.breaths_min_per_min === null
          ? null
          : {
              min: row.breaths_min_per_min,
              max: row.breaths_max_per_min ?? row.breaths_min_per_min,
              basis: row.breaths_basis ?? '',
            },
      mac,
      apnoeaMacMultiple:
        row.apnoea_mac_multiple === null
          ? null
          : { value: row.apnoea_mac_multiple, basis: row.apnoea_basis ?? '' },
      anatomyNotes: JSON.parse(row.anatomy_notes_json) as SpeciesValues['anatomyNotes'],
    },
    stamp: stampOf(row),
  };
}

/** The value columns of a species row (everything but the key, origin and stamp). */
type ValueColumns = Omit<SpeciesRow, keyof StampRow | 'species_key' | 'origin'>;

function valuesToParameters(values: SpeciesValues): ValueColumns {
  const parameters: Record<string, string | number | null> = {
    common_name: values.commonName,
    scientific_name: values.scientificName,
    mass_min_g: values.massMinG,
    mass_max_g: values.massMaxG,
    mass_basis: values.massBasis,
    heart_rate_min_per_min: values.heartRate?.min ?? null,
    heart_rate_max_per_min: values.heartRate?.max ?? null,
    heart_rate_basis: values.heartRate?.basis ?? null,
    breaths_min_per_min: values.breathsPerMin?.min ?? null,
    breaths_max_per_min: values.breathsPerMin?.max ?? null,
    breaths_basis: values.breathsPerMin?.basis ?? null,
    apnoea_mac_multiple: values.apnoeaMacMultiple?.value ?? null,
    apnoea_basis: values.apnoeaMacMultiple?.basis ?? null,
    anatomy_notes_json: JSON.stringify(values.anatomyNotes),
  };
  for (const agent of agentIds) {
    const mac = values.mac[agent];
    parameters[`mac_${agent}_pct`] = mac?.macPct ?? null;
    parameters[`mac_${agent}_sd_pct`] = mac?.sdPct ?? null;
    parameters[`mac_${agent}_measure`] = mac === null ? null : mac.measure;
    parameters[`mac_${agent}_basis`] = mac?.basis ?? null;
    parameters[`mac_${agent}_note`] = mac?.note ?? null;
  }
  return parameters as ValueColumns;
}

/** Converts an entry of the shipped species reference into editable species values. */
export function referenceToValues(reference: SpeciesReference): SpeciesValues {
  const mac = Object.fromEntries(
    agentIds.map((agent) => {
      const value = reference.macByAgent[agent];
      return [
        agent,
        value === undefined
          ? null
          : {
              macPct: value.macPct,
              sdPct: value.sdPct ?? null,
              measure: value.measure,
              basis: storedBasis(value),
              note: value.note ?? null,
            },
      ];
    }),
  ) as SpeciesValues['mac'];
  return {
    commonName: reference.commonName,
    scientificName: reference.scientificName,
    massMinG: reference.typicalMassG.minG,
    massMaxG: reference.typicalMassG.maxG,
    massBasis: storedBasis(reference.typicalMassG),
    heartRate:
      reference.restingHeartRatePerMin === undefined
        ? null
        : {
            min: reference.restingHeartRatePerMin.minPerMin,
            max: reference.restingHeartRatePerMin.maxPerMin,
            basis: storedBasis(reference.restingHeartRatePerMin),
          },
    breathsPerMin:
      reference.restingBreathsPerMin === undefined
        ? null
        : {
            min: reference.restingBreathsPerMin.minPerMin,
            max: reference.restingBreathsPerMin.maxPerMin,
            basis: storedBasis(reference.restingBreathsPerMin),
          },
    mac,
    apnoeaMacMultiple:
      reference.apnoeaMacMultiple === undefined
        ? null
        : {
            value: reference.apnoeaMacMultiple.value,
            basis: storedBasis(reference.apnoeaMacMultiple),
          },
    anatomyNotes: reference.anatomyNotes.map((note) => ({
      code: note.code,
      text: note.text,
      basis: storedBasis(note),
    })),
  };
}

/** All SQL for the species table. Edits add a version; the old value and its source stay. */
export function createSpeciesRepository(sql: Sql) {
  const tables = (on: Sql) => on.kysely.withTables<Tables>();

  /** The current version of each species: the rows no later row corrects. */
  function current(on: Sql) {
    return tables(on)
      .selectFrom('species as s')
      .selectAll('s')
      .where(({ not, exists, selectFrom }) =>
        not(
          exists(
            selectFrom('species as later').select('later.id').whereRef('later.corrects_id', '=', 's.id'),
          ),
        ),
      );
  }

  async function getCurrent(on: Sql, key: string): Promise<SpeciesRow | undefined> {
    return current(on).where('s.species_key', '=', key).executeTakeFirst();
  }

  async function keyExists(on: Sql, key: string): Promise<boolean> {
    const row = await tables(on)
      .selectFrom('species')
      .select('id')
      .where('species_key', '=', key)
      .limit(1)
      .executeTakeFirst();
    return row !== undefined;
  }

  async function write(
    on: Sql,
    key: string,
    origin: 'reference' | 'clinic',
    correctsId: number | null,
    values: SpeciesValues,
    meta: Meta,
    at: Date,
  ): Promise<Species> {
    const written = await insert(on, key, origin, correctsId, values, meta, at, false);
    if (written === null) throw new Error('Species row vanished after insert');
    return written;
  }

  /** Inserts a version; with `onlyNewKey`, a first version whose key another writer just took is skipped (null). */
  async function insert(
    on: Sql,
    key: string,
    origin: 'reference' | 'clinic',
    correctsId: number | null,
    values: SpeciesValues,
    meta: Meta,
    at: Date,
    onlyNewKey: boolean,
  ): Promise<Species | null> {
    const row: Insertable<Tables['species']> = {
      ...valuesToParameters(values),
      species_key: key,
      corrects_id: correctsId,
      origin,
      entered_at: at.toISOString(),
      entered_by: meta.enteredBy,
      reason: meta.reason,
    };
    const inserted = await tables(on)
      .insertInto('species')
      .values(row)
      .$if(onlyNewKey, (query) =>
        query.onConflict((conflict) =>
          conflict.column('species_key').where('corrects_id', 'is', null).doNothing(),
        ),
      )
      .returning('id')
      .executeTakeFirst();
    if (inserted === undefined) return null;
    const { id } = inserted;
    const stored = await tables(on).selectFrom('species').selectAll().where('id', '=', id).executeTakeFirst();
    if (stored === undefined) throw new Error('Species row vanished after insert');
    return rowToSpecies(stored);
  }

  async function uniqueKey(on: Sql, commonName: string): Promise<string> {
    const base =
      commonName
        .toLowerCase()
        .normalize('NFKD')
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-+|-+$/g, '')
        .slice(0, 50) || 'species';
    let key = base;
    for (let suffix = 2; await keyExists(on, key); suffix += 1) key = `${base}-${suffix}`;
    return key;
  }

  return {
    async list(): Promise<Species[]> {
      const rows = await current(sql)
        .orderBy(kyselySql`lower(s.common_name)`)
        .execute();
      return rows.map(rowToSpecies);
    },
    async get(key: string): Promise<Species | null> {
      const row = await getCurrent(sql, key);
      return row === undefined ? null : rowToSpecies(row);
    },
    /** Every version of one species, newest first. */
    async history(key: string): Promise<Species[]> {
      const row = await getCurrent(sql, key);
      if (row === undefined) return [];
      const ids = await chainIds(sql, 'species', row.id);
      // Newest first, as the chain is: a later version always has a higher id.
      const rows = await tables(sql)
        .selectFrom('species')
        .selectAll()
        .where('id', 'in', ids)
        .orderBy('id', 'desc')
        .execute();
      return rows.map(rowToSpecies);
    },
    add(values: SpeciesValues, meta: Meta, at: Date): Promise<Species> {
      return writeTransaction(sql, async (tx) =>
        write(tx, await uniqueKey(tx, values.commonName), 'clinic', null, values, meta, at),
      );
    },
    /**
     * Records an edit as a new version pointing at the one it replaces. With `versionId` (the
     * version the user saw), refuses with SpeciesVersionMismatchError when another version was
     * saved since.
     */
    correct(
      key: string,
      values: SpeciesValues,
      meta: Meta,
      at: Date,
      versionId?: number,
    ): Promise<Species | null> {
      return writeTransaction(sql, async (tx) => {
        const row = await getCurrent(tx, key);
        if (row === undefined) return null;
        if (versionId !== undefined && versionId !== row.id)
          throw new SpeciesVersionMismatchError(versionId, row.id);
        return write(tx, key, row.origin, row.id, values, meta, at);
      });
    },
    /** Adds every shipped reference species the database lacks; never touches clinic edits. */
    seedReference(reference: readonly SpeciesReference[], at: Date): Promise<number> {
      return writeTransaction(sql, async (tx) => {
        const keys = await tables(tx).selectFrom('species').select('species_key').distinct().execute();
        const present = new Set(keys.map((row) => row.species_key));
        let added = 0;
        for (const entry of reference) {
          if (present.has(entry.id)) continue;
          // Another workstation starting at the same moment may seed the same key first (PostgreSQL).
          const written = await insert(
            tx,
            entry.id,
            'reference',
            null,
            referenceToValues(entry),
            {
              enteredBy: 'Tidewing species reference',
              reason: 'Seeded from the species reference shipped with Tidewing',
            },
            at,
            true,
          );
          if (written !== null) added += 1;
        }
        return added;
      });
    },
  };
}

export type SpeciesRepository = ReturnType<typeof createSpeciesRepository>;

/** A correction named a version of the species that is no longer the current one. */
export class SpeciesVersionMismatchError extends Error {
  readonly seenVersionId: number;
  readonly currentVersionId: number;
  constructor(seenVersionId: number, currentVersionId: number) {
    super(`Version ${String(seenVersionId)} of the species is not the current one.`);
    this.name = 'SpeciesVersionMismatchError';
    this.seenVersionId = seenVersionId;
    this.currentVersionId = currentVersionId;
  }
}
