import { useCallback, useEffect, useState } from 'react';
import type { ChannelName, RequestOf, ResponseOf } from '../../contract/channels.js';
import type { ContractError } from '../../contract/result.js';
import { api } from './bridge.js';

export type Loadable<T> =
  { state: 'loading' } | { state: 'ready'; value: T } | { state: 'failed'; error: ContractError };

/** Loads one channel's answer when the screen mounts; `reload` asks again. */
export function useChannel<C extends ChannelName>(
  channel: C,
  request: RequestOf<C>,
): [Loadable<ResponseOf<C>>, () => void] {
  const [result, setResult] = useState<Loadable<ResponseOf<C>>>({ state: 'loading' });
  const [generation, setGeneration] = useState(0);
  const key = JSON.stringify(request);
  useEffect(() => {
    let live = true;
    void api.invoke(channel, JSON.parse(key) as RequestOf<C>).then((answer) => {
      if (!live) return;
      setResult(
        answer.ok ? { state: 'ready', value: answer.value } : { state: 'failed', error: answer.error },
      );
    });
    return () => {
      live = false;
    };
  }, [channel, key, generation]);
  const reload = useCallback(() => setGeneration((value) => value + 1), []);
  return [result, reload];
}
