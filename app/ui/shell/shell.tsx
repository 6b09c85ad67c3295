import { useEffect, type ReactNode } from 'react';
import { OperatorField } from '../common/operator.js';
import { areas, type AreaId } from './areas.js';

type Props = {
  readonly current: AreaId;
  readonly clinicName: string;
  readonly appVersion: string;
  readonly children: ReactNode;
};

/** Frame of every screen: the standing caution, navigation (Alt+1 to Alt+6) and the content. */
export function Shell({ current, clinicName, appVersion, children }: Props) {
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
      <header className="topbar">
        <div className="brand">
          <span className="brand-name">Tidewing</span>
          <span className="brand-clinic">{clinicName}</span>
        </div>
        <p className="standing-caution" role="note">
          Planning aid: every figure is an estimate with its basis shown. The responsible veterinarian
          decides.
        </p>
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
      <div className="content">{children}</div>
    </div>
  );
}
