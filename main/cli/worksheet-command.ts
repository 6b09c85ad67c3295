import path from 'node:path';
import type { PlanDetail } from '../../app/contract/plan-records.js';
import { planChoiceIn, planChoiceText } from '../../app/core/plan-choice.js';
import { dataLocation, parseArguments, parseOrExplain, UsageError, type CommandIo } from './command-io.js';
import { Refusal, runPrintJob, type PrintCommandOptions } from './print-command.js';

export const worksheetUsage =
  'Usage: tidewing worksheet --plan ID --out FILE.pdf [--data DIR]\n' +
  '  Renders the printable worksheet of saved plan ID from the clinic database in DIR (default: the usual data folder) to a PDF, with headless Chromium\n' +
  '  (CHROMIUM_PATH, else /usr/bin/chromium), on the paper size chosen in Settings.';

export type WorksheetCommandOptions = PrintCommandOptions;

type Arguments = { planId: number; outFile: string; location: ReturnType<typeof dataLocation> };

function parse(args: string[]): Arguments {
  const parsed = parseArguments(args, { valueOptions: ['--plan', '--data', '--out'], maxPositionals: 0 });
  const plan = parsed.values.get('--plan');
  if (plan === undefined)
    throw new UsageError(
      '--plan ID is required: the number of the saved plan (shown on the Worksheets screen).',
    );
  const planId = Number(plan);
  if (!/^\d+$/.test(plan) || !Number.isSafeInteger(planId) || planId <= 0)
    throw new UsageError(`--plan must be a plan number such as 12, not "${plan}".`);
  const out = parsed.values.get('--out');
  if (out === undefined) throw new UsageError('--out FILE.pdf is required: where to write the worksheet.');
  if (path.extname(out).toLowerCase() !== '.pdf')
    throw new UsageError(`--out must name a .pdf file, not "${out}".`);
  return { planId, outFile: path.resolve(out), location: dataLocation(parsed) };
}

/**
 * `tidewing worksheet --plan ID --data DIR --out FILE.pdf`: the same worksheet page the app
 * prints, rendered by headless Chromium from an in-process loopback host on a free port and
 * written to FILE (via a temporary file renamed into place, so FILE is never half-written).
 * Exit 0 written, 1 refused or failed (nothing written under FILE), 2 bad arguments.
 */
export async function runWorksheetCommand(
  args: string[],
  io: CommandIo,
  options: WorksheetCommandOptions = {},
): Promise<number> {
  const parsed = parseOrExplain(io, 'worksheet', worksheetUsage, () => parse(args));
  if (parsed === null) return 2;
  const { planId, outFile, location } = parsed;
  return runPrintJob(
    {
      command: 'worksheet',
      what: `the worksheet of plan ${planId}`,
      noun: 'worksheet',
      outFile,
      location,
      hash: `#/worksheets/${planId}`,
      readySelector: '.worksheet[data-ready="true"]',
      findIt: async (backEnd) => {
        const detail = await backEnd.dispatch('plans:get', { id: planId });
        if (!detail.ok)
          throw new Refusal(
            detail.error.code === 'not-found'
              ? `there is no plan ${planId} in ${location.databaseFile}.`
              : detail.error.message,
          );
        // Of a saved comparison: whether this is the plan the clinic will use or its alternative.
        const choice = planChoiceText(planChoiceIn(planId, (detail.value as PlanDetail).comparison));
        return choice === '' ? '' : ` (${choice})`;
      },
    },
    io,
    options,
  );
}
