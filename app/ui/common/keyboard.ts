/** The parts of a focused element that tell whether the user is typing in it. */
export type FocusedElement = {
  readonly tagName: string;
  readonly isContentEditable?: boolean;
  readonly type?: string;
};

/** Input types that take no typed text: a "/" pressed on them is free for a shortcut. */
const nonTextInputs = new Set([
  'button',
  'checkbox',
  'radio',
  'submit',
  'reset',
  'range',
  'color',
  'file',
  'image',
]);

/**
 * Whether keys pressed now go into a field: a text box, a text area, a drop-down list (which
 * jumps to options by typed letters) or editable text. Single-key shortcuts such as "/" for the
 * patient search wait until focus is elsewhere.
 */
export function isTypingIn(element: FocusedElement | null | undefined): boolean {
  if (element === null || element === undefined) return false;
  if (element.isContentEditable === true) return true;
  const tag = element.tagName.toUpperCase();
  if (tag === 'TEXTAREA' || tag === 'SELECT') return true;
  if (tag !== 'INPUT') return false;
  return !nonTextInputs.has((element.type ?? 'text').toLowerCase());
}

/**
 * Whether a key press is the bare "/" shortcut: no modifier held, not part of a composition,
 * not already handled, and not typed into a field.
 */
export function isSearchShortcut(
  event: {
    readonly key: string;
    readonly ctrlKey: boolean;
    readonly metaKey: boolean;
    readonly altKey: boolean;
    readonly isComposing?: boolean;
    readonly defaultPrevented: boolean;
  },
  focused: FocusedElement | null | undefined,
): boolean {
  return (
    event.key === '/' &&
    !event.ctrlKey &&
    !event.metaKey &&
    !event.altKey &&
    event.isComposing !== true &&
    !event.defaultPrevented &&
    !isTypingIn(focused)
  );
}
