import type { ReactNode } from 'react';

/**
 * A wide table in its own scrolling box, so a narrow or zoomed window scrolls the table and not
 * the whole page. Focusable and named, so keyboard users can scroll it with the arrow keys and a
 * screen reader says what it holds.
 */
export function ScrollRegion({ label, children }: { readonly label: string; readonly children: ReactNode }) {
  return (
    // tabIndex 0: a keyboard reaches the scroll box even when nothing inside it takes focus.
    <div className="scroll-region" role="region" aria-label={label} tabIndex={0}>
      {children}
    </div>
  );
}
