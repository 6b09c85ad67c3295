import { afterEach, describe, expect, it } from 'vitest';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { correctionBy, enteredByRw } from '../support/clinic-birds.js';

const open: ChannelHarness[] = [];
afterEach(() => open.splice(0).forEach((harness) => harness.close()));
function harness(): ChannelHarness {
  const opened = openChannelHarness();
  open.push(opened);
  return opened;
}

// Neutral placeholders entered "by the clinic": Tidewing ships no drug and no dose.
const drugB = {
  name: 'Drug B',
  concentrationMgPerMl: 2,
  doseLowMgPerKg: 0.5,
  doseHighMgPerKg: 1,
  route: 'IM',
  doseSource: 'Clinic protocol 2026',
  notes: '',
};
const drugA = { ...drugB, name: 'drug A', route: 'IV', doseHighMgPerKg: null };

describe('emergency drug channels', () => {
  it('drugs:add stamps the entry and drugs:list answers the current drugs by name', async () => {
    const api = harness();
    const b = await api.answer('drugs:add', { values: drugB, meta: enteredByRw });
    expect(b).toMatchObject({
      values: drugB,
      voided: false,
      stamp: { enteredBy: 'RW', enteredAt: '2026-12-01T09:30:00.000Z', correctsId: null },
    });
    await api.answer('drugs:add', { values: drugA, meta: enteredByRw });
    expect((await api.answer('drugs:list', {})).map((drug) => drug.values.name)).toEqual([
      'drug A',
      'Drug B',
    ]);
    expect(await api.refusal('drugs:list', { all: true })).toMatchObject({
      code: 'invalid-request',
      field: '(request)',
    });
  });

  it('drugs:add names a concentration of 0 mg/mL', async () => {
    const error = await harness().refusal('drugs:add', {
      values: { ...drugB, concentrationMgPerMl: 0 },
      meta: enteredByRw,
    });
    expect(error).toMatchObject({
      code: 'invalid-request',
      field: 'values.concentrationMgPerMl',
      message: 'Concentration must be above 0 and at most 1000 mg/mL.',
    });
  });

  it('drugs:correct replaces the entry in the list; correcting the replaced version conflicts', async () => {
    const api = harness();
    const added = await api.answer('drugs:add', { values: drugB, meta: enteredByRw });
    api.clock.set('2026-12-01T10:00:00.000Z');
    const corrected = await api.answer('drugs:correct', {
      id: added.id,
      values: { ...drugB, concentrationMgPerMl: 5 },
      meta: correctionBy('MK', 'New stock is 5 mg/mL'),
    });
    expect(corrected).toMatchObject({
      values: { concentrationMgPerMl: 5 },
      stamp: { correctsId: added.id, reason: 'New stock is 5 mg/mL', enteredAt: '2026-12-01T10:00:00.000Z' },
    });
    expect(await api.answer('drugs:list', {})).toEqual([corrected]);
    const stale = await api.refusal('drugs:correct', {
      id: added.id,
      values: drugB,
      meta: correctionBy('RW', 'Again'),
    });
    expect(stale.code).toBe('conflict');
  });

  it('drugs:void takes the drug off the list and needs a reason', async () => {
    const api = harness();
    const added = await api.answer('drugs:add', { values: drugB, meta: enteredByRw });
    expect(await api.refusal('drugs:void', { id: added.id, meta: enteredByRw })).toMatchObject({
      field: 'meta.reason',
    });
    const voided = await api.answer('drugs:void', {
      id: added.id,
      meta: correctionBy('RW', 'Entered twice'),
    });
    expect(voided).toMatchObject({ voided: true, values: drugB, stamp: { correctsId: added.id } });
    expect(await api.answer('drugs:list', {})).toEqual([]);
  });
});
