import { describe, expect, it } from 'vitest';
import { asaGradeText, dialStepsText } from '../../../app/ui/common/plan-labels.js';

describe('the day list lines', () => {
  it('writes a vaporiser schedule in one line', () => {
    // examples/plans/pip-budgerigar-mask-isoflurane.json: 4 % from 0, 2 % from 4 min, off at 30 min
    expect(
      dialStepsText([
        { atMin: 0, vaporPct: 4 },
        { atMin: 4, vaporPct: 2 },
        { atMin: 30, vaporPct: 0 },
      ]),
    ).toBe('4 % → 2 % at 4 min, off at 30 min');
    expect(
      dialStepsText([
        { atMin: 0, vaporPct: 5 },
        { atMin: 10, vaporPct: 5 },
        { atMin: 12.25, vaporPct: 0 },
      ]),
    ).toBe('5 %, off at 12.3 min');
    expect(dialStepsText([])).toBe('');
  });

  it('writes the ASA grade with E for an emergency', () => {
    expect(asaGradeText(2, false)).toBe('2');
    expect(asaGradeText(3, true)).toBe('3E');
    expect(asaGradeText(null, false)).toBe('not graded');
    expect(asaGradeText(null, true)).toBe('not graded (E)');
  });
});
