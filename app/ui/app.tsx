import { useEffect, useState } from 'react';
import type { SafetyStatus } from '../contract/safety.js';
import type { StoredSettings } from '../contract/settings.js';
import { useChannel } from './common/use-channel.js';
import { CautionsScreen } from './safety/cautions-screen.js';
import { SettingsScreen } from './settings/settings-screen.js';
import { areaFromHash, areas, type AreaId } from './shell/areas.js';
import { NotBuilt } from './shell/not-built.js';
import { Shell } from './shell/shell.js';

function useHashArea(): AreaId {
  const [area, setArea] = useState<AreaId>(() => areaFromHash(window.location.hash));
  useEffect(() => {
    const onChange = () => setArea(areaFromHash(window.location.hash));
    window.addEventListener('hashchange', onChange);
    return () => window.removeEventListener('hashchange', onChange);
  }, []);
  return area;
}

function Failure({ message }: { readonly message: string }) {
  return (
    <main className="gate">
      <h1>Syrinx cannot start</h1>
      <p className="form-error" role="alert">{message}</p>
    </main>
  );
}

/** First run: cautions, then clinic setup; afterwards the shell with its areas. */
export function App() {
  const [safetyLoad] = useChannel('safety:status', {});
  const [settingsLoad] = useChannel('settings:get', {});
  const [safety, setSafety] = useState<SafetyStatus | null>(null);
  const [stored, setStored] = useState<StoredSettings | null>(null);
  const area = useHashArea();

  const currentSafety = safety ?? (safetyLoad.state === 'ready' ? safetyLoad.value : null);
  const currentSettings = stored ?? (settingsLoad.state === 'ready' ? settingsLoad.value : null);

  if (safetyLoad.state === 'failed') return <Failure message={safetyLoad.error.message} />;
  if (settingsLoad.state === 'failed') return <Failure message={settingsLoad.error.message} />;
  if (currentSafety === null || currentSettings === null) {
    return (
      <main className="gate" aria-busy="true">
        <p>Opening the clinic database…</p>
      </main>
    );
  }
  if (!currentSafety.acknowledged) return <CautionsScreen status={currentSafety} onAcknowledged={setSafety} />;

  const needsSetup = currentSettings.settings === null;
  const shown: AreaId = needsSetup ? 'settings' : area;
  const definition = areas.find((candidate) => candidate.id === shown) ?? areas[0];
  return (
    <Shell current={shown} clinicName={currentSettings.settings?.clinicName ?? 'New clinic'} appVersion={currentSafety.appVersion}>
      {shown === 'settings' || definition === undefined ? (
        <SettingsScreen
          stored={currentSettings}
          safety={currentSafety}
          onSaved={(saved) => {
            // After first-run setup, stay on Settings so the confirmation is seen.
            if (needsSetup) window.location.hash = '#/settings';
            setStored(saved);
          }}
        />
      ) : (
        <NotBuilt area={definition} />
      )}
    </Shell>
  );
}
