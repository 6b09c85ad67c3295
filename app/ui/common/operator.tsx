import { createContext, useContext, useEffect, useId, useRef, useState, type ReactNode } from 'react';
import type { Result } from '../../contract/result.js';
import {
  workstationInitialsMax,
  type Workstation,
  type WorkstationChange,
} from '../../contract/workstation.js';
import { api } from './bridge.js';
import { applyThemeChoice } from './theme.js';

type Operator = {
  /** Who is at the keyboard: every record written carries these initials. */
  readonly initials: string;
  readonly setInitials: (initials: string) => void;
  /** This workstation's settings as last saved (initials as typed, theme as pinned). */
  readonly workstation: Workstation | null;
  /** Saves a change to this workstation's name or theme (initials go through `setInitials`). */
  readonly saveWorkstation: (change: WorkstationChange) => Promise<Result<Workstation>>;
};

const OperatorContext = createContext<Operator>({
  initials: '',
  setInitials: () => undefined,
  workstation: null,
  saveWorkstation: () =>
    Promise.resolve({ ok: false, error: { code: 'internal', message: 'No workstation is loaded.' } }),
});

/** What an earlier version kept in this browser's storage, carried into the database once. */
const legacyInitialsKey = 'tidewing.operator';
const legacyThemeKey = 'tidewing.theme';

function takeLegacyChoices(): WorkstationChange | null {
  try {
    const initials = window.localStorage.getItem(legacyInitialsKey)?.trim() ?? '';
    const theme = window.localStorage.getItem(legacyThemeKey);
    window.localStorage.removeItem(legacyInitialsKey);
    window.localStorage.removeItem(legacyThemeKey);
    const change: WorkstationChange = {
      ...(initials === '' ? {} : { initials: initials.slice(0, workstationInitialsMax) }),
      ...(theme === 'light' || theme === 'dim' ? { theme: theme as 'light' | 'dim' } : {}),
    };
    return Object.keys(change).length === 0 ? null : change;
  } catch {
    return null;
  }
}

/**
 * This workstation's settings from the clinic database (`workstation:get`, loaded before the
 * shell is shown): the initials of whoever is at the keyboard and the pinned theme. Initials are
 * saved as they are typed, one save at a time with the latest text, so they survive a restart
 * and a new port of the browser host.
 */
export function OperatorProvider({
  loaded,
  children,
}: {
  readonly loaded: Workstation;
  readonly children: ReactNode;
}) {
  const [workstation, setWorkstation] = useState<Workstation>(loaded);
  const [initials, setState] = useState(loaded.initials);
  const saving = useRef<{ busy: boolean; next: string | null }>({ busy: false, next: null });

  useEffect(() => {
    applyThemeChoice(loaded.theme);
    if (loaded.updatedAt !== null) return;
    const legacy = takeLegacyChoices();
    if (legacy === null) return;
    void api.invoke('workstation:save', legacy).then((answer) => {
      if (!answer.ok) return;
      setWorkstation(answer.value);
      setState(answer.value.initials);
      applyThemeChoice(answer.value.theme);
    });
  }, [loaded]);

  async function drainInitials() {
    const queue = saving.current;
    if (queue.busy) return;
    queue.busy = true;
    while (queue.next !== null) {
      const value = queue.next;
      queue.next = null;
      const answer = await api.invoke('workstation:save', { initials: value });
      if (answer.ok) setWorkstation(answer.value);
    }
    queue.busy = false;
  }

  const setInitials = (value: string) => {
    const trimmed = value.trim().slice(0, workstationInitialsMax);
    setState(trimmed);
    saving.current.next = trimmed;
    void drainInitials();
  };

  const saveWorkstation = async (change: WorkstationChange) => {
    const answer = await api.invoke('workstation:save', change);
    if (answer.ok) {
      setWorkstation(answer.value);
      applyThemeChoice(answer.value.theme);
    }
    return answer;
  };

  return (
    <OperatorContext.Provider value={{ initials, setInitials, workstation, saveWorkstation }}>
      {children}
    </OperatorContext.Provider>
  );
}

export function useOperator(): Operator {
  return useContext(OperatorContext);
}

/** The initials box in the top bar. */
export function OperatorField() {
  const { initials, setInitials } = useOperator();
  const id = useId();
  return (
    <div className="operator">
      <label htmlFor={id}>Your initials</label>
      <input
        id={id}
        value={initials}
        maxLength={workstationInitialsMax}
        size={6}
        placeholder="e.g. RW"
        onChange={(event) => setInitials(event.target.value)}
        aria-invalid={initials === ''}
      />
    </div>
  );
}
