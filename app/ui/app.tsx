import { lazy, Suspense, useEffect, useState } from 'react';
import type { SafetyStatus } from '../contract/safety.js';
import type { StoredSettings } from '../contract/settings.js';
import { setClinicDateFormat } from './common/display.js';
import { OperatorProvider } from './common/operator.js';
import { SettingsContext } from './common/settings-context.js';
import { useChannel } from './common/use-channel.js';
import { useChangeNotices } from './common/use-change-notices.js';
import { EvidenceArea } from './evidence/evidence-area.js';
import { PatientsArea } from './patients/patients-area.js';
import { CautionsScreen } from './safety/cautions-screen.js';
import { SettingsScreen } from './settings/settings-screen.js';
import { routeFromHash, type Route } from './shell/areas.js';
import { Shell } from './shell/shell.js';

// The first screen (patients) loads with the app; each other area loads when first opened (no
// loading of the others while idle: measured, it slowed the screen the address opened on).
const loadSpecies = () => import('./species/species-area.js');
const loadPlans = () => import('./plans/plans-area.js');
const loadRecords = () => import('./records/records-area.js');
const loadWorksheets = () => import('./worksheets/worksheets-area.js');
const SpeciesArea = lazy(() => loadSpecies().then((module) => ({ default: module.SpeciesArea })));
const PlansArea = lazy(() => loadPlans().then((module) => ({ default: module.PlansArea })));
const RecordsArea = lazy(() => loadRecords().then((module) => ({ default: module.RecordsArea })));
const WorksheetsArea = lazy(() => loadWorksheets().then((module) => ({ default: module.WorksheetsArea })));

const areaLoaders: Partial<Record<Route['area'], () => Promise<unknown>>> = {
  species: loadSpecies,
  plans: loadPlans,
  records: loadRecords,
  worksheets: loadWorksheets,
};
// The area the address opens on starts loading with the app, not after the database answers.
void areaLoaders[routeFromHash(window.location.hash).area]?.();

function useRoute(): Route {
  const [route, setRoute] = useState<Route>(() => routeFromHash(window.location.hash));
  useEffect(() => {
    const onChange = () => setRoute(routeFromHash(window.location.hash));
    window.addEventListener('hashchange', onChange);
    return () => window.removeEventListener('hashchange', onChange);
  }, []);
  return route;
}

function Failure({ message }: { readonly message: string }) {
  return (
    <main className="gate">
      <h1>Tidewing cannot start</h1>
      <p className="form-error" role="alert">
        {message}
      </p>
    </main>
  );
}

function AreaContent({ route }: { readonly route: Route }) {
  return (
    <Suspense
      fallback={
        <p className="area-loading" aria-busy="true">
          Loading…
        </p>
      }
    >
      <Area route={route} />
    </Suspense>
  );
}

function Area({ route }: { readonly route: Route }) {
  switch (route.area) {
    case 'patients':
      return <PatientsArea route={route} />;
    case 'species':
      return <SpeciesArea route={route} />;
    case 'plans':
      return <PlansArea route={route} />;
    case 'records':
      return <RecordsArea route={route} />;
    case 'evidence':
      return <EvidenceArea />;
    case 'worksheets':
      return <WorksheetsArea route={route} />;
    case 'settings':
      return null;
  }
}

/** The settings saved here or loaded (again, after another workstation saved them): the newer. */
function newerSettings(saved: StoredSettings | null, loaded: StoredSettings | null): StoredSettings | null {
  if (saved === null || loaded === null) return saved ?? loaded;
  return (loaded.updatedAt ?? '') > (saved.updatedAt ?? '') ? loaded : saved;
}

/** First run: cautions, then clinic setup; afterwards the shell with its areas. */
export function App() {
  const [safetyLoad] = useChannel('safety:status', {});
  const [settingsLoad, reloadSettings] = useChannel('settings:get', {});
  const [workstationLoad] = useChannel('workstation:get', {});
  const [demoLoad, reloadDemo] = useChannel('demo-clinic:status', {});
  const [safety, setSafety] = useState<SafetyStatus | null>(null);
  const [stored, setStored] = useState<StoredSettings | null>(null);
  const route = useRoute();

  const currentSafety = safety ?? (safetyLoad.state === 'ready' ? safetyLoad.value : null);
  const currentSettings = newerSettings(stored, settingsLoad.state === 'ready' ? settingsLoad.value : null);
  // Units, date format and clinic name saved on another workstation reach every screen here. Not
  // during first-run setup, whose form would be replaced; the settings form keeps its draft.
  const setUp = currentSettings?.settings != null;
  useChangeNotices((notice) => notice.kind === 'settings' && setUp, reloadSettings);
  // Whether the clinic holds patients, and the demo's invented birds (the header says so).
  useChangeNotices((notice) => notice.kind === 'patients', reloadDemo);

  if (safetyLoad.state === 'failed') return <Failure message={safetyLoad.error.message} />;
  if (settingsLoad.state === 'failed') return <Failure message={settingsLoad.error.message} />;
  if (workstationLoad.state === 'failed') return <Failure message={workstationLoad.error.message} />;
  if (
    currentSafety === null ||
    currentSettings === null ||
    workstationLoad.state !== 'ready' ||
    demoLoad.state === 'loading'
  ) {
    return (
      <main className="gate" aria-busy="true">
        <p>Opening the clinic database…</p>
      </main>
    );
  }
  if (!currentSafety.acknowledged)
    return <CautionsScreen status={currentSafety} onAcknowledged={setSafety} />;

  setClinicDateFormat(currentSettings.settings?.dateFormat);
  const needsSetup = currentSettings.settings === null;
  const shown: Route = needsSetup ? { area: 'settings', segments: [] } : route;
  // Without an answer (the status failed), no demo is offered and no banner shown.
  const demo = demoLoad.state === 'ready' ? demoLoad.value : null;
  return (
    <OperatorProvider loaded={workstationLoad.value}>
      <SettingsContext.Provider value={currentSettings.settings}>
        <Shell
          current={shown.area}
          clinicName={currentSettings.settings?.clinicName ?? 'New clinic'}
          appVersion={currentSafety.appVersion}
          demoClinic={demo !== null && demo.demoPatientCount > 0}
          screenKey={needsSetup ? 'setup' : window.location.hash}
        >
          {shown.area === 'settings' ? (
            <SettingsScreen
              stored={currentSettings}
              safety={currentSafety}
              onSaved={(saved) => {
                // After first-run setup, stay on Settings so the confirmation is seen.
                if (needsSetup) window.location.hash = '#/settings';
                setStored(saved);
              }}
              demoOffer={demo !== null && demo.patientCount === 0 ? demo : null}
              onDemoOpened={(written) => {
                // Straight to what the demo is for: the clinic's records beside the model's predictions.
                window.location.hash = '#/evidence';
                reloadDemo();
                if (written.settings.settings !== null) setStored(written.settings);
              }}
            />
          ) : (
            <AreaContent route={shown} />
          )}
        </Shell>
      </SettingsContext.Provider>
    </OperatorProvider>
  );
}
