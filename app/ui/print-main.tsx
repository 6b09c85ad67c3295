import { StrictMode, useState } from 'react';
import { createRoot } from 'react-dom/client';
import { loadPrintData, planIdFromHash, type PrintData } from './print-data.js';
import { Sheet } from './worksheets/sheet.js';
import './styles.css';

/**
 * `print.html#/worksheets/<planId>`: the worksheet alone, as the command line prints it. It loads
 * only the sheet (no other screen, no validation library) and asks for everything it needs at
 * once, before React draws anything, so a cold headless browser draws it quickly. The app's own
 * worksheet screen renders the same `Sheet`.
 */

const data = loadPrintData(planIdFromHash(window.location.hash));

function PrintedWorksheet({ loaded }: { readonly loaded: PrintData }) {
  const [printedAt] = useState(() => new Date());
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
  return <Sheet {...loaded.props} printedAt={printedAt} />;
}

const container = document.getElementById('root');
if (container === null) throw new Error('The page has no #root element');
const root = createRoot(container);
root.render(<p aria-busy="true">Loading the worksheet…</p>);
void data.then((loaded) =>
  root.render(
    <StrictMode>
      <PrintedWorksheet loaded={loaded} />
    </StrictMode>,
  ),
);
