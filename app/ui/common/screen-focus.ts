import { useEffect, useRef, useState } from 'react';

/** The name the window and the screen reader give a screen: "Patients - Tidewing". */
export function screenTitle(heading: string): string {
  const trimmed = heading.replace(/\s+/g, ' ').trim();
  return trimmed === '' ? 'Tidewing' : `${trimmed} - Tidewing`;
}

/**
 * Moves focus to the first heading of the main content, making it focusable for the purpose; a
 * screen reader then reads the new screen's name. Returns false when the heading is not drawn yet.
 */
export function focusMainHeading(): boolean {
  const heading = document.querySelector<HTMLElement>('main h1');
  if (heading === null) return false;
  if (!heading.hasAttribute('tabindex')) heading.setAttribute('tabindex', '-1');
  heading.focus();
  return true;
}

/**
 * Keeps `document.title` equal to the main heading (screens draw it after their data loads) and,
 * when `screenKey` changes after the first screen, moves focus to the new screen's heading unless
 * the screen put focus on one of its own fields already (autoFocus).
 */
export function useScreenAnnouncement(screenKey: string): void {
  const first = useRef(true);
  useEffect(() => {
    const main = document.querySelector('main');
    if (main === null) return undefined;
    let focusPending = !first.current;
    first.current = false;
    let focusedHeading: Element | null = null;
    const update = () => {
      const heading = main.querySelector('h1');
      if (heading === null) return;
      const title = screenTitle(heading.textContent ?? '');
      if (document.title !== title) document.title = title;
      if (focusPending) {
        focusPending = false;
        // A screen that focused one of its own fields on arrival (autoFocus) keeps it; a button
        // left focused by the previous screen (Save, a link) does not.
        const active = document.activeElement;
        const ownField =
          active !== null && main.contains(active) && active.matches('input, select, textarea');
        if (!ownField && focusMainHeading()) focusedHeading = heading;
      } else if (
        focusedHeading !== null &&
        !focusedHeading.isConnected &&
        (document.activeElement === null || document.activeElement === document.body)
      ) {
        // The heading focused on arrival was replaced (a screen drawn while loading, then with its
        // data): focus follows to the new heading instead of dropping to the page.
        focusedHeading = focusMainHeading() ? heading : null;
      }
    };
    update();
    const observer = new MutationObserver(update);
    observer.observe(main, { childList: true, subtree: true, characterData: true });
    return () => observer.disconnect();
  }, [screenKey]);
}

/**
 * After a failed save, focus goes to the first field marked invalid inside `ref` (or to the form's
 * error message when no field is marked). Call `focusFirstError()` where the save fails; the focus
 * moves once the errors are drawn.
 */
export function useFocusFirstError<T extends HTMLElement>(): {
  readonly ref: React.RefObject<T | null>;
  readonly focusFirstError: () => void;
} {
  const ref = useRef<T | null>(null);
  const [attempt, setAttempt] = useState(0);
  useEffect(() => {
    if (attempt === 0) return;
    const container = ref.current;
    if (container === null) return;
    const target =
      container.querySelector<HTMLElement>('[aria-invalid="true"]') ??
      container.querySelector<HTMLElement>('.form-error');
    if (target === null) return;
    if (!target.matches('input, select, textarea, button') && !target.hasAttribute('tabindex'))
      target.setAttribute('tabindex', '-1');
    target.focus();
  }, [attempt]);
  return { ref, focusFirstError: () => setAttempt((value) => value + 1) };
}
