import { describe, expect, it } from 'vitest';
import { computePlan } from '../../../app/core/model/compute-plan.js';
import {
  defaultRecoveryMacFraction,
  defaultTargetMacMultiple,
  lossOfRightingMacFraction,
  standingMacFraction,
} from '../../../app/core/model/parameters.js';
import { sourceKinds } from '../../../app/core/sourced.js';
import { speciesReference } from '../../../app/core/species-reference.js';
import { duckPlan, twoHourBudgerigarPlan } from './plan-fixtures.js';

describe('clinical milestones', () => {
  const result = computePlan(twoHourBudgerigarPlan, { species: speciesReference });
  const m = result.milestones;

  it('are reached in their clinical order: loss of righting, surgical depth; first movement, standing', () => {
    for (const value of [m.lossOfRightingMin, m.surgicalDepthMin, m.firstMovementMin, m.standingMin])
      expect(value).not.toBeNull();
    expect(m.lossOfRightingMin ?? Infinity).toBeLessThan(m.surgicalDepthMin ?? 0);
    expect(m.firstMovementMin ?? Infinity).toBeLessThan(m.standingMin ?? 0);
    // The fields the screens already read keep their meaning.
    expect(m.surgicalDepthMin).toBe(m.inductionMin);
    expect(m.firstMovementMin).toBe(m.recoveryMin);
  });

  it('each have a stated definition whose threshold is a named parameter with a basis, a kind and a range', () => {
    expect(m.definitions.map((definition) => definition.id)).toEqual([
      'lossOfRighting',
      'surgicalDepth',
      'firstMovement',
      'standing',
    ]);
    const parameters = [
      lossOfRightingMacFraction,
      defaultTargetMacMultiple,
      defaultRecoveryMacFraction,
      standingMacFraction,
    ];
    m.definitions.forEach((definition, index) => {
      const parameter = parameters[index];
      expect(definition.macMultiple).toBe(parameter?.value);
      expect(definition.basis).toBe(parameter?.basis);
      expect(definition.definition).toContain(String(parameter?.value));
    });
    for (const parameter of parameters) {
      expect(sourceKinds).toContain(parameter.kind);
      expect(parameter.range[0]).toBeLessThanOrEqual(parameter.value);
      expect(parameter.range[1]).toBeGreaterThanOrEqual(parameter.value);
    }
    // The light plane lies below the surgical depth, standing below first movement.
    expect(lossOfRightingMacFraction.range[1]).toBeLessThan(defaultTargetMacMultiple.value);
    expect(standingMacFraction.range[1]).toBeLessThanOrEqual(defaultRecoveryMacFraction.range[0]);
  });

  it('follow a plan that enters its own first-movement threshold', () => {
    const own = computePlan({ ...duckPlan, recoveryMacFraction: 0.3 }, { species: speciesReference });
    const firstMovement = own.milestones.definitions.find((definition) => definition.id === 'firstMovement');
    expect(firstMovement?.macMultiple).toBe(0.3);
    expect(firstMovement?.basis).toBe('entered for this plan');
  });
});
