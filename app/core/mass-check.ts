/**
 * One rule for a body mass against the species' typical adult range, used by the weights panel
 * and by the plan's cautions, so the same bird gets the same verdict on every screen.
 *
 * A g/kg unit slip multiplies or divides the intended mass by exactly 1000. So a mass is called a
 * likely slip when 1000 times it (or a thousandth of it) lands within a factor of 2 of the typical
 * range: the factor leaves room for birds outside a typical range and for ranges the clinic has
 * not widened yet. A mass outside the range that undoing a slip does not explain is a wrong
 * weight or a wrong species, which the clinic must check but the program cannot name.
 */
import type { Sourced } from './sourced.js';

/** The thresholds of the rule with their basis. */
export const unitSlipRule = {
  /** Grams per kilogram: the size of the slip. */
  slipFactor: 1000,
  /** How far (as a factor) a corrected mass may sit from the typical range and still count as a slip. */
  toleranceFactor: {
    value: 2,
    basis:
      'Assumption: a mass corrected by 1000 that lands within a factor of 2 of the typical adult range is most likely a g/kg slip',
    kind: 'assumption',
  } satisfies Sourced<number>,
  /** Basis of the typical adult ranges themselves. */
  rangeBasis:
    'Typical adult mass ranges are editable guides, not norms (common practice, owner-facing sources)',
} as const;

export type TypicalMassRange = { readonly minG: number; readonly maxG: number };

/** Outcome of the rule; a slip names what was probably meant. */
export type MassVerdict =
  | { readonly verdict: 'within' }
  | {
      readonly verdict: 'unit-slip';
      readonly severity: 'danger';
      /** 'kg-as-g': a kilogram figure typed as grams (too heavy); 'g-as-kg': the reverse. */
      readonly slip: 'kg-as-g' | 'g-as-kg';
      /** The mass probably meant, g. */
      readonly meantG: number;
    }
  | {
      readonly verdict: 'outside';
      readonly severity: 'warning';
      readonly direction: 'heavier' | 'lighter';
      /** How many times outside the range (>1). */
      readonly factorOutside: number;
    };

/** How far (as a factor) a mass sits from a range; 1 inside it. */
function factorOutside(massG: number, range: TypicalMassRange): number {
  if (massG < range.minG) return range.minG / massG;
  if (massG > range.maxG) return massG / range.maxG;
  return 1;
}

/**
 * Checks a body mass against the species' typical adult range.
 * @param massG body mass in g, > 0
 * @param range typical adult mass range in g, 0 < minG <= maxG
 * @returns 'within' the range (edges included), a likely g/kg 'unit-slip' (danger), or 'outside'
 *   the range with no slip to explain it (warning)
 */
export function checkMassAgainstRange(massG: number, range: TypicalMassRange): MassVerdict {
  if (!(massG > 0) || !Number.isFinite(massG)) throw new RangeError('massG must be a positive number');
  const outside = factorOutside(massG, range);
  if (outside === 1) return { verdict: 'within' };
  const { slipFactor, toleranceFactor } = unitSlipRule;
  const heavier = massG > range.maxG;
  // Rounded to 12 significant figures so 0.032 kg reads back as 32 g, not 31.999999999999996.
  const meantG = Number((heavier ? massG / slipFactor : massG * slipFactor).toPrecision(12));
  if (factorOutside(meantG, range) <= toleranceFactor.value) {
    return { verdict: 'unit-slip', severity: 'danger', slip: heavier ? 'kg-as-g' : 'g-as-kg', meantG };
  }
  return {
    verdict: 'outside',
    severity: 'warning',
    direction: heavier ? 'heavier' : 'lighter',
    factorOutside: outside,
  };
}
