import { describe, expect, it } from 'vitest';
import { planInputSchema } from '../../../app/contract/plan.js';
import {
  defaultDraft,
  draftToInput,
  inputToDraft,
  type PlanDraft,
} from '../../../app/ui/plans/plan-draft.js';

const birdDraft = (bodyTemperatureText: string): PlanDraft => ({
  ...defaultDraft('isoflurane', 'g'),
  massText: '95',
  bodyTemperatureText,
});

describe('the body temperature box of the planning form', () => {
  it('leaves the temperature out when blank, so the model takes a normal bird', () => {
    const converted = draftToInput(birdDraft(''), 0);
    if (!('input' in converted)) throw new Error(JSON.stringify(converted.problems));
    expect(converted.input.bodyTemperatureC).toBeUndefined();
  });

  it('carries an entered temperature into the plan and back into the form', () => {
    const converted = draftToInput(birdDraft('38.5'), 0);
    if (!('input' in converted)) throw new Error(JSON.stringify(converted.problems));
    expect(converted.input.bodyTemperatureC).toBe(38.5);
    expect(planInputSchema.safeParse(converted.input).success).toBe(true);
    expect(inputToDraft(converted.input, 'g').bodyTemperatureText).toBe('38.5');
  });

  it("puts the contract's refusal of an impossible temperature on the box itself", () => {
    // The contract accepts 30-44 C (app/contract/plan.ts, bodyTemperatureLimitsC).
    const converted = draftToInput(birdDraft('25'), 0);
    if ('input' in converted) throw new Error('a 25 C bird was accepted');
    expect(converted.problems['bodyTemperatureText']).toMatch(
      /body temperature must be between 30 C and 44 C/i,
    );
  });
});
