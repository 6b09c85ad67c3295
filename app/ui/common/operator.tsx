import { createContext, useContext, useId, useState, type ReactNode } from 'react';

const storageKey = 'tidewing.operator';

type Operator = { readonly initials: string; readonly setInitials: (initials: string) => void };

const OperatorContext = createContext<Operator>({ initials: '', setInitials: () => undefined });

/** Who is at the keyboard: every record written carries these initials. Kept per computer. */
export function OperatorProvider({ children }: { readonly children: ReactNode }) {
  const [initials, setState] = useState(() => window.localStorage.getItem(storageKey) ?? '');
  const setInitials = (value: string) => {
    const trimmed = value.trim().slice(0, 40);
    window.localStorage.setItem(storageKey, trimmed);
    setState(trimmed);
  };
  return <OperatorContext.Provider value={{ initials, setInitials }}>{children}</OperatorContext.Provider>;
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
        maxLength={40}
        size={6}
        placeholder="e.g. RW"
        onChange={(event) => setInitials(event.target.value)}
        aria-invalid={initials === ''}
      />
    </div>
  );
}
