import { describe, expect, it } from 'vitest';
import { speciesReference } from '../../app/core/species-reference.js';
import type { ClinicDb, Engine } from '../../db/clinic-db.js';
import { createPatientRepository, nextPrefix } from '../../db/repositories/patient-repository.js';
import {
  createSpeciesRepository,
  SpeciesVersionMismatchError,
} from '../../db/repositories/species-repository.js';
import { createWeightRepository, WeightCorrectionError } from '../../db/repositories/weight-repository.js';
import { createWorkstationRepository } from '../../db/repositories/workstation-repository.js';
import { openTestClinic, testEngines } from '../support/clinic-engines.js';

const t0 = new Date('2026-12-01T08:00:00Z');
const meta = { enteredBy: 'RW', reason: '' };

async function fresh(engine: Engine, context: { skip: (note?: string) => never }): Promise<ClinicDb> {
  const clinic = await openTestClinic(engine, context);
  await createSpeciesRepository(clinic).seedReference(speciesReference, t0);
  return clinic;
}

const pip = {
  name: 'Pip',
  speciesKey: 'budgerigar',
  sex: 'male',
  hatchDate: '2024-04-02',
  ageText: '',
  ringId: 'HL-24-117',
  microchipId: '',
  ownerReference: 'Owner 5521',
  notes: 'Plucks when stressed',
} as const;

describe.each(testEngines)('species repository on %s', (engine) => {
  it('seeds the shipped reference once and never twice', async (context) => {
    const clinic = await fresh(engine, context);
    const species = createSpeciesRepository(clinic);
    const list = await species.list();
    expect(list).toHaveLength(speciesReference.length);
    // Listed by common name, whatever its case.
    const names = list.map((entry) => entry.values.commonName.toLowerCase());
    expect(names).toEqual([...names].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0)));
    expect(await species.seedReference(speciesReference, t0)).toBe(0);
    // Pekin duck isoflurane MAC 1.30 +/- 0.23 % (Ludders, Mitchell & Rode 1990)
    const duck = list.find((entry) => entry.values.mac.isoflurane?.macPct === 1.3);
    expect(duck?.values.mac.isoflurane?.basis).toMatch(/Ludders/);
    expect(duck?.origin).toBe('reference');
  });

  it('keeps the old value and its source when a clinic edits a species', async (context) => {
    const clinic = await fresh(engine, context);
    const species = createSpeciesRepository(clinic);
    const before = await species.get('budgerigar');
    expect(before).not.toBeNull();
    if (before === null) return;
    const edited = await species.correct(
      'budgerigar',
      {
        ...before.values,
        massMaxG: 60,
        massBasis: 'Exhibition budgerigars in our clinic, 30-60 g (common practice)',
      },
      { enteredBy: 'MK', reason: 'Many exhibition birds' },
      new Date('2026-12-02T09:00:00Z'),
    );
    expect(edited?.values.massMaxG).toBe(60);
    expect(edited?.values).toEqual({ ...before.values, massMaxG: 60, massBasis: edited?.values.massBasis });
    const history = await species.history('budgerigar');
    expect(history.map((entry) => entry.values.massMaxG)).toEqual([60, before.values.massMaxG]);
    expect(history[1]?.values.massBasis).toBe(before.values.massBasis);
    expect(history[0]?.stamp).toMatchObject({
      enteredBy: 'MK',
      reason: 'Many exhibition birds',
      correctsId: before.stamp.versionId,
    });
    expect(await species.list()).toHaveLength(speciesReference.length);
    expect(await species.correct('no-such-bird', before.values, meta, t0)).toBeNull();
    expect(await species.history('no-such-bird')).toEqual([]);
  });

  it('refuses a correction naming a version that is no longer the current one, writing nothing', async (context) => {
    const clinic = await fresh(engine, context);
    const species = createSpeciesRepository(clinic);
    const seen = await species.get('budgerigar');
    if (seen === null) return expect.fail('budgerigar is not seeded');
    const at = new Date('2026-12-02T09:00:00Z');
    const first = await species.correct(
      'budgerigar',
      { ...seen.values, massMaxG: 65 },
      { enteredBy: 'MK', reason: 'Many exhibition birds' },
      at,
      seen.stamp.versionId,
    );
    expect(first?.stamp.correctsId).toBe(seen.stamp.versionId);
    await expect(
      species.correct(
        'budgerigar',
        { ...seen.values, massMinG: 22 },
        { enteredBy: 'RW', reason: 'Small hens' },
        at,
        seen.stamp.versionId,
      ),
    ).rejects.toBeInstanceOf(SpeciesVersionMismatchError);
    expect((await species.history('budgerigar')).map((entry) => entry.values.massMaxG)).toEqual([
      65,
      seen.values.massMaxG,
    ]);
  });

  it('adds a clinic species under a key of its own, never reusing a taken one', async (context) => {
    const clinic = await fresh(engine, context);
    const species = createSpeciesRepository(clinic);
    const budgerigar = await species.get('budgerigar');
    if (budgerigar === null) throw new Error('budgerigar is seeded');
    const added = await species.add({ ...budgerigar.values, commonName: 'Budgerigar' }, meta, t0);
    expect(added).toMatchObject({ key: 'budgerigar-2', origin: 'clinic' });
    const again = await species.add({ ...budgerigar.values, commonName: 'Budgerigar' }, meta, t0);
    expect(again.key).toBe('budgerigar-3');
    expect(await species.get('budgerigar-2')).toEqual(added);
  });

  it('refuses to change or delete a species row in place', async (context) => {
    const clinic = await fresh(engine, context);
    const table = clinic.kysely.withTables<{ species: { species_key: string; mass_max_g: number } }>();
    await expect(
      table.updateTable('species').set({ mass_max_g: 1 }).where('species_key', '=', 'budgerigar').execute(),
    ).rejects.toThrow(/never changed in place/);
    await expect(
      table.deleteFrom('species').where('species_key', '=', 'budgerigar').execute(),
    ).rejects.toThrow(/never deleted/);
  });
});

describe.each(testEngines)('patient repository on %s', (engine) => {
  it('creates, corrects with history and finds patients by any identifier', async (context) => {
    const clinic = await fresh(engine, context);
    const patients = createPatientRepository(clinic);
    const created = await patients.create(pip, meta, t0);
    expect(created).toMatchObject({ createdAt: t0.toISOString(), values: pip });
    await patients.create(
      { ...pip, name: 'Kiwi', ringId: 'HL-25-002', ownerReference: 'Owner 7000' },
      meta,
      t0,
    );
    const corrected = await patients.correct(
      created.id,
      { ...pip, microchipId: '985112004455667' },
      { enteredBy: 'MK', reason: 'Chip read at check-in' },
      new Date('2026-12-01T09:00:00Z'),
    );
    expect(corrected?.values.microchipId).toBe('985112004455667');
    expect(corrected?.stamp).toMatchObject({
      reason: 'Chip read at check-in',
      correctsId: created.stamp.versionId,
    });
    expect((await patients.get(created.id))?.values.microchipId).toBe('985112004455667');
    expect((await patients.history(created.id)).map((version) => version.values.microchipId)).toEqual([
      '985112004455667',
      '',
    ]);
    const names = async (query: string) => (await patients.search(query)).map((summary) => summary.name);
    expect(await names('004455')).toEqual(['Pip']);
    expect(await names('HL-2')).toEqual(['Kiwi', 'Pip']);
    expect(await patients.search('budgerigar')).toHaveLength(2);
    // The species' common name is in the index too, in any case.
    expect(await names('BUDGERIG')).toEqual(['Kiwi', 'Pip']);
    expect(await names('owner 70')).toEqual(['Kiwi']);
    expect(await names('Pi')).toEqual(['Pip']);
    expect(await names('"; DROP TABLE patients; --')).toEqual([]);
    // LIKE's own characters are matched literally, long or short.
    expect(await names('%')).toEqual([]);
    expect(await names('_')).toEqual([]);
    expect(await names('H_-2')).toEqual([]);
    expect(await names('%%%%')).toEqual([]);
    // An empty search lists the newest patients first.
    expect(await names('')).toEqual(['Kiwi', 'Pip']);
    expect(await patients.search('', 1)).toHaveLength(1);
    expect(await patients.count()).toBe(2);
    expect(await patients.get(999)).toBeNull();
    expect(await patients.correct(999, pip, meta, t0)).toBeNull();
    expect(await patients.history(999)).toEqual([]);
  });

  it('finds one or two letters at the start of the current name, ring number or microchip number, never in the middle', async (context) => {
    const clinic = await fresh(engine, context);
    const patients = createPatientRepository(clinic);
    const created = await patients.create(pip, meta, t0);
    await patients.create(
      { ...pip, name: 'Kiwi', ringId: 'HL-25-002', ownerReference: 'Owner 7000' },
      meta,
      t0,
    );
    await patients.create({ ...pip, name: 'Pjotr', ringId: 'ZB-1', ownerReference: 'Owner 7001' }, meta, t0);
    await patients.create({ ...pip, name: 'Pi\u{1F426}', ringId: '', ownerReference: '' }, meta, t0);
    const zuri = await patients.create({ ...pip, name: 'Zuri', ringId: '', ownerReference: '' }, meta, t0);
    await patients.correct(
      created.id,
      { ...pip, microchipId: '985112004455667' },
      { enteredBy: 'MK', reason: 'Chip' },
      t0,
    );
    await patients.correct(
      zuri.id,
      { ...pip, name: 'Amber', ringId: '' },
      { enteredBy: 'MK', reason: 'Renamed' },
      t0,
    );
    const names = async (query: string) =>
      (await patients.search(query)).map((summary) => summary.name).sort();
    // Name starts, whatever the case of A-Z; the range stops before the next letter ("Pjotr").
    expect(await names('Pi')).toEqual(['Pip', 'Pi\u{1F426}']);
    expect(await names('pI')).toEqual(['Pip', 'Pi\u{1F426}']);
    expect(await names('P')).toEqual(['Pip', 'Pi\u{1F426}', 'Pjotr']);
    // Ring and microchip starts; the microchip of the current version only.
    expect(await names('hl')).toEqual(['Kiwi', 'Pip']);
    expect(await names('ZB')).toEqual(['Pjotr']);
    expect(await names('98')).toEqual(['Pip']);
    // The current name only: the renamed bird is found by its new name.
    expect(await names('Zu')).toEqual([]);
    expect(await names('Am')).toEqual(['Amber']);
    // Not the middle of a field, nor the other fields (owner, species, notes): three letters do that.
    expect(await names('ip')).toEqual([]);
    expect(await names('Ow')).toEqual([]);
    expect(await names('Own')).toEqual(['Amber', 'Kiwi', 'Pip', 'Pjotr']);
    expect(await names('bu')).toEqual([]);
    // LIKE's and the range's own characters are plain characters.
    expect(await names('%')).toEqual([]);
    expect(await names('H_')).toEqual([]);
  });

  it('bounds a start-of-field range by the prefix with its last character one higher', () => {
    expect(nextPrefix('pi')).toBe('pj');
    expect(nextPrefix('a')).toBe('b');
    expect(nextPrefix('z\u{10FFFF}')).toBe('{');
    expect(nextPrefix('\u{D7FF}')).toBe('\u{E000}');
    expect(nextPrefix('\u{10FFFF}')).toBeNull();
  });

  it('lists each patient with its newest weight that stands', async (context) => {
    const clinic = await fresh(engine, context);
    const patients = createPatientRepository(clinic);
    const weights = createWeightRepository(clinic);
    const patient = await patients.create(pip, meta, t0);
    const bird = (await patients.search('Pip'))[0];
    expect(bird).toMatchObject({ speciesName: 'Budgerigar', latestMassG: null, latestWeighedOn: null });
    await weights.add(
      patient.id,
      { weighedOn: '2026-11-01', massG: 34, bodyCondition: '', weighedBy: '' },
      meta,
      t0,
    );
    const later = await weights.add(
      patient.id,
      { weighedOn: '2026-11-30', massG: 36, bodyCondition: '', weighedBy: '' },
      meta,
      t0,
    );
    expect((await patients.search('Pip'))[0]).toMatchObject({
      latestMassG: 36,
      latestWeighedOn: '2026-11-30',
    });
    await weights.void(later.id, { enteredBy: 'RW', reason: 'Wrong bird' }, t0);
    expect((await patients.search('Pip'))[0]).toMatchObject({
      latestMassG: 34,
      latestWeighedOn: '2026-11-01',
    });
  });
});

describe.each(testEngines)('weight repository on %s', (engine) => {
  it('lists current weights, keeps corrections and voids in the history, and refuses a stale correction', async (context) => {
    const clinic = await fresh(engine, context);
    const patient = await createPatientRepository(clinic).create(pip, meta, t0);
    const weights = createWeightRepository(clinic);
    const first = await weights.add(
      patient.id,
      { weighedOn: '2026-11-01', massG: 34, bodyCondition: 'ideal', weighedBy: 'RW' },
      meta,
      t0,
    );
    const second = await weights.add(
      patient.id,
      { weighedOn: '2026-11-30', massG: 3.1, bodyCondition: '', weighedBy: 'RW' },
      meta,
      t0,
    );
    const fixed = await weights.correct(
      second.id,
      { ...second.values, massG: 31 },
      { enteredBy: 'RW', reason: 'Decimal point slipped' },
      t0,
    );
    expect(await weights.list(patient.id)).toEqual([first, fixed]);
    await expect(
      weights.correct(second.id, { ...second.values, massG: 30 }, { enteredBy: 'RW', reason: 'again' }, t0),
    ).rejects.toThrow(WeightCorrectionError);
    expect((await weights.history(second.id)).map((weight) => weight.values.massG)).toEqual([31, 3.1]);
    await weights.void(first.id, { enteredBy: 'RW', reason: 'Wrong bird on the scale' }, t0);
    expect((await weights.list(patient.id)).map((weight) => weight.values.massG)).toEqual([31]);
    expect((await weights.history(first.id)).map((weight) => weight.voided)).toEqual([true, false]);
    expect(fixed?.stamp.reason).toBe('Decimal point slipped');
    expect(await weights.correct(999, second.values, meta, t0)).toBeNull();
    expect(await weights.void(999, meta, t0)).toBeNull();
  });
});

describe.each(testEngines)('workstation repository on %s', (engine) => {
  it('shows the defaults until saved, then applies only the fields given', async (context) => {
    const clinic = await openTestClinic(engine, context);
    const workstations = createWorkstationRepository(clinic);
    const defaults = { id: 'a1b2c3d4-0000-4000-8000-000000000001', name: 'reception-pc' };
    expect(await workstations.get(defaults)).toEqual({
      id: defaults.id,
      name: 'reception-pc',
      theme: 'system',
      initials: '',
      updatedAt: null,
    });
    await workstations.save(defaults, { theme: 'dim' }, t0);
    const saved = await workstations.save(
      defaults,
      { name: 'Reception', initials: 'RW' },
      new Date('2026-12-02T08:00:00Z'),
    );
    expect(saved).toEqual({
      id: defaults.id,
      name: 'Reception',
      theme: 'dim',
      initials: 'RW',
      updatedAt: '2026-12-02T08:00:00.000Z',
    });
    expect(await workstations.get(defaults)).toEqual(saved);
    expect(await workstations.names()).toEqual(new Map([[defaults.id, 'Reception']]));
  });
});
