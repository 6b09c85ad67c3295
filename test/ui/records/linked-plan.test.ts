import { describe, expect, it } from 'vitest';
import type { PlanSummary } from '../../../app/contract/plan-records.js';
import {
  planStartAirway,
  plannedPhasesNote,
  recordAgentHint,
  withLinkedPlan,
} from '../../../app/ui/records/linked-plan.js';
import { emptyRecordDraft } from '../../../app/ui/records/record-form.js';

type Linkable = Parameters<typeof withLinkedPlan>[1] & {};

const phase = (
  startMin: number,
  route: PlanSummary['phases'][number]['route'],
  circuit: 'nonRebreathing' | 'circle' | null,
) => ({
  startMin,
  gapMin: startMin === 0 ? 0 : 0.5,
  route,
  circuit,
  freshGasLpm: 1,
  recommendedLpm: 0.8,
  minimumLpm: 0.4,
  dialSteps: [{ atMin: startMin, vaporPct: 2 }],
});

const maskThenTube: Linkable = {
  agent: 'sevoflurane',
  route: 'mask',
  circuit: 'circle',
  label: 'crop biopsy',
  asaGrade: 2,
  emergency: false,
  phases: [phase(0, 'mask', 'circle'), phase(6, 'endotracheal', 'nonRebreathing')],
};
const chamberThenMask: Linkable = {
  agent: 'desflurane',
  route: 'chamber',
  circuit: null,
  label: 'radiographs',
  asaGrade: null,
  emergency: false,
  phases: [phase(0, 'chamber', null), phase(4, 'mask', 'nonRebreathing')],
};
const tubeOnly: Linkable = {
  agent: 'isoflurane',
  route: 'endotracheal',
  circuit: 'nonRebreathing',
  label: '',
  asaGrade: null,
  emergency: false,
  phases: [phase(0, 'endotracheal', 'nonRebreathing')],
};

const blank = () => emptyRecordDraft('2026-12-02T09:00', 'RW', 'isoflurane');

describe('a new record from a linked plan', () => {
  it('takes the airway and breathing system of the phase it starts on (the first)', () => {
    expect(planStartAirway(maskThenTube)).toEqual({ airway: 'mask', circuit: 'circle' });
    // A chamber has no breathing system: the one of the mask it moves to.
    expect(planStartAirway(chamberThenMask)).toEqual({ airway: 'chamber', circuit: 'nonRebreathing' });
    // A summary saved before phases existed: the plan's own route.
    expect(planStartAirway({ ...tubeOnly, phases: [] })).toEqual({
      airway: 'endotracheal',
      circuit: 'nonRebreathing',
    });
  });

  it('says the later phases as planned moves', () => {
    expect(plannedPhasesNote(maskThenTube)).toBe('Planned: intubate at 6 min.');
    expect(plannedPhasesNote(chamberThenMask)).toBe('Planned: move to a face mask at 4 min.');
    expect(plannedPhasesNote(tubeOnly)).toBeNull();
  });

  it('follows a change of the linked plan: no stale airway, breathing system or name', () => {
    const linked = withLinkedPlan(blank(), maskThenTube, null, 'isoflurane');
    expect(linked).toMatchObject({
      airway: 'mask',
      circuit: 'circle',
      procedureName: 'crop biopsy',
      asaGrade: 2,
    });
    const changed = withLinkedPlan(linked, chamberThenMask, maskThenTube, 'isoflurane');
    expect(changed).toMatchObject({
      airway: 'chamber',
      circuit: 'nonRebreathing',
      procedureName: 'radiographs',
    });
    // The ASA grade chosen (here from the first plan) stays.
    expect(changed.asaGrade).toBe(2);
    const unlinked = withLinkedPlan(changed, null, chamberThenMask, 'isoflurane');
    expect(unlinked).toMatchObject({ airway: '', circuit: '', procedureName: '', planId: null });
  });

  it('takes the linked plan’s agent, else the clinic’s default, and keeps one chosen by hand', () => {
    // Blank form: the clinic's default agent.
    expect(blank().agent).toBe('isoflurane');
    const linked = withLinkedPlan(blank(), maskThenTube, null, 'isoflurane');
    expect(linked.agent).toBe('sevoflurane');
    expect(recordAgentHint(linked.agent, maskThenTube, 'isoflurane')).toBe('The linked plan’s agent.');
    // Another plan: its agent.
    expect(withLinkedPlan(linked, chamberThenMask, maskThenTube, 'isoflurane').agent).toBe('desflurane');
    // Unlinked: back to the clinic's default, unless chosen by hand.
    expect(withLinkedPlan(linked, null, maskThenTube, 'isoflurane').agent).toBe('isoflurane');
    const chosen = { ...linked, agent: 'desflurane' as const };
    expect(recordAgentHint(chosen.agent, maskThenTube, 'isoflurane')).toBe(
      'Not the linked plan’s agent (Sevoflurane); the record keeps the one chosen here.',
    );
    expect(withLinkedPlan(chosen, null, maskThenTube, 'isoflurane').agent).toBe('desflurane');
    expect(recordAgentHint('isoflurane', null, 'isoflurane')).toBe(
      'The clinic’s default agent (Settings); no plan is linked.',
    );
    // A plan summary naming an agent Tidewing does not know leaves the agent as it was.
    expect(withLinkedPlan(blank(), { ...tubeOnly, agent: 'halothane' }, null, 'sevoflurane').agent).toBe(
      'isoflurane',
    );
  });

  it('keeps what was typed by hand when the plan is unlinked', () => {
    const linked = withLinkedPlan(blank(), tubeOnly, null, 'isoflurane');
    const edited = { ...linked, airway: 'airSacTube' as const, procedureName: 'Air-sac tube placement' };
    const unlinked = withLinkedPlan(edited, null, tubeOnly, 'isoflurane');
    expect(unlinked).toMatchObject({ airway: 'airSacTube', procedureName: 'Air-sac tube placement' });
    // The breathing system was still the plan's: cleared.
    expect(unlinked.circuit).toBe('');
  });
});
