import { describe, expect, it } from 'vitest';
import {
  notCompared,
  planChoiceIn,
  planChoiceParts,
  planChoiceSuffix,
  planChoiceText,
} from '../../app/core/plan-choice.js';

describe('the words for the chosen plan of a comparison and its alternative', () => {
  it('marks each plan of a comparison the way the day list does', () => {
    expect(planChoiceParts({ variantOf: null, chosen: true })).toEqual(['chosen']);
    expect(planChoiceParts({ variantOf: null, chosen: false })).toEqual(['compared, not chosen']);
    expect(planChoiceParts({ variantOf: 11, chosen: true })).toEqual(['chosen', 'alternative of plan 11']);
    expect(planChoiceParts({ variantOf: 11, chosen: false })).toEqual(['alternative of plan 11, not chosen']);
    expect(planChoiceText({ variantOf: 11, chosen: true })).toBe('chosen · alternative of plan 11');
    expect(planChoiceSuffix({ variantOf: 11, chosen: false })).toBe(' · alternative of plan 11, not chosen');
  });

  it('marks nothing outside a comparison', () => {
    expect(planChoiceParts(notCompared)).toEqual([]);
    expect(planChoiceText(notCompared)).toBe('');
    expect(planChoiceSuffix(notCompared)).toBe('');
  });

  it('reads a plan’s mark from the comparison of its detail; an earlier version is not marked', () => {
    const comparison = {
      chosenId: 12,
      plans: [
        { id: 11, variantOf: null },
        { id: 12, variantOf: 11 },
      ],
    };
    expect(planChoiceIn(11, comparison)).toEqual({ variantOf: null, chosen: false });
    expect(planChoiceIn(12, comparison)).toEqual({ variantOf: 11, chosen: true });
    expect(planChoiceIn(9, comparison)).toEqual(notCompared);
    expect(planChoiceIn(11, null)).toEqual(notCompared);
  });
});
