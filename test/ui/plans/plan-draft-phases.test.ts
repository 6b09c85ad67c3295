import { describe, expect, it } from 'vitest';
import { planInputSchema } from '../../../app/contract/plan.js';
import { defaultPhaseGapMin } from '../../../app/core/model/phases.js';
import { newPhaseDraft, phaseFieldOfPath, type PhaseDraft } from '../../../app/ui/plans/phase-draft.js';
import {
  defaultDraft,
  draftToInput,
  inputToDraft,
  type PlanDraft,
} from '../../../app/ui/plans/plan-draft.js';

/** A 95 g bird induced on a face mask (the draft's own defaults: 4 % then 2 % from 5 min, off at 30 min). */
const maskDraft = (): PlanDraft => ({ ...defaultDraft('isoflurane', 'g'), massText: '95' });

const tubePhase = (overrides: Partial<PhaseDraft> = {}): PhaseDraft => ({
  ...newPhaseDraft([], { route: 'mask', circuit: 'nonRebreathing', freshGasText: '1' }, '6'),
  freshGasText: '0.5',
  ...overrides,
});

function inputOf(draft: PlanDraft) {
  const converted = draftToInput(draft, 0);
  if (!('input' in converted)) throw new Error(`problems: ${JSON.stringify(converted.problems)}`);
  return converted.input;
}

function problemsOf(draft: PlanDraft) {
  const converted = draftToInput(draft, 0);
  if ('input' in converted) throw new Error('the draft was accepted');
  return converted.problems;
}

describe('a new later phase', () => {
  it('after a mask is a tube at the maintenance minute, with the default gap shown and the previous flow', () => {
    const phase = newPhaseDraft([], { route: 'mask', circuit: 'circle', freshGasText: '0.8' }, '6');
    expect(phase.route).toBe('endotracheal');
    expect(phase.startMinText).toBe('6');
    // The gap shown is the model's default, itself marked as an assumption.
    expect(phase.gapMinText).toBe(String(defaultPhaseGapMin.value));
    expect(defaultPhaseGapMin.kind).toBe('assumption');
    expect(phase.circuit).toBe('circle');
    expect(phase.freshGasText).toBe('0.8');
  });

  it('after a tube is a mask 5 min after the previous move, with its own key', () => {
    const first = tubePhase();
    const next = newPhaseDraft([first], { ...first }, '6');
    expect(next.route).toBe('mask');
    expect(next.startMinText).toBe('11');
    expect(next.key).not.toBe(first.key);
  });
});

describe('draft to plan input with phases', () => {
  it('a mask then a tube at 6 min gives one later phase with its own flow and gap', () => {
    const input = inputOf({ ...maskDraft(), laterPhases: [tubePhase({ gapMinText: '1' })] });
    expect(input.route).toBe('mask');
    expect(input.laterPhases).toEqual([
      { startMin: 6, gapMin: 1, route: 'endotracheal', circuit: 'nonRebreathing', freshGasLpm: 0.5 },
    ]);
  });

  it('a chamber phase carries its volume and no breathing system; a circle carries its volume', () => {
    const input = inputOf({
      ...maskDraft(),
      route: 'chamber',
      laterPhases: [
        tubePhase({ route: 'mask', maskLeakText: '20', startMinText: '4' }),
        tubePhase({
          key: 9,
          route: 'endotracheal',
          circuit: 'circle',
          circuitVolumeText: '2',
          startMinText: '8',
        }),
      ],
    });
    expect(input.laterPhases?.[0]).toMatchObject({ route: 'mask', maskLeakFraction: 0.2, startMin: 4 });
    expect(input.laterPhases?.[1]).toMatchObject({
      route: 'endotracheal',
      circuit: 'circle',
      circuitVolumeL: 2,
    });
    const chamberLater = inputOf({
      ...maskDraft(),
      laterPhases: [tubePhase({ route: 'chamber', chamberVolumeText: '2.5' })],
    }).laterPhases?.[0];
    expect(chamberLater).toMatchObject({ route: 'chamber', chamberVolumeL: 2.5 });
    expect(chamberLater).not.toHaveProperty('circuit');
  });

  it('a blank gap leaves the model its default', () => {
    const input = inputOf({ ...maskDraft(), laterPhases: [tubePhase({ gapMinText: '' })] });
    expect(input.laterPhases?.[0]).not.toHaveProperty('gapMin');
  });

  it('no later phases gives a plan without laterPhases (one route, as before)', () => {
    expect(inputOf({ ...maskDraft(), laterPhases: [] })).not.toHaveProperty('laterPhases');
    expect(inputOf(maskDraft())).not.toHaveProperty('laterPhases');
  });
});

describe('errors land on the phase field to blame', () => {
  it('maps the contract paths laterPhases.N.field to the form fields', () => {
    expect(phaseFieldOfPath('laterPhases.0.startMin')).toBe('laterPhases.0.startMinText');
    expect(phaseFieldOfPath('laterPhases.2.gapMin')).toBe('laterPhases.2.gapMinText');
    expect(phaseFieldOfPath('laterPhases.1.freshGasLpm')).toBe('laterPhases.1.freshGasText');
    expect(phaseFieldOfPath('laterPhases.1.circuitVolumeL')).toBe('laterPhases.1.circuitVolumeText');
    expect(phaseFieldOfPath('laterPhases.0.maskLeakFraction')).toBe('laterPhases.0.maskLeakText');
    expect(phaseFieldOfPath('freshGasLpm')).toBeNull();
    expect(phaseFieldOfPath('laterPhases')).toBeNull();
  });

  it('text that is not a number is named on its phase field', () => {
    const problems = problemsOf({ ...maskDraft(), laterPhases: [tubePhase({ startMinText: 'six' })] });
    expect(problems['laterPhases.0.startMinText']).toBe('Phase start must be a number.');
  });

  it('a phase out of time order is refused on the second phase’s start, in the contract’s words', () => {
    const problems = problemsOf({
      ...maskDraft(),
      laterPhases: [
        tubePhase({ startMinText: '8' }),
        tubePhase({ key: 2, route: 'mask', startMinText: '7' }),
      ],
    });
    expect(problems['laterPhases.1.startMinText']).toMatch(/^Phases must be in time order/);
    expect(problems['laterPhases.0.startMinText']).toBeUndefined();
  });

  it('a flow out of range and a gap too long land on their own boxes', () => {
    const problems = problemsOf({
      ...maskDraft(),
      laterPhases: [tubePhase({ freshGasText: '40', gapMinText: '30' })],
    });
    expect(problems['laterPhases.0.freshGasText']).toMatch(/fresh gas flow must be between/i);
    expect(problems['laterPhases.0.gapMinText']).toMatch(/gap on room air must be between/i);
  });

  it('IPPV from the start of a mask induction points at the IPPV start, which the tube phase allows', () => {
    const ippv = { ventilation: 'ippv' as const, ippvRateText: '10', ippvTidalText: '1' };
    const problems = problemsOf({ ...maskDraft(), ...ippv, laterPhases: [tubePhase()] });
    expect(problems['ippvFromText']).toMatch(/IPPV needs an endotracheal tube or an air-sac tube/);
    // From 7 min the tube (6 min plus the 0.5 min gap) is running: accepted.
    expect(
      inputOf({ ...maskDraft(), ...ippv, ippvFromText: '7', laterPhases: [tubePhase()] }).ventilation,
    ).toEqual({
      mode: 'ippv',
      breathsPerMin: 10,
      tidalVolumeMl: 1,
      fromMin: 7,
    });
  });
});

describe('a saved plan back into the form', () => {
  it('keeps its phases (draft → input → draft → input is the same plan)', () => {
    const draft: PlanDraft = {
      ...maskDraft(),
      route: 'chamber',
      laterPhases: [
        tubePhase({ route: 'mask', maskDeadSpaceText: '2', maskLeakText: '15', startMinText: '3' }),
        tubePhase({
          key: 2,
          circuit: 'circle',
          circuitVolumeText: '1.5',
          startMinText: '9',
          gapMinText: '0.75',
        }),
      ],
    };
    const input = inputOf(draft);
    const restored = inputToDraft(input, 'g');
    expect(restored.laterPhases?.map((phase) => phase.route)).toEqual(['mask', 'endotracheal']);
    expect(restored.laterPhases?.[1]?.gapMinText).toBe('0.75');
    expect(inputOf(restored)).toEqual(input);
  });

  it('a plan saved before phases existed loads with none, and a phase without a gap shows the default', () => {
    const old = planInputSchema.parse({
      bodyMassG: 95,
      agent: 'isoflurane',
      route: 'mask',
      freshGasLpm: 1,
      schedule: [
        { atMin: 0, vaporPct: 4 },
        { atMin: 5, vaporPct: 2 },
        { atMin: 30, vaporPct: 0 },
      ],
    });
    expect(inputToDraft(old, 'g').laterPhases).toEqual([]);
    const withPhase = planInputSchema.parse({
      ...old,
      laterPhases: [{ startMin: 6, route: 'endotracheal', freshGasLpm: 0.5 }],
    });
    expect(inputToDraft(withPhase, 'g').laterPhases?.[0]?.gapMinText).toBe(String(defaultPhaseGapMin.value));
  });
});
