import { afterEach, describe, expect, it } from 'vitest';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { correctionBy, enteredByRw, kiwiValues, pipValues } from '../support/clinic-birds.js';

const open: ChannelHarness[] = [];
afterEach(() => open.splice(0).forEach((harness) => harness.close()));
function harness(): ChannelHarness {
  const opened = openChannelHarness();
  open.push(opened);
  return opened;
}

const pipWeight = { weighedOn: '2026-11-01', massG: 40, bodyCondition: 'ideal', weighedBy: 'RW' } as const;

describe('patient channels', () => {
  it('patients:create stamps the first version; patients:get reads it back with its species', async () => {
    const api = harness();
    const created = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    expect(created).toEqual({
      id: created.id,
      values: pipValues,
      createdAt: '2026-12-01T09:30:00.000Z',
      stamp: {
        versionId: created.stamp.versionId,
        enteredAt: '2026-12-01T09:30:00.000Z',
        enteredBy: 'RW',
        reason: '',
        correctsId: null,
      },
    });
    const detail = await api.answer('patients:get', { id: created.id });
    expect(detail.patient).toEqual(created);
    expect(detail.history).toEqual([created]);
    expect(detail.species?.values.commonName).toBe('Budgerigar');
    expect(detail).toMatchObject({
      weights: [],
      procedures: [],
      trend: { latest: null, sinceLast: null, sinceFirst: null, flags: [] },
    });
  });

  it('patients:create refuses a blank name and a species not in the list, naming each field', async () => {
    const api = harness();
    const blank = await api.refusal('patients:create', {
      values: { ...pipValues, name: '   ' },
      meta: enteredByRw,
    });
    expect(blank).toMatchObject({
      code: 'invalid-request',
      field: 'values.name',
      message: 'Enter the bird’s name or clinic ID.',
    });
    const unknownSpecies = await api.refusal('patients:create', {
      values: { ...pipValues, speciesKey: 'dodo' },
      meta: enteredByRw,
    });
    expect(unknownSpecies).toMatchObject({ code: 'invalid-request', field: 'values.speciesKey' });
    expect(unknownSpecies.message).toMatch(/There is no species "dodo"/);
    const noInitials = await api.refusal('patients:create', {
      values: pipValues,
      meta: { enteredBy: '', reason: '' },
    });
    expect(noInitials.field).toBe('meta.enteredBy');
    expect((await api.answer('patients:search', {})).total).toBe(0);
  });

  it('patients:search finds by name, ring and owner reference and counts every patient', async () => {
    const api = harness();
    await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    await api.answer('patients:create', { values: kiwiValues, meta: enteredByRw });
    const all = await api.answer('patients:search', {});
    expect(all.total).toBe(2);
    expect(all.patients.map((patient) => patient.name)).toEqual(['Kiwi', 'Pip']);
    expect(all.patients[1]).toMatchObject({
      speciesKey: 'budgerigar',
      speciesName: 'Budgerigar',
      ringId: 'HL-24-117',
      latestMassG: null,
      latestWeighedOn: null,
    });
    const byRing = await api.answer('patients:search', { query: 'HL-25' });
    expect(byRing.patients.map((patient) => patient.name)).toEqual(['Kiwi']);
    const byOwner = await api.answer('patients:search', { query: 'owner 55' });
    expect(byOwner.patients.map((patient) => patient.name)).toEqual(['Pip']);
    const limited = await api.answer('patients:search', { query: '', limit: 1 });
    expect(limited).toMatchObject({ total: 2, patients: [{ name: 'Kiwi' }] });
  });

  it('patients:search refuses a limit above 500 and names it', async () => {
    const error = await harness().refusal('patients:search', { query: 'Pip', limit: 501 });
    expect(error).toMatchObject({ code: 'invalid-request', field: 'limit' });
  });

  it('patients:get says a missing patient was not found', async () => {
    const error = await harness().refusal('patients:get', { id: 404 });
    expect(error.code).toBe('not-found');
    expect(error.message).toMatch(/^Patient 404 was not found/);
    const badId = await harness().refusal('patients:get', { id: 'Pip' });
    expect(badId).toMatchObject({ field: 'id', message: 'An id must be a number.' });
  });

  it('patients:correct adds a version with its reason and keeps the earlier one in the history', async () => {
    const api = harness();
    const created = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    api.clock.set('2026-12-01T11:00:00.000Z');
    const corrected = await api.answer('patients:correct', {
      id: created.id,
      values: { ...pipValues, sex: 'female', notes: 'Laid an egg: she is a hen' },
      meta: correctionBy('MK', 'Sex was wrong'),
    });
    expect(corrected).toMatchObject({
      id: created.id,
      values: { sex: 'female' },
      createdAt: '2026-12-01T09:30:00.000Z',
      stamp: {
        enteredBy: 'MK',
        reason: 'Sex was wrong',
        enteredAt: '2026-12-01T11:00:00.000Z',
        correctsId: created.stamp.versionId,
      },
    });
    const detail = await api.answer('patients:get', { id: created.id });
    expect(detail.history.map((version) => version.values.sex)).toEqual(['female', 'male']);
  });

  it('patients:correct naming the version the user saw is refused with who, when and why when another was saved first', async () => {
    const api = harness();
    const created = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const seen = created.stamp.versionId;
    api.clock.set('2026-12-01T11:00:00.000Z');
    await api.answer('patients:correct', {
      id: created.id,
      versionId: seen,
      values: { ...pipValues, ringId: 'HL-24-118' },
      meta: correctionBy('MK', 'Ring misread'),
    });
    const clash = await api.refusal('patients:correct', {
      id: created.id,
      versionId: seen,
      values: { ...pipValues, notes: 'Calm today' },
      meta: correctionBy('RW', 'Note added'),
    });
    expect(clash).toMatchObject({ code: 'conflict', field: 'id' });
    expect(clash.message).toMatch(
      /^Not saved: this patient was already corrected by MK at \d\d:\d\d \(reason: Ring misread\)\. Your change was not applied; reload to see the current patient\.$/,
    );
    const detail = await api.answer('patients:get', { id: created.id });
    expect(detail.patient.values).toMatchObject({ ringId: 'HL-24-118', notes: pipValues.notes });
    expect(detail.history).toHaveLength(2);
  });

  it('patients:correct needs a reason, a known species and a patient that exists', async () => {
    const api = harness();
    const created = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const noReason = await api.refusal('patients:correct', {
      id: created.id,
      values: pipValues,
      meta: { enteredBy: 'MK', reason: '  ' },
    });
    expect(noReason).toMatchObject({ code: 'invalid-request', field: 'meta.reason' });
    const badSpecies = await api.refusal('patients:correct', {
      id: created.id,
      values: { ...pipValues, speciesKey: 'dodo' },
      meta: correctionBy('MK', 'Species'),
    });
    expect(badSpecies).toMatchObject({ code: 'invalid-request', field: 'values.speciesKey' });
    const missing = await api.refusal('patients:correct', {
      id: created.id + 1,
      values: pipValues,
      meta: correctionBy('MK', 'Typo'),
    });
    expect(missing.code).toBe('not-found');
  });
});

describe('weight channels', () => {
  it('weights:add records a weight and patients:get shows the loss band since the previous weight', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const first = await api.answer('weights:add', {
      patientId: pip.id,
      values: pipWeight,
      meta: enteredByRw,
    });
    expect(first).toMatchObject({ patientId: pip.id, values: pipWeight, voided: false });
    await api.answer('weights:add', {
      patientId: pip.id,
      values: { ...pipWeight, weighedOn: '2026-11-29', massG: 36 },
      meta: enteredByRw,
    });
    const detail = await api.answer('patients:get', { id: pip.id });
    expect(detail.weights.map((weight) => weight.values.massG)).toEqual([40, 36]);
    expect(detail.trend.latest).toEqual({ weighedOn: '2026-11-29', massG: 36 });
    // 40 g to 36 g is a 10 % loss: band 10-15 % (IVAPM pain scale for birds).
    expect(detail.trend.sinceLast?.grams).toBe(-4);
    expect(detail.trend.sinceLast?.percent).toBeCloseTo(-10, 9);
    expect(detail.trend.sinceLast?.lossBand).toBe('10-15 %');
    expect(detail.trend.flags.map((flag) => flag.code)).toContain('weight-loss-since-last');
    const search = await api.answer('patients:search', { query: 'Pip' });
    expect(search.patients[0]).toMatchObject({ latestMassG: 36, latestWeighedOn: '2026-11-29' });
  });

  it('weights:add refuses a weight of 0 g and a patient that does not exist', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const zero = await api.refusal('weights:add', {
      patientId: pip.id,
      values: { ...pipWeight, massG: 0 },
      meta: enteredByRw,
    });
    expect(zero).toMatchObject({
      code: 'invalid-request',
      field: 'values.massG',
      message: 'Weight must be between 0.5 g and 200000 g (200 kg); check the scale and the unit.',
    });
    const badDate = await api.refusal('weights:add', {
      patientId: pip.id,
      values: { ...pipWeight, weighedOn: '01/11/2026' },
      meta: enteredByRw,
    });
    expect(badDate).toMatchObject({
      field: 'values.weighedOn',
      message: expect.stringContaining('"01/11/2026" is not a date on the calendar; enter it as YYYY-MM-DD'),
    });
    const nobody = await api.refusal('weights:add', { patientId: 999, values: pipWeight, meta: enteredByRw });
    expect(nobody.code).toBe('not-found');
  });

  it('weights:correct replaces a weight; weights:history lists the chain; a stale correction conflicts', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const typo = await api.answer('weights:add', {
      patientId: pip.id,
      values: { ...pipWeight, massG: 400 },
      meta: enteredByRw,
    });
    api.clock.set('2026-12-01T09:35:00.000Z');
    const fixed = await api.answer('weights:correct', {
      id: typo.id,
      values: pipWeight,
      meta: correctionBy('RW', 'Typed an extra zero'),
    });
    expect(fixed).toMatchObject({
      patientId: pip.id,
      values: { massG: 40 },
      stamp: { correctsId: typo.id, reason: 'Typed an extra zero', enteredAt: '2026-12-01T09:35:00.000Z' },
    });
    const history = await api.answer('weights:history', { id: fixed.id });
    expect(history.map((weight) => weight.values.massG)).toEqual([40, 400]);
    expect((await api.answer('patients:get', { id: pip.id })).weights.map((w) => w.values.massG)).toEqual([
      40,
    ]);
    const stale = await api.refusal('weights:correct', {
      id: typo.id,
      values: pipWeight,
      meta: correctionBy('MK', 'Also fixing'),
    });
    // Who corrected it first, when and why; the clock shows the workstation's local time.
    expect(stale).toMatchObject({ code: 'conflict', field: 'id' });
    expect(stale.message).toMatch(
      /^Not saved: this weight was already corrected by RW at \d\d:\d\d \(reason: Typed an extra zero\)\. Your change was not applied; reload to see the current weight\.$/,
    );
    const noReason = await api.refusal('weights:correct', {
      id: fixed.id,
      values: pipWeight,
      meta: enteredByRw,
    });
    expect(noReason).toMatchObject({ code: 'invalid-request', field: 'meta.reason' });
  });

  it('weights:void withdraws a weight, which stays in its history marked void', async () => {
    const api = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    const wrongBird = await api.answer('weights:add', {
      patientId: pip.id,
      values: { ...pipWeight, massG: 95 },
      meta: enteredByRw,
    });
    const voided = await api.answer('weights:void', {
      id: wrongBird.id,
      meta: correctionBy('RW', 'Weighed the wrong bird'),
    });
    expect(voided).toMatchObject({
      voided: true,
      values: { massG: 95 },
      stamp: { correctsId: wrongBird.id },
    });
    expect((await api.answer('patients:get', { id: pip.id })).weights).toEqual([]);
    const history = await api.answer('weights:history', { id: voided.id });
    expect(history.map((weight) => weight.voided)).toEqual([true, false]);
    const again = await api.refusal('weights:void', { id: wrongBird.id, meta: correctionBy('RW', 'Twice') });
    expect(again.code).toBe('conflict');
    const missing = await api.refusal('weights:void', { id: 999, meta: correctionBy('RW', 'Gone') });
    expect(missing.code).toBe('not-found');
  });

  it('weights:history answers an empty chain for an unknown id and refuses a non-number id', async () => {
    const api = harness();
    expect(await api.answer('weights:history', { id: 12345 })).toEqual([]);
    const error = await api.refusal('weights:history', { id: -1 });
    expect(error).toMatchObject({ code: 'invalid-request', field: 'id' });
  });
});
