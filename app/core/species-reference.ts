/**
 * Species reference: birds commonly kept as patients, with typical adult mass, published MAC by
 * agent and airway anatomy notes. Every value carries its basis in the project's words. This
 * table seeds the clinic's database (where it becomes editable with provenance) and gives the
 * model its species defaults.
 *
 * Resting heart and breathing rates are left out: no species-specific source was read for them,
 * and the model estimates both from body mass (Grubb 1983; Lasiewski & Calder 1971).
 */
import type { AgentId } from './agents.js';
import type { Basis, SourceKind, Sourced } from './sourced.js';

/** Typical adult body mass range. An editable typical range, not a norm. */
export type MassRange = Basis & {
  readonly minG: number;
  readonly maxG: number;
};

/** What a published anaesthetic potency figure measured. */
export const potencyMeasures = ['MAC', 'ED50', 'minimum anaesthetic dose'] as const;
export type PotencyMeasure = (typeof potencyMeasures)[number];

/** A published anaesthetic potency of an agent in a species, end-tidal vol %. */
export type SpeciesMac = Basis & {
  readonly macPct: number;
  /** Standard deviation, vol %, where published. */
  readonly sdPct?: number;
  readonly measure: PotencyMeasure;
  /** Conditions that matter when using the value (stimulus, premedication, species studied). */
  readonly note?: string;
};

/** A multiple of MAC with its basis (e.g. where apnoea becomes common). */
export type MacMultiple = Sourced<number>;

/** An anatomy note that matters for the airway or the gas path. */
export type AnatomyNote = Basis & {
  readonly code: string;
  readonly text: string;
};

/** A resting rate range, per minute, with its basis. */
export type RateRange = Basis & {
  readonly minPerMin: number;
  readonly maxPerMin: number;
};

export type SpeciesReference = {
  /** Stable kebab-case identifier; never renamed once published (patients and plans refer to it). */
  readonly id: string;
  readonly commonName: string;
  readonly scientificName: string;
  readonly typicalMassG: MassRange;
  /** Resting heart rate, only where a basis exists (none in the seed table; the clinic may add one). */
  readonly restingHeartRatePerMin?: RateRange;
  /** Resting breathing rate, only where a basis exists (none in the seed table; the clinic may add one). */
  readonly restingBreathsPerMin?: RateRange;
  readonly macByAgent: Partial<Record<AgentId, SpeciesMac>>;
  /** MAC multiple above which apnoea is reported, where published. */
  readonly apnoeaMacMultiple?: MacMultiple;
  readonly anatomyNotes: readonly AnatomyNote[];
};

const typicalMassBasis = 'Typical adult mass, editable typical range (common practice, owner-facing sources)';

/** Complete tracheal rings: true of every bird. */
export const completeTrachealRingsNote: AnatomyNote = {
  code: 'complete-tracheal-rings',
  text: 'Complete tracheal rings: use an uncuffed tube or leave the cuff down; an inflated cuff can injure the tracheal mucosa',
  basis: 'Elliott 2014, WSAVA proceedings',
  kind: 'published',
};

function mass(
  minG: number,
  maxG: number,
  basis = typicalMassBasis,
  kind: SourceKind = 'common practice',
): MassRange {
  return { minG, maxG, basis, kind };
}

const ludders1990 = 'Ludders, Mitchell & Rode 1990, Vet Surg 19';
const midon2021 = 'Midon et al. 2021, J Zoo Wildl Med 52:327-331';

export const speciesReference: readonly SpeciesReference[] = [
  {
    id: 'zebra-finch',
    commonName: 'Zebra finch',
    scientificName: 'Taeniopygia guttata',
    typicalMassG: mass(10, 16),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'canary',
    commonName: 'Canary',
    scientificName: 'Serinus canaria',
    typicalMassG: mass(12, 30),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'budgerigar',
    commonName: 'Budgerigar',
    scientificName: 'Melopsittacus undulatus',
    typicalMassG: mass(
      25,
      60,
      'Typical adult mass 25-35 g, exhibition birds 30-60 g (common practice, owner-facing sources)',
    ),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'rosy-faced-lovebird',
    commonName: 'Rosy-faced lovebird',
    scientificName: 'Agapornis roseicollis',
    typicalMassG: mass(
      45,
      70,
      'Typical adult mass of lovebirds, editable typical range (common practice, owner-facing sources)',
    ),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'cockatiel',
    commonName: 'Cockatiel',
    scientificName: 'Nymphicus hollandicus',
    typicalMassG: mass(80, 125),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'green-cheeked-conure',
    commonName: 'Green-cheeked conure',
    scientificName: 'Pyrrhura molinae',
    typicalMassG: mass(60, 80),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'african-grey-parrot',
    commonName: 'African grey parrot',
    scientificName: 'Psittacus erithacus',
    typicalMassG: mass(300, 600),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'blue-fronted-amazon',
    commonName: 'Blue-fronted Amazon',
    scientificName: 'Amazona aestiva',
    typicalMassG: mass(
      300,
      680,
      'Typical adult mass of Amazon parrots, editable typical range (common practice, owner-facing sources)',
    ),
    macByAgent: {
      sevoflurane: {
        macPct: 2.4,
        sdPct: 0.37,
        measure: 'minimum anaesthetic dose',
        basis: 'BMC Vet Res 2013, 9:142',
        kind: 'published',
        note: 'Unpremedicated birds',
      },
    },
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'blue-and-yellow-macaw',
    commonName: 'Blue-and-yellow macaw',
    scientificName: 'Ara ararauna',
    typicalMassG: mass(
      900,
      1600,
      'Typical adult mass of macaws, editable typical range (common practice, owner-facing sources)',
    ),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'moluccan-cockatoo',
    commonName: 'Moluccan cockatoo',
    scientificName: 'Cacatua moluccensis',
    typicalMassG: mass(650, 1050),
    macByAgent: {
      isoflurane: {
        macPct: 1.44,
        sdPct: 0.07,
        measure: 'ED50',
        basis: 'Curro, Brunson & Paul-Murphy 1994, Vet Surg',
        kind: 'published',
        note: 'Measured in cockatoos and applied to this species; 1.08 % after butorphanol premedication',
      },
    },
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'thick-billed-parrot',
    commonName: 'Thick-billed parrot',
    scientificName: 'Rhynchopsitta pachyrhyncha',
    typicalMassG: mass(300, 400, 'Typical adult mass', 'from memory'),
    macByAgent: {
      sevoflurane: {
        macPct: 2.35,
        measure: 'MAC',
        basis: 'Phair et al. 2012',
        kind: 'published',
        note: 'With a mechanical stimulus',
      },
    },
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'domestic-pigeon',
    commonName: 'Domestic pigeon',
    scientificName: 'Columba livia domestica',
    typicalMassG: mass(240, 300),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'chicken',
    commonName: 'Chicken',
    scientificName: 'Gallus gallus domesticus',
    typicalMassG: mass(500, 4500, 'Typical adult mass, bantams to heavy breeds', 'from memory'),
    macByAgent: {
      isoflurane: { macPct: 1.18, sdPct: 0.09, measure: 'MAC', basis: midon2021, kind: 'published' },
      sevoflurane: {
        macPct: 2.21,
        sdPct: 0.32,
        measure: 'MAC',
        basis: 'Naganobu et al. 2000, Vet Surg 29:102-105',
        kind: 'published',
      },
    },
    apnoeaMacMultiple: {
      value: 3.31 / 1.18,
      basis: `Apnoea at 3.31 % isoflurane with MAC 1.18 % (${midon2021}): 3.31 / 1.18 = 2.8 MAC`,
      kind: 'derived',
    },
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'pekin-duck',
    commonName: 'Pekin duck',
    scientificName: 'Anas platyrhynchos domesticus',
    typicalMassG: mass(
      2500,
      4000,
      `About 3000 g in ${ludders1990} (published); range unverified`,
      'from memory',
    ),
    macByAgent: {
      isoflurane: { macPct: 1.3, sdPct: 0.23, measure: 'MAC', basis: ludders1990, kind: 'published' },
    },
    apnoeaMacMultiple: {
      value: 1.5,
      basis: `Apnoea common above 1.5 MAC isoflurane (${ludders1990})`,
      kind: 'published',
    },
    anatomyNotes: [
      completeTrachealRingsNote,
      {
        code: 'tracheal-bulla',
        text: 'Males have a tracheal (syringeal) bulla, an extra gas volume at the syrinx (vocal organ) that adds dead space',
        basis: 'Tracheal bulla in male ducks (Anatidae)',
        kind: 'from memory',
      },
      {
        code: 'dive-response',
        text: 'Ducks may hold their breath with a slow heart rate when a mask or chamber is applied (dive response)',
        basis: 'Dive response of ducks at induction',
        kind: 'from memory',
      },
    ],
  },
  {
    id: 'red-tailed-hawk',
    commonName: 'Red-tailed hawk',
    scientificName: 'Buteo jamaicensis',
    typicalMassG: mass(
      1100,
      1600,
      'Typical adult mass of study birds, editable typical range (common practice)',
    ),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'barn-owl',
    commonName: 'Barn owl',
    scientificName: 'Tyto alba',
    typicalMassG: mass(250, 500, 'Typical adult mass', 'from memory'),
    macByAgent: {},
    anatomyNotes: [completeTrachealRingsNote],
  },
  {
    id: 'sandhill-crane',
    commonName: 'Sandhill crane',
    scientificName: 'Antigone canadensis',
    typicalMassG: mass(3000, 6000, 'Typical adult mass', 'from memory'),
    macByAgent: {
      isoflurane: {
        macPct: 1.34,
        sdPct: 0.14,
        measure: 'MAC',
        basis: 'Ludders et al. 1989',
        kind: 'published',
      },
    },
    anatomyNotes: [
      completeTrachealRingsNote,
      {
        code: 'tracheal-loops',
        text: 'The trachea coils in loops within the keel: a long trachea with a large dead space, and a tube reaches only its first part',
        basis: 'Tracheal loops in cranes',
        kind: 'from memory',
      },
    ],
  },
];
