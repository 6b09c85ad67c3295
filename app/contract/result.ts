import { z } from 'zod';

/** Error codes every host returns in the same shape. */
export const errorCodes = [
  'invalid-request',
  'unknown-channel',
  'not-found',
  'conflict',
  'database',
  /** The channel exists but this host cannot do it (for example saving a PDF in the browser host). */
  'unavailable',
  'internal',
] as const;

export type ErrorCode = (typeof errorCodes)[number];

export const contractErrorSchema = z.object({
  code: z.enum(errorCodes),
  message: z.string(),
  /** Dotted path of the offending field, when one field is to blame. */
  field: z.string().optional(),
  /** Every field problem, when validation found several. */
  issues: z.array(z.object({ field: z.string(), message: z.string() })).optional(),
});

export type ContractError = z.infer<typeof contractErrorSchema>;

export type Result<T> =
  { readonly ok: true; readonly value: T } | { readonly ok: false; readonly error: ContractError };

/** Turns zod issues into field-named messages a clinic user can act on. */
export function describeIssues(issues: readonly z.core.$ZodIssue[]): { field: string; message: string }[] {
  return issues.map((issue) => ({
    field: issue.path.map(String).join('.') || '(request)',
    message: issue.message,
  }));
}
