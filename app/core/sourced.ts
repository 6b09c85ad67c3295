/**
 * One way to say where a value comes from, shared by the agents, the species reference and the
 * model's parameters.
 *
 * - 'published': read in the named source.
 * - 'derived': arithmetic from published inputs (the arithmetic is in the basis).
 * - 'from memory': a coefficient known from memory whose primary paper was not read here; usable
 *   as a default, shown to the clinic as "unverified value", never a test oracle.
 * - 'assumption': a choice of ours, shown to the user as such.
 * - 'common practice': a fact of the trade with no single source.
 * - 'measured': entered by the clinic from its own measurement of this bird.
 */
export const sourceKinds = [
  'published',
  'derived',
  'from memory',
  'assumption',
  'common practice',
  'measured',
] as const;

export type SourceKind = (typeof sourceKinds)[number];

/** A value with its basis (citation or reasoning) and the kind of that basis. */
export type Sourced<T> = {
  readonly value: T;
  readonly basis: string;
  readonly kind: SourceKind;
};
