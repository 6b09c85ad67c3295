import { describe, expect, it } from 'vitest';
import {
  defaultDraft,
  draftToInput,
  inputToDraft,
  type PlanDraft,
} from '../../../app/ui/plans/plan-draft.js';
import { ventilationText } from '../../../app/ui/worksheets/sheet-text.js';

/** A 95 g bird intubated from the start (the draft's defaults: 4 % then 2 % from 5 min, off at 30 min). */
const tubeDraft = (): PlanDraft => ({
  ...defaultDraft('isoflurane', 'g'),
  massText: '95',
  route: 'endotracheal',
  ventilation: 'ippv',
  ippvRateText: '10',
  ippvTidalText: '1',
  ippvFromText: '5',
});

function convert(draft: PlanDraft) {
  return draftToInput(draft, 0);
}

describe('the IPPV end in the planning form', () => {
  it('sends the end typed as untilMin, and none when left blank', () => {
    const ended = convert({ ...tubeDraft(), ippvUntilText: '20' });
    if (!('input' in ended)) throw new Error(JSON.stringify(ended.problems));
    expect(ended.input.ventilation).toEqual({
      mode: 'ippv',
      breathsPerMin: 10,
      tidalVolumeMl: 1,
      fromMin: 5,
      untilMin: 20,
    });
    expect(ventilationText(ended.input)).toBe(
      'IPPV 10 breaths/min, 1 mL tidal volume from 5 min until 20 min',
    );
    const open = convert({ ...tubeDraft(), ippvUntilText: '' });
    if (!('input' in open)) throw new Error(JSON.stringify(open.problems));
    expect(open.input.ventilation).not.toHaveProperty('untilMin');
    // A draft kept from before the end existed has no end field: IPPV to the end.
    const old: PlanDraft = tubeDraft();
    delete old.ippvUntilText;
    const fromOld = convert(old);
    if (!('input' in fromOld)) throw new Error(JSON.stringify(fromOld.problems));
    expect(fromOld.input.ventilation).toEqual({
      mode: 'ippv',
      breathsPerMin: 10,
      tidalVolumeMl: 1,
      fromMin: 5,
    });
  });

  it('puts an end before the start by the end field, in the words of the contract', () => {
    const refused = convert({ ...tubeDraft(), ippvUntilText: '3' });
    if ('input' in refused) throw new Error('accepted');
    expect(refused.problems['ippvUntilText']).toBe(
      'IPPV must end after it starts: the end (3 min) is not after the start (5 min).',
    );
  });

  it('keeps the later periods of a saved plan through the form', () => {
    const saved = convert({ ...tubeDraft(), ippvUntilText: '12' });
    if (!('input' in saved)) throw new Error(JSON.stringify(saved.problems));
    const withLater = {
      ...saved.input,
      ventilation: {
        mode: 'ippv' as const,
        breathsPerMin: 10,
        tidalVolumeMl: 1,
        fromMin: 5,
        untilMin: 12,
        laterPeriods: [{ fromMin: 20, breathsPerMin: 8, tidalVolumeMl: 1 }],
      },
    };
    const back = convert(inputToDraft(withLater, 'g'));
    if (!('input' in back)) throw new Error(JSON.stringify(back.problems));
    expect(back.input.ventilation).toEqual(withLater.ventilation);
  });
});
