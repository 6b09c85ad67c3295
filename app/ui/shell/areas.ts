export type AreaId = 'patients' | 'species' | 'plans' | 'records' | 'evidence' | 'worksheets' | 'settings';

export type Area = {
  readonly id: AreaId;
  readonly title: string;
  /** What the area holds, in plain words. */
  readonly purpose: string;
};

export const areas: readonly Area[] = [
  {
    id: 'patients',
    title: 'Patients',
    purpose:
      'each bird with its species, identification, owner reference and weight history with trend warnings',
  },
  {
    id: 'species',
    title: 'Species',
    purpose:
      'the species reference: typical mass range, resting rates, MAC by agent and airway anatomy notes, each with its source',
  },
  {
    id: 'plans',
    title: 'Anaesthetic plans',
    purpose:
      'planning an anaesthetic with predicted wash-in and wash-out, fresh gas flow, agent and oxygen budgets and cautions',
  },
  {
    id: 'records',
    title: 'Procedure records',
    purpose:
      'the time-stamped record of vaporiser setting, oxygen flow, vital signs and events during a procedure',
  },
  {
    id: 'worksheets',
    title: 'Worksheets',
    purpose:
      'the printable pre-procedure worksheet with the plan, an emergency card in your clinic’s own doses and a monitoring grid',
  },
  { id: 'settings', title: 'Settings', purpose: 'clinic name, address and preferred units' },
  {
    id: 'evidence',
    title: 'Observed vs predicted',
    purpose:
      'the clinic’s completed records beside the model’s prediction for what was given, and the calibration on them',
  },
];

export type Route = { readonly area: AreaId; readonly segments: readonly string[] };

/**
 * The route named by a location hash such as `#/patients/12/weights`: the area and what follows.
 * Patients when nothing matches.
 */
export function routeFromHash(hash: string): Route {
  const [first, ...segments] = hash
    .replace(/^#\/?/, '')
    .split('/')
    .filter((part) => part !== '');
  const area = areas.find((candidate) => candidate.id === first)?.id;
  return area === undefined
    ? { area: 'patients', segments: [] }
    : { area, segments: segments.map(decodeURIComponent) };
}

/** The hash for a route, e.g. `href('patients', 12)` -> `#/patients/12`. */
export function href(area: AreaId, ...segments: readonly (string | number)[]): string {
  return `#/${[area, ...segments.map((segment) => encodeURIComponent(String(segment)))].join('/')}`;
}
