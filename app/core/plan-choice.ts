/**
 * Which plan of a saved comparison the clinic will use, in the words every place that lists or
 * prints a plan shows (the day list, the worksheet, the worksheet command, the record's plan
 * picker): "chosen", "alternative of plan 11, not chosen", "compared, not chosen". A comparison is
 * two plans saved together (`variant_of` names the first; `plan_choices`, newest counting, says
 * which is used); a plan outside one has no mark.
 */

/** A plan's place in a comparison: the plan it is the alternative of, and whether it is the chosen one (null outside a comparison). */
export type PlanChoice = { readonly variantOf: number | null; readonly chosen: boolean | null };

/** No comparison: nothing to mark. */
export const notCompared: PlanChoice = { variantOf: null, chosen: null };

/**
 * The marks of a plan in order, e.g. ["chosen", "alternative of plan 11"] or
 * ["compared, not chosen"]; none for a plan outside a comparison.
 */
export function planChoiceParts(choice: PlanChoice): string[] {
  const parts: string[] = [];
  if (choice.chosen === true) parts.push('chosen');
  if (choice.variantOf !== null)
    parts.push(
      `alternative of plan ${String(choice.variantOf)}${choice.chosen === false ? ', not chosen' : ''}`,
    );
  else if (choice.chosen === false) parts.push('compared, not chosen');
  return parts;
}

/** The marks in one line: "chosen · alternative of plan 11"; empty outside a comparison. */
export function planChoiceText(choice: PlanChoice): string {
  return planChoiceParts(choice).join(' · ');
}

/** The marks after a plan's name in a line: " · chosen"; empty outside a comparison. */
export function planChoiceSuffix(choice: PlanChoice): string {
  const text = planChoiceText(choice);
  return text === '' ? '' : ` · ${text}`;
}

/**
 * A plan's choice from its saved comparison as `plans:get` gives it (the newest version of each
 * member, the compared plan first). A plan that is not a member (an earlier version) is not marked.
 */
export function planChoiceIn(
  planId: number,
  comparison: {
    readonly chosenId: number;
    readonly plans: readonly { readonly id: number; readonly variantOf: number | null }[];
  } | null,
): PlanChoice {
  const member = comparison?.plans.find((plan) => plan.id === planId);
  if (comparison === null || member === undefined) return notCompared;
  return { variantOf: member.variantOf, chosen: comparison.chosenId === planId };
}
