import { StrictMode, useEffect, useState } from 'react';
import { createRoot } from 'react-dom/client';
import type { ChannelName, RequestOf, ResponseOf } from '../contract/channels.js';
import { api } from './common/bridge.js';
import { routeFromHash } from './shell/areas.js';
import { Sheet, type SheetProps } from './worksheets/sheet.js';
import './styles.css';

/**
 * `print.html#/worksheets/<planId>`: the worksheet alone, as the command line prints it. It loads
 * only the sheet (no other screen, no validation library) and asks for everything it needs at
 * once, so a cold headless browser draws it quickly. The app's own worksheet screen renders the
 * same `Sheet`.
 */

type Loaded = { state: 'loading' } | { state: 'failed'; message: string } | { state: 'ready'; props: Omit<SheetProps, 'printedAt'> };

async function ask<C extends ChannelName>(channel: C, request: RequestOf<C>): Promise<ResponseOf<C>> {
  const answer = await api.invoke(channel, request);
  if (!answer.ok) throw new Error(answer.error.message);
  return answer.value;
}

async function load(planId: number): Promise<Loaded> {
  try {
    const [safety, stored, detail, drugs, info] = await Promise.all([
      ask('safety:status', {}),
      ask('settings:get', {}),
      ask('plans:get', { id: planId }),
      ask('drugs:list', {}),
      ask('app:info', {}),
    ]);
    if (!safety.acknowledged) return { state: 'failed', message: `The cautions of Syrinx ${safety.appVersion} have not been acknowledged yet. Open the app, read and acknowledge them first.` };
    if (stored.settings === null) return { state: 'failed', message: 'The clinic is not set up yet. Open the app and save Settings first.' };
    return { state: 'ready', props: { detail, drugs, appVersion: info.appVersion, settings: stored.settings } };
  } catch (error) {
    return { state: 'failed', message: error instanceof Error ? error.message : String(error) };
  }
}

function planIdFromHash(): number | null {
  const route = routeFromHash(window.location.hash);
  const id = Number(route.segments[0]);
  return route.area === 'worksheets' && Number.isInteger(id) && id > 0 ? id : null;
}

function PrintedWorksheet() {
  const [planId] = useState(planIdFromHash);
  const [loaded, setLoaded] = useState<Loaded>(() => (planId === null ? { state: 'failed', message: 'No plan named: the address must end in #/worksheets/<plan number>.' } : { state: 'loading' }));
  const [printedAt] = useState(() => new Date());
  useEffect(() => {
    if (planId === null) return;
    let live = true;
    void load(planId).then((result) => {
      if (live) setLoaded(result);
    });
    return () => {
      live = false;
    };
  }, [planId]);
  if (loaded.state === 'failed') {
    return (
      <main className="gate">
        <h1>Worksheet</h1>
        <p className="form-error" role="alert">
          {loaded.message}
        </p>
      </main>
    );
  }
  if (loaded.state === 'loading') return <p aria-busy="true">Loading the worksheet…</p>;
  return <Sheet {...loaded.props} printedAt={printedAt} />;
}

const container = document.getElementById('root');
if (container === null) throw new Error('The page has no #root element');
createRoot(container).render(
  <StrictMode>
    <PrintedWorksheet />
  </StrictMode>,
);
