import { useEffect, type ReactNode } from 'react';
import { OperatorField } from '../common/operator.js';
import { useScreenAnnouncement } from '../common/screen-focus.js';
import { areas, type AreaId } from './areas.js';
import './demo-clinic-marker.css';

type Props = {
  readonly current: AreaId;
  readonly clinicName: string;
  readonly appVersion: string;
  /** The clinic holds the demo's invented birds: said on every screen, so none is taken for real. */
  readonly demoClinic?: boolean;
  /** Changes when the screen changes (the location hash): focus then moves to the new heading. */
  readonly screenKey: string;
  readonly children: ReactNode;
};

/** The hash routes screens, so the skip link moves focus itself instead of following its href. */
function skipToMain(event: React.MouseEvent<HTMLAnchorElement>) {
  event.preventDefault();
  document.getElementById('main')?.focus();
}

/** Frame of every screen: the standing caution, navigation (Alt+1 to Alt+7) and the content. */
export function Shell({ current, clinicName, appVersion, demoClinic = false, screenKey, children }: Props) {
  useScreenAnnouncement(screenKey);
  useEffect(() => {
    function onKey(event: KeyboardEvent) {
      if (!event.altKey || event.ctrlKey || event.metaKey) return;
      const index = Number(event.key) - 1;
      const area = areas[index];
      if (area !== undefined) {
        event.preventDefault();
        window.location.hash = `#/${area.id}`;
      }
    }
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  return (
    <div className="shell">
      <a className="skip-link" href="#main" onClick={skipToMain}>
        Skip to main content
      </a>
      <header className="topbar">
        <div className="brand">
          <span className="brand-name">Tidewing</span>
          <span className="brand-clinic">{clinicName}</span>
        </div>
        <p className="standing-caution" role="note">
          Planning aid: every figure is an estimate with its basis shown. The responsible veterinarian
          decides.
        </p>
        {demoClinic && (
          <p className="demo-clinic-marker" role="note">
            Demo clinic: invented birds, not real patients.
          </p>
        )}
        <OperatorField />
      </header>
      <nav className="sidebar" aria-label="Areas">
        <ul>
          {areas.map((area, index) => (
            <li key={area.id}>
              <a
                href={`#/${area.id}`}
                title={area.purpose}
                aria-current={area.id === current ? 'page' : undefined}
                className={area.id === current ? 'current' : undefined}
              >
                <span>{area.title}</span>
                <kbd aria-label={`Alt ${index + 1}`}>Alt+{index + 1}</kbd>
              </a>
            </li>
          ))}
        </ul>
        <p className="version">Version {appVersion}</p>
      </nav>
      <main id="main" className="content" tabIndex={-1}>
        {children}
      </main>
    </div>
  );
}
