/** The evidence view's filter form as the `evidence:list` request, without React. */
import type { EvidenceFilter } from '../../contract/evidence-channels.js';

/**
 * The filter after one field of the form changed: a field set to blank or "All" is left out of
 * the request (the channel reads a missing field as no filter), so an emptied form asks for every
 * record.
 * @param filter the filter before the change
 * @param change the changed fields; '' or undefined clears a field
 */
export function mergeFilter(filter: EvidenceFilter, change: Partial<EvidenceFilter>): EvidenceFilter {
  const merged: Record<string, unknown> = { ...filter, ...change };
  return Object.fromEntries(
    Object.entries(merged).filter(([, value]) => value !== '' && value !== undefined),
  ) as EvidenceFilter;
}
