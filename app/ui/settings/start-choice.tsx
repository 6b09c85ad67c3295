import { useId, useState } from 'react';
import type { DemoClinicStatus, DemoClinicWritten } from '../../contract/demo-clinic-channels.js';
import { api } from '../common/bridge.js';
import './start-choice.css';

export type StartKind = 'empty' | 'demo';

/**
 * The first start's choice, offered only while the clinic holds no patient: an empty clinic for
 * the clinic's own birds (the default), or the invented demo clinic.
 */
export function StartChoice({
  demo,
  value,
  onChange,
}: {
  readonly demo: DemoClinicStatus['demo'];
  readonly value: StartKind;
  readonly onChange: (value: StartKind) => void;
}) {
  const emptyHint = useId();
  const demoHint = useId();
  return (
    <fieldset className="start-choice">
      <legend>How do you want to start?</legend>
      <label className={value === 'empty' ? 'chosen' : undefined}>
        <input
          type="radio"
          name="start"
          value="empty"
          checked={value === 'empty'}
          aria-describedby={emptyHint}
          autoFocus
          onChange={() => onChange('empty')}
        />
        <span>
          <strong>Start an empty clinic</strong>
          <span className="hint" id={emptyHint}>
            For your own patients and records. Enter the clinic’s name and units below.
          </span>
        </span>
      </label>
      <label className={value === 'demo' ? 'chosen' : undefined}>
        <input
          type="radio"
          name="start"
          value="demo"
          checked={value === 'demo'}
          aria-describedby={demoHint}
          onChange={() => onChange('demo')}
        />
        <span>
          <strong>Explore the demo clinic, with invented birds and records</strong>
          <span className="hint" id={demoHint}>
            {demo.birds} invented birds of {demo.species} species and {demo.records} finished procedures over
            the last {demo.days} days, to show what Tidewing learns from a clinic’s own records.
          </span>
        </span>
      </label>
    </fieldset>
  );
}

/** How to start the clinic's real records once the demo is in this data folder or database. */
function RealClinicLater({ status }: { readonly status: DemoClinicStatus }) {
  if (status.engine === 'postgresql')
    return (
      <p>
        The demo is written into the clinic’s database on the server, which every workstation using that
        database will show. For your real clinic, use another, empty database: name it in Settings, Clinic
        database (it takes effect at the next start), or start Tidewing with{' '}
        <code>npm start -- --database postgresql://USER@HOST:5432/DATABASE</code>.
      </p>
    );
  return (
    <>
      <p>
        The demo stays in this data folder: <code className="path">{status.dataDirectory}</code>. For your
        real clinic, start Tidewing on a new, empty data folder, from the project folder:{' '}
        <code>npm start -- --data FOLDER</code>, and choose an empty clinic on that first start.
      </p>
      <p className="hint">
        <code>--new-clinic</code> does not clear the demo: it refuses a data folder whose database holds
        records.
      </p>
    </>
  );
}

/** The demo chosen: what it is, that its birds are invented, how to start for real later, and the write. */
export function DemoStart({
  status,
  onOpened,
}: {
  readonly status: DemoClinicStatus;
  readonly onOpened: (written: DemoClinicWritten) => void;
}) {
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<string | null>(null);

  async function open() {
    setBusy(true);
    setFailure(null);
    const answer = await api.invoke('demo-clinic:create', {});
    setBusy(false);
    if (answer.ok) onOpened(answer.value);
    else setFailure(`The demo clinic was not opened: ${answer.error.message}`);
  }

  return (
    <section className="panel demo-start" aria-labelledby="demo-start-title">
      <h2 id="demo-start-title">The demo clinic</h2>
      <p className="demo-warning">
        <strong>Every bird, owner, weight and time in the demo clinic is invented.</strong> None is a real
        patient or a measurement. Do not enter real patients into the demo clinic, and do not use its figures
        for a real bird.
      </p>
      <p>
        The clinic is named “{status.demo.name}” and the top of every screen says it is the demo clinic. Its
        units are grams, mmHg and °C, with isoflurane as the default agent; Settings changes them.
      </p>
      <h3>Starting your real clinic later</h3>
      <RealClinicLater status={status} />
      <div className="form-actions">
        <button type="button" className="primary" disabled={busy} onClick={() => void open()}>
          {busy ? 'Writing the demo clinic…' : 'Open the demo clinic'}
        </button>
        <p role="status" className={failure === null ? 'hint' : 'form-error'}>
          {failure ?? (busy ? 'Writing the invented birds and their records; this takes a few seconds.' : '')}
        </p>
      </div>
    </section>
  );
}
