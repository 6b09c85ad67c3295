import { describe, expect, it } from 'vitest';
import {
  agentText,
  airwayText,
  asaText,
  checkRecordDraft,
  emptyRecordDraft,
  recordToDraft,
  type RecordDraft,
} from '../../../app/ui/records/record-form.js';

const filled: RecordDraft = {
  ...emptyRecordDraft('2026-03-10T09:00', 'RW', 'isoflurane'),
  procedureName: 'Beak trim',
  airway: 'endotracheal',
  tubeSizeMm: '2.5',
  tubeType: 'uncuffed',
  circuit: 'nonRebreathing',
  asaGrade: 2,
};

describe('new procedure record form', () => {
  it('names every missing field of an empty form', () => {
    const checked = checkRecordDraft(emptyRecordDraft('2026-03-10T09:00', '', 'isoflurane'));
    expect(checked.ok).toBe(false);
    if (!checked.ok) {
      expect(checked.errors).toMatchObject({
        procedureName: 'Enter the procedure.',
        airway: 'Choose mask, chamber, endotracheal tube or air-sac tube.',
        circuit: 'Choose non-rebreathing system or circle.',
        staffInitials: 'Enter the initials of the staff monitoring.',
      });
    }
  });

  it('defaults the reminder to 5 minutes and sends a filled form in contract form', () => {
    // Vital signs recorded at least every 5 min: common practice.
    expect(emptyRecordDraft('2026-03-10T09:00', 'RW', 'isoflurane').promptIntervalMin).toBe('5');
    const checked = checkRecordDraft(filled);
    expect(checked.ok).toBe(true);
    if (checked.ok) {
      expect(checked.values).toMatchObject({
        procedureName: 'Beak trim',
        asaGrade: 2,
        emergency: false,
        tubeSizeMm: 2.5,
        tubeType: 'uncuffed',
        promptIntervalMin: 5,
        planId: null,
        endedAt: null,
        agent: 'isoflurane',
      });
      expect(checked.values.startedAt).toBe(new Date(2026, 2, 10, 9, 0).toISOString());
    }
  });

  it('keeps no tube size or type for a mask, and no ASA grade when not graded', () => {
    const checked = checkRecordDraft({ ...filled, airway: 'mask', asaGrade: 0 });
    expect(checked.ok).toBe(true);
    if (checked.ok) expect(checked.values).toMatchObject({ tubeSizeMm: null, tubeType: '', asaGrade: null });
  });

  it('refuses a reminder interval outside 1 to 30 minutes and a tube size that is not a number', () => {
    const checked = checkRecordDraft({ ...filled, promptIntervalMin: '0', tubeSizeMm: 'two' });
    expect(checked.ok).toBe(false);
    if (!checked.ok) {
      expect(checked.errors['promptIntervalMin']).toBe('Prompt interval is 1 to 30 minutes.');
      expect(checked.errors['tubeSizeMm']).toBe('Tube size must be a number in mm.');
    }
  });

  it('starts on the clinic default agent, sends the one chosen, and asks for one when none is chosen', () => {
    expect(emptyRecordDraft('2026-03-10T09:00', 'RW', 'sevoflurane').agent).toBe('sevoflurane');
    const chosen = checkRecordDraft({ ...filled, agent: 'sevoflurane' });
    expect(chosen.ok && chosen.values.agent).toBe('sevoflurane');
    const none = checkRecordDraft({ ...filled, agent: '' });
    expect(none.ok).toBe(false);
    if (!none.ok)
      expect(none.errors['agent']).toBe(
        'Choose the anaesthetic agent given: isoflurane, sevoflurane or desflurane.',
      );
  });

  it('lets a record made before records named their agent keep none when corrected', () => {
    const older = checkRecordDraft({ ...filled, agent: '' }, { agentMayStayUnrecorded: true });
    expect(older.ok).toBe(true);
    const draft = recordToDraft({
      planId: null,
      startedAt: '2026-03-10T09:00:00.000Z',
      endedAt: null,
      asaGrade: null,
      emergency: false,
      procedureName: 'Beak trim',
      fasting: '',
      cropChecked: 'not checked',
      airway: 'mask',
      tubeSizeMm: null,
      tubeType: '',
      circuit: 'circle',
      agent: null,
      staffInitials: 'RW',
      promptIntervalMin: 5,
    });
    expect(draft.agent).toBe('');
    const kept = checkRecordDraft(draft, { agentMayStayUnrecorded: true });
    expect(kept.ok && kept.values.agent).toBeNull();
    expect(checkRecordDraft(draft).ok).toBe(false);
    expect(agentText(null)).toBe('agent not recorded');
    expect(agentText('desflurane')).toBe('Desflurane');
  });

  it('writes the airway and ASA grade as a record shows them', () => {
    expect(airwayText({ airway: 'endotracheal', tubeSizeMm: 2.5, tubeType: 'cuffed, cuff down' })).toBe(
      'Endotracheal tube 2.5 mm, cuffed, cuff down',
    );
    expect(airwayText({ airway: 'airSacTube', tubeSizeMm: 3, tubeType: '' })).toBe('Air-sac tube 3 mm');
    expect(asaText({ asaGrade: 4, emergency: true })).toBe('4E');
    expect(asaText({ asaGrade: null, emergency: false })).toBe('not graded');
  });
});
