import { describe, expect, it } from 'vitest';
import { screenTitle } from '../../../app/ui/common/screen-focus.js';

describe('screenTitle', () => {
  it('names the screen before the product, as window titles do (common practice)', () => {
    expect(screenTitle('Patients')).toBe('Patients - Tidewing');
  });

  it('collapses the white space a heading built from several elements carries', () => {
    expect(screenTitle('  Anaesthetic plan 4\n  · Pip ')).toBe('Anaesthetic plan 4 · Pip - Tidewing');
  });

  it('falls back to the product name while the heading is empty', () => {
    expect(screenTitle('   ')).toBe('Tidewing');
  });
});
