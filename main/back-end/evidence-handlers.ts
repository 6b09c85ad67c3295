import { createHash } from 'node:crypto';
import { z } from 'zod';
import type { ChannelName, ParsedRequestOf, ResponseOf } from '../../app/contract/channels.js';
import {
  recordAgentOf,
  recordLogOf,
  type EvidenceFilter,
  evidenceRowSchema,
  type EvidenceRow,
  type evidenceChannels,
} from '../../app/contract/evidence-channels.js';
import { planInputSchema, type PlanInput } from '../../app/contract/plan.js';
import { speciesToReference } from '../../app/contract/species-mapping.js';
import type { AgentId } from '../../app/core/agents.js';
import {
  calibrationPrior,
  fitMilestone,
  speciesCalibration,
  z90,
} from '../../app/core/evidence/calibration.js';
import { evidenceCsv } from '../../app/core/evidence/evidence-csv.js';
import {
  evidenceMilestoneIds,
  milestoneEvents,
  recordEvidence,
  type EvidenceMilestoneId,
} from '../../app/core/evidence/observed.js';
import { speciesGroupOf, speciesGroups } from '../../app/core/evidence/species-groups.js';
import { modelVersion } from '../../app/core/model/compute-plan.js';
import type { ClinicDb } from '../../db/clinic-db.js';
import { createEvidenceCacheRepository } from '../../db/repositories/evidence-cache-repository.js';
import { createEvidenceRepository } from '../../db/repositories/evidence-repository.js';
import { createPatientRepository } from '../../db/repositories/patient-repository.js';
import { createPlanRepository } from '../../db/repositories/plan-repository.js';
import { createProcedureEntryRepository } from '../../db/repositories/procedure-entry-repository.js';
import { createProcedureRecordRepository } from '../../db/repositories/procedure-record-repository.js';
import { createSettingsRepository } from '../../db/repositories/settings-repository.js';
import { createSpeciesRepository } from '../../db/repositories/species-repository.js';
import { createWeightRepository } from '../../db/repositories/weight-repository.js';
import { RecordError } from './record-handlers.js';

type EvidenceChannel = keyof typeof evidenceChannels & ChannelName;
type EvidenceHandlerTable = {
  [C in EvidenceChannel]: (request: ParsedRequestOf<C>) => ResponseOf<C> | Promise<ResponseOf<C>>;
};
type ComputedRow = Omit<EvidenceRow, 'exclusion'>;

/**
 * The shape of a stored row (the exclusion is applied when answering), as a short hash of its
 * JSON Schema: part of every row's cache key, so rows stored by a build whose rows had another
 * shape are stale and computed again, without checking 5,000 stored rows one by one at each start.
 */
const rowFormat = createHash('sha256')
  .update(
    JSON.stringify(z.toJSONSchema(evidenceRowSchema.omit({ exclusion: true }), { unrepresentable: 'any' })),
  )
  .digest('hex')
  .slice(0, 16);

/** The method in one paragraph, for the screens (docs/evidence.md has the equations). */
export const calibrationMethod =
  'Observed / predicted per milestone, on the log scale, in a three-level normal hierarchical model: each species shrunk towards its group of species and the group towards the whole clinic, the clinic towards the population model (empirical Bayes partial pooling; Gelman et al., Bayesian Data Analysis, 3rd ed. 2013, ch. 5; Efron & Morris 1975, JASA 70:311-319). Records with a missing event are left out of that milestone, never filled in.';

/** Everything in a record that its evidence depends on, so an unchanged record is not recomputed. */
function fingerprint(parts: readonly (string | number | null)[]): string {
  return parts.map((part) => String(part)).join('|');
}

/** What every row depends on besides its record: the species table and the default agent, as a key part. */
type ClinicState = {
  readonly tables: { species: ReturnType<typeof speciesToReference>[] };
  readonly speciesByKey: ReadonlyMap<string, SpeciesRecord>;
  readonly defaultAgent: AgentId;
  readonly clinicKey: string;
};
type SpeciesRecord = Awaited<ReturnType<ReturnType<typeof createSpeciesRepository>['list']>>[number];

/** A completed record whose row is missing or stale, with the key its row is to be stored under. */
export type PendingRow = { readonly recordId: number; readonly key: string };

/**
 * The clinic view's rows (observed vs predicted per completed record), kept in
 * evidence_prediction_cache: computed when a record ends or an ended record is corrected
 * (`keep`), and for older or stale rows by the back-fill (`pendingRows`, `adopt`, `compute`,
 * `store`), so the view only reads them (`readyRows`). Writes only the cache table, never a
 * clinical table; a key is always read before the record it describes, so a row stored under a
 * key never holds older data than the key says (a write in between makes it stale, not wrong).
 */
export function createEvidenceRows(now: () => Date, clinic: ClinicDb) {
  const evidence = createEvidenceRepository(clinic);
  const procedures = createProcedureRecordRepository(clinic);
  const entries = createProcedureEntryRepository(clinic);
  const patients = createPatientRepository(clinic);
  const weights = createWeightRepository(clinic);
  const species = createSpeciesRepository(clinic);
  const plans = createPlanRepository(clinic);
  const settings = createSettingsRepository(clinic);
  const stored = createEvidenceCacheRepository(clinic);
  // Rows computed before, by record id, with the fingerprint they were computed for: read from
  // the stored cache (evidence_prediction_cache) at the first answer, kept here after.
  let cache: Map<number, { key: string; row: ComputedRow }> | null = null;

  /** A stored row of this build's format (the format is in the key), or null; one that does not parse is computed again. */
  function parsed(entry: { key: string; rowJson: string }): ComputedRow | null {
    if (!entry.key.startsWith(`${rowFormat}|`)) return null;
    try {
      return JSON.parse(entry.rowJson) as ComputedRow;
    } catch {
      return null;
    }
  }

  async function loadCache(): Promise<Map<number, { key: string; row: ComputedRow }>> {
    const loaded = new Map<number, { key: string; row: ComputedRow }>();
    for (const [recordId, entry] of await stored.all()) {
      const row = parsed(entry);
      if (row !== null) loaded.set(recordId, { key: entry.key, row });
    }
    return loaded;
  }

  async function clinicState(): Promise<ClinicState> {
    const speciesList = await species.list();
    const defaultAgent = (await settings.get()).settings?.defaultAgent ?? 'isoflurane';
    return {
      tables: { species: speciesList.map(speciesToReference) },
      speciesByKey: new Map(speciesList.map((entry) => [entry.key, entry])),
      defaultAgent,
      // Species edits and the default agent change every record's answer.
      clinicKey: fingerprint([
        rowFormat,
        modelVersion,
        defaultAgent,
        speciesList.map((entry) => entry.stamp.versionId).join(','),
      ]),
    };
  }

  /** One completed record beside the model: the one computation of a row, for every path. */
  async function computeRow(recordId: number, state: ClinicState): Promise<ComputedRow | null> {
    const { tables, speciesByKey, defaultAgent } = state;
    const record = await procedures.get(recordId);
    if (record === null || record.values.endedAt === null) return null;
    const patient = await patients.get(record.patientId);
    if (patient === null) return null;
    const speciesRecord = speciesByKey.get(patient.values.speciesKey);
    const recordEntries = await entries.list(record.id);
    const day = record.values.startedAt.slice(0, 10);
    const patientWeights = await weights.list(patient.id);
    const weight =
      [...patientWeights].reverse().find((entry) => entry.values.weighedOn <= day) ??
      patientWeights[0] ??
      null;
    const planRecord = record.values.planId === null ? null : await plans.get(record.values.planId);
    const parsedPlan = planRecord === null ? null : planInputSchema.safeParse(planRecord.input);
    const planInput: PlanInput | null = parsedPlan?.success === true ? parsedPlan.data : null;
    const agentOf = recordAgentOf(record, planInput, defaultAgent);
    const base = {
      recordId: record.id,
      patientId: patient.id,
      patientName: patient.values.name,
      speciesKey: patient.values.speciesKey,
      speciesName: speciesRecord?.values.commonName ?? patient.values.speciesKey,
      agent: agentOf.agent,
      airway: record.values.airway,
      staffInitials: record.values.staffInitials,
      procedureName: record.values.procedureName,
      startedAt: record.values.startedAt,
      endedAt: record.values.endedAt,
    };
    const logged = recordLogOf(record, recordEntries, {
      bodyMassG: weight?.values.massG ?? null,
      speciesKey: patient.values.speciesKey,
      plan: planInput,
      defaultAgent,
    });
    if (!logged.ok)
      return {
        ...base,
        agentBasis: agentOf.basis,
        bodyMassG: null,
        skipped: logged.missing,
        milestones: [],
        extubationMin: null,
        notes: [],
      };
    let compared: ReturnType<typeof recordEvidence>;
    try {
      compared = recordEvidence(logged.log, tables);
    } catch (error) {
      // One log the model cannot run must not hold back every other record: listed, skipped with why.
      compared = {
        ok: false,
        skipped: `the model could not run on this log (${error instanceof Error ? error.message : String(error)})`,
      };
    }
    return {
      ...base,
      agentBasis: logged.log.bird.agentBasis,
      bodyMassG: logged.log.bird.bodyMassG,
      skipped: compared.ok ? null : compared.skipped,
      milestones: compared.ok
        ? compared.milestones.map((milestone) =>
            'ratio' in milestone
              ? { ...milestone, skipped: null }
              : {
                  id: milestone.id,
                  observedMin: null,
                  predictedMin: null,
                  ratio: null,
                  skipped: milestone.skipped,
                },
          )
        : [],
      extubationMin:
        compared.ok && compared.extubationMin !== null && compared.extubationMin > 0
          ? compared.extubationMin
          : null,
      notes: compared.ok ? [...compared.notes] : [],
    };
  }

  /** Computes one pending row (kept in memory; `store` writes it); null when the record has no row. */
  async function compute(
    target: PendingRow,
    state: ClinicState,
  ): Promise<{ recordId: number; key: string; rowJson: string } | null> {
    const row = await computeRow(target.recordId, state);
    if (row === null) return null;
    cache ??= await loadCache();
    cache.set(target.recordId, { key: target.key, row });
    return { recordId: target.recordId, key: target.key, rowJson: JSON.stringify(row) };
  }

  /** Completed records whose row is missing or stale, newest first; never computes. */
  async function pendingRows(state: ClinicState): Promise<PendingRow[]> {
    cache ??= await loadCache();
    const pending: PendingRow[] = [];
    for (const { recordId, ended, key: recordKey } of await evidence.recordFingerprints()) {
      if (!ended) continue;
      const key = `${state.clinicKey}|${recordKey}`;
      if (cache.get(recordId)?.key !== key) pending.push({ recordId, key });
    }
    return pending.sort((a, b) => b.recordId - a.recordId);
  }

  return {
    clinicState,
    compute,
    pendingRows,
    /** Stores computed rows (one transaction); a write the database refuses is skipped (computed again later). */
    store: (rows: readonly { recordId: number; key: string; rowJson: string }[]) => stored.store(rows, now()),
    /**
     * Takes up the rows of these records already stored under the same key (by another back end on
     * the same database, or before a restart of this one); answers the ids taken up.
     */
    async adopt(targets: readonly PendingRow[]): Promise<Set<number>> {
      cache ??= await loadCache();
      const adopted = new Set<number>();
      const found = await stored.rowsFor(targets.map((target) => target.recordId));
      for (const target of targets) {
        const entry = found.get(target.recordId);
        const row = entry === undefined || entry.key !== target.key ? null : parsed(entry);
        if (row === null) continue;
        cache.set(target.recordId, { key: target.key, row });
        adopted.add(target.recordId);
      }
      return adopted;
    },
    /**
     * Computes and stores the rows of these records (or all of one patient's) that have ended and
     * whose row is missing or stale: what a write of an ended record calls. Answers how many were stored.
     */
    async keep(only: {
      readonly recordIds?: readonly number[];
      readonly patientId?: number;
    }): Promise<number> {
      // A running record (a row logged in theatre) costs this one query.
      const ended = (await evidence.recordFingerprints(only)).filter((entry) => entry.ended);
      if (ended.length === 0) return 0;
      const state = await clinicState();
      cache ??= await loadCache();
      const computed: { recordId: number; key: string; rowJson: string }[] = [];
      for (const { recordId, key: recordKey } of ended) {
        const key = `${state.clinicKey}|${recordKey}`;
        if (cache.get(recordId)?.key === key) continue;
        const row = await compute({ recordId, key }, state);
        if (row !== null) computed.push(row);
      }
      await stored.store(computed, now());
      return computed.length;
    },
    /**
     * The rows ready now (their stored key matches the record and the clinic as they are), newest
     * start first, the completed records still waiting for theirs, and the records still running.
     * Never runs the model: the view opens at once and says what is still being compared.
     */
    async readyRows(): Promise<{ rows: ComputedRow[]; pending: PendingRow[]; inProgress: number }> {
      const state = await clinicState();
      cache ??= await loadCache();
      const rows: ComputedRow[] = [];
      const pending: PendingRow[] = [];
      let inProgress = 0;
      for (const { recordId, ended, key: recordKey } of await evidence.recordFingerprints()) {
        if (!ended) {
          inProgress += 1;
          continue;
        }
        const key = `${state.clinicKey}|${recordKey}`;
        const cached = cache.get(recordId);
        if (cached !== undefined && cached.key === key) rows.push(cached.row);
        else pending.push({ recordId, key });
      }
      // Newest start first, as the records list shows them.
      rows.sort((a, b) => b.startedAt.localeCompare(a.startedAt) || b.recordId - a.recordId);
      return { rows, pending, inProgress };
    },
  };
}

export type EvidenceRows = ReturnType<typeof createEvidenceRows>;

/** Handlers for the clinic's own evidence: observed vs predicted, the CSV, the calibration, exclusions. */
export function createEvidenceHandlers(
  now: () => Date,
  clinic: ClinicDb,
  keeper: {
    readonly rows: EvidenceRows;
    /** Called when an answer found completed records whose rows are not ready (starts the back-fill). */
    readonly pendingSeen: () => void;
  } = { rows: createEvidenceRows(now, clinic), pendingSeen: () => undefined },
): EvidenceHandlerTable {
  const evidence = createEvidenceRepository(clinic);
  const procedures = createProcedureRecordRepository(clinic);
  const species = createSpeciesRepository(clinic);

  /** The ready rows with their exclusions; `pending` counts the completed records still being compared. */
  async function allRows(): Promise<{
    rows: EvidenceRow[];
    pending: readonly PendingRow[];
    inProgress: number;
  }> {
    const { rows, pending, inProgress } = await keeper.rows.readyRows();
    if (pending.length > 0) keeper.pendingSeen();
    const exclusions = await evidence.exclusions();
    const exclusionOf = (recordId: number) => {
      const entry = exclusions.get(recordId);
      return entry !== undefined && entry.excluded
        ? { reason: entry.reason, enteredBy: entry.enteredBy, enteredAt: entry.enteredAt }
        : null;
    };
    return {
      rows: rows.map((row) => ({ ...row, exclusion: exclusionOf(row.recordId) })),
      pending,
      inProgress,
    };
  }

  function matches(row: EvidenceRow, filter: EvidenceFilter): boolean {
    if (filter.recordId !== undefined && row.recordId !== filter.recordId) return false;
    if (filter.speciesKey !== undefined && filter.speciesKey !== '' && row.speciesKey !== filter.speciesKey)
      return false;
    if (filter.agent !== undefined && row.agent !== filter.agent) return false;
    if (filter.route !== undefined && row.airway !== filter.route) return false;
    if (
      filter.staffInitials !== undefined &&
      filter.staffInitials.trim() !== '' &&
      !row.staffInitials.toLowerCase().includes(filter.staffInitials.trim().toLowerCase())
    )
      return false;
    if (filter.from !== undefined && row.startedAt.slice(0, 10) < filter.from) return false;
    if (filter.to !== undefined && row.startedAt.slice(0, 10) > filter.to) return false;
    return true;
  }

  async function list(filter: EvidenceFilter) {
    if (filter.from !== undefined && filter.to !== undefined && filter.to < filter.from)
      throw new RecordError('invalid-request', 'The "to" date is before the "from" date; swap them.', 'to');
    const { rows, pending, inProgress } = await allRows();
    const shown = rows.filter((row) => matches(row, filter));
    const skippedByMilestone = Object.fromEntries(evidenceMilestoneIds.map((id) => [id, 0])) as Record<
      EvidenceMilestoneId,
      number
    >;
    let compared = 0;
    for (const row of shown) {
      if (row.skipped !== null) continue;
      if (row.milestones.some((milestone) => milestone.ratio !== null)) compared += 1;
      for (const milestone of row.milestones)
        if (milestone.ratio === null) skippedByMilestone[milestone.id] += 1;
    }
    return {
      rows: shown,
      counts: {
        completed: shown.length,
        compared,
        skipped: shown.filter((row) => row.skipped !== null).length,
        skippedByMilestone,
        excluded: shown.filter((row) => row.exclusion !== null).length,
        inProgress,
        // One record asked for: whether it is the one still waiting; else the whole clinic's.
        pending:
          filter.recordId === undefined
            ? pending.length
            : pending.filter((entry) => entry.recordId === filter.recordId).length,
      },
    };
  }

  async function calibration() {
    const switchState = await evidence.calibrationSwitch();
    const { rows, pending } = await allRows();
    const used = rows.filter((row) => row.exclusion === null && row.skipped === null);
    const speciesList = await species.list();
    const recordsIn = used
      .map((row) => ({
        recordId: row.recordId,
        milestones: row.milestones
          .filter((milestone) => milestone.ratio !== null)
          .map((milestone) => milestone.id),
      }))
      .filter((entry) => entry.milestones.length > 0);
    const band = (mean: number, sd: number) => ({
      low: Math.exp(mean - z90 * sd),
      high: Math.exp(mean + z90 * sd),
    });
    return {
      on: switchState.on,
      switchedBy: switchState.enteredBy,
      switchedAt: switchState.enteredAt,
      switchReason: switchState.reason,
      method: calibrationMethod,
      priorBasis: calibrationPrior.basis,
      milestones: evidenceMilestoneIds.map((id) => {
        const observations = used.flatMap((row) =>
          row.milestones
            .filter((milestone) => milestone.id === id && milestone.ratio !== null)
            .map((milestone) => ({
              speciesId: row.speciesKey,
              logRatio: Math.log(milestone.ratio as number),
            })),
        );
        const fit = fitMilestone(observations);
        return {
          id,
          label: milestoneEvents[id].label,
          records: fit.records,
          birdSd: fit.birdSd,
          clinicFactor: Math.exp(fit.clinic.mean),
          clinicBand90: band(fit.clinic.mean, fit.clinic.sd),
          species: speciesList.map((entry) => {
            const calibrated = speciesCalibration(fit, entry.key);
            return {
              speciesKey: entry.key,
              speciesName: entry.values.commonName,
              groupName: speciesGroups[speciesGroupOf(entry.key)],
              factor: calibrated.factor,
              band90: calibrated.band90,
              birdBand90: calibrated.birdBand90,
              speciesRecords: calibrated.speciesRecords,
              groupRecords: calibrated.groupRecords,
              clinicRecords: calibrated.clinicRecords,
            };
          }),
        };
      }),
      recordsIn,
      pending: pending.length,
    };
  }

  return {
    'evidence:list': (request) => list(request),
    'evidence:export-csv': async (request) => {
      const { rows, counts } = await list(request);
      const csv = evidenceCsv(
        rows.map((row) => ({
          ...row,
          agent: row.agent,
          excludedReason: row.exclusion?.reason ?? null,
        })),
      );
      const day = now().toISOString().slice(0, 10);
      return {
        fileName: `tidewing-observed-vs-predicted-${day}.csv`,
        csv,
        rows: rows.length,
        pending: counts.pending,
      };
    },
    'evidence:calibration': () => calibration(),
    'evidence:exclude': async (request) => {
      const record = await procedures.get(request.recordId);
      if (record === null)
        throw new RecordError(
          'not-found',
          `Procedure record ${request.recordId} was not found; it may have been opened from an old link.`,
          'recordId',
        );
      if (record.values.endedAt === null)
        throw new RecordError(
          'invalid-request',
          'This record has not ended; only completed records go into the calibration.',
          'recordId',
        );
      return evidence.setExcluded(request.recordId, request.excluded, request.meta, now());
    },
    'evidence:set-calibration': (request) => evidence.setCalibration(request.on, request.meta, now()),
  };
}
