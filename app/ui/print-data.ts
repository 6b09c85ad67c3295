import type { ChannelName, RequestOf, ResponseOf } from '../contract/channels.js';
import { api } from './common/bridge.js';
import { routeFromHash } from './shell/areas.js';
import type { ProcedureDetail } from '../contract/record-channels.js';
import type { ClinicSettings } from '../contract/settings.js';
import type { SheetProps } from './worksheets/sheet.js';

/** What the printed worksheet needs, or why it cannot be drawn. */
export type PrintData =
  { state: 'failed'; message: string } | { state: 'ready'; props: Omit<SheetProps, 'printedAt'> };

async function ask<C extends ChannelName>(channel: C, request: RequestOf<C>): Promise<ResponseOf<C>> {
  const answer = await api.invoke(channel, request);
  if (!answer.ok) throw new Error(answer.error.message);
  return answer.value;
}

/** The plan number in `#/worksheets/<planId>`, or null. */
export function planIdFromHash(hash: string): number | null {
  const route = routeFromHash(hash);
  const id = Number(route.segments[0]);
  return route.area === 'worksheets' && Number.isInteger(id) && id > 0 ? id : null;
}

/** The record number in `#/records/<recordId>`, or null. */
export function recordIdFromHash(hash: string): number | null {
  const route = routeFromHash(hash);
  const id = Number(route.segments[0]);
  return route.area === 'records' && Number.isInteger(id) && id > 0 ? id : null;
}

/** What the printed procedure record needs first (the rest is asked for by the record's module). */
export type RecordPrintData =
  | { state: 'failed'; message: string }
  | { state: 'ready'; detail: ProcedureDetail; settings: ClinicSettings; appVersion: string };

/** Asks for the record, the clinic's settings and the app version at once. */
export async function loadRecordPrintData(recordId: number): Promise<RecordPrintData> {
  try {
    const [safety, stored, detail, info] = await Promise.all([
      ask('safety:status', {}),
      ask('settings:get', {}),
      ask('procedures:get', { id: recordId }),
      ask('app:info', {}),
    ]);
    if (!safety.acknowledged)
      return {
        state: 'failed',
        message: `The cautions of Tidewing ${safety.appVersion} have not been acknowledged yet. Open the app, read and acknowledge them first.`,
      };
    if (stored.settings === null)
      return {
        state: 'failed',
        message: 'The clinic is not set up yet. Open the app and save Settings first.',
      };
    return { state: 'ready', detail, settings: stored.settings, appVersion: info.appVersion };
  } catch (error) {
    return { state: 'failed', message: error instanceof Error ? error.message : String(error) };
  }
}

/** Asks for everything the sheet shows at once. */
export async function loadPrintData(planId: number | null): Promise<PrintData> {
  if (planId === null)
    return { state: 'failed', message: 'No plan named: the address must end in #/worksheets/<plan number>.' };
  try {
    const [safety, stored, detail, drugs, info, calibration] = await Promise.all([
      ask('safety:status', {}),
      ask('settings:get', {}),
      ask('plans:get', { id: planId }),
      ask('drugs:list', {}),
      ask('app:info', {}),
      // The sheet is printed without the calibration (and says so) when it cannot be read.
      ask('evidence:calibration', {}).catch(() => null),
    ]);
    if (!safety.acknowledged)
      return {
        state: 'failed',
        message: `The cautions of Tidewing ${safety.appVersion} have not been acknowledged yet. Open the app, read and acknowledge them first.`,
      };
    if (stored.settings === null)
      return {
        state: 'failed',
        message: 'The clinic is not set up yet. Open the app and save Settings first.',
      };
    return {
      state: 'ready',
      props: { detail, drugs, appVersion: info.appVersion, settings: stored.settings, calibration },
    };
  } catch (error) {
    return { state: 'failed', message: error instanceof Error ? error.message : String(error) };
  }
}
