import path from 'node:path';
import { dataLocation, parseArguments, parseOrExplain, UsageError, type CommandIo } from './command-io.js';
import { Refusal, runPrintJob, type PrintCommandOptions } from './print-command.js';

export const recordUsage =
  'Usage: tidewing record --id N --out FILE.pdf [--data DIR]\n' +
  '  Renders procedure record N from the clinic database in DIR (default: the usual data folder) to a PDF for the patient file:\n' +
  '  the log as strips and as a table, the events, every correction with its reason, the initials, and the linked plan beside what was logged.\n' +
  '  Uses headless Chromium (CHROMIUM_PATH, else /usr/bin/chromium) on the paper size chosen in Settings.';

type Arguments = { recordId: number; outFile: string; location: ReturnType<typeof dataLocation> };

function parse(args: string[]): Arguments {
  const parsed = parseArguments(args, { valueOptions: ['--id', '--data', '--out'], maxPositionals: 0 });
  const id = parsed.values.get('--id');
  if (id === undefined)
    throw new UsageError(
      '--id N is required: the number of the procedure record (shown on the Records screen).',
    );
  const recordId = Number(id);
  if (!/^\d+$/.test(id) || !Number.isSafeInteger(recordId) || recordId <= 0)
    throw new UsageError(`--id must be a record number such as 7, not "${id}".`);
  const out = parsed.values.get('--out');
  if (out === undefined) throw new UsageError('--out FILE.pdf is required: where to write the record.');
  if (path.extname(out).toLowerCase() !== '.pdf')
    throw new UsageError(`--out must name a .pdf file, not "${out}".`);
  return { recordId, outFile: path.resolve(out), location: dataLocation(parsed) };
}

/**
 * `tidewing record --id N --data DIR --out FILE.pdf`: the printed procedure record, the same
 * page the record screen prints, rendered by headless Chromium. Exit 0 written, 1 refused or
 * failed (nothing written under FILE), 2 bad arguments.
 */
export async function runRecordCommand(
  args: string[],
  io: CommandIo,
  options: PrintCommandOptions = {},
): Promise<number> {
  const parsed = parseOrExplain(io, 'record', recordUsage, () => parse(args));
  if (parsed === null) return 2;
  const { recordId, outFile, location } = parsed;
  return runPrintJob(
    {
      command: 'record',
      what: `procedure record ${recordId}`,
      noun: 'record',
      outFile,
      location,
      hash: `#/records/${recordId}`,
      readySelector: '.printed-record[data-ready="true"]',
      findIt: async (backEnd) => {
        const detail = await backEnd.dispatch('procedures:get', { id: recordId });
        if (!detail.ok)
          throw new Refusal(
            detail.error.code === 'not-found'
              ? `there is no procedure record ${recordId} in ${location.databaseFile}.`
              : detail.error.message,
          );
        return '';
      },
    },
    io,
    options,
  );
}
