import { useEffect, useState } from 'react';

/**
 * The screen theme. `system` follows the computer's light or dark setting; `light` and `dim` pin
 * one on this workstation. Kept in this browser's local storage, not in the clinic database:
 * the theatre's computer may want dim while the reception's stays light, and the clinic settings
 * are shared by every workstation of the clinic.
 */
export type ThemeChoice = 'system' | 'light' | 'dim';

export const themeChoices: readonly ThemeChoice[] = ['system', 'light', 'dim'];

const storageKey = 'tidewing.theme';
const changeEvent = 'tidewing-theme-change';

function isThemeChoice(value: unknown): value is ThemeChoice {
  return value === 'system' || value === 'light' || value === 'dim';
}

/** The workstation's stored choice; `system` when none is stored or storage is unavailable. */
export function readThemeChoice(): ThemeChoice {
  try {
    const stored = window.localStorage.getItem(storageKey);
    return isThemeChoice(stored) ? stored : 'system';
  } catch {
    return 'system';
  }
}

/** Sets `data-theme` on the page root (none for `system`), which the style sheet reads. */
export function applyThemeChoice(choice: ThemeChoice): void {
  const root = document.documentElement;
  if (choice === 'system') delete root.dataset['theme'];
  else root.dataset['theme'] = choice;
  window.dispatchEvent(new Event(changeEvent));
}

/** Stores the choice for this workstation and applies it at once. */
export function storeThemeChoice(choice: ThemeChoice): void {
  try {
    if (choice === 'system') window.localStorage.removeItem(storageKey);
    else window.localStorage.setItem(storageKey, choice);
  } catch {
    // Storage refused (private window): the choice still holds until the page is closed.
  }
  applyThemeChoice(choice);
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
