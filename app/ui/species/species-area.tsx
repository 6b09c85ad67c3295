import type { Route } from '../shell/areas.js';
import { SpeciesFormScreen } from './species-form.js';
import { SpeciesListScreen } from './species-list.js';

/** Species reference: `#/species`, `#/species/new`, `#/species/<key>` (edit with history). */
export function SpeciesArea({ route }: { readonly route: Route }) {
  const [first] = route.segments;
  if (first === undefined) return <SpeciesListScreen />;
  return <SpeciesFormScreen key={first} speciesKey={first === 'new' ? null : first} />;
}
