import { useEffect, useState } from 'react';
import type { ThemeChoice } from '../../contract/workstation.js';

/**
 * The screen theme. `system` follows the computer's light or dark setting; `light` and `dim` pin
 * one on this workstation. Kept in the clinic database per workstation (`workstation:save`), not
 * in the browser's storage, which a new port of the browser host loses: the theatre's computer may
 * want dim while the reception's stays light. The host writes the pinned theme into the page
 * (`data-theme` on the root) before it is shown, so there is no flash of the other one.
 */
export { themeChoices, themeLabels, type ThemeChoice } from '../../contract/workstation.js';

const changeEvent = 'tidewing-theme-change';

/** The theme the page was served with, or last applied. */
export function currentThemeChoice(): ThemeChoice {
  const pinned = document.documentElement.dataset['theme'];
  return pinned === 'light' || pinned === 'dim' ? pinned : 'system';
}

/** Sets `data-theme` on the page root (none for `system`), which the style sheet reads. */
export function applyThemeChoice(choice: ThemeChoice): void {
  const root = document.documentElement;
  if (choice === currentThemeChoice()) return;
  if (choice === 'system') delete root.dataset['theme'];
  else root.dataset['theme'] = choice;
  window.dispatchEvent(new Event(changeEvent));
}

/**
 * A colour as the canvas needs it (`rgb(...)`), from any CSS colour including `var(--chart-blue)`,
 * `light-dark(...)` and system colours such as `CanvasText`: resolved by the browser on a hidden
 * element inside `within`, so the theme, the colour scheme of that part of the page (the worksheet
 * preview is always light) and forced-colours mode in force now decide.
 */
export function resolveColour(cssColour: string, within: HTMLElement): string {
  let probe = probes.get(within);
  if (probe === undefined || !probe.isConnected) {
    probe = document.createElement('span');
    probe.setAttribute('aria-hidden', 'true');
    // forced-color-adjust: none, so a system colour named in a variable is read as the system draws it.
    probe.style.cssText = 'position:absolute;width:0;height:0;overflow:hidden;forced-color-adjust:none';
    within.appendChild(probe);
    probes.set(within, probe);
  }
  probe.style.color = '';
  probe.style.color = cssColour;
  return getComputedStyle(probe).color;
}

const probes = new WeakMap<HTMLElement, HTMLSpanElement>();

/**
 * A number that changes whenever the colours in force may have changed: a theme pinned or
 * released in Settings, the system's light/dark setting, or forced-colours mode switched.
 * Charts rebuild on a change so their legends and canvases take the new colours.
 */
export function useThemeGeneration(): number {
  const [generation, setGeneration] = useState(0);
  useEffect(() => {
    const bump = () => setGeneration((value) => value + 1);
    const queries = ['(prefers-color-scheme: dark)', '(forced-colors: active)'].map((query) =>
      window.matchMedia(query),
    );
    window.addEventListener(changeEvent, bump);
    for (const query of queries) query.addEventListener('change', bump);
    return () => {
      window.removeEventListener(changeEvent, bump);
      for (const query of queries) query.removeEventListener('change', bump);
    };
  }, []);
  return generation;
}
