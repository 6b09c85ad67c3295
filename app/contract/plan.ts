/**
 * The anaesthetic plan: the input the model reads (planInputSchema) and the result it returns
 * (planResultSchema). Validation messages are written for a veterinarian: each says what is
 * wrong in plain words, and planIssueMessages() puts the field's path in front of it.
 */
import { z } from 'zod';
import { agentIds } from '../core/agents.js';
import { cautionSeverities } from '../core/cautions.js';
import { circuits, routes, type Circuit, type Route } from '../core/delivery.js';
import { estimateRespiratory } from '../core/model/allometry.js';
import { ippvPeriodsOf, maxLaterIppvPeriods } from '../core/model/ippv-periods.js';
import { defaultPhaseGapMin } from '../core/model/phases.js';
import { bodyTemperatureLimitsC } from '../core/model/temperature.js';
import { hasLetterOrDigit, hiddenCharacterProblem } from './input-rules.js';
import type { PlanInput as CorePlanInput, PlanResult as CorePlanResult } from '../core/model/plan-types.js';

/**
 * A measured value more than this many times above or below the allometric estimate for the
 * bird's mass is taken as an entry error (assumption: individual birds stay well within it).
 */
export const overridePlausibilityFactor = 10;

function boundedNumber(
  what: string,
  unit: string,
  min: number,
  max: number,
  options: { integer?: boolean } = {},
) {
  const range = `${what} must be between ${String(min)}${unit} and ${String(max)}${unit}`;
  const base = z.number({
    error: (issue) => (issue.input === undefined ? `${what} is required` : `${what} must be a number`),
  });
  const checked = options.integer === true ? base.int({ error: `${what} must be a whole number` }) : base;
  return checked.min(min, { error: range }).max(max, { error: range });
}

function strict<T extends z.ZodRawShape>(shape: T, what: string) {
  return z.strictObject(shape, {
    error: (issue) => {
      if (issue.code === 'unrecognized_keys') {
        return `${issue.keys.map((key) => `"${key}"`).join(', ')} ${issue.keys.length === 1 ? 'is' : 'are'} not part of ${what} (check the spelling)`;
      }
      if (issue.code === 'invalid_type') return `${what} must be an object with named fields`;
      return undefined;
    },
  });
}

const kebabCase = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;

export const agentSchema = z.enum(agentIds, {
  error: 'agent must be isoflurane, sevoflurane or desflurane',
});
export const routeSchema = z.enum(routes, {
  error: 'route must be mask, chamber, endotracheal or airSacTube',
});
export const circuitSchema = z.enum(circuits, {
  error: 'circuit must be nonRebreathing or circle',
});

export const overridesSchema = strict(
  {
    tidalVolumeMl: boundedNumber('measured tidal volume', ' mL', 0.01, 1000).optional(),
    breathsPerMin: boundedNumber('measured breathing rate', ' breaths/min', 1, 200).optional(),
    trachealVolumeMl: boundedNumber('measured tracheal volume', ' mL', 0.01, 200).optional(),
    heartRatePerMin: boundedNumber('measured heart rate', ' beats/min', 20, 1500).optional(),
    cardiacOutputMlMin: boundedNumber('measured cardiac output', ' mL/min', 0.5, 20000).optional(),
    lungVolumeMl: boundedNumber('measured lung volume', ' mL', 0.05, 2000).optional(),
    airSacVolumeMl: boundedNumber('measured air-sac volume', ' mL', 0.5, 5000).optional(),
  },
  'the measured values',
);

export const scheduleStepSchema = strict(
  {
    atMin: boundedNumber('step time', ' min', 0, 1440),
    vaporPct: boundedNumber('dial setting', ' %', 0, 20),
  },
  'a vaporiser step',
);

/** Longest room-air gap a move between phases may take, min (a bird off the agent longer is a new induction). */
export const maxPhaseGapMin = 10;

export const phaseChangeSchema = strict(
  {
    startMin: boundedNumber('phase start', ' min', 0.1, 1440),
    gapMin: boundedNumber('gap on room air', ' min', 0, maxPhaseGapMin).optional(),
    route: routeSchema,
    circuit: circuitSchema.optional(),
    freshGasLpm: boundedNumber('fresh gas flow', ' L/min', 0.05, 20),
    chamberVolumeL: boundedNumber('chamber volume', ' L', 0.1, 100).optional(),
    maskDeadSpaceMl: boundedNumber('mask dead space', ' mL', 0, 500).optional(),
    maskLeakFraction: boundedNumber('mask leak fraction', '', 0, 0.9).optional(),
    circuitVolumeL: boundedNumber('circle volume', ' L', 0.1, 20).optional(),
  },
  'a later phase',
);

const ventilatorRate = boundedNumber('ventilator rate', ' breaths/min', 1, 150);
const ventilatorTidalVolume = boundedNumber('ventilator tidal volume', ' mL', 0.05, 1000);

/** A later IPPV period: its own start, optional end and settings. */
export const ippvPeriodSchema = strict(
  {
    fromMin: boundedNumber('IPPV period start', ' min', 0, 1440),
    untilMin: boundedNumber('IPPV period end', ' min', 0, 1440).optional(),
    breathsPerMin: ventilatorRate,
    tidalVolumeMl: ventilatorTidalVolume,
  },
  'a later IPPV period',
);

export const ventilationSchema = z.discriminatedUnion(
  'mode',
  [
    strict({ mode: z.literal('spontaneous') }, 'spontaneous ventilation'),
    strict(
      {
        mode: z.literal('ippv'),
        breathsPerMin: ventilatorRate,
        tidalVolumeMl: ventilatorTidalVolume,
        fromMin: boundedNumber('ventilation start', ' min', 0, 1440).optional(),
        untilMin: boundedNumber('ventilation end', ' min', 0, 1440).optional(),
        laterPeriods: z
          .array(ippvPeriodSchema, { error: 'later IPPV periods must be a list of periods' })
          .max(maxLaterIppvPeriods, {
            error: `a plan may have at most ${String(maxLaterIppvPeriods)} later IPPV periods`,
          })
          .optional(),
      },
      'IPPV settings',
    ),
  ],
  { error: 'ventilation mode must be spontaneous or ippv' },
);

export const cylinderSchema = z.discriminatedUnion(
  'kind',
  [
    strict(
      {
        kind: z.literal('preset'),
        presetId: z.enum(['us-e', 'metric-2l-200bar', 'metric-10l-200bar'], {
          error: 'cylinder preset must be us-e, metric-2l-200bar or metric-10l-200bar',
        }),
        gaugePressureBar: boundedNumber('gauge pressure', ' bar', 0, 300).optional(),
        gaugePressurePsi: boundedNumber('gauge pressure', ' psi', 0, 4400).optional(),
      },
      'a cylinder preset',
    ),
    strict(
      {
        kind: z.literal('waterCapacity'),
        waterCapacityL: boundedNumber('cylinder water capacity', ' L', 0.1, 100),
        pressureBar: boundedNumber('cylinder pressure', ' bar', 0, 300),
      },
      'a cylinder by water capacity',
    ),
    strict(
      { kind: z.literal('content'), contentL: boundedNumber('cylinder content', ' L', 0, 100000) },
      'a cylinder by content',
    ),
  ],
  { error: 'cylinder kind must be preset, waterCapacity or content' },
);

const planShape = strict(
  {
    patientName: z
      .string({ error: 'patient name must be text' })
      .max(100, { error: 'patient name must be at most 100 characters' })
      .superRefine((name, context) => {
        const hidden = hiddenCharacterProblem('patient name', name);
        if (hidden !== null) context.addIssue({ code: 'custom', message: hidden });
        else if (name.trim() !== '' && !hasLetterOrDigit(name))
          context.addIssue({
            code: 'custom',
            message: 'patient name must contain at least one letter or digit',
          });
      })
      .optional(),
    bodyMassG: boundedNumber('body mass', ' g', 5, 15000),
    speciesId: z
      .string({ error: 'species id must be text' })
      .regex(kebabCase, {
        error: 'species id must be lower-case words joined by hyphens, e.g. budgerigar or pekin-duck',
      })
      .optional(),
    overrides: overridesSchema.optional(),
    agent: agentSchema,
    macPct: boundedNumber('MAC', ' %', 0.1, 15).optional(),
    route: routeSchema,
    circuit: circuitSchema.optional(),
    freshGasLpm: boundedNumber('fresh gas flow', ' L/min', 0.05, 20),
    chamberVolumeL: boundedNumber('chamber volume', ' L', 0.1, 100).optional(),
    maskDeadSpaceMl: boundedNumber('mask dead space', ' mL', 0, 500).optional(),
    maskLeakFraction: boundedNumber('mask leak fraction', '', 0, 0.9).optional(),
    circuitVolumeL: boundedNumber('circle volume', ' L', 0.1, 20).optional(),
    schedule: z
      .array(scheduleStepSchema, { error: 'schedule must be a list of vaporiser steps' })
      .min(1, { error: 'schedule needs at least one vaporiser step' })
      .max(50, { error: 'schedule may have at most 50 steps' }),
    laterPhases: z
      .array(phaseChangeSchema, { error: 'later phases must be a list of phases' })
      .max(5, { error: 'a plan may have at most 5 later phases' })
      .optional(),
    ventilation: ventilationSchema.optional(),
    targetMacMultiple: boundedNumber('planned depth', ' x MAC', 0.5, 3).optional(),
    recoveryMacFraction: boundedNumber('recovery threshold', ' x MAC', 0.1, 0.95).optional(),
    recoveryWindowMin: boundedNumber('recovery window', ' min', 5, 240).optional(),
    scavenging: z.boolean({ error: 'scavenging must be true or false' }).optional(),
    room: strict(
      {
        volumeM3: boundedNumber('room volume', ' m3', 5, 5000),
        airChangesPerHour: boundedNumber('room air changes', ' per hour', 0.1, 60),
      },
      'the room',
    ).optional(),
    cylinder: cylinderSchema.optional(),
    vaporiserTemperatureC: boundedNumber('vaporiser temperature', ' C', 10, 35).optional(),
    bodyTemperatureC: boundedNumber(
      'body temperature',
      ' C',
      bodyTemperatureLimitsC.minC,
      bodyTemperatureLimitsC.maxC,
    ).optional(),
    uncertainty: strict(
      {
        samples: boundedNumber('number of uncertainty samples', '', 0, 2000, { integer: true }),
        seed: boundedNumber('uncertainty seed', '', 0, 2147483647, { integer: true }),
      },
      'the uncertainty settings',
    ).optional(),
  },
  'a plan',
);

export const planInputSchema = planShape.superRefine((plan, context) => {
  const steps = plan.schedule;
  const first = steps[0];
  if (first !== undefined && first.atMin !== 0) {
    context.addIssue({
      code: 'custom',
      path: ['schedule', 0, 'atMin'],
      message: 'the first vaporiser step must start at 0 min',
    });
  }
  for (let index = 1; index < steps.length; index += 1) {
    const previous = steps[index - 1];
    const step = steps[index];
    if (previous !== undefined && step !== undefined && step.atMin <= previous.atMin) {
      context.addIssue({
        code: 'custom',
        path: ['schedule', index, 'atMin'],
        message: `steps must be in time order: this step (${String(step.atMin)} min) does not come after the one before (${String(previous.atMin)} min)`,
      });
    }
  }
  const last = steps[steps.length - 1];
  const window = plan.recoveryWindowMin ?? 30;
  if (last !== undefined && last.atMin + window > 1440) {
    context.addIssue({
      code: 'custom',
      path: ['recoveryWindowMin'],
      message: 'the last step plus the recovery window must end within 24 h (1440 min)',
    });
  }
  checkPhaseDelivery(plan, [], context);
  const laterPhases = plan.laterPhases ?? [];
  let previousStart = 0;
  laterPhases.forEach((phase, index) => {
    checkPhaseDelivery(phase, ['laterPhases', index], context);
    if (phase.startMin <= previousStart) {
      context.addIssue({
        code: 'custom',
        path: ['laterPhases', index, 'startMin'],
        message: `phases must be in time order: this phase (${String(phase.startMin)} min) does not start after the one before (${String(previousStart)} min)`,
      });
    }
    if (last !== undefined && phase.startMin >= last.atMin + window) {
      context.addIssue({
        code: 'custom',
        path: ['laterPhases', index, 'startMin'],
        message: 'a phase must start before the end of the plan (the last step plus the recovery window)',
      });
    }
    previousStart = phase.startMin;
  });
  const ventilation = plan.ventilation;
  if (ventilation?.mode === 'ippv') {
    checkIppvPeriods(plan, ventilation, last === undefined ? 1440 : last.atMin + window, context);
  }
  if (plan.overrides !== undefined) {
    const estimates = estimateRespiratory(plan.bodyMassG);
    const checks: [keyof NonNullable<typeof plan.overrides>, number, string, string][] = [
      ['tidalVolumeMl', estimates.tidalVolumeMl.value, 'measured tidal volume', 'mL'],
      ['breathsPerMin', estimates.breathsPerMin.value, 'measured breathing rate', 'breaths/min'],
      ['trachealVolumeMl', estimates.trachealDeadSpaceMl.value, 'measured tracheal volume', 'mL'],
      ['heartRatePerMin', estimates.heartRatePerMin.value, 'measured heart rate', 'beats/min'],
      ['cardiacOutputMlMin', estimates.cardiacOutputMlMin.value, 'measured cardiac output', 'mL/min'],
      ['lungVolumeMl', estimates.lungVolumeMl.value, 'measured lung volume', 'mL'],
      ['airSacVolumeMl', estimates.airSacVolumeMl.value, 'measured air-sac volume', 'mL'],
    ];
    for (const [field, estimate, what, unit] of checks) {
      const measured = plan.overrides[field];
      if (measured === undefined) continue;
      if (
        measured > estimate * overridePlausibilityFactor ||
        measured < estimate / overridePlausibilityFactor
      ) {
        context.addIssue({
          code: 'custom',
          path: ['overrides', field],
          message: `${what} of ${String(measured)} ${unit} is more than ${String(overridePlausibilityFactor)} times off the ${estimate.toPrecision(3)} ${unit} expected for a ${String(plan.bodyMassG)} g bird: check the value and the units`,
        });
      }
    }
  }
});

type ParsedPlan = z.infer<typeof planShape>;
type IppvVentilation = Extract<NonNullable<ParsedPlan['ventilation']>, { mode: 'ippv' }>;

/**
 * The IPPV periods' checks: each ends after it starts, they come in time order without
 * overlapping (only the last may run to the end of the plan), each starts and ends within the
 * plan, each runs on a tube (no mask or chamber phase within it), and each tidal volume is
 * plausible for the bird. The first period is the plan's own IPPV fields (`ventilation.fromMin`,
 * `ventilation.untilMin`); later ones are at `ventilation.laterPeriods[i]`.
 */
function checkIppvPeriods(
  plan: ParsedPlan,
  ventilation: IppvVentilation,
  planEndMin: number,
  context: z.RefinementCtx,
) {
  const laterPhases = plan.laterPhases ?? [];
  const periods = ippvPeriodsOf(ventilation);
  const pathOf = (index: number, field: string): (string | number)[] =>
    index === 0 ? ['ventilation', field] : ['ventilation', 'laterPeriods', index - 1, field];
  const nameOf = (index: number): string => (index === 0 ? 'IPPV' : `IPPV period ${String(index + 1)}`);
  const span = (fromMin: number, untilMin: number | null): string =>
    untilMin === null
      ? `from ${String(fromMin)} min to the end of the plan`
      : `from ${String(fromMin)} to ${String(untilMin)} min`;
  // A later phase's route delivers from the end of its gap (the default gap when none is set).
  const deliveryFrom = (phase: (typeof laterPhases)[number]): number =>
    phase.startMin + (phase.gapMin ?? defaultPhaseGapMin.value);
  const tubeRoute = (route: Route): boolean => route === 'endotracheal' || route === 'airSacTube';
  const expectedTidal = estimateRespiratory(plan.bodyMassG).tidalVolumeMl.value;
  const phasesRefused = new Set<number>();
  periods.forEach((period, index) => {
    const { fromMin, untilMin } = period;
    // IPPV needs a tube from its start until its end.
    const routeAtStart = laterPhases.reduce<Route>(
      (route, phase) => (deliveryFrom(phase) <= fromMin ? phase.route : route),
      plan.route,
    );
    if (!tubeRoute(routeAtStart)) {
      const firstTube = laterPhases.find((phase) => deliveryFrom(phase) > fromMin && tubeRoute(phase.route));
      context.addIssue({
        code: 'custom',
        path: index === 0 && firstTube === undefined ? ['ventilation', 'mode'] : pathOf(index, 'fromMin'),
        message:
          firstTube !== undefined
            ? `IPPV needs an endotracheal tube or an air-sac tube: start it once the tube phase is running (from ${String(deliveryFrom(firstTube))} min, after its gap on room air)`
            : 'IPPV needs an endotracheal tube or an air-sac tube, not a mask or chamber',
      });
    }
    laterPhases.forEach((phase, phaseIndex) => {
      if (phasesRefused.has(phaseIndex) || tubeRoute(phase.route)) return;
      if (deliveryFrom(phase) > fromMin && (untilMin === null || phase.startMin < untilMin)) {
        phasesRefused.add(phaseIndex);
        const route = phase.route === 'mask' ? 'mask' : 'chamber';
        context.addIssue({
          code: 'custom',
          path: ['laterPhases', phaseIndex, 'route'],
          message:
            untilMin === null
              ? `IPPV runs from ${String(fromMin)} min to the end of the plan: a later ${route} phase cannot follow it; keep the bird on a tube`
              : `${nameOf(index)} runs ${span(fromMin, untilMin)}: a ${route} phase cannot start before it ends; end IPPV by ${String(phase.startMin)} min or keep the bird on a tube`,
        });
      }
    });
    if (period.tidalVolumeMl > expectedTidal * overridePlausibilityFactor) {
      context.addIssue({
        code: 'custom',
        path: pathOf(index, 'tidalVolumeMl'),
        message: `a ventilator tidal volume of ${String(period.tidalVolumeMl)} mL is more than ${String(overridePlausibilityFactor)} times the ${expectedTidal.toPrecision(3)} mL expected for a ${String(plan.bodyMassG)} g bird: check the value and the units`,
      });
    }
    if (untilMin !== null && untilMin <= fromMin) {
      context.addIssue({
        code: 'custom',
        path: pathOf(index, 'untilMin'),
        message: `${nameOf(index)} must end after it starts: the end (${String(untilMin)} min) is not after the start (${String(fromMin)} min)`,
      });
    }
    const previous = periods[index - 1];
    if (previous !== undefined && previous.untilMin === null) {
      context.addIssue({
        code: 'custom',
        path: pathOf(index - 1, 'untilMin'),
        message: `${nameOf(index - 1)} has no end, so it runs to the end of the plan: give it an end before ${nameOf(index)} starts (${String(fromMin)} min); only the last period may run to the end`,
      });
    } else if (previous !== undefined && previous.untilMin !== null && fromMin < previous.untilMin) {
      context.addIssue({
        code: 'custom',
        path: pathOf(index, 'fromMin'),
        message: `IPPV periods must be in time order and must not overlap: ${nameOf(index)} starts at ${String(fromMin)} min, before ${nameOf(index - 1)} ends (${String(previous.untilMin)} min)`,
      });
    }
    if ((index > 0 || ventilation.fromMin !== undefined) && fromMin > planEndMin) {
      context.addIssue({
        code: 'custom',
        path: pathOf(index, 'fromMin'),
        message:
          index === 0
            ? 'ventilation must start before the end of the plan'
            : `${nameOf(index)} must start before the end of the plan (${String(planEndMin)} min, the last step plus the recovery window)`,
      });
    }
    if (untilMin !== null && untilMin > planEndMin) {
      context.addIssue({
        code: 'custom',
        path: pathOf(index, 'untilMin'),
        message: `${nameOf(index)} must end within the plan (by ${String(planEndMin)} min, the last step plus the recovery window); leave the end out to ventilate to the end`,
      });
    }
  });
}

type PhaseDelivery = {
  readonly route: Route;
  readonly circuit?: Circuit | undefined;
  readonly chamberVolumeL?: number | undefined;
  readonly circuitVolumeL?: number | undefined;
  readonly maskDeadSpaceMl?: number | undefined;
  readonly maskLeakFraction?: number | undefined;
};

/** The checks that depend on a phase's route and breathing system (the plan's own fields are the first phase). */
function checkPhaseDelivery(
  phase: PhaseDelivery,
  at: readonly (string | number)[],
  context: z.RefinementCtx,
) {
  if (phase.route === 'chamber' && phase.chamberVolumeL === undefined) {
    context.addIssue({
      code: 'custom',
      path: [...at, 'chamberVolumeL'],
      message: 'the chamber volume is needed for the chamber route',
    });
  }
  const circuit = phase.circuit ?? 'nonRebreathing';
  if (phase.route !== 'chamber' && circuit === 'circle' && phase.circuitVolumeL === undefined) {
    context.addIssue({
      code: 'custom',
      path: [...at, 'circuitVolumeL'],
      message: 'the circle volume (bag, hoses and absorber) is needed for a circle system',
    });
  }
  if (phase.route === 'airSacTube' && circuit === 'circle') {
    context.addIssue({
      code: 'custom',
      path: [...at, 'circuit'],
      message: 'an air-sac tube is run from a non-rebreathing system in this model; choose nonRebreathing',
    });
  }
  if (phase.maskDeadSpaceMl !== undefined && phase.route !== 'mask') {
    context.addIssue({
      code: 'custom',
      path: [...at, 'maskDeadSpaceMl'],
      message: 'mask dead space applies only to the mask route',
    });
  }
  if (phase.maskLeakFraction !== undefined && phase.route !== 'mask') {
    context.addIssue({
      code: 'custom',
      path: [...at, 'maskLeakFraction'],
      message: 'mask leak applies only to the mask route',
    });
  }
}

export type PlanInput = z.infer<typeof planInputSchema>;

/**
 * One line per problem, "path: why", e.g. "bodyMassG: body mass must be between 5 g and 15000 g".
 * @param error a zod error from planInputSchema
 */
export function planIssueMessages(error: z.ZodError): string[] {
  return error.issues.map((issue) => `${formatPath(issue.path)}: ${issue.message}`);
}

function formatPath(path: readonly PropertyKey[]): string {
  if (path.length === 0) return '(plan)';
  let text = '';
  for (const part of path) {
    if (typeof part === 'number') text += `[${String(part)}]`;
    else text += text === '' ? String(part) : `.${String(part)}`;
  }
  return text;
}

// ---------------------------------------------------------------------------------------------
// Result

const estimateSchema = z.object({ value: z.number(), basis: z.string() });
const percentilesSchema = z.object({ p5: z.number(), p50: z.number(), p95: z.number() });
const nullableNumber = z.number().nullable();
const flowsSchema = z.object({
  recommendedLpm: z.number(),
  minimumLpm: z.number(),
  rule: z.string(),
  basis: z.string(),
  rebreathing: z.boolean(),
  rebreathingReason: z.string(),
  chamberTimeTo95Min: nullableNumber,
});
const nonNegative = z.number().refine(Number.isFinite, { message: 'not a finite number' }).min(0);
const milestoneIdSchema = z.enum(['lossOfRighting', 'surgicalDepth', 'firstMovement', 'standing']);
// A partial pressure is finite and never negative: a model result with NaN, Infinity or a negative
// level is refused rather than shown.
const partialPressuresPct = z.array(
  z
    .number()
    .refine(Number.isFinite, { message: 'A computed level is not a finite number: the plan cannot be shown' })
    .min(0, { message: 'A computed level is negative: the plan cannot be shown' }),
);

export const planResultSchema = z.object({
  modelVersion: z.string(),
  patientName: z.string().nullable(),
  speciesId: z.string().nullable(),
  agent: agentSchema,
  mac: z.object({ valuePct: z.number(), basis: z.string() }),
  targetMacMultiple: z.number(),
  recoveryMacFraction: z.object({ value: z.number(), basis: z.string() }),
  estimates: z.object({
    tidalVolumeMl: estimateSchema,
    breathsPerMin: estimateSchema,
    minuteVentilationMlMin: estimateSchema,
    trachealDeadSpaceMl: estimateSchema,
    lungVolumeMl: estimateSchema,
    anteriorSacsMl: estimateSchema,
    posteriorSacsMl: estimateSchema,
    airSacVolumeMl: estimateSchema,
    heartRatePerMin: estimateSchema,
    cardiacOutputMlMin: estimateSchema,
  }),
  // Snapshots saved before phases existed read back with none (the plan's own route is the one phase).
  phases: z
    .array(
      z.object({
        index: z.number().int().min(0),
        startMin: nonNegative,
        gapMin: nonNegative,
        deliveryFromMin: nonNegative,
        endMin: nonNegative,
        route: routeSchema,
        circuit: circuitSchema,
        freshGasLpm: nonNegative,
        dialSteps: z.array(z.object({ atMin: nonNegative, vaporPct: nonNegative })),
        flows: flowsSchema,
        oxygenUsedL: nonNegative,
        liquidMl: nonNegative,
      }),
    )
    .default([]),
  timeline: z.object({
    sampleIntervalMin: z.number(),
    timeMin: z.array(z.number()),
    inspiredPct: partialPressuresPct,
    tracheaPct: partialPressuresPct,
    posteriorSacsPct: partialPressuresPct,
    parabronchialPct: partialPressuresPct,
    anteriorSacsPct: partialPressuresPct,
    arterialPct: partialPressuresPct,
    brainPct: partialPressuresPct,
    musclePct: partialPressuresPct,
    fatPct: partialPressuresPct,
  }),
  milestones: z.object({
    inductionMin: nullableNumber,
    recoveryMin: nullableNumber,
    vaporiserOffMin: nullableNumber,
    airSacWashin95Breaths: nullableNumber,
    airSacWashin95Min: nullableNumber,
    airSacWashout95Breaths: nullableNumber,
    airSacWashout95Min: nullableNumber,
    peakBrainMacMultiple: z.number(),
    lowestVentilationFraction: z.number(),
    basis: z.string(),
    // Snapshots saved before the clinical milestones existed read them back as absent.
    lossOfRightingMin: nullableNumber.default(null),
    surgicalDepthMin: nullableNumber.default(null),
    firstMovementMin: nullableNumber.default(null),
    standingMin: nullableNumber.default(null),
    definitions: z
      .array(
        z.object({
          id: milestoneIdSchema,
          label: z.string(),
          macMultiple: z.number(),
          when: z.enum(['rising', 'falling']),
          definition: z.string(),
          basis: z.string(),
        }),
      )
      .default([]),
  }),
  uncertainty: z.object({
    samples: z.number(),
    seed: z.number(),
    // Snapshots saved before the band existed read back as null.
    brainBandPct: z.object({ p5: partialPressuresPct, p95: partialPressuresPct }).nullable().default(null),
    inductionMin: percentilesSchema.nullable(),
    recoveryMin: percentilesSchema.nullable(),
    inductionReached: z.number(),
    recoveryReached: z.number(),
    // Snapshots saved before these fields existed read back as fully reached, without a note.
    inductionReachedShare: z.number().min(0).max(1).default(1),
    recoveryReachedShare: z.number().min(0).max(1).default(1),
    inductionNote: z.string().nullable().default(null),
    recoveryNote: z.string().nullable().default(null),
    parameters: z.array(z.object({ name: z.string(), low: z.number(), high: z.number(), basis: z.string() })),
    method: z.string(),
    milestones: z
      .array(
        z.object({
          id: milestoneIdSchema,
          percentiles: percentilesSchema.nullable(),
          reachedShare: z.number().min(0).max(1),
          note: z.string().nullable(),
        }),
      )
      .default([]),
  }),
  flows: flowsSchema,
  consumption: z.object({
    vapourMlPerLiquidMl: z.number(),
    liquidMl: z.number(),
    maintenanceVaporPct: z.number(),
    liquidMlPerHour: z.number(),
    basis: z.string(),
  }),
  oxygen: z.object({
    durationMin: z.number(),
    usedL: z.number(),
    cylinderContentL: nullableNumber,
    enduranceMin: nullableNumber,
    suffices: z.boolean().nullable(),
    basis: z.string(),
  }),
  wasteGas: z.object({
    scavenging: z.boolean(),
    roomVolumeM3: z.number(),
    airChangesPerHour: z.number(),
    sources: z.array(z.object({ source: z.string(), vapourMl: z.number(), basis: z.string() })),
    releasedVapourMl: z.number(),
    peakPpm: z.number(),
    highestHourMeanPpm: z.number(),
    ceilingPpm: z.number(),
    exceedsCeiling: z.boolean(),
    basis: z.string(),
  }),
  cautions: z.array(
    z.object({
      code: z.string(),
      severity: z.enum(cautionSeverities),
      message: z.string(),
      reason: z.string(),
    }),
  ),
  massBalance: z.object({
    deliveredToBirdMl: z.number(),
    exhaledMl: z.number(),
    uptakeMl: z.number(),
    gasStoredMl: z.number(),
    bodyStoredMl: z.number(),
    vaporiserOutputMl: z.number(),
  }),
  assumptions: z.array(z.string()),
});

export type PlanResult = z.infer<typeof planResultSchema>;

// Compile-time agreement between the contract and the model's own types: a parsed plan is a
// valid model input, and a result read back through the schema is a model result.
type Assignable<From extends To, To> = From;
export type PlanInputMatchesModel = Assignable<PlanInput, CorePlanInput>;
export type PlanResultMatchesModel = Assignable<PlanResult, CorePlanResult>;
