import { describe, expect, it } from 'vitest';
import { defaultDraft, withAgent } from '../../../app/ui/plans/plan-draft.js';

describe('the dials follow the chosen agent', () => {
  it('switching to sevoflurane takes sevoflurane’s usual dials, not isoflurane’s', () => {
    // Usual dials (from memory, the draft's own defaults): isoflurane 4 % then 2 %, sevoflurane 6 % then 3 %
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
