export type AreaId = 'patients' | 'species' | 'plans' | 'records' | 'worksheets' | 'settings';

export type Area = {
  readonly id: AreaId;
  readonly title: string;
  /** What the area will hold, said plainly while it is not built. */
  readonly purpose: string;
  readonly built: boolean;
};

export const areas: readonly Area[] = [
  { id: 'patients', title: 'Patients', purpose: 'each bird with its species, identification, owner reference and weight history with trend warnings', built: false },
  { id: 'species', title: 'Species', purpose: 'the species reference: typical mass range, resting rates, MAC by agent and airway anatomy notes, each with its source', built: false },
  { id: 'plans', title: 'Anaesthetic plans', purpose: 'planning an anaesthetic with predicted wash-in and wash-out, fresh gas flow, agent and oxygen budgets and cautions', built: false },
  { id: 'records', title: 'Procedure records', purpose: 'the time-stamped record of vaporiser setting, oxygen flow, vital signs and events during a procedure', built: false },
  { id: 'worksheets', title: 'Worksheets', purpose: 'the printable pre-procedure worksheet with the plan, an emergency card in your clinic’s own doses and a monitoring grid', built: false },
  { id: 'settings', title: 'Settings', purpose: 'clinic name, address and preferred units', built: true },
];

/** The area named by a location hash such as `#/settings`; patients when none matches. */
export function areaFromHash(hash: string): AreaId {
  const id = hash.replace(/^#\/?/, '');
  return areas.find((area) => area.id === id)?.id ?? 'patients';
}
