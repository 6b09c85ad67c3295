import type { Route } from '../shell/areas.js';
import { areas } from '../shell/areas.js';
import { NotBuilt } from '../shell/not-built.js';

export function PatientsArea(_props: { readonly route: Route }) {
  const area = areas.find((candidate) => candidate.id === 'patients');
  return area === undefined ? null : <NotBuilt area={area} />;
}
