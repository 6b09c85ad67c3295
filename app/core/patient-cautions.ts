/**
 * Cautions that concern one sex only, filtered by what is known of the patient: a female duck is
 * not told that males have a tracheal bulla. Applied where a plan is shown for a known patient;
 * the plan's stored result keeps every caution.
 */

/** Anatomy cautions that apply to one sex only, by caution code (species reference notes). */
export const cautionSexes: Readonly<Record<string, 'male' | 'female'>> = {
  // Tracheal (syringeal) bulla: a feature of male ducks (Anatidae), common practice.
  'anatomy-tracheal-bulla': 'male',
};

/**
 * The cautions that apply to this patient: those for the other sex are left out when the sex
 * is known; with the sex unknown every caution stays.
 * @param cautions the plan's cautions
 * @param sex the patient's sex, or 'unknown' / null when not known
 */
export function cautionsForPatient<T extends { readonly code: string }>(
  cautions: readonly T[],
  sex: 'male' | 'female' | 'unknown' | null,
): T[] {
  if (sex === null || sex === 'unknown') return [...cautions];
  return cautions.filter((caution) => {
    const only = cautionSexes[caution.code];
    return only === undefined || only === sex;
  });
}
