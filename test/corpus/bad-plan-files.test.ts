/**
 * Bad plan files: each is parsed as `tidewing plan` parses a file (JSON.parse, then the contract's
 * planInputSchema, whose first message planIssueMessages() prefixes with the field's path), and
 * sent as the plan of `plans:save`, which must refuse the same field and leave the database
 * unchanged.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { planInputSchema, planIssueMessages } from '../../app/contract/plan.js';
import {
  corpusToday,
  expectRefused,
  meta,
  openClinic,
  pipPlanInput,
  validChecklist,
  type Clinic,
} from './clinic-fixture.js';

type PlanCase = readonly [label: string, text: string, path: string, says?: string];

/** The example plan file with `change` applied (a key set to undefined is left out). */
function planText(change: Record<string, unknown>): string {
  return JSON.stringify({ ...pipPlanInput, ...change });
}

const steps = (...pairs: [number, number][]) => pairs.map(([atMin, vaporPct]) => ({ atMin, vaporPct }));

const cases: PlanCase[] = [
  [
    'patient name with an escape sequence',
    planText({ patientName: '\u001b[2J\u001b[31mPip' }),
    'patientName',
    'control character',
  ],
  ['patient name with NUL', planText({ patientName: 'Pi\u0000p' }), 'patientName', 'control character'],
  [
    'patient name with a right-to-left override',
    planText({ patientName: 'Pip\u202e' }),
    'patientName',
    'text-direction',
  ],
  [
    'patient name of a zero width space',
    planText({ patientName: '\u200b' }),
    'patientName',
    'letter or digit',
  ],
  [
    'patient name with a lone surrogate',
    '{"patientName":"Pip\\ud800","bodyMassG":32}',
    'patientName',
    'broken character',
  ],
  ['patient name too long', planText({ patientName: 'P'.repeat(101) }), 'patientName'],
  ['patient name as a number', planText({ patientName: 42 }), 'patientName'],
  ...[0, -1, 4.9, 15_001, '32', null, true].map((bodyMassG): PlanCase => [
    `body mass ${JSON.stringify(bodyMassG)}`,
    planText({ bodyMassG }),
    'bodyMassG',
  ]),
  [
    'body mass 1e999 (Infinity once parsed)',
    planText({ bodyMassG: 1 }).replace('"bodyMassG":1', '"bodyMassG":1e999'),
    'bodyMassG',
  ],
  ['body mass missing', planText({ bodyMassG: undefined }), 'bodyMassG', 'body mass is required'],
  ...['Budgerigar', 'budgie bird', '../etc/passwd', '', 'pekin_duck'].map((speciesId): PlanCase => [
    `species id ${JSON.stringify(speciesId)}`,
    planText({ speciesId }),
    'speciesId',
  ]),
  ['agent halothane', planText({ agent: 'halothane' }), 'agent'],
  ['route nose', planText({ route: 'nose' }), 'route'],
  ['circuit open', planText({ circuit: 'open' }), 'circuit'],
  ...['0', '-1', '21', '1e999'].map((freshGasLpm): PlanCase => [
    `fresh gas ${freshGasLpm}`,
    planText({ freshGasLpm: 1 }).replace('"freshGasLpm":1', `"freshGasLpm":${freshGasLpm}`),
    'freshGasLpm',
  ]),
  ['an empty schedule', planText({ schedule: [] }), 'schedule'],
  ['a schedule that is not a list', planText({ schedule: 'ramp' }), 'schedule'],
  ['a first step after 0 min', planText({ schedule: steps([5, 4]) }), 'schedule.0.atMin'],
  ['steps out of order', planText({ schedule: steps([0, 4], [10, 2], [5, 1]) }), 'schedule.2.atMin'],
  ['a dial setting of 25 %', planText({ schedule: steps([0, 25]) }), 'schedule.0.vaporPct'],
  ['a negative dial setting', planText({ schedule: steps([0, -1]) }), 'schedule.0.vaporPct'],
  [
    '51 steps',
    planText({ schedule: Array.from({ length: 51 }, (_, index) => ({ atMin: index, vaporPct: 1 })) }),
    'schedule',
  ],
  ['a plan longer than a day', planText({ schedule: steps([0, 2], [1430, 0]) }), 'recoveryWindowMin'],
  [
    'a chamber without its volume',
    planText({ route: 'chamber', maskDeadSpaceMl: undefined, maskLeakFraction: undefined }),
    'chamberVolumeL',
  ],
  [
    'a circle without its volume',
    planText({
      route: 'endotracheal',
      circuit: 'circle',
      maskDeadSpaceMl: undefined,
      maskLeakFraction: undefined,
    }),
    'circuitVolumeL',
  ],
  [
    'IPPV through a mask',
    planText({ ventilation: { mode: 'ippv', breathsPerMin: 10, tidalVolumeMl: 3 } }),
    'ventilation.mode',
  ],
  ['an unknown ventilation mode', planText({ ventilation: { mode: 'auto' } }), 'ventilation.mode'],
  ['a mask leak fraction of 1', planText({ maskLeakFraction: 1 }), 'maskLeakFraction'],
  ['a misspelt field', planText({ bodyMass: 32 }), '', '"bodyMass" is not part of a plan'],
  [
    'a misspelt room field',
    planText({ room: { volumeM3: 30, airChangesPerHour: 10, airChanges: 10 } }),
    'room',
    '"airChanges" is not part of the room',
  ],
  [
    'an unknown cylinder preset',
    planText({ cylinder: { kind: 'preset', presetId: 'g-size' } }),
    'cylinder.presetId',
  ],
  ['a negative room volume', planText({ room: { volumeM3: -30, airChangesPerHour: 10 } }), 'room.volumeM3'],
  ['uncertainty samples 1.5', planText({ uncertainty: { samples: 1.5, seed: 1 } }), 'uncertainty.samples'],
  ['a list instead of a plan', '[]', '', 'a plan must be an object'],
  ['null instead of a plan', 'null', '', 'a plan must be an object'],
  ['a number instead of a plan', '32', '', 'a plan must be an object'],
];

describe('bad plan files are refused with the field named, by the plan command and by the back end', () => {
  let clinic: Clinic;
  beforeAll(async () => {
    clinic = await openClinic();
  });
  afterAll(() => clinic.close());

  it.each(cases.map((entry) => [entry[0], entry] as const))('%s', async (_label, [, text, path, says]) => {
    // As `tidewing plan` reads a file.
    const parsed = planInputSchema.safeParse(JSON.parse(text));
    expect(parsed.success).toBe(false);
    if (parsed.success) return;
    const shownPath = path === '' ? '(plan)' : path.replace(/\.(\d+)/g, '[$1]');
    const first = planIssueMessages(parsed.error)[0] ?? '';
    expect(first.startsWith(`${shownPath}: `), first).toBe(true);
    if (says !== undefined) expect(first).toContain(says);

    // The same plan through the back end's channels.
    const input = JSON.parse(text) as unknown;
    const inner = path === '' ? '' : `.${path}`;
    await expectRefused(
      clinic,
      'plans:save',
      {
        fields: {
          patientId: clinic.ids.pip,
          plannedFor: corpusToday,
          label: '',
          input,
          checklist: validChecklist,
        },
        meta,
      },
      { code: 'invalid-request', field: `fields.input${inner}` },
    );
  });
});
