import type { Route } from '../shell/areas.js';
import { SpeciesFormScreen } from './species-form.js';
import { SpeciesListScreen } from './species-list.js';
import { SpeciesViewScreen } from './species-view.js';

/**
 * Species reference: `#/species`, `#/species/new`, `#/species/<key>` (read-only, whole sources)
 * and `#/species/<key>/edit` (the form, with a reason and the history).
 */
export function SpeciesArea({ route }: { readonly route: Route }) {
  const [first, second] = route.segments;
  if (first === undefined) return <SpeciesListScreen />;
  if (first === 'new') return <SpeciesFormScreen key="new" speciesKey={null} />;
  if (second === 'edit') return <SpeciesFormScreen key={`${first}-edit`} speciesKey={first} />;
  return <SpeciesViewScreen key={first} speciesKey={first} />;
}
