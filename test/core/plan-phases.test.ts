import { describe, expect, it } from 'vitest';
import { dialStepTexts, dialStepsText } from '../../app/core/plan-phases.js';

describe('the one wording of dial steps', () => {
  it('writes each change of setting with its minute, for the worksheet one a line', () => {
    // examples/plans/pip-budgerigar-mask-isoflurane.json: 4 % from 0, 2 % from 4 min, off at 30 min
    const pip = [
      { atMin: 0, vaporPct: 4 },
      { atMin: 4, vaporPct: 2 },
      { atMin: 30, vaporPct: 0 },
    ];
    expect(dialStepTexts(pip)).toEqual(['4 % from 0 min', '2 % from 4 min', 'off at 30 min']);
    // Lists (planning screen, prep room, day list) and the command line join the same parts.
    expect(dialStepsText(pip)).toBe('4 % from 0 min, 2 % from 4 min, off at 30 min');
  });

  it('leaves out a step at the setting already dialled and keeps at most 2 decimals', () => {
    const steps = [
      { atMin: 0, vaporPct: 5 },
      { atMin: 10, vaporPct: 5 },
      { atMin: 12.255, vaporPct: 0 },
    ];
    expect(dialStepTexts(steps)).toEqual(['5 % from 0 min', 'off at 12.26 min']);
    expect(dialStepsText([{ atMin: 6, vaporPct: 2.25 }])).toBe('2.25 % from 6 min');
  });

  it('says "off from" when a phase starts with the vaporiser off, and nothing for no step', () => {
    expect(dialStepTexts([{ atMin: 30, vaporPct: 0 }])).toEqual(['off from 30 min']);
    expect(dialStepsText([])).toBe('');
  });
});
