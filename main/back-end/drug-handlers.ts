import type { ParsedRequestOf, ResponseOf } from '../../app/contract/channels.js';
import type { drugChannels } from '../../app/contract/drug-channels.js';
import type { ClinicDb } from '../../db/clinic-db.js';
import {
  createEmergencyDrugRepository,
  DrugCorrectionError,
} from '../../db/repositories/emergency-drug-repository.js';
import { RecordError } from './record-handlers.js';

type DrugChannel = keyof typeof drugChannels;
type DrugHandlerTable = { [C in DrugChannel]: (request: ParsedRequestOf<C>) => Promise<ResponseOf<C>> };

async function checked<T>(write: () => Promise<T | null>, id: number): Promise<T> {
  let written: T | null;
  try {
    written = await write();
  } catch (error) {
    if (error instanceof DrugCorrectionError) throw new RecordError('conflict', error.message, 'id');
    throw error;
  }
  if (written === null)
    throw new RecordError(
      'not-found',
      `Emergency drug ${id} was not found; it may have been opened from an old list.`,
      'id',
    );
  return written;
}

/** Handlers for the clinic's emergency-drug list (the worksheet's emergency card). */
export function createDrugHandlers(now: () => Date, clinic: ClinicDb): DrugHandlerTable {
  const drugs = createEmergencyDrugRepository(clinic);
  return {
    'drugs:list': () => drugs.list(),
    'drugs:add': (request) => drugs.add(request.values, request.meta, now()),
    'drugs:correct': (request) =>
      checked(() => drugs.correct(request.id, request.values, request.meta, now()), request.id),
    'drugs:void': (request) => checked(() => drugs.void(request.id, request.meta, now()), request.id),
  };
}
