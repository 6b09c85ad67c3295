import { StrictMode, useState } from 'react';
import { createRoot } from 'react-dom/client';
import {
  loadPrintData,
  loadRecordPrintData,
  planIdFromHash,
  recordIdFromHash,
  type PrintData,
} from './print-data.js';
import { Sheet } from './worksheets/sheet.js';
import './styles.css';

/**
 * `print.html#/worksheets/<planId>`: the worksheet alone, as the command line prints it. It loads
 * only the sheet (no other screen, no validation library) and asks for everything it needs at
 * once, before React draws anything, so a cold headless browser draws it quickly. The app's own
 * worksheet screen renders the same `Sheet`.
 *
 * `print.html#/records/<recordId>`: the procedure record for the patient file, loaded as its own
 * module only when asked for, so the worksheet stays as light as it was.
 */

function Failed({ title, message }: { readonly title: string; readonly message: string }) {
  return (
    <main className="gate">
      <h1>{title}</h1>
      <p className="form-error" role="alert">
        {message}
      </p>
    </main>
  );
}

function PrintedWorksheet({ loaded }: { readonly loaded: PrintData }) {
  const [printedAt] = useState(() => new Date());
  if (loaded.state === 'failed') return <Failed title="Worksheet" message={loaded.message} />;
  return <Sheet {...loaded.props} printedAt={printedAt} />;
}

const container = document.getElementById('root');
if (container === null) throw new Error('The page has no #root element');
const root = createRoot(container);
const recordId = recordIdFromHash(window.location.hash);

if (recordId === null) {
  const data = loadPrintData(planIdFromHash(window.location.hash));
  root.render(<p aria-busy="true">Loading the worksheet…</p>);
  void data.then((loaded) =>
    root.render(
      <StrictMode>
        <PrintedWorksheet loaded={loaded} />
      </StrictMode>,
    ),
  );
} else {
  root.render(<p aria-busy="true">Loading the procedure record…</p>);
  void Promise.all([
    loadRecordPrintData(recordId),
    import('./records/printed-record.js'),
    import('./records/printed-record-data.js'),
  ]).then(async ([loaded, { PrintedRecord }, { loadPrintedRecordExtras }]) => {
    if (loaded.state === 'failed') {
      root.render(<Failed title="Procedure record" message={loaded.message} />);
      return;
    }
    const extras = await loadPrintedRecordExtras(loaded.detail);
    root.render(
      <StrictMode>
        <PrintedRecord
          detail={loaded.detail}
          histories={extras.histories}
          plan={extras.plan}
          voided={extras.voided}
          settings={loaded.settings}
          appVersion={loaded.appVersion}
          printedAt={new Date()}
        />
      </StrictMode>,
    );
  });
}
