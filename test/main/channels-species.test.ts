import { afterEach, describe, expect, it } from 'vitest';
import { speciesReference } from '../../app/core/species-reference.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { correctionBy, enteredByRw } from '../support/clinic-birds.js';

const open: ChannelHarness[] = [];
afterEach(() => open.splice(0).forEach((harness) => harness.close()));
function harness(): ChannelHarness {
  const opened = openChannelHarness();
  open.push(opened);
  return opened;
}

// A species the clinic adds itself; the range is the clinic's own entry (from memory).
const bourkesParrot = {
  commonName: "Bourke's parrot",
  scientificName: 'Neopsephotus bourkii',
  massMinG: 40,
  massMaxG: 50,
  massBasis: 'Typical adult mass (from memory)',
  heartRate: null,
  breathsPerMin: null,
  mac: { isoflurane: null, sevoflurane: null, desflurane: null },
  apnoeaMacMultiple: null,
  anatomyNotes: [],
};

describe('species channels', () => {
  it('species:list holds the shipped reference with its typical ranges and sources', async () => {
    const listed = await harness().answer('species:list', {});
    expect(listed).toHaveLength(speciesReference.length);
    const budgerigar = listed.find((species) => species.key === 'budgerigar');
    // Typical adult mass 25-60 g including exhibition birds (common practice, as in the reference).
    expect(budgerigar).toMatchObject({
      origin: 'reference',
      values: { commonName: 'Budgerigar', massMinG: 25, massMaxG: 60 },
    });
    // Pekin duck isoflurane MAC 1.30 +/- 0.23 % (Ludders, Mitchell & Rode 1990).
    const duck = listed.find((species) => species.key === 'pekin-duck');
    expect(duck?.values.mac.isoflurane).toMatchObject({ macPct: 1.3, sdPct: 0.23, measure: 'MAC' });
    expect(duck?.values.mac.isoflurane?.basis).toMatch(/Ludders/);
  });

  it('species:list takes no arguments', async () => {
    const error = await harness().refusal('species:list', { origin: 'clinic' });
    expect(error).toMatchObject({ code: 'invalid-request', field: '(request)' });
  });

  it('species:add makes a clinic species with a key from its name, and a second one of the same name a new key', async () => {
    const api = harness();
    const added = await api.answer('species:add', { values: bourkesParrot, meta: enteredByRw });
    expect(added).toMatchObject({
      key: 'bourke-s-parrot',
      origin: 'clinic',
      values: { commonName: "Bourke's parrot", massMinG: 40, massMaxG: 50 },
      stamp: { enteredBy: 'RW', enteredAt: '2026-12-01T09:30:00.000Z', correctsId: null },
    });
    const again = await api.answer('species:add', { values: bourkesParrot, meta: enteredByRw });
    expect(again.key).toBe('bourke-s-parrot-2');
    const listed = await api.answer('species:list', {});
    expect(listed).toHaveLength(speciesReference.length + 2);
    expect(listed.filter((species) => species.origin === 'clinic').map((species) => species.key)).toEqual([
      'bourke-s-parrot',
      'bourke-s-parrot-2',
    ]);
  });

  it('species:add refuses an upper mass below the lower one and names the upper field', async () => {
    const error = await harness().refusal('species:add', {
      values: { ...bourkesParrot, massMinG: 50, massMaxG: 40 },
      meta: enteredByRw,
    });
    expect(error).toMatchObject({
      code: 'invalid-request',
      field: 'values.massMaxG',
      message: 'The upper typical mass must not be below the lower one.',
    });
  });

  it('species:add refuses a range without its source', async () => {
    const error = await harness().refusal('species:add', {
      values: { ...bourkesParrot, massBasis: ' ' },
      meta: enteredByRw,
    });
    expect(error).toMatchObject({
      field: 'values.massBasis',
      message:
        'Give the source; without one, end with (common practice), (unverified value) or (assumption).',
    });
  });

  it('species:correct keeps the earlier version, and species:history lists both newest first', async () => {
    const api = harness();
    const [before] = (await api.answer('species:list', {})).filter((species) => species.key === 'budgerigar');
    if (before === undefined) return expect.fail('budgerigar is not in the reference');
    api.clock.set('2026-12-02T09:00:00.000Z');
    const corrected = await api.answer('species:correct', {
      key: 'budgerigar',
      values: {
        ...before.values,
        massMaxG: 65,
        massBasis: 'Heavy exhibition birds in our clinic (common practice)',
      },
      meta: correctionBy('MK', 'Many exhibition birds'),
    });
    expect(corrected).toMatchObject({
      key: 'budgerigar',
      origin: 'reference',
      values: { massMaxG: 65 },
      stamp: {
        enteredBy: 'MK',
        reason: 'Many exhibition birds',
        enteredAt: '2026-12-02T09:00:00.000Z',
        correctsId: before.stamp.versionId,
      },
    });
    const history = await api.answer('species:history', { key: 'budgerigar' });
    expect(history.map((version) => version.values.massMaxG)).toEqual([65, 60]);
    expect(history[1]?.values.massBasis).toBe(before.values.massBasis);
    expect(await api.answer('species:history', { key: 'no-such-bird' })).toEqual([]);
  });

  it('species:correct naming the version the user saw is refused with who, when and why when another was saved first', async () => {
    const api = harness();
    const [seen] = await api.answer('species:history', { key: 'budgerigar' });
    if (seen === undefined) return expect.fail('budgerigar is not in the reference');
    api.clock.set('2026-12-02T09:00:00.000Z');
    // Values are the clinic's own edits of the range (invented for the test, not reference values).
    const first = await api.answer('species:correct', {
      key: 'budgerigar',
      versionId: seen.stamp.versionId,
      values: { ...seen.values, massMaxG: 65 },
      meta: correctionBy('MK', 'Many exhibition birds'),
    });
    expect(first.stamp.correctsId).toBe(seen.stamp.versionId);
    const clash = await api.refusal('species:correct', {
      key: 'budgerigar',
      versionId: seen.stamp.versionId,
      values: { ...seen.values, massMinG: 22 },
      meta: correctionBy('RW', 'Small hens'),
    });
    expect(clash).toMatchObject({ code: 'conflict', field: 'id' });
    expect(clash.message).toMatch(
      /^Not saved: this species was already corrected by MK at \d\d:\d\d( on 2026-12-02)? \(reason: Many exhibition birds\)\. Your change was not applied; reload to see the current species\.$/,
    );
    const history = await api.answer('species:history', { key: 'budgerigar' });
    expect(history.map((version) => [version.values.massMinG, version.values.massMaxG])).toEqual([
      [seen.values.massMinG, 65],
      [seen.values.massMinG, seen.values.massMaxG],
    ]);

    // Naming the version now current corrects it.
    const next = await api.answer('species:correct', {
      key: 'budgerigar',
      versionId: first.stamp.versionId,
      values: { ...first.values, massMinG: 22 },
      meta: correctionBy('RW', 'Small hens'),
    });
    expect(next.stamp.correctsId).toBe(first.stamp.versionId);

    // A version of another species is refused without naming anyone, and nothing is written.
    const [cockatiel] = await api.answer('species:history', { key: 'cockatiel' });
    if (cockatiel === undefined) return expect.fail('cockatiel is not in the reference');
    const foreign = await api.refusal('species:correct', {
      key: 'budgerigar',
      versionId: cockatiel.stamp.versionId,
      values: { ...next.values, massMaxG: 70 },
      meta: correctionBy('RW', 'Typo'),
    });
    expect(foreign).toMatchObject({ code: 'conflict', field: 'id' });
    expect(foreign.message).toBe(
      'Not saved: this species was changed on another workstation first. Your change was not applied; reload to see the current species.',
    );
    expect(await api.answer('species:history', { key: 'budgerigar' })).toHaveLength(3);
  });

  it('species:correct needs a reason and a species that exists', async () => {
    const api = harness();
    const noReason = await api.refusal('species:correct', {
      key: 'budgerigar',
      values: bourkesParrot,
      meta: { enteredBy: 'MK', reason: '' },
    });
    expect(noReason).toMatchObject({
      field: 'meta.reason',
      message: 'Say why the record is corrected; the reason is kept with the history.',
    });
    const missing = await api.refusal('species:correct', {
      key: 'no-such-bird',
      values: bourkesParrot,
      meta: correctionBy('MK', 'Typo'),
    });
    expect(missing.code).toBe('not-found');
    expect(missing.message).toMatch(/Species no-such-bird was not found/);
  });

  it('species:history needs a key', async () => {
    const error = await harness().refusal('species:history', { key: '' });
    expect(error).toMatchObject({ code: 'invalid-request', field: 'key' });
  });
});
