import { describe, expect, it } from 'vitest';
import { speciesReference, type SpeciesReference } from '../../app/core/species-reference.js';
import { basisText, sourceKinds } from '../../app/core/sourced.js';

const findSpeciesReference = (id: string) => speciesReference.find((species) => species.id === id);

/** Every object in the tree that holds a number beside a basis string, with its path. */
function sourcedValues(
  value: unknown,
  path: string,
  found: { path: string; basis: unknown; kind: unknown }[],
): void {
  if (value === null || typeof value !== 'object') return;
  const record = value as Record<string, unknown>;
  if ('basis' in record) found.push({ path, basis: record['basis'], kind: record['kind'] });
  for (const [key, child] of Object.entries(record)) sourcedValues(child, `${path}.${key}`, found);
}

function species(id: string): SpeciesReference {
  const found = findSpeciesReference(id);
  if (found === undefined) throw new Error(`species ${id} missing`);
  return found;
}

describe('species reference table', () => {
  it('holds at least 15 species with unique kebab-case ids', () => {
    expect(speciesReference.length).toBeGreaterThanOrEqual(15);
    const ids = speciesReference.map((entry) => entry.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(/^[a-z]+(-[a-z]+)*$/);
  });

  it('covers the species the clinic sees most', () => {
    for (const id of [
      'zebra-finch',
      'canary',
      'budgerigar',
      'rosy-faced-lovebird',
      'cockatiel',
      'green-cheeked-conure',
      'african-grey-parrot',
      'blue-fronted-amazon',
      'blue-and-yellow-macaw',
      'moluccan-cockatoo',
      'domestic-pigeon',
      'chicken',
      'pekin-duck',
      'red-tailed-hawk',
      'barn-owl',
      'sandhill-crane',
    ]) {
      expect(findSpeciesReference(id), id).toBeDefined();
    }
  });

  it('gives every value a basis and a basis kind', () => {
    for (const entry of speciesReference) {
      expect(entry.commonName.length).toBeGreaterThan(0);
      expect(entry.scientificName).toMatch(/^[A-Z][a-z]+ [a-z]+( [a-z]+)?$/);
      const found: { path: string; basis: unknown; kind: unknown }[] = [];
      sourcedValues(entry, entry.id, found);
      // mass range, every MAC, the apnoea multiple and every anatomy note
      const expectedCount =
        1 +
        Object.keys(entry.macByAgent).length +
        (entry.apnoeaMacMultiple === undefined ? 0 : 1) +
        entry.anatomyNotes.length;
      expect(found.length, entry.id).toBe(expectedCount);
      for (const value of found) {
        expect(typeof value.basis === 'string' && value.basis.length > 5, value.path).toBe(true);
        expect(sourceKinds, value.path).toContain(value.kind);
      }
    }
  });

  it('keeps every typical mass range ordered, positive and within 5 g to 15 kg', () => {
    for (const entry of speciesReference) {
      expect(entry.typicalMassG.minG, entry.id).toBeGreaterThanOrEqual(5);
      expect(entry.typicalMassG.maxG, entry.id).toBeGreaterThan(entry.typicalMassG.minG);
      expect(entry.typicalMassG.maxG, entry.id).toBeLessThanOrEqual(15000);
    }
  });

  it('takes the typical masses from the reference list', () => {
    // typical adult masses (g) [common practice, owner-facing sources]
    expect(species('zebra-finch').typicalMassG).toMatchObject({ minG: 10, maxG: 16 });
    expect(species('canary').typicalMassG).toMatchObject({ minG: 12, maxG: 30 });
    expect(species('budgerigar').typicalMassG).toMatchObject({ minG: 25, maxG: 60 }); // 25-35 (exhibition 30-60)
    expect(species('rosy-faced-lovebird').typicalMassG).toMatchObject({ minG: 45, maxG: 70 });
    expect(species('cockatiel').typicalMassG).toMatchObject({ minG: 80, maxG: 125 });
    expect(species('green-cheeked-conure').typicalMassG).toMatchObject({ minG: 60, maxG: 80 });
    expect(species('african-grey-parrot').typicalMassG).toMatchObject({ minG: 300, maxG: 600 });
    expect(species('blue-fronted-amazon').typicalMassG).toMatchObject({ minG: 300, maxG: 680 });
    expect(species('blue-and-yellow-macaw').typicalMassG).toMatchObject({ minG: 900, maxG: 1600 });
    expect(species('moluccan-cockatoo').typicalMassG).toMatchObject({ minG: 650, maxG: 1050 });
    expect(species('domestic-pigeon').typicalMassG).toMatchObject({ minG: 240, maxG: 300 });
    expect(species('red-tailed-hawk').typicalMassG).toMatchObject({ minG: 1100, maxG: 1600 });
    // Pekin duck about 3000 g (Ludders 1990) lies in the range
    expect(species('pekin-duck').typicalMassG.minG).toBeLessThanOrEqual(3000);
    expect(species('pekin-duck').typicalMassG.maxG).toBeGreaterThanOrEqual(3000);
  });

  it('labels masses taken from memory as such, shown to the clinic as unverified values', () => {
    for (const id of ['barn-owl', 'sandhill-crane', 'chicken']) {
      expect(species(id).typicalMassG.kind, id).toBe('from memory');
      expect(basisText(species(id).typicalMassG), id).toMatch(/\(unverified value\)$/);
      expect(basisText(species(id).typicalMassG), id).not.toMatch(/memory/);
    }
  });
});

describe('published MAC values', () => {
  it('gives isoflurane MAC of the Pekin duck, sandhill crane, chicken and cockatoo as published', () => {
    // Pekin duck 1.30 +/- 0.23 (Ludders, Mitchell & Rode 1990, Vet Surg 19) [published]
    expect(species('pekin-duck').macByAgent.isoflurane).toMatchObject({
      macPct: 1.3,
      sdPct: 0.23,
      basis: 'Ludders, Mitchell & Rode 1990, Vet Surg 19',
      kind: 'published',
    });
    // sandhill crane 1.34 +/- 0.14 (Ludders et al. 1989) [published]
    expect(species('sandhill-crane').macByAgent.isoflurane).toMatchObject({
      macPct: 1.34,
      sdPct: 0.14,
      basis: 'Ludders et al. 1989',
    });
    // chicken 1.18 +/- 0.09 (Midon et al. 2021, J Zoo Wildl Med 52:327-331) [published]
    expect(species('chicken').macByAgent.isoflurane).toMatchObject({
      macPct: 1.18,
      sdPct: 0.09,
      basis: 'Midon et al. 2021, J Zoo Wildl Med 52:327-331',
    });
    // cockatoo ED50 1.44 +/- 0.07 (Curro, Brunson & Paul-Murphy 1994, Vet Surg) [published]
    expect(species('moluccan-cockatoo').macByAgent.isoflurane).toMatchObject({
      macPct: 1.44,
      sdPct: 0.07,
      measure: 'ED50',
      basis: 'Curro, Brunson & Paul-Murphy 1994, Vet Surg',
    });
  });

  it('gives sevoflurane values of the chicken, thick-billed parrot and blue-fronted Amazon as published', () => {
    // chicken 2.21 +/- 0.32 (Naganobu et al. 2000, Vet Surg 29:102-105) [published]
    expect(species('chicken').macByAgent.sevoflurane).toMatchObject({
      macPct: 2.21,
      sdPct: 0.32,
      basis: 'Naganobu et al. 2000, Vet Surg 29:102-105',
    });
    // thick-billed parrot 2.35 with mechanical stimulus (Phair et al. 2012) [published]
    expect(species('thick-billed-parrot').macByAgent.sevoflurane).toMatchObject({
      macPct: 2.35,
      basis: 'Phair et al. 2012',
      note: 'With a mechanical stimulus',
    });
    // blue-fronted Amazon minimum anaesthetic dose 2.4 +/- 0.37 unpremedicated (BMC Vet Res 2013, 9:142) [published]
    expect(species('blue-fronted-amazon').macByAgent.sevoflurane).toMatchObject({
      macPct: 2.4,
      sdPct: 0.37,
      measure: 'minimum anaesthetic dose',
      basis: 'BMC Vet Res 2013, 9:142',
    });
  });

  it('holds no desflurane MAC for any bird', () => {
    // desflurane in birds: none found [reference list]
    for (const entry of speciesReference) expect(entry.macByAgent.desflurane, entry.id).toBeUndefined();
  });

  it('gives the published apnoea MAC multiples of the duck and the chicken', () => {
    // duck apnoea common above 1.5 MAC (Ludders, Mitchell & Rode 1990, Vet Surg 19) [published]
    expect(species('pekin-duck').apnoeaMacMultiple?.value).toBe(1.5);
    // chicken apnoea at 3.31 % isoflurane = 2.8 MAC (Midon et al. 2021) [derived: 3.31 / 1.18]
    expect(species('chicken').apnoeaMacMultiple?.value).toBeCloseTo(2.8, 1);
    expect(species('chicken').apnoeaMacMultiple?.kind).toBe('derived');
  });
});

describe('airway anatomy notes', () => {
  it('notes complete tracheal rings for every bird', () => {
    // complete tracheal rings (Elliott 2014) [published]
    for (const entry of speciesReference) {
      const rings = entry.anatomyNotes.find((note) => note.code === 'complete-tracheal-rings');
      expect(rings?.basis, entry.id).toBe('Elliott 2014, WSAVA proceedings');
    }
  });

  it('notes the tracheal bulla of male ducks and the tracheal loops of cranes, from memory', () => {
    // tracheal bulla in male ducks (Anatidae) [memory]; tracheal loops in cranes [memory]
    expect(species('pekin-duck').anatomyNotes.find((note) => note.code === 'tracheal-bulla')?.kind).toBe(
      'from memory',
    );
    expect(species('sandhill-crane').anatomyNotes.find((note) => note.code === 'tracheal-loops')?.kind).toBe(
      'from memory',
    );
  });
});
