import { useEffect, useRef } from 'react';
import type { ChangeNotice } from '../../contract/change-notices.js';
import { api } from './bridge.js';

/** Notices that arrive this close together make one refresh (a saved comparison sends several). */
const gatherMs = 100;

/**
 * Calls `refresh` when a change notice that `filter` accepts arrives (a write on this
 * workstation, in another tab, or on another workstation sharing the database). `refresh` must
 * only reload what the screen shows (lists, rows), never reset a form the user is typing in.
 * Notices close together make one call. The newest `filter` and `refresh` are used, so both
 * may be written inline.
 */
export function useChangeNotices(filter: (notice: ChangeNotice) => boolean, refresh: () => void): void {
  const latest = useRef({ filter, refresh });
  useEffect(() => {
    latest.current = { filter, refresh };
  });
  useEffect(() => {
    let timer: ReturnType<typeof setTimeout> | null = null;
    const stop = api.onChange((notice) => {
      if (!latest.current.filter(notice) || timer !== null) return;
      timer = setTimeout(() => {
        timer = null;
        latest.current.refresh();
      }, gatherMs);
    });
    return () => {
      stop();
      if (timer !== null) clearTimeout(timer);
    };
  }, []);
}
