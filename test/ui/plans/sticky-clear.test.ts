import { describe, expect, it } from 'vitest';
import { coversTarget } from '../../../app/ui/plans/sticky-clear.js';

describe('a panel held at the top of the window and the chart below it', () => {
  // A 110 px panel held from the top of the window (0 px), as the folded cautions panel.
  it('covers the chart only while the chart reaches into the band the panel is held in', () => {
    expect(coversTarget(0, 110, 200, 900)).toBe(false); // the chart below the panel
    expect(coversTarget(0, 110, 110, 900)).toBe(false); // the chart starts where the panel ends
    expect(coversTarget(0, 110, 60, 800)).toBe(true); // the chart's top under the panel
    expect(coversTarget(0, 110, -400, 50)).toBe(true); // only the chart's bottom left, under the panel
    expect(coversTarget(0, 110, -800, 0)).toBe(false); // the chart scrolled away above
  });

  it('measures the band from where the panel is held', () => {
    expect(coversTarget(40, 110, 20, 45)).toBe(true);
    expect(coversTarget(40, 110, 0, 40)).toBe(false);
    expect(coversTarget(40, 110, 150, 600)).toBe(false);
  });
});
