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

/** The basis of a value that has several parts (a range, a MAC with its SD): Sourced without the value. */
export type Basis = Pick<Sourced<unknown>, 'basis' | 'kind'>;

/**
 * The kinds in plain words for the clinic. A value from memory is an unverified value: its
 * primary source was not read, so the clinic should check it before relying on it.
 */
export const sourceKindLabels: Readonly<Record<SourceKind, string>> = {
  published: 'published',
  derived: 'derived from published values',
  'from memory': 'unverified value',
  assumption: 'assumption',
  'common practice': 'common practice',
  measured: 'measured',
};

/** Tags written by earlier versions of the species seed, read as today's kinds. */
const legacyTags: Readonly<Record<string, SourceKind>> = { memory: 'from memory', equation: 'derived' };

function kindOfTag(tag: string): SourceKind | undefined {
  const lower = tag.trim().toLowerCase();
  return (
    sourceKinds.find((kind) => kind === lower) ??
    sourceKinds.find((kind) => sourceKindLabels[kind] === lower) ??
    legacyTags[lower]
  );
}

/**
 * A basis as stored in a text column: the basis with its kind in brackets at the end
 * ("Elliott 2014, WSAVA proceedings [published]"), so the kind survives the clinic's edits.
 */
export function storedBasis(sourced: Basis): string {
  return `${sourced.basis} [${sourced.kind}]`;
}

/**
 * Reads a stored or typed basis back into its text and kind. The kind is taken from a final
 * "[kind]" tag (the seed's form, including the older tags 'memory' and 'equation') or a final
 * "(kind in plain words)" as the screens show it; a basis the clinic typed without either counts
 * as the clinic's own, 'common practice'.
 */
export function readBasis(text: string): { readonly basis: string; readonly kind: SourceKind } {
  const trimmed = text.trim();
  const tagged = /^(.*?)\s*[[(]([a-z ]+)[\])]$/i.exec(trimmed);
  const kind = tagged === null ? undefined : kindOfTag(tagged[2] ?? '');
  if (tagged === null || kind === undefined) return { basis: trimmed, kind: 'common practice' };
  return { basis: tagged[1] ?? '', kind };
}

/**
 * A basis in plain words for the screen and the worksheet: "Typical adult mass (unverified
 * value)". The kind is added unless the basis already says it.
 */
export function basisText(sourced: Basis): string {
  const label = sourceKindLabels[sourced.kind];
  // Older bases say "from memory" in their words; the clinic reads that as an unverified value.
  const basis = sourced.basis.trim().replace(/\bfrom memory\b/gi, sourceKindLabels['from memory']);
  if (basis === '') return label;
  return basis.toLowerCase().includes(label) ? basis : `${basis} (${label})`;
}
