import { useEffect, useRef, useState } from 'react';
import {
  apnoeaActionSeconds,
  stoppedStopwatch,
  stopwatchLevel,
  stopwatchSeconds,
  toggleStopwatch,
  type Stopwatch,
} from './monitoring.js';

/** The key that starts and stops the apnoea stopwatch: no clash with typing numbers. */
export const apnoeaKey = 'F2';

/** An apnoea timed by the stopwatch: when it began (ms since 1970) and how long it lasted (s). */
export type FinishedApnoea = { readonly startedAtMs: number; readonly durationS: number };

export type ApnoeaStopwatch = {
  readonly level: ReturnType<typeof stopwatchLevel>;
  /** Whole seconds since the stopwatch started; 0 when stopped. */
  readonly seconds: number;
  readonly toggle: () => void;
};

/**
 * The apnoea stopwatch, started and stopped by a button or by `apnoeaKey` wherever focus is (so
 * the hands stay on the keyboard). `onFinished` receives each timed apnoea when it is stopped.
 */
export function useApnoeaStopwatch(
  nowMs: number,
  onFinished: (finished: FinishedApnoea) => void,
): ApnoeaStopwatch {
  const [stopwatch, setStopwatch] = useState<Stopwatch>(stoppedStopwatch);
  const toggleRef = useRef<() => void>(() => undefined);
  useEffect(() => {
    toggleRef.current = () => {
      const { next, finished } = toggleStopwatch(stopwatch, Date.now());
      setStopwatch(next);
      if (finished !== null) onFinished(finished);
    };
  });
  useEffect(() => {
    function onKey(event: KeyboardEvent) {
      if (event.key !== apnoeaKey || event.repeat) return;
      event.preventDefault();
      toggleRef.current();
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);
  return {
    level: stopwatchLevel(stopwatch, nowMs),
    seconds: stopwatchSeconds(stopwatch, nowMs),
    toggle: () => toggleRef.current(),
  };
}

/** The stopwatch button, turning to a warning past the time that calls for action. */
export function ApnoeaStopwatchButton({ stopwatch }: { readonly stopwatch: ApnoeaStopwatch }) {
  const { level, seconds } = stopwatch;
  return (
    <div className="record-stopwatch">
      <button
        type="button"
        className={`record-apnoea record-apnoea-${level}`}
        aria-pressed={level !== 'stopped'}
        aria-keyshortcuts={apnoeaKey}
        onClick={() => stopwatch.toggle()}
      >
        {level === 'stopped' ? 'Start apnoea stopwatch' : `Apnoea ${seconds} s: stop and log`}{' '}
        <kbd>{apnoeaKey}</kbd>
      </button>
      {level === 'danger' && (
        <span className="record-apnoea-warning" role="alert">
          Apnoea over {apnoeaActionSeconds} s: act now.
        </span>
      )}
    </div>
  );
}
