/**
 * The species groups the calibration pools through: a species' effect is shrunk towards its
 * group and the group towards the whole clinic. Groups are the birds' orders as the trade uses
 * them (common practice); a species the clinic added itself falls in "other birds".
 */
export const speciesGroups = {
  parrots: 'Parrots and cockatoos',
  songbirds: 'Finches and canaries',
  pigeons: 'Pigeons and doves',
  fowl: 'Fowl',
  waterfowl: 'Ducks and geese',
  raptors: 'Birds of prey and owls',
  cranes: 'Cranes',
  other: 'Other birds',
} as const;
export type SpeciesGroupId = keyof typeof speciesGroups;

const groupOfSpecies: Readonly<Record<string, SpeciesGroupId>> = {
  'zebra-finch': 'songbirds',
  canary: 'songbirds',
  budgerigar: 'parrots',
  'rosy-faced-lovebird': 'parrots',
  cockatiel: 'parrots',
  'green-cheeked-conure': 'parrots',
  'african-grey-parrot': 'parrots',
  'blue-fronted-amazon': 'parrots',
  'blue-and-yellow-macaw': 'parrots',
  'moluccan-cockatoo': 'parrots',
  'thick-billed-parrot': 'parrots',
  'domestic-pigeon': 'pigeons',
  chicken: 'fowl',
  'pekin-duck': 'waterfowl',
  'red-tailed-hawk': 'raptors',
  'barn-owl': 'raptors',
  'sandhill-crane': 'cranes',
};

/**
 * The group a species is pooled with.
 * @param speciesId a species key such as `cockatiel`
 */
export function speciesGroupOf(speciesId: string): SpeciesGroupId {
  return Object.hasOwn(groupOfSpecies, speciesId) ? (groupOfSpecies[speciesId] as SpeciesGroupId) : 'other';
}
