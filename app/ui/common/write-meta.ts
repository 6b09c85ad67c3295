import { useOperator } from './operator.js';

/**
 * The who/why of a write. Returns null and says why when the operator has not entered initials,
 * so no record is written without a name.
 */
export function useWriteMeta(): (
  reason?: string,
) => { meta: { enteredBy: string; reason: string } } | { missing: string } {
  const { initials } = useOperator();
  return (reason = '') =>
    initials.trim() === ''
      ? { missing: 'Enter your initials at the top of the screen first; every record carries them.' }
      : { meta: { enteredBy: initials.trim(), reason } };
}
