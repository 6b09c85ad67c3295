/**
 * `tidewing plan FILE` (or `-` for standard input): validates a plan, computes it and prints the
 * result JSON, or with `--summary` a short table. Invalid input: exit code 2, one line per bad
 * field on standard error, nothing on standard output. A UTF-8 byte-order mark is skipped; every
 * piece of the input it echoes is escaped for the terminal; an unknown `speciesId` is refused
 * unless `--allow-unknown-species` is given.
 */
import { planInputSchema, planIssueMessages } from '../../app/contract/plan.js';
import { clinicalMilestoneLines } from '../../app/core/clinical-milestones.js';
import { circuitLabels, routeLabels } from '../../app/core/delivery.js';
import { dialStepsText } from '../../app/core/plan-phases.js';
import { computePlan } from '../../app/core/model/compute-plan.js';
import type { PlanPhaseSummary, PlanResult } from '../../app/core/model/plan-types.js';
import { speciesReference } from '../../app/core/species-reference.js';
import { escapeForTerminal, jsonForTerminal } from './command-io.js';

export type PlanCommandIo = {
  readonly stdin: NodeJS.ReadableStream;
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  readonly readFile: (path: string) => Promise<string>;
};

export const planCommandUsage =
  'Usage: tidewing plan FILE [--summary] [--allow-unknown-species]   (FILE may be - for standard input)';

async function readStream(stream: NodeJS.ReadableStream): Promise<string> {
  // Decoded once at the end, so a character split between two chunks stays whole.
  const chunks: Buffer[] = [];
  for await (const chunk of stream)
    chunks.push(typeof chunk === 'string' ? Buffer.from(chunk, 'utf8') : Buffer.from(chunk));
  return Buffer.concat(chunks).toString('utf8');
}

/** Input shown in a message: escaped, so it can neither drive the terminal nor fake a line. */
const shown = (text: string): string => escapeForTerminal(text);

function errorMessage(error: unknown): string {
  return shown(error instanceof Error ? error.message : String(error));
}

/**
 * Runs `tidewing plan`.
 * @param args arguments after `plan`
 * @param io standard streams and a file reader (injected so tests run without a process)
 * @returns exit code: 0 done, 2 bad usage or invalid plan, 1 unexpected failure
 */
export async function runPlanCommand(args: string[], io: PlanCommandIo): Promise<number> {
  let summary = false;
  let allowUnknownSpecies = false;
  const files: string[] = [];
  for (const arg of args) {
    if (arg === '--summary') summary = true;
    else if (arg === '--allow-unknown-species') allowUnknownSpecies = true;
    else if (arg === '--help' || arg === '-h') {
      io.stdout(`${planCommandUsage}\n`);
      return 0;
    } else if (arg.startsWith('--')) {
      io.stderr(`tidewing plan: unknown option ${shown(arg)}\n${planCommandUsage}\n`);
      return 2;
    } else files.push(arg);
  }
  const file = files[0];
  if (file === undefined || files.length > 1) {
    io.stderr(`tidewing plan: give exactly one plan file\n${planCommandUsage}\n`);
    return 2;
  }
  const source = file === '-' ? 'standard input' : shown(file);
  let text: string;
  try {
    text = file === '-' ? await readStream(io.stdin) : await io.readFile(file);
  } catch (error) {
    io.stderr(`tidewing plan: cannot read ${source}: ${errorMessage(error)}\n`);
    return 2;
  }
  // Editors on some systems start UTF-8 files with a byte-order mark; JSON.parse refuses it.
  if (text.startsWith('\uFEFF')) text = text.slice(1);
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    io.stderr(`tidewing plan: ${source} is not valid JSON (${errorMessage(error)})\n`);
    return 2;
  }
  const parsed = planInputSchema.safeParse(json);
  if (!parsed.success) {
    const lines = planIssueMessages(parsed.error).map(shown);
    io.stderr(
      `tidewing plan: the plan has ${String(lines.length)} problem${lines.length === 1 ? '' : 's'}:\n${lines.map((line) => `  ${line}`).join('\n')}\n`,
    );
    return 2;
  }
  const speciesId = parsed.data.speciesId;
  if (
    speciesId !== undefined &&
    !allowUnknownSpecies &&
    !speciesReference.some((row) => row.id === speciesId)
  ) {
    // A misspelt id would silently lose the species' mass range and published MAC.
    io.stderr(
      `tidewing plan: speciesId "${shown(speciesId)}" is not in the species reference, so its mass range and published MAC could not be checked. ` +
        `Use one of: ${speciesReference.map((row) => row.id).join(', ')}; or leave speciesId out; ` +
        'or add --allow-unknown-species to compute with the agent default MAC.\n',
    );
    return 2;
  }
  let result: PlanResult;
  try {
    result = computePlan(parsed.data, { species: speciesReference });
  } catch (error) {
    io.stderr(`tidewing plan: the plan could not be computed: ${errorMessage(error)}\n`);
    return 1;
  }
  io.stdout(summary ? formatPlanSummary(result) : `${jsonForTerminal(result)}\n`);
  return 0;
}

function minutes(value: number | null): string {
  return value === null ? 'not reached' : `${value.toFixed(1)} min`;
}

/**
 * A short human-readable table of a computed plan.
 * @param result computed plan
 */
export function formatPlanSummary(result: PlanResult): string {
  const e = result.estimates;
  const m = result.milestones;
  const milestoneLines = clinicalMilestoneLines(result);
  const rows: [string, string][] = [
    [
      'Patient',
      `${result.patientName === null ? '(unnamed)' : shown(result.patientName)}${result.speciesId === null ? '' : `, ${shown(result.speciesId)}`}`,
    ],
    ['Agent / MAC', `${result.agent}, MAC ${result.mac.valuePct.toFixed(2)} % (${result.mac.basis})`],
    ['Tidal volume', `${e.tidalVolumeMl.value.toPrecision(3)} mL`],
    ['Breathing rate', `${e.breathsPerMin.value.toPrecision(3)} /min`],
    ['Minute ventilation', `${e.minuteVentilationMlMin.value.toPrecision(3)} mL/min`],
    ['Tracheal dead space', `${e.trachealDeadSpaceMl.value.toPrecision(3)} mL`],
    [
      'Air sacs (ant./post.)',
      `${e.anteriorSacsMl.value.toPrecision(3)} / ${e.posteriorSacsMl.value.toPrecision(3)} mL`,
    ],
    [
      'Heart rate / output',
      `${e.heartRatePerMin.value.toPrecision(3)} /min, ${e.cardiacOutputMlMin.value.toPrecision(3)} mL/min`,
    ],
    ...milestoneLines.map((line): [string, string] => {
      const notes = [
        ...(line.rangeText === null ? [] : [`p5-p95 ${line.rangeText}`]),
        ...(line.note === null ? [] : [line.note]),
      ];
      return [
        `${line.label}${line.from === 'vaporiser off' ? ' after off' : ''}`,
        `${line.minutes === null ? line.minutesText : minutes(line.minutes)}${notes.length === 0 ? '' : `  (${notes.join('; ')})`}`,
      ];
    }),
    [
      'Air-sac wash-in 95 %',
      m.airSacWashin95Breaths === null
        ? 'not reached'
        : `${String(m.airSacWashin95Breaths)} breaths, ${minutes(m.airSacWashin95Min)}`,
    ],
    [
      'Air-sac washout 95 %',
      m.airSacWashout95Breaths === null
        ? 'not reached'
        : `${String(m.airSacWashout95Breaths)} breaths, ${minutes(m.airSacWashout95Min)}`,
    ],
    [
      'Fresh gas',
      result.phases.length > 1
        ? 'per phase, below'
        : `recommended ${result.flows.recommendedLpm.toFixed(2)} L/min, minimum ${result.flows.minimumLpm.toFixed(2)} L/min`,
    ],
    [
      'Liquid agent',
      `${result.consumption.liquidMl.toFixed(1)} mL for the plan, ${result.consumption.liquidMlPerHour.toFixed(1)} mL/h at ${String(result.consumption.maintenanceVaporPct)} %`,
    ],
    [
      'Oxygen',
      `${result.oxygen.usedL.toFixed(0)} L${result.oxygen.enduranceMin === null ? '' : `, cylinder lasts ${result.oxygen.enduranceMin.toFixed(0)} min`}`,
    ],
    [
      'Waste gas peak',
      `${result.wasteGas.peakPpm.toFixed(2)} ppm (ceiling ${String(result.wasteGas.ceilingPpm)} ppm)`,
    ],
  ];
  const width = Math.max(...rows.map(([label]) => label.length));
  const lines = rows.map(([label, value]) => `${label.padEnd(width)}  ${value}`);
  // Caution messages may quote the input (an unknown species id, say).
  const cautions = result.cautions.map((caution) => `  [${caution.severity}] ${shown(caution.message)}`);
  // Each milestone's definition, so a figure is never read without what it times.
  const definitions = milestoneLines.map((line) => `  ${line.definition}`);
  return `${lines.join('\n')}\n${formatPhases(result.phases)}Milestones (brain level in the model):\n${definitions.join('\n')}\n${cautions.length === 0 ? 'No cautions' : `Cautions:\n${cautions.join('\n')}`}\nEstimates from model ${result.modelVersion}; the veterinarian's judgement decides.\n`;
}

function figure(value: number): string {
  return String(Number(value.toFixed(2)));
}

/** A phase's route and breathing system in words (a chamber has no breathing system of its own). */
function deliveryWords(phase: PlanPhaseSummary): string {
  return phase.route === 'chamber'
    ? routeLabels.chamber
    : `${routeLabels[phase.route]}, ${circuitLabels[phase.circuit].toLowerCase()}`;
}

/**
 * Each phase of a plan (a single-route plan is one phase): its minutes, route and breathing
 * system, the gap on room air, the set, recommended and minimum flows, the dial steps within it,
 * and its oxygen and liquid agent.
 * @param phases the result's phases (empty for results saved before phases: nothing printed)
 */
export function formatPhases(phases: readonly PlanPhaseSummary[]): string {
  if (phases.length === 0) return '';
  const lines = phases.map((phase) => {
    const gap =
      phase.gapMin > 0
        ? `${figure(phase.gapMin)} min on room air while the bird is moved, then from ${figure(phase.deliveryFromMin)} min: `
        : '';
    const flows = phase.flows;
    const dial = dialStepsText(phase.dialSteps);
    return [
      `  Phase ${String(phase.index + 1)}  ${figure(phase.startMin)}-${figure(phase.endMin)} min  ${gap}${deliveryWords(phase)}`,
      `    Fresh gas ${phase.freshGasLpm.toFixed(2)} L/min set; recommended ${flows.recommendedLpm.toFixed(2)} L/min, minimum ${flows.minimumLpm.toFixed(2)} L/min${flows.rebreathing ? ' (rebreathes at the set flow)' : ''}`,
      `    Dial ${dial === '' ? 'no step' : dial}`,
      `    Oxygen ${phase.oxygenUsedL.toFixed(1)} L, liquid agent ${phase.liquidMl.toFixed(1)} mL`,
    ].join('\n');
  });
  return `Phases:\n${lines.join('\n')}\n`;
}
