import { useEffect, useState } from 'react';

/** The wall clock in ms since 1970, re-rendering every second so clocks and reminders stay current. */
export function useNowMs(): number {
  const [nowMs, setNowMs] = useState(() => Date.now());
  useEffect(() => {
    const timer = window.setInterval(() => setNowMs(Date.now()), 1000);
    return () => window.clearInterval(timer);
  }, []);
  return nowMs;
}
