import { describe, expect, it } from 'vitest';
import { asaGradeText } from '../../../app/ui/common/plan-labels.js';

describe('the day list lines', () => {
  it('writes the ASA grade with E for an emergency', () => {
    expect(asaGradeText(2, false)).toBe('2');
    expect(asaGradeText(3, true)).toBe('3E');
    expect(asaGradeText(null, false)).toBe('not graded');
    expect(asaGradeText(null, true)).toBe('not graded (E)');
  });
});
