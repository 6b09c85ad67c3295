import { describe, expect, it } from 'vitest';
import { basisText, readBasis, sourceKindLabels, sourceKinds, storedBasis } from '../../app/core/sourced.js';

describe('the basis of a value', () => {
  it('round-trips every kind through the stored form', () => {
    for (const kind of sourceKinds) {
      expect(readBasis(storedBasis({ basis: 'Elliott 2014, WSAVA proceedings', kind }))).toEqual({
        basis: 'Elliott 2014, WSAVA proceedings',
        kind,
      });
    }
  });

  it('reads the tags of earlier seeds: memory as from memory, equation as derived', () => {
    expect(readBasis('Typical adult mass (from memory) [memory]')).toEqual({
      basis: 'Typical adult mass (from memory)',
      kind: 'from memory',
    });
    expect(readBasis('Saturated concentration [equation]').kind).toBe('derived');
  });

  it('reads the plain words the screens show, so an edited basis keeps its kind', () => {
    expect(readBasis('Typical adult mass (unverified value)')).toEqual({
      basis: 'Typical adult mass',
      kind: 'from memory',
    });
    expect(readBasis('Our own scale readings (measured)').kind).toBe('measured');
  });

  it("counts a basis the clinic typed without a kind as the clinic's own common practice", () => {
    expect(readBasis('Exhibition budgerigars in our clinic, 30-60 g')).toEqual({
      basis: 'Exhibition budgerigars in our clinic, 30-60 g',
      kind: 'common practice',
    });
    // A citation in brackets is not a kind.
    expect(readBasis('Apnoea above 1.5 MAC (Ludders, Mitchell & Rode 1990, Vet Surg 19)').kind).toBe(
      'common practice',
    );
  });

  it('shows a value from memory as an unverified value, never with the stored tag', () => {
    const shown = basisText(readBasis('Typical adult mass [from memory]'));
    expect(shown).toBe('Typical adult mass (unverified value)');
    expect(shown).not.toMatch(/memory|\[/);
  });

  it('does not repeat a kind the basis already names', () => {
    expect(basisText({ basis: 'Assumption: about 10 min in a chamber', kind: 'assumption' })).toBe(
      'Assumption: about 10 min in a chamber',
    );
    expect(basisText({ basis: 'Elliott 2014', kind: 'published' })).toBe('Elliott 2014 (published)');
  });

  it('has plain words for every kind', () => {
    expect(Object.keys(sourceKindLabels).sort()).toEqual([...sourceKinds].sort());
  });
});
