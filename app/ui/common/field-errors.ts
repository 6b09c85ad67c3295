import type { ContractError } from '../../contract/result.js';

export type FieldErrors = Readonly<Record<string, string>>;

/** First message per field, from a contract error or a local zod check. */
export function fieldErrorsFrom(issues: readonly { field: string; message: string }[]): FieldErrors {
  const errors: Record<string, string> = {};
  for (const issue of issues) if (errors[issue.field] === undefined) errors[issue.field] = issue.message;
  return errors;
}

export function fieldErrorsFromContract(error: ContractError): FieldErrors {
  if (error.issues !== undefined) return fieldErrorsFrom(error.issues);
  if (error.field !== undefined) return { [error.field]: error.message };
  return {};
}
