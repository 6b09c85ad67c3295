import { basisText, readBasis } from '../../core/sourced.js';
import { bodyMassUnit, formatMass, gToKg, type MassUnit } from '../../core/units.js';

/**
 * Mass as the clinic reads it: grams below 1 kg whatever the preference (95 g, not 0.095 kg);
 * from 1 kg, kilograms when the clinic prefers them, else grams with kilograms beside.
 */
export function displayMass(massG: number, preference: MassUnit): string {
  if (bodyMassUnit(massG, preference) === 'kg') return formatMass(massG, 'kg', 3).text;
  const grams = `${Number(massG.toFixed(massG < 100 ? 1 : 0))} g`;
  return massG >= 1000 ? `${grams} (${Number(gToKg(massG).toFixed(2))} kg)` : grams;
}

/** Local date and time, short, for record stamps. */
export function displayDateTime(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime())
    ? iso
    : date.toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });
}

/** Today as YYYY-MM-DD in local time. */
export function todayIso(now: Date = new Date()): string {
  const local = new Date(now.getTime() - now.getTimezoneOffset() * 60_000);
  return local.toISOString().slice(0, 10);
}

/**
 * A stored basis ("Typical adult mass [from memory]") in plain words for the clinic: "Typical adult
 * mass (unverified value)". Never shows the stored tag.
 */
export function displayBasis(stored: string): string {
  return plainBasis(basisText(readBasis(stored)));
}

/**
 * A basis written by the program (an estimate's, the MAC's) with "from memory" said as the clinic
 * reads it: "unverified value" (the primary source was not read here; check before relying on it).
 */
export function plainBasis(basis: string): string {
  return basis.replace(/\bfrom memory\b/gi, 'unverified value');
}
