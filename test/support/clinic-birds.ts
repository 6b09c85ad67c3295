/**
 * Invented patients of the invented Heron Lane Bird Clinic, with the records staff would enter
 * for them. Names, rings, owners and readings are invented for tests; nothing here is a real bird.
 */

/** Who enters a first version; no reason is needed for a new record. */
export const enteredByRw = { enteredBy: 'RW', reason: '' } as const;

/** A correction must say why. */
export function correctionBy(enteredBy: string, reason: string) {
  return { enteredBy, reason } as const;
}

/** Pip, a male budgerigar (species key of the shipped reference: `budgerigar`). */
export const pipValues = {
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

/** Kiwi, a female cockatiel. */
export const kiwiValues = {
  name: 'Kiwi',
  speciesKey: 'cockatiel',
  sex: 'female',
  hatchDate: null,
  ageText: 'about 6 years',
  ringId: 'HL-25-002',
  microchipId: '',
  ownerReference: 'Owner 7000',
  notes: '',
} as const;

/** A procedure record for Pip under mask, as the front desk would open it. */
export const pipRadiographValues = {
  planId: null,
  startedAt: '2026-12-01T10:00:00.000Z',
  endedAt: null,
  asaGrade: 2,
  emergency: false,
  procedureName: 'Wing radiograph',
  fasting: '1 h, crop empty',
  cropChecked: 'empty',
  airway: 'mask',
  tubeSizeMm: null,
  tubeType: '',
  circuit: 'nonRebreathing',
  staffInitials: 'RW',
  promptIntervalMin: 5,
} as const;

/** One row of readings five minutes into Pip's procedure. */
export const pipVitalsValues = {
  at: '2026-12-01T10:05:00.000Z',
  kind: 'vitals',
  vaporPct: 2,
  oxygenLpm: 1,
  heartRatePerMin: 420,
  breathsPerMin: 40,
  temperatureC: 40.1,
  etco2Mmhg: null,
  spo2Pct: null,
  eventType: null,
  eventNote: '',
  drugName: '',
  drugDose: '',
} as const;

/** The induction event of Pip's procedure. */
export const pipInductionValues = {
  ...pipVitalsValues,
  at: '2026-12-01T10:01:00.000Z',
  kind: 'event',
  vaporPct: null,
  oxygenLpm: null,
  heartRatePerMin: null,
  breathsPerMin: null,
  temperatureC: null,
  eventType: 'induction',
  eventNote: 'Smooth, no struggling',
} as const;

/** A plan's pre-anaesthetic checklist with no grade and every item still open. */
export const openChecklist = {
  asaGrade: null,
  emergency: false,
  items: {
    fastingAndCrop: 'open',
    hydration: 'open',
    bloods: 'open',
    equipmentLeakCheck: 'open',
    oxygenSupply: 'open',
    scavenging: 'open',
    emergencyCard: 'open',
  },
  notes: '',
} as const;

/** A log row's values with nothing measured, no event, note or drug (add `at`, `kind` and the readings). */
export const nothingMeasured = {
  vaporPct: null,
  oxygenLpm: null,
  heartRatePerMin: null,
  breathsPerMin: null,
  temperatureC: null,
  etco2Mmhg: null,
  spo2Pct: null,
  eventType: null,
  eventNote: '',
  drugName: '',
  drugDose: '',
} as const;
