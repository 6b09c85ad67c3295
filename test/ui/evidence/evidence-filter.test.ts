import { describe, expect, it } from 'vitest';
import { evidenceFilterSchema } from '../../../app/contract/evidence-channels.js';
import { mergeFilter } from '../../../app/ui/evidence/evidence-filter.js';

describe('the evidence filter form as the evidence:list request', () => {
  it('adds a chosen field and keeps the others', () => {
    const filter = mergeFilter({ speciesKey: 'cockatiel' }, { agent: 'sevoflurane' });
    expect(filter).toEqual({ speciesKey: 'cockatiel', agent: 'sevoflurane' });
    expect(evidenceFilterSchema.parse(filter)).toEqual(filter);
  });

  it('leaves out a field set back to All or emptied, so an emptied form asks for every record', () => {
    let filter = mergeFilter({}, { speciesKey: 'cockatiel', staffInitials: 'AK', from: '2026-10-01' });
    filter = mergeFilter(filter, { speciesKey: '' });
    filter = mergeFilter(filter, { staffInitials: '' });
    expect(filter).toEqual({ from: '2026-10-01' });
    filter = mergeFilter(filter, { from: '' });
    expect(filter).toEqual({});
    expect(Object.keys(mergeFilter({ agent: 'isoflurane' }, { agent: undefined }))).toEqual([]);
  });

  it('gives a request the channel accepts for every field the form sets', () => {
    const filter = mergeFilter(
      {},
      {
        speciesKey: 'budgerigar',
        agent: 'isoflurane',
        route: 'endotracheal',
        staffInitials: 'rw',
        from: '2026-06-01',
        to: '2026-11-30',
      },
    );
    expect(evidenceFilterSchema.safeParse(filter).success).toBe(true);
  });
});
