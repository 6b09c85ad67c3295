import type { Species, SpeciesValues } from '../../app/contract/records.js';
import { agentIds, type AgentId } from '../../app/core/agents.js';
import { storedBasis } from '../../app/core/sourced.js';
import type { PotencyMeasure, SpeciesReference } from '../../app/core/species-reference.js';
import type { TidewingDatabase } from '../connection.js';
import { writeTransaction } from '../write-transaction.js';
import { chainIdsSync, stampOf, type StampRow } from './version-chain.js';

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

function valuesToParameters(values: SpeciesValues) {
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
  return parameters;
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

const columns = [
  'common_name',
  'scientific_name',
  'mass_min_g',
  'mass_max_g',
  'mass_basis',
  'heart_rate_min_per_min',
  'heart_rate_max_per_min',
  'heart_rate_basis',
  'breaths_min_per_min',
  'breaths_max_per_min',
  'breaths_basis',
  'apnoea_mac_multiple',
  'apnoea_basis',
  'anatomy_notes_json',
  ...agentIds.flatMap((agent) =>
    ['pct', 'sd_pct', 'measure', 'basis', 'note'].map((part) => `mac_${agent}_${part}`),
  ),
];

/** All SQL for the species table. Edits add a version; the old value and its source stay. */
export function createSpeciesRepository(db: TidewingDatabase) {
  const currentCondition = 'NOT EXISTS (SELECT 1 FROM species later WHERE later.corrects_id = s.id)';
  const listCurrent = db.prepare<[], SpeciesRow>(
    `SELECT * FROM species s WHERE ${currentCondition} ORDER BY common_name COLLATE NOCASE`,
  );
  const getCurrent = db.prepare<[string], SpeciesRow>(
    `SELECT * FROM species s WHERE species_key = ? AND ${currentCondition}`,
  );
  const getById = db.prepare<[number], SpeciesRow>('SELECT * FROM species WHERE id = ?');
  const keyExists = db.prepare<[string], { found: number }>(
    'SELECT 1 AS found FROM species WHERE species_key = ? LIMIT 1',
  );
  const insert = db.prepare(
    `INSERT INTO species (species_key, corrects_id, origin, ${columns.join(', ')}, entered_at, entered_by, reason)
     VALUES (@species_key, @corrects_id, @origin, ${columns.map((column) => `@${column}`).join(', ')}, @entered_at, @entered_by, @reason)`,
  );

  function write(
    key: string,
    origin: 'reference' | 'clinic',
    correctsId: number | null,
    values: SpeciesValues,
    meta: Meta,
    at: Date,
  ): Species {
    const result = insert.run({
      ...valuesToParameters(values),
      species_key: key,
      corrects_id: correctsId,
      origin,
      entered_at: at.toISOString(),
      entered_by: meta.enteredBy,
      reason: meta.reason,
    });
    const row = getById.get(Number(result.lastInsertRowid));
    if (row === undefined) throw new Error('Species row vanished after insert');
    return rowToSpecies(row);
  }

  function uniqueKey(commonName: string): string {
    const base =
      commonName
        .toLowerCase()
        .normalize('NFKD')
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-+|-+$/g, '')
        .slice(0, 50) || 'species';
    let key = base;
    for (let suffix = 2; keyExists.get(key) !== undefined; suffix += 1) key = `${base}-${suffix}`;
    return key;
  }

  return {
    list(): Species[] {
      return listCurrent.all().map(rowToSpecies);
    },
    get(key: string): Species | null {
      const row = getCurrent.get(key);
      return row === undefined ? null : rowToSpecies(row);
    },
    /** Every version of one species, newest first. */
    history(key: string): Species[] {
      const current = getCurrent.get(key);
      if (current === undefined) return [];
      return chainIdsSync(db, 'species', current.id).map((id) => rowToSpecies(getById.get(id) as SpeciesRow));
    },
    add(values: SpeciesValues, meta: Meta, at: Date): Species {
      return writeTransaction(db, () =>
        write(uniqueKey(values.commonName), 'clinic', null, values, meta, at),
      );
    },
    /** Records an edit as a new version pointing at the one it replaces. */
    correct(key: string, values: SpeciesValues, meta: Meta, at: Date): Species | null {
      return writeTransaction(db, () => {
        const current = getCurrent.get(key);
        if (current === undefined) return null;
        return write(key, current.origin, current.id, values, meta, at);
      });
    },
    /** Adds every shipped reference species the database lacks; never touches clinic edits. */
    seedReference(reference: readonly SpeciesReference[], at: Date): number {
      return writeTransaction(db, () => {
        let added = 0;
        for (const entry of reference) {
          if (keyExists.get(entry.id) !== undefined) continue;
          write(
            entry.id,
            'reference',
            null,
            referenceToValues(entry),
            {
              enteredBy: 'Tidewing species reference',
              reason: 'Seeded from the species reference shipped with Tidewing',
            },
            at,
          );
          added += 1;
        }
        return added;
      });
    },
  };
}

export type SpeciesRepository = ReturnType<typeof createSpeciesRepository>;
