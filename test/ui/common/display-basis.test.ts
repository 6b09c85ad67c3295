import { describe, expect, it } from 'vitest';
import { displayBasis, plainBasis } from '../../../app/ui/common/display.js';

describe('bases as the clinic reads them', () => {
  it('shows a stored species basis without its tag, a value from memory as unverified', () => {
    expect(displayBasis('Typical adult mass [from memory]')).toBe('Typical adult mass (unverified value)');
    // A database seeded by an earlier version wrote both the words and the old tag.
    expect(displayBasis('Typical adult mass (from memory) [memory]')).toBe(
      'Typical adult mass (unverified value)',
    );
    expect(displayBasis('Elliott 2014, WSAVA proceedings [published]')).toBe(
      'Elliott 2014, WSAVA proceedings (published)',
    );
  });

  it("says 'unverified value' where the model's own basis says from memory", () => {
    expect(plainBasis('Lasiewski & Calder 1971 (from memory): 13.2 * M^1.08 mL')).toBe(
      'Lasiewski & Calder 1971 (unverified value): 13.2 * M^1.08 mL',
    );
    expect(plainBasis('Grubb 1983, Am J Physiol 245:H567-572')).toBe('Grubb 1983, Am J Physiol 245:H567-572');
  });
});
