import { useCallback, useRef, type KeyboardEvent } from 'react';

/** A keydown handler that runs `run` on Escape and keeps the key from reaching anything else. */
export function onEscape(run: () => void): (event: KeyboardEvent<HTMLElement>) => void {
  return (event) => {
    if (event.key !== 'Escape') return;
    event.preventDefault();
    event.stopPropagation();
    run();
  };
}

/**
 * For an inline form opened by a button: remembers what opened it, so that Escape (`onEscape`)
 * and Cancel put focus back on that button (WCAG 2.4.3, focus order) and the keyboard user is
 * where they were.
 */
export function useReturnFocus(): {
  /** Call when the form opens; remembers the element given, or the one with focus. */
  readonly remember: (opener?: HTMLElement | null) => void;
  /** Focuses what opened the form, if it is still on the page. */
  readonly returnFocus: () => void;
} {
  const opener = useRef<HTMLElement | null>(null);
  const remember = useCallback((element?: HTMLElement | null) => {
    opener.current =
      element ?? (document.activeElement instanceof HTMLElement ? document.activeElement : null);
  }, []);
  const returnFocus = useCallback(() => {
    const target = opener.current;
    if (target !== null && target.isConnected) target.focus();
  }, []);
  return { remember, returnFocus };
}
