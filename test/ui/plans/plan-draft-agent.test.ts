import { describe, expect, it } from 'vitest';
import { agentIds } from '../../../app/core/agents.js';
import {
  defaultDraft,
  dialCaution,
  dialHint,
  dialLimitPct,
  withAgent,
} from '../../../app/ui/plans/plan-draft.js';

describe('the dials follow the chosen agent', () => {
  it('switching to sevoflurane takes sevoflurane’s usual dials, not isoflurane’s', () => {
    // Usual dials (from memory, the draft's own defaults, app/ui/plans/plan-draft.ts typicalDialsPct): isoflurane 4 % then 2 %, sevoflurane 6 % then 3 %
    const iso = { ...defaultDraft('isoflurane', 'g'), massText: '95', macText: '1.4' };
    const sevo = withAgent(iso, 'sevoflurane');
    expect(sevo.agent).toBe('sevoflurane');
    expect(sevo.inductionPctText).toBe(defaultDraft('sevoflurane', 'g').inductionPctText);
    expect(sevo.maintenancePctText).toBe(defaultDraft('sevoflurane', 'g').maintenancePctText);
    expect(sevo.inductionPctText).not.toBe(iso.inductionPctText);
    // The MAC typed for isoflurane does not carry over; the bird's weight does.
    expect(sevo.macText).toBe('');
    expect(sevo.massText).toBe('95');
  });

  it('choosing the same agent again changes nothing', () => {
    const draft = { ...defaultDraft('isoflurane', 'g'), inductionPctText: '3.5' };
    expect(withAgent(draft, 'isoflurane')).toBe(draft);
  });
});

describe('each agent has its own dial limit and usual dials', () => {
  it('limits the dials to the vaporiser marks: isoflurane 5 %, sevoflurane 8 %, desflurane 18 % (common practice)', () => {
    expect(dialLimitPct('isoflurane')).toBe(5);
    expect(dialLimitPct('sevoflurane')).toBe(8);
    expect(dialLimitPct('desflurane')).toBe(18);
    expect(dialHint('sevoflurane')).toBe('The sevoflurane vaporiser is marked 0-8 %.');
  });

  it('starts every agent within its own vaporiser mark', () => {
    for (const agent of agentIds) {
      const draft = defaultDraft(agent, 'g');
      expect(Number(draft.inductionPctText)).toBeLessThanOrEqual(dialLimitPct(agent));
      expect(Number(draft.maintenancePctText)).toBeLessThan(Number(draft.inductionPctText));
      expect(dialCaution(draft.inductionPctText, agent)).toBeUndefined();
    }
  });

  it('cautions above the mark only, and not on a blank or half-typed box', () => {
    expect(dialCaution('6', 'isoflurane')).toBe(
      'Above the 5 % mark of the isoflurane vaporiser: it cannot be set there.',
    );
    expect(dialCaution('5', 'isoflurane')).toBeUndefined();
    expect(dialCaution('6', 'sevoflurane')).toBeUndefined();
    expect(dialCaution('', 'isoflurane')).toBeUndefined();
    expect(dialCaution('0.', 'isoflurane')).toBeUndefined();
  });

  it('converts changed dials at the same multiple of MAC, within the new mark', () => {
    // Fallback MACs: isoflurane 1.3 %, sevoflurane 2.3 %, desflurane 6.0 % (assumptions in app/core/agents.ts).
    // 3 % isoflurane x 2.3 / 1.3 = 5.3 %, to the nearest 0.5 %: 5.5 %; 1.5 % x 2.3 / 1.3 = 2.65 %: 2.5 %.
    const iso = { ...defaultDraft('isoflurane', 'g'), inductionPctText: '3', maintenancePctText: '1.5' };
    const sevo = withAgent(iso, 'sevoflurane');
    expect(sevo.inductionPctText).toBe('5.5');
    expect(sevo.maintenancePctText).toBe('2.5');
    // 5 % isoflurane x 6.0 / 1.3 = 23 %: held at the desflurane vaporiser's 18 % mark.
    const des = withAgent({ ...iso, inductionPctText: '5' }, 'desflurane');
    expect(des.inductionPctText).toBe('18');
    // Back from desflurane 18 % to isoflurane: 18 x 1.3 / 6.0 = 3.9 %, but 18 is desflurane's usual, so 4 %.
    expect(withAgent(des, 'isoflurane').inductionPctText).toBe('4');
  });
});
