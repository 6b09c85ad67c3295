import type { Route } from '../shell/areas.js';
import { areas } from '../shell/areas.js';
import { NotBuilt } from '../shell/not-built.js';

/** Procedure records: list, live entry screen for one record. */
export function RecordsArea(_props: { readonly route: Route }) {
  const area = areas.find((candidate) => candidate.id === 'records');
  return area === undefined ? null : <NotBuilt area={area} />;
}
